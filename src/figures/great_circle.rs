//! Great circles on the equal-area net: a circle given by its pole, split at the horizon into the half
//! below it (drawn solid) and the half above it (drawn dashed), each a sampled polyline of directions.
//!
//! # Formula
//! For a pole p (unit vector, x north, y east, z down) the circle is {v : v · p = 0}. It meets the
//! horizontal plane at ±h, h = (p × ẑ)/|p × ẑ|; with w = p × h, chosen so that w points down (w_z ≥ 0),
//! v(t) = h cos t + w sin t runs through the lower hemisphere for t ∈ [0, π] and the upper for
//! t ∈ [π, 2π]. A vertical pole (a horizontal plane) has no such h: the circle is the horizon itself,
//! returned whole as the lower half.
//!
//! # References
//! Fisher, Lewis & Embleton (1987), *Statistical Analysis of Spherical Data*, §3.2 (great circles by
//! their poles); Snyder (1987), *Map Projections — A Working Manual*, USGS PP 1395, §24 (the net's
//! Lambert projection, inverted in [`unproject`]).

use super::net_projection::project;
use crate::sphere::{Direction, Vec3};

/// The two halves of a great circle, lower hemisphere first; both run from horizon to horizon and meet
/// there (the last point of `lower` is the first of `upper`, and the last of `upper` the first of `lower`).
#[derive(Debug, Clone, PartialEq)]
pub struct CircleHalves {
    /// Points with inclination ≥ 0 (drawn solid).
    pub lower: Vec<Direction>,
    /// Points with inclination ≤ 0 (drawn dashed); empty for a horizontal plane.
    pub upper: Vec<Direction>,
}

/// Split the great circle whose pole is `pole` into its lower and upper halves, `n` segments each.
pub fn great_circle_halves(pole: Direction, n: usize) -> CircleHalves {
    let n = n.max(2);
    let p = pole.to_vector();
    let down = Vec3::new(0.0, 0.0, 1.0);
    let Some(h) = p.cross(down).normalized().filter(|_| p.z.abs() < 1.0 - 1e-12) else {
        // The horizon: every point has I = 0.
        let lower = (0..=2 * n).map(|k| Direction { dec: 180.0 * k as f64 / n as f64 % 360.0, inc: 0.0 }).collect();
        return CircleHalves { lower, upper: Vec::new() };
    };
    let mut w = p.cross(h);
    if w.z < 0.0 {
        w = w * -1.0;
    }
    let at = |t: f64| {
        let (s, c) = t.sin_cos();
        Direction::from_vector(h * c + w * s).expect("unit vector")
    };
    // The ends are put exactly on the horizon (h has z = 0 exactly; sin π is not exactly 0).
    let on_horizon = |v: Vec3| Direction::from_vector(v).map(|d| Direction { inc: 0.0, ..d }).expect("unit");
    let half = |from: f64| -> Vec<Direction> {
        (0..=n)
            .map(|k| match k {
                0 => on_horizon(if from == 0.0 { h } else { h * -1.0 }),
                _ if k == n => on_horizon(if from == 0.0 { h * -1.0 } else { h }),
                _ => at(from + std::f64::consts::PI * k as f64 / n as f64),
            })
            .collect()
    };
    CircleHalves { lower: half(0.0), upper: half(std::f64::consts::PI) }
}

/// Net coordinates (unit horizon) of a polyline of directions.
pub fn project_all(pts: &[Direction]) -> Vec<(f64, f64)> {
    pts.iter().map(|d| project(*d)).collect()
}

/// The direction at net coordinates (x east, y north, unit horizon) on the chosen hemisphere; `None`
/// outside the net.
///
/// # Formula
/// Inverse of [`project`]: r² = x² + y², |sin I| = 1 − r², D = atan2(x, y).
pub fn unproject((x, y): (f64, f64), lower: bool) -> Option<Direction> {
    let r2 = x * x + y * y;
    if !(r2 <= 1.0 + 1e-12) {
        return None;
    }
    let inc = (1.0 - r2).clamp(0.0, 1.0).asin().to_degrees();
    let dec = if r2 == 0.0 { 0.0 } else { crate::sphere::wrap360(x.atan2(y).to_degrees()) };
    Some(Direction { dec, inc: if lower { inc } else { -inc } })
}

