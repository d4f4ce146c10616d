//! Dipole moments: virtual axial dipole moment (VADM), virtual dipole moment (VDM), and the geocentric
//! dipole of degree-1 Gauss coefficients (moment, tilt, north geomagnetic pole).

use super::vgp::colatitude_from_inclination;
use crate::error::{check_range, Error, Result};
use crate::sphere::{GeoPoint, Vec3};

/// Magnetic constant μ0 = 4π × 10⁻⁷ H/m (the pre-2019 SI defined value; the 2019 SI value differs by
/// less than 10⁻⁹ relative, far below any paleointensity uncertainty).
pub const MU0: f64 = 4.0e-7 * std::f64::consts::PI;

/// Earth radius used for VADM and VDM: 6.371 × 10⁶ m, the mean radius (IUGG R1 = 6371.0088 km,
/// rounded as is common practice in paleointensity work).
pub const EARTH_RADIUS_M: f64 = 6.371e6;

/// Reference radius of the IGRF spherical-harmonic expansion: a = 6371.2 km (IAGA convention), used for
/// moments from Gauss coefficients.
pub const IGRF_REFERENCE_RADIUS_M: f64 = 6.3712e6;

/// Moment (A·m²) of a dipole whose equatorial surface field at radius `radius_m` is `b_tesla`.
fn moment_from_equatorial(b_tesla: f64, radius_m: f64) -> f64 {
    4.0 * std::f64::consts::PI * radius_m.powi(3) / MU0 * b_tesla
}

/// Virtual axial dipole moment from a paleointensity and the site's latitude.
///
/// # Units
/// `intensity_ut` in µT, `lat_deg` in degrees; returns A·m².
///
/// # Formula
/// VADM = (4π R³ / μ0) · B / √(1 + 3 sin² λ), with R = [`EARTH_RADIUS_M`] and λ the geographic site
/// latitude (the field is assumed to be that of a geocentric axial dipole).
///
/// # References
/// Butler (1992), §1.2 (dipole field) and McElhinny & McFadden (2000), §1.2 and §4.2 (VADM, VDM);
/// Smirnov & Tarduno (2003) for the use of VADM versus VDM.
pub fn vadm(intensity_ut: f64, lat_deg: f64) -> Result<f64> {
    check_range("intensity", intensity_ut, 0.0, 1.0e4, "[0, 10000] µT")?;
    check_range("latitude", lat_deg, -90.0, 90.0, "[-90, 90]")?;
    let s = lat_deg.to_radians().sin();
    Ok(moment_from_equatorial(intensity_ut * 1e-6, EARTH_RADIUS_M) / (1.0 + 3.0 * s * s).sqrt())
}

/// Virtual dipole moment from a paleointensity and the inclination measured with it.
///
/// # Units
/// `intensity_ut` in µT, `inc_deg` in degrees; returns A·m².
///
/// # Formula
/// The magnetic colatitude p from tan I = 2 cot p, then VDM = (4π R³ / μ0) · B / √(1 + 3 cos² p).
/// Exact for a geocentric dipole of any orientation.
///
/// # References
/// McElhinny & McFadden (2000), §4.2; Butler (1992), §1.2.
pub fn vdm(intensity_ut: f64, inc_deg: f64) -> Result<f64> {
    check_range("intensity", intensity_ut, 0.0, 1.0e4, "[0, 10000] µT")?;
    check_range("inclination", inc_deg, -90.0, 90.0, "[-90, 90]")?;
    let c = colatitude_from_inclination(inc_deg).to_radians().cos();
    Ok(moment_from_equatorial(intensity_ut * 1e-6, EARTH_RADIUS_M) / (1.0 + 3.0 * c * c).sqrt())
}

/// The geocentric dipole described by degree-1 Gauss coefficients.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct GaussDipole {
    /// Dipole moment, A·m².
    pub moment: f64,
    /// Strength of the degree-1 field, B0 = √(g10² + g11² + h11²), nT.
    pub b0_nt: f64,
    /// Angle between the dipole axis and the rotation axis, degrees in [0, 90].
    pub tilt: f64,
    /// The north geomagnetic pole: where the axis meets the surface and the dipole field points down
    /// (the direction −m). In the southern hemisphere when g10 > 0 (a field of reversed polarity).
    pub pole: GeoPoint,
    /// True when g10 > 0: the dipole is reversed with respect to today's field.
    pub reversed: bool,
}

