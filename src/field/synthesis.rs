//! The field of a set of Gauss coefficients at a point: geocentric synthesis, the WGS84 geodetic
//! conversion, and the seven elements X, Y, Z, H, F, D, I.

use super::coefficients::{index, Coefficients};
use super::error::{check, FieldResult};
use super::legendre::schmidt;
use crate::sphere::wrap360;

/// Reference radius of the expansion, km (the IGRF convention).
pub const REFERENCE_RADIUS_KM: f64 = 6371.2;
/// WGS84 semi-major axis, km.
pub const WGS84_A_KM: f64 = 6378.137;
/// WGS84 flattening.
pub const WGS84_F: f64 = 1.0 / 298.257223563;
/// Colatitudes closer than this to a pole (radians) are moved to it, so that Y stays finite.
const POLE_GUARD: f64 = 1e-9;

/// How a point's latitude and altitude are given.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Frame {
    /// Geodetic latitude on the WGS84 ellipsoid, altitude above the ellipsoid; X and Z along the
    /// ellipsoid's horizontal and normal.
    Geodetic,
    /// Geocentric latitude, altitude above the reference sphere of radius 6371.2 km.
    Geocentric,
}

/// A point where the field is evaluated.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Site {
    /// Latitude, degrees, [-90, 90].
    pub lat: f64,
    /// Longitude east, degrees, [0, 360).
    pub lon: f64,
    /// Altitude, km.
    pub altitude_km: f64,
    /// Geodetic or geocentric.
    pub frame: Frame,
}

impl Site {
    /// A validated point: latitude in [-90, 90], longitude in [-360, 360] (wrapped), altitude in
    /// [-1000, 100 000] km.
    pub fn new(lat: f64, lon: f64, altitude_km: f64, frame: Frame) -> FieldResult<Site> {
        check("latitude", lat, -90.0, 90.0, "[-90, 90]")?;
        check("longitude", lon, -360.0, 360.0, "[-360, 360]")?;
        check("altitude", altitude_km, -1000.0, 1.0e5, "[-1000, 100000] km")?;
        Ok(Site { lat, lon: wrap360(lon), altitude_km, frame })
    }

    /// Geocentric radius (km), colatitude (radians) and the angle δ (radians) from the geocentric to
    /// the site's own vertical (zero for a geocentric site).
    ///
    /// # Formula
    /// WGS84: N = a/√(1 − e² sin² φ), p = (N + h) cos φ, z = (N(1 − e²) + h) sin φ; r = √(p² + z²),
    /// geocentric latitude ψ = atan2(z, p), δ = φ − ψ.
    ///
    /// # References
    /// NIMA TR8350.2 (2000), *Department of Defense World Geodetic System 1984*, §4 and eq. 4-14/4-15
    /// (the ellipsoid and its Cartesian coordinates).
    pub fn geocentric(&self) -> (f64, f64, f64) {
        match self.frame {
            Frame::Geocentric => (REFERENCE_RADIUS_KM + self.altitude_km, (90.0 - self.lat).to_radians(), 0.0),
            Frame::Geodetic => {
                let phi = self.lat.to_radians();
                let e2 = WGS84_F * (2.0 - WGS84_F);
                let (s, c) = phi.sin_cos();
                let n = WGS84_A_KM / (1.0 - e2 * s * s).sqrt();
                let p = (n + self.altitude_km) * c;
                let z = (n * (1.0 - e2) + self.altitude_km) * s;
                let psi = z.atan2(p);
                (p.hypot(z), std::f64::consts::FRAC_PI_2 - psi, phi - psi)
            }
        }
    }
}

/// The seven field elements at a point.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct FieldElements {
    /// North component, nT.
    pub x: f64,
    /// East component, nT.
    pub y: f64,
    /// Down component, nT.
    pub z: f64,
    /// Horizontal intensity, nT.
    pub h: f64,
    /// Total intensity, nT.
    pub f: f64,
    /// Declination, degrees clockwise from north, [0, 360).
    pub dec: f64,
    /// Inclination, degrees, positive down.
    pub inc: f64,
}

impl FieldElements {
    /// Elements from the three components (nT).
    pub fn from_xyz(x: f64, y: f64, z: f64) -> Self {
        let h = x.hypot(y);
        FieldElements { x, y, z, h, f: h.hypot(z), dec: wrap360(y.atan2(x).to_degrees()), inc: z.atan2(h).to_degrees() }
    }
}

/// Field components in the geocentric spherical frame at radius `r_km`, colatitude `theta` and
/// longitude `phi` (radians): (B_r, B_θ, B_φ) in nT.
///
/// # Formula
/// V = a Σ_n (a/r)^{n+1} Σ_m (g cos mφ + h sin mφ) P_n^m(cos θ) with a = 6371.2 km; B = −∇V:
/// B_r = Σ (n+1)(a/r)^{n+2} Σ (g cos mφ + h sin mφ) P, B_θ = −Σ (a/r)^{n+2} Σ (g cos mφ + h sin mφ) dP/dθ,
/// B_φ = Σ (a/r)^{n+2} Σ m (g sin mφ − h cos mφ) P / sin θ.
///
/// # References
/// Langel (1987), §4.2, eq. 4.8–4.11; Alken et al. (2021), IGRF-13, *Earth Planets Space* 73:49, eq. 1.
pub fn spherical_components(c: &Coefficients, r_km: f64, theta: f64, phi: f64) -> (f64, f64, f64) {
    let theta = theta.clamp(POLE_GUARD, std::f64::consts::PI - POLE_GUARD);
    let (mut p, mut dp) = (Vec::new(), Vec::new());
    schmidt(theta, c.degree, &mut p, &mut dp);
    let ratio = REFERENCE_RADIUS_KM / r_km;
    let (mut br, mut bt, mut bp) = (0.0, 0.0, 0.0);
    let trig: Vec<(f64, f64)> = (0..=c.degree).map(|m| (m as f64 * phi).sin_cos()).collect();
    let mut rn = ratio * ratio; // (a/r)^{n+2} for n = 0
    for n in 1..=c.degree {
        rn *= ratio;
        let (mut sr, mut st, mut sp) = (0.0, 0.0, 0.0);
        for (m, &(sm, cm)) in trig.iter().enumerate().take(n + 1) {
            let k = index(n, m);
            let (g, h) = (c.g[k], c.h[k]);
            let a = g * cm + h * sm;
            sr += a * p[k];
            st += a * dp[k];
            sp += m as f64 * (g * sm - h * cm) * p[k];
        }
        br += (n as f64 + 1.0) * rn * sr;
        bt -= rn * st;
        bp += rn * sp;
    }
    (br, bt, bp / theta.sin())
}

/// The field elements of coefficients `c` at a site.
///
/// X, Y, Z are taken along the site's own north, east and down: for a geodetic site the geocentric
/// components are turned by δ, the angle between the two verticals: X = X_c cos δ + Z_c sin δ,
/// Z = Z_c cos δ − X_c sin δ (Langel 1987, §4.3).
pub fn field_at(c: &Coefficients, site: &Site) -> FieldElements {
    let (r, theta, delta) = site.geocentric();
    let (br, bt, bp) = spherical_components(c, r, theta, site.lon.to_radians());
    let (xc, zc) = (-bt, -br);
    let (sd, cd) = delta.sin_cos();
    FieldElements::from_xyz(xc * cd + zc * sd, bp, zc * cd - xc * sd)
}