/// Cut a polyline into dashes: pieces of length `on` separated by gaps of length `off` (same units as
/// the points), measured along the line from its first point.
pub fn dashes(path: &[(f64, f64)], on: f64, off: f64) -> Vec<Vec<(f64, f64)>> {
    let mut out = Vec::new();
    if path.len() < 2 || !(on > 0.0) || !(off >= 0.0) {
        return out;
    }
    let mut dash = vec![path[0]];
    let (mut solid, mut left) = (true, on);
    for seg in path.windows(2) {
        let (mut a, b) = (seg[0], seg[1]);
        let mut len = (b.0 - a.0).hypot(b.1 - a.1);
        while len > left {
            let t = left / len;
            a = (a.0 + (b.0 - a.0) * t, a.1 + (b.1 - a.1) * t);
            len -= left;
            if solid {
                dash.push(a);
                out.push(std::mem::take(&mut dash));
            } else {
                dash.push(a);
            }
            solid = !solid;
            left = if solid { on } else { off };
        }
        left -= len;
        if solid {
            dash.push(b);
        }
    }
    if solid && dash.len() > 1 {
        out.push(dash);
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    fn all_points(h: &CircleHalves) -> impl Iterator<Item = &Direction> {
        h.lower.iter().chain(h.upper.iter())
    }

    #[test]
    fn every_point_is_ninety_degrees_from_the_pole() {
        // Definition of a great circle by its pole (Fisher, Lewis & Embleton 1987, §3.2).
        for (dec, inc) in [(30.0, 40.0), (200.0, -65.0), (359.9, 0.5), (90.0, 89.0), (10.0, -5.0)] {
            let pole = Direction { dec, inc };
            let h = great_circle_halves(pole, 90);
            assert_eq!(h.lower.len(), 91);
            assert_eq!(h.upper.len(), 91);
            for d in all_points(&h) {
                assert_abs_diff_eq!(d.angle_to(pole), 90.0, epsilon = 1e-9);
            }
            assert!(h.lower.iter().all(|d| d.inc >= 0.0), "{dec} {inc}");
            assert!(h.upper.iter().all(|d| d.inc <= 0.0), "{dec} {inc}");
        }
    }

    #[test]
    fn the_halves_join_at_the_horizon() {
        let h = great_circle_halves(Direction { dec: 123.0, inc: 35.0 }, 60);
        let (l0, l1) = (h.lower[0], h.lower[h.lower.len() - 1]);
        let (u0, u1) = (h.upper[0], h.upper[h.upper.len() - 1]);
        for d in [l0, l1, u0, u1] {
            assert_eq!(d.inc, 0.0);
        }
        assert_abs_diff_eq!(l1.angle_to(u0), 0.0, epsilon = 1e-9);
        assert_abs_diff_eq!(u1.angle_to(l0), 0.0, epsilon = 1e-9);
        // The two horizon points are antipodal and lie along the strike, 90° from the pole's declination.
        assert_abs_diff_eq!(l0.angle_to(l1), 180.0, epsilon = 1e-9);
        let off = (l0.dec - 123.0).rem_euclid(180.0);
        assert_abs_diff_eq!(off, 90.0, epsilon = 1e-9);
        // The lowest point of the lower half dips at 90° − 35° = 55°, toward the azimuth opposite the
        // pole's (a plane's dip is the complement of its pole's plunge: common practice).
        let deepest = h.lower.iter().fold(h.lower[0], |a, b| if b.inc > a.inc { *b } else { a });
        assert_abs_diff_eq!(deepest.inc, 55.0, epsilon = 0.1);
        assert_abs_diff_eq!(deepest.dec, 303.0, epsilon = 1.5);
    }

    #[test]
    fn a_vertical_plane_projects_to_a_diameter() {
        // Pole horizontal at D = 90°: the plane is the vertical north–south plane; on the net both halves
        // lie on the north–south diameter (x = 0), through the centre.
        let h = great_circle_halves(Direction { dec: 90.0, inc: 0.0 }, 90);
        for (x, _) in project_all(&h.lower).into_iter().chain(project_all(&h.upper)) {
            assert_abs_diff_eq!(x, 0.0, epsilon = 1e-9);
        }
        let deepest = h.lower.iter().map(|d| d.inc).fold(f64::MIN, f64::max);
        assert_abs_diff_eq!(deepest, 90.0, epsilon = 1e-9);
    }

    #[test]
    fn a_horizontal_plane_is_the_primitive_circle() {
        for inc in [90.0, -90.0] {
            let h = great_circle_halves(Direction { dec: 0.0, inc }, 36);
            assert!(h.upper.is_empty());
            for (x, y) in project_all(&h.lower) {
                assert_abs_diff_eq!(x.hypot(y), 1.0, epsilon = 1e-12);
            }
            let first = h.lower[0];
            assert_abs_diff_eq!(h.lower[h.lower.len() - 1].angle_to(first), 0.0, epsilon = 1e-9);
        }
    }

    #[test]
    fn unproject_inverts_the_projection() {
        for (dec, inc) in [(0.0, 0.0), (45.0, 30.0), (200.0, 75.5), (300.0, -20.0), (10.0, 90.0)] {
            let d = Direction { dec, inc };
            let back = unproject(project(d), inc >= 0.0).unwrap();
            assert_abs_diff_eq!(back.angle_to(d), 0.0, epsilon = 1e-6);
        }
        assert!(unproject((0.9, 0.9), true).is_none());
    }

    #[test]
    fn dashes_alternate_on_and_off() {
        // A straight line of length 10 in two segments, dashes 2 on, 1 off: on at [0,2], [3,5], [6,8], [9,10].
        let d = dashes(&[(0.0, 0.0), (4.0, 0.0), (10.0, 0.0)], 2.0, 1.0);
        let spans: Vec<(f64, f64)> = d.iter().map(|p| (p[0].0, p[p.len() - 1].0)).collect();
        assert_eq!(spans.len(), 4);
        for (got, want) in spans.iter().zip([(0.0, 2.0), (3.0, 5.0), (6.0, 8.0), (9.0, 10.0)]) {
            assert_abs_diff_eq!(got.0, want.0, epsilon = 1e-12);
            assert_abs_diff_eq!(got.1, want.1, epsilon = 1e-12);
        }
        // The dash that spans the corner at x = 4 keeps the corner point.
        assert_eq!(d[1], vec![(3.0, 0.0), (4.0, 0.0), (5.0, 0.0)]);
    }
}