/// Moment, tilt and north geomagnetic pole of the degree-1 Gauss coefficients.
///
/// # Units
/// Coefficients in nT; moment in A·m²; angles in degrees; pole longitude in [0, 360).
///
/// # Formula
/// m = (4π a³ / μ0) · (g11, h11, g10) in Earth-centred coordinates (x to 0°E, y to 90°E, z north), with
/// a = [`IGRF_REFERENCE_RADIUS_M`]; |m| = (4π a³/μ0) B0. The north geomagnetic pole lies along −m:
/// latitude asin(−g10/B0), longitude atan2(−h11, −g11). Tilt = atan(√(g11² + h11²)/|g10|).
///
/// # References
/// Campbell (2003), *Introduction to Geomagnetic Fields*, §2.6; Alken et al. (2021), IGRF-13,
/// *Earth Planets Space* 73:49 (coefficients and reference radius).
pub fn gauss_dipole(g10: f64, g11: f64, h11: f64) -> Result<GaussDipole> {
    for (name, v) in [("g10", g10), ("g11", g11), ("h11", h11)] {
        check_range(name, v, -1.0e6, 1.0e6, "[-1e6, 1e6] nT")?;
    }
    let b0 = (g10 * g10 + g11 * g11 + h11 * h11).sqrt();
    if b0 == 0.0 {
        return Err(Error::Undefined("all three Gauss coefficients are zero: there is no dipole".into()));
    }
    let pole = GeoPoint::from_vector(Vec3::new(-g11, -h11, -g10)).expect("non-zero");
    Ok(GaussDipole {
        moment: moment_from_equatorial(b0 * 1e-9, IGRF_REFERENCE_RADIUS_M),
        b0_nt: b0,
        tilt: g11.hypot(h11).atan2(g10.abs()).to_degrees(),
        pole,
        reversed: g10 > 0.0,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::{assert_abs_diff_eq, assert_relative_eq};

    // IGRF-13 degree-1 coefficients (IAGA; Alken et al. 2021, Earth Planets Space 73:49), nT.
    const IGRF2020: (f64, f64, f64) = (-29404.8, -1450.9, 4652.5);
    const IGRF1900: (f64, f64, f64) = (-31543.0, -2298.0, 5922.0);

    #[test]
    fn igrf13_dipole_2020_and_1900() {
        let d20 = gauss_dipole(IGRF2020.0, IGRF2020.1, IGRF2020.2).unwrap();
        let d00 = gauss_dipole(IGRF1900.0, IGRF1900.1, IGRF1900.2).unwrap();
        // Reference values: NumPy 2.4.6, m = 4*pi*a**3/mu0*sqrt(g10**2+g11**2+h11**2)*1e-9 with a = 6371.2 km,
        // tilt = degrees(arctan(hypot(g11, h11)/|g10|)), pole = (degrees(arcsin(-g10/B0)), degrees(arctan2(-h11, -g11)) % 360).
        assert_relative_eq!(d20.moment, 7.708436706635235e22, max_relative = 1e-12);
        assert_abs_diff_eq!(d20.tilt, 9.410531276662093, epsilon = 1e-9);
        assert_abs_diff_eq!(d20.pole.lat, 80.58946872333793, epsilon = 1e-9);
        assert_abs_diff_eq!(d20.pole.lon, 287.3202900926125, epsilon = 1e-9);
        assert_relative_eq!(d00.moment, 8.321455283671425e22, max_relative = 1e-12);
        assert_abs_diff_eq!(d00.tilt, 11.386123589323638, epsilon = 1e-9);
        // Commonly stated figures: moment about 7.7e22 A m^2 (2020), tilt about 9.4 deg (2020) and about 11 deg
        // (1900); the 1900 dipole is some 8 % stronger than that of 2020 (measured: 7.95 %).
        assert!((d20.moment / 1e22 - 7.7).abs() < 0.05);
        assert!((d00.tilt - 11.4).abs() < 0.05);
        assert_abs_diff_eq!(d00.moment / d20.moment - 1.0, 0.0795, epsilon = 0.0005);
        // The 2020 north geomagnetic pole published with IGRF-13: 80.65 N, 72.68 W (from memory; the
        // published figure uses the same degree-1 terms).
        assert_abs_diff_eq!(d20.pole.lat, 80.65, epsilon = 0.1);
        assert_abs_diff_eq!(d20.pole.lon, 360.0 - 72.68, epsilon = 0.1);
        assert!(!d20.reversed);
        // A reversed dipole: the same axis, the pole on the other side.
        let r = gauss_dipole(-IGRF2020.0, -IGRF2020.1, -IGRF2020.2).unwrap();
        assert!(r.reversed);
        assert_abs_diff_eq!(r.tilt, d20.tilt, epsilon = 1e-12);
        assert_abs_diff_eq!(r.pole.lat, -d20.pole.lat, epsilon = 1e-9);
        assert!(gauss_dipole(0.0, 0.0, 0.0).is_err());
    }

    /// Field of a degree-1 potential V = a (a/r)^2 [g10 cos t + (g11 cos f + h11 sin f) sin t] at the
    /// surface r = a, from the textbook component formulas B_r = -dV/dr, B_t = -(1/r) dV/dt,
    /// B_f = -(1/(r sin t)) dV/df (Campbell 2003, §2.6). Returns (intensity nT, inclination deg).
    fn degree1_field(g10: f64, g11: f64, h11: f64, lat: f64, lon: f64) -> (f64, f64) {
        let (t, f) = ((90.0 - lat).to_radians(), lon.to_radians());
        let br = 2.0 * (g10 * t.cos() + (g11 * f.cos() + h11 * f.sin()) * t.sin());
        let bt = -(-g10 * t.sin() + (g11 * f.cos() + h11 * f.sin()) * t.cos());
        let bf = -(-g11 * f.sin() + h11 * f.cos());
        let (north, east, down) = (-bt, bf, -br);
        let h = north.hypot(east);
        ((h * h + down * down).sqrt(), down.atan2(h).to_degrees())
    }

    #[test]
    fn vdm_recovers_the_moment_of_a_tilted_dipole_anywhere() {
        // For a pure dipole, VDM from the local intensity and inclination equals the dipole moment exactly;
        // the field comes from the spherical-harmonic component formulas, not from the VDM formula.
        let (g10, g11, h11) = IGRF2020;
        let m = gauss_dipole(g10, g11, h11).unwrap().moment;
        for &(lat, lon) in &[(0.0, 0.0), (41.6, 243.85), (-33.0, 151.0), (78.0, 290.0), (-89.9, 10.0)] {
            let (f, i) = degree1_field(g10, g11, h11, lat, lon);
            let v = vdm(f / 1000.0, i).unwrap() * (IGRF_REFERENCE_RADIUS_M / EARTH_RADIUS_M).powi(3);
            assert_relative_eq!(v, m, max_relative = 1e-9);
        }
    }

    #[test]
    fn vadm_of_an_axial_dipole_field() {
        // Axial dipole g10 only: the VADM at any latitude equals the moment (Campbell 2003 component formulas).
        let g10 = -30000.0;
        let m = gauss_dipole(g10, 0.0, 0.0).unwrap().moment * (EARTH_RADIUS_M / IGRF_REFERENCE_RADIUS_M).powi(3);
        for lat in [-90.0, -45.0, 0.0, 12.5, 60.0, 90.0] {
            let (f, _) = degree1_field(g10, 0.0, 0.0, lat, 0.0);
            assert_relative_eq!(vadm(f / 1000.0, lat).unwrap(), m, max_relative = 1e-12);
        }
        // NumPy 2.4.6: 4*pi*6.371e6**3/(4e-7*pi)*30e-6/sqrt(1+3*sin(radians(30))**2) = 5.864419722206164e22.
        assert_relative_eq!(vadm(30.0, 30.0).unwrap(), 5.864419722206164e22, max_relative = 1e-12);
        assert!(vadm(30.0, 91.0).is_err());
        assert!(vadm(-1.0, 10.0).is_err());
        assert!(vdm(30.0, -91.0).is_err());
    }
}
