//! Dip poles: the points of the WGS84 surface where the horizontal field vanishes.

use super::coefficients::Coefficients;
use super::error::{FieldError, FieldResult};
use super::synthesis::{field_at, Frame, Site};
use crate::sphere::{GeoPoint, Vec3};

/// Which dip pole.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum DipPole {
    /// Where the field points straight down (I = +90°); today in the Arctic.
    Down,
    /// Where the field points straight up (I = −90°); today near Antarctica.
    Up,
}

/// Horizontal field (nT) at a geodetic surface point given by its unit normal, as an Earth-centred vector.
fn horizontal(c: &Coefficients, normal: Vec3) -> (Vec3, f64) {
    let p = GeoPoint::from_vector(normal).expect("unit vector");
    let site = Site { lat: p.lat, lon: p.lon, altitude_km: 0.0, frame: Frame::Geodetic };
    let e = field_at(c, &site);
    let (north, east) = p.local_frame();
    (north * e.x + east * e.y, e.z)
}

/// A coarse start: the cell of a global 2° grid with the smallest H/F and the right sign of Z.
fn coarse_start(c: &Coefficients, which: DipPole) -> Vec3 {
    let mut best = (f64::INFINITY, Vec3::new(0.0, 0.0, 1.0));
    for i in 0..90 {
        let lat = -89.0 + 2.0 * i as f64;
        for j in 0..180 {
            let p = GeoPoint { lat, lon: 2.0 * j as f64 };
            let site = Site { lat, lon: p.lon, altitude_km: 0.0, frame: Frame::Geodetic };
            let e = field_at(c, &site);
            let right_sign = match which {
                DipPole::Down => e.z > 0.0,
                DipPole::Up => e.z < 0.0,
            };
            if right_sign && e.h / e.f < best.0 {
                best = (e.h / e.f, p.to_vector());
            }
        }
    }
    best.1
}

/// The dip pole of a set of coefficients on the WGS84 surface (geodetic latitude, altitude 0).
///
/// # Units
/// Degrees; longitude in [0, 360).
///
/// # Formula
/// Newton steps on the sphere of surface normals: at the current point p with local north n̂ and east ê,
/// the residual is the horizontal field (H·n̂, H·ê); its 2 × 2 Jacobian with respect to displacements
/// along n̂ and ê is taken by central differences (10⁻⁶ rad); the step (capped at 0.1 rad) moves p in
/// its tangent plane and back onto the sphere. Stops when a step is below 10⁻¹¹ rad (≈ 0.06 mm) or H < 10⁻⁸ |Z|.
/// The start is `start` (e.g. last epoch's pole) or the best cell of a 2° grid.
///
/// # References
/// The dip pole as the point where H = 0: Campbell (2003), *Introduction to Geomagnetic Fields*, §1.3
/// (common practice in the trade); Newton's method: Press et al. (2007), *Numerical Recipes* 3rd ed., §9.6.
pub fn dip_pole(c: &Coefficients, which: DipPole, start: Option<GeoPoint>) -> FieldResult<GeoPoint> {
    let mut p = start.map(GeoPoint::to_vector).unwrap_or_else(|| coarse_start(c, which));
    const EPS: f64 = 1e-6;
    for _ in 0..60 {
        let here = GeoPoint::from_vector(p).expect("unit vector");
        let (n, e) = here.local_frame();
        let res = |q: Vec3| {
            let (h, _) = horizontal(c, q.normalized().expect("non-zero"));
            (h.dot(n), h.dot(e))
        };
        let (r1, r2) = res(p);
        let (_, z) = horizontal(c, p);
        let vertical = match which {
            DipPole::Down => z > 0.0,
            DipPole::Up => z < 0.0,
        };
        // Converged when the field is within 1e-8 rad of the vertical (some 0.1 m on the ground) (also where the pole guard of
        // the synthesis stops the steps from shrinking, at a geographic pole).
        if vertical && r1.hypot(r2) < 1e-8 * z.abs() {
            return Ok(here);
        }
        let (a1, a2) = res(p + n * EPS);
        let (b1, b2) = res(p - n * EPS);
        let (c1, c2) = res(p + e * EPS);
        let (d1, d2) = res(p - e * EPS);
        let j =
            [[(a1 - b1) / (2.0 * EPS), (c1 - d1) / (2.0 * EPS)], [(a2 - b2) / (2.0 * EPS), (c2 - d2) / (2.0 * EPS)]];
        let det = j[0][0] * j[1][1] - j[0][1] * j[1][0];
        if det == 0.0 || !det.is_finite() {
            break;
        }
        let mut s1 = -(j[1][1] * r1 - j[0][1] * r2) / det;
        let mut s2 = -(-j[1][0] * r1 + j[0][0] * r2) / det;
        let len = s1.hypot(s2);
        if len > 0.1 {
            (s1, s2) = (s1 * 0.1 / len, s2 * 0.1 / len);
        }
        p = (p + n * s1 + e * s2).normalized().expect("non-zero");
        if len < 1e-11 {
            if vertical {
                return Ok(GeoPoint::from_vector(p).expect("unit vector"));
            }
            break;
        }
    }
    let last = GeoPoint::from_vector(p).expect("unit vector");
    Err(FieldError::NoConvergence { what: "the dip-pole search", lat: last.lat, lon: last.lon })
}
