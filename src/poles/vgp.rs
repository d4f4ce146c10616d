//! Virtual geomagnetic poles and the inverse (expected direction from a pole).

use crate::sphere::{Direction, GeoPoint};

/// A virtual geomagnetic pole computed from a site and a direction.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Vgp {
    /// The pole position.
    pub pole: GeoPoint,
    /// Magnetic colatitude p of the site (angular distance site → pole), degrees.
    pub colatitude: f64,
    /// Paleolatitude of the site, 90° − p, degrees (negative for a reversed direction).
    pub paleolat: f64,
}

/// Magnetic colatitude from inclination for a geocentric axial dipole.
///
/// # Formula
/// tan I = 2 cot p  ⇒  p = atan2(2 cos I, sin I), p in [0°, 180°].
///
/// # References
/// Butler (1992), eq. 1.8 and §7.1; McElhinny & McFadden (2000), eq. 1.21.
pub fn colatitude_from_inclination(inc_deg: f64) -> f64 {
    let i = inc_deg.to_radians();
    (2.0 * i.cos()).atan2(i.sin()).to_degrees()
}

/// Inclination of a geocentric axial dipole field at (paleo)latitude λ: tan I = 2 tan λ.
pub fn dipole_inclination(lat_deg: f64) -> f64 {
    (2.0 * lat_deg.to_radians().tan()).atan().to_degrees()
}

/// The VGP of a site with mean direction `dir`.
///
/// # Formula
/// The pole lies at angular distance p (magnetic colatitude) from the site along azimuth D (the great-
/// circle direct problem, [`GeoPoint::destination`]). Equivalent to the usual closed form
/// sin λp = sin λs cos p + cos λs sin p cos D with its longitude branch, but without the branch.
///
/// # References
/// Butler (1992), §7.1, eqs. 7.1–7.4.
pub fn vgp(site: GeoPoint, dir: Direction) -> Vgp {
    let p = colatitude_from_inclination(dir.inc);
    Vgp { pole: site.destination(dir.dec, p), colatitude: p, paleolat: 90.0 - p }
}

/// The direction expected at `site` from a geocentric dipole whose virtual pole is `pole` (the inverse
/// of [`vgp`]).
///
/// # Formula
/// p = distance(site, pole), D = initial azimuth site → pole, I = atan(2 cot p).
pub fn expected_direction(site: GeoPoint, pole: GeoPoint) -> Direction {
    let (p, az) = site.distance_azimuth(pole);
    let inc = (2.0 * p.to_radians().cos()).atan2(p.to_radians().sin()).to_degrees();
    Direction { dec: az, inc }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn axial_dipole_inclination() {
        // tan I = 2 tan(45 deg) = 2 => I = 63.4349 deg (dipole formula, common practice).
        assert_abs_diff_eq!(dipole_inclination(45.0), 63.43494882292201, epsilon = 1e-12);
        assert_abs_diff_eq!(colatitude_from_inclination(63.43494882292201), 45.0, epsilon = 1e-9);
        assert_abs_diff_eq!(colatitude_from_inclination(90.0), 0.0, epsilon = 1e-12);
        assert_abs_diff_eq!(colatitude_from_inclination(-90.0), 180.0, epsilon = 1e-12);
    }

    #[test]
    fn axial_dipole_direction_gives_the_geographic_pole_and_round_trips() {
        let site = GeoPoint::new(41.6, 243.85).unwrap();
        let v = vgp(site, Direction { dec: 0.0, inc: dipole_inclination(41.6) });
        assert_abs_diff_eq!(v.pole.lat, 90.0, epsilon = 1e-9);
        let r = vgp(site, Direction { dec: 180.0, inc: -dipole_inclination(41.6) });
        assert_abs_diff_eq!(r.pole.lat, -90.0, epsilon = 1e-9);
        for &(d, i) in &[(10.0, 50.0), (200.0, -30.0), (355.0, 5.0), (90.0, 80.0)] {
            let dir = Direction::new(d, i).unwrap();
            let back = expected_direction(site, vgp(site, dir).pole);
            assert!(back.angle_to(dir) < 1e-9, "{d} {i}: {back:?}");
        }
    }
}
