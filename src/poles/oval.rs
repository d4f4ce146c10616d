//! The confidence oval of a virtual geomagnetic pole (dp, dm) and the paleolatitude range implied by α95.

use super::vgp::{colatitude_from_inclination, Vgp};
use crate::error::{check_range, Result};

/// Semi-axes of the confidence oval about a VGP, transferred from the cone α95 about the site mean.
///
/// # Units
/// Degrees of arc on the Earth's surface.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PoleOval {
    /// Semi-axis along the great circle site → pole (the colatitude direction), degrees.
    pub dp: f64,
    /// Semi-axis perpendicular to it, degrees.
    pub dm: f64,
}

/// The oval (dp, dm) about a VGP whose site lies at magnetic colatitude `colatitude_deg`, from the
/// cone half-angle `a95_deg` about the site-mean direction.
///
/// # Formula
/// dp = α95 (1 + 3 cos² p) / 2 and dm = α95 sin p / cos I. With tan I = 2 cot p the second is written
/// without the 0/0 at the magnetic pole as dm = α95 √(1 + 3 cos² p). dp is α95 times |dp/dI|, the
/// derivative of the colatitude with respect to inclination (a first-order transfer of the cone).
///
/// # References
/// Butler (1992), §7.1, eqs. 7.5–7.6; McElhinny & McFadden (2000), §5.2.
pub fn pole_oval(colatitude_deg: f64, a95_deg: f64) -> Result<PoleOval> {
    check_range("a95", a95_deg, 0.0, 180.0, "[0, 180]")?;
    check_range("magnetic colatitude", colatitude_deg, 0.0, 180.0, "[0, 180]")?;
    let c2 = colatitude_deg.to_radians().cos().powi(2);
    Ok(PoleOval { dp: 0.5 * a95_deg * (1.0 + 3.0 * c2), dm: a95_deg * (1.0 + 3.0 * c2).sqrt() })
}

/// [`pole_oval`] for a computed VGP.
pub fn vgp_oval(v: &Vgp, a95_deg: f64) -> Result<PoleOval> {
    pole_oval(v.colatitude, a95_deg)
}

/// A paleolatitude with the range implied by the cone about the inclination.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PaleolatitudeRange {
    /// Paleolatitude from tan I = 2 tan λ, degrees.
    pub paleolat: f64,
    /// Paleolatitude at I − α95 (inclination clamped to −90), degrees.
    pub low: f64,
    /// Paleolatitude at I + α95 (inclination clamped to 90), degrees.
    pub high: f64,
}

/// Paleolatitude λ with its range from I ± α95.
///
/// # Formula
/// tan I = 2 tan λ ⇒ λ = 90° − p with p the magnetic colatitude; the range takes λ at I − α95 and
/// I + α95 (each clamped to [−90°, 90°]); λ grows with I, so low ≤ λ ≤ high.
///
/// # References
/// Butler (1992), §7.1 (paleolatitude and its error from α95).
pub fn paleolatitude_range(inc_deg: f64, a95_deg: f64) -> Result<PaleolatitudeRange> {
    check_range("inclination", inc_deg, -90.0, 90.0, "[-90, 90]")?;
    check_range("a95", a95_deg, 0.0, 180.0, "[0, 180]")?;
    let lat = |i: f64| 90.0 - colatitude_from_inclination(i.clamp(-90.0, 90.0));
    Ok(PaleolatitudeRange { paleolat: lat(inc_deg), low: lat(inc_deg - a95_deg), high: lat(inc_deg + a95_deg) })
}

/// Uncertainty of the direction expected at a site from a pole known to within A95.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct ExpectedOval {
    /// Half-range of the expected declination, degrees; `None` when the A95 circle contains the site or
    /// its antipode (every declination is possible).
    pub delta_dec: Option<f64>,
    /// Half-range of the expected inclination, degrees.
    pub delta_inc: f64,
}

/// ΔD and ΔI of the direction expected at `site` from `pole` with confidence circle `a95_deg`.
///
/// # Formula
/// With p the site–pole distance: ΔI = 2 A95 / (1 + 3 cos² p) (the inverse of the dp transfer) and
/// ΔD = asin(sin A95 / sin p) (the half-angle subtended at the site by the A95 circle).
///
/// # References
/// Butler (1992), §11.1 (expected directions and their confidence limits); Beck (1980), *J. Geophys.
/// Res.* 85, 7115–7131.
pub fn expected_oval(
    site: crate::sphere::GeoPoint,
    pole: crate::sphere::GeoPoint,
    a95_deg: f64,
) -> Result<ExpectedOval> {
    check_range("A95", a95_deg, 0.0, 90.0, "[0, 90]")?;
    let (p, _) = site.distance_azimuth(pole);
    let (sp, c2) = (p.to_radians().sin(), p.to_radians().cos().powi(2));
    let ratio = a95_deg.to_radians().sin() / sp;
    let delta_dec = (a95_deg < p && a95_deg < 180.0 - p && ratio <= 1.0).then(|| ratio.asin().to_degrees());
    Ok(ExpectedOval { delta_dec, delta_inc: 2.0 * a95_deg / (1.0 + 3.0 * c2) })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn oval_limits() {
        // Equator (p = 90): dp = a95/2, dm = a95; magnetic pole (p = 0): a circle of radius 2 a95
        // (Butler 1992, eqs. 7.5-7.6, evaluated by hand).
        let e = pole_oval(90.0, 10.0).unwrap();
        assert_abs_diff_eq!(e.dp, 5.0, epsilon = 1e-12);
        assert_abs_diff_eq!(e.dm, 10.0, epsilon = 1e-12);
        let p = pole_oval(0.0, 10.0).unwrap();
        assert_abs_diff_eq!(p.dp, 20.0, epsilon = 1e-12);
        assert_abs_diff_eq!(p.dm, 20.0, epsilon = 1e-12);
        assert!(pole_oval(30.0, -1.0).is_err());
    }

    #[test]
    fn dm_equals_butlers_sin_p_over_cos_i_and_dp_is_the_derivative() {
        // dm: Butler's written form sin p / cos I, evaluated directly away from the pole.
        // dp: a central finite difference of p(I) = atan2(2 cos I, sin I), independent of the closed form.
        for &inc in &[-75.0f64, -30.0, 5.0, 40.0, 63.0, 85.0] {
            let p = colatitude_from_inclination(inc);
            let o = pole_oval(p, 1.0).unwrap();
            assert_abs_diff_eq!(o.dm, p.to_radians().sin() / inc.to_radians().cos(), epsilon = 1e-9);
            let h = 1e-5;
            let deriv = (colatitude_from_inclination(inc + h) - colatitude_from_inclination(inc - h)) / (2.0 * h);
            assert_abs_diff_eq!(o.dp, deriv.abs(), epsilon = 1e-6);
        }
    }

    #[test]
    fn paleolatitude_range_brackets() {
        // tan I = 2 tan(lambda): I = 63.4349 gives 45 degrees (dipole formula, common practice).
        let r = paleolatitude_range(63.43494882292201, 5.0).unwrap();
        assert_abs_diff_eq!(r.paleolat, 45.0, epsilon = 1e-9);
        assert!(r.low < 45.0 && r.high > 45.0);
        assert_abs_diff_eq!(r.low, (58.43494882292201f64.to_radians().tan() / 2.0).atan().to_degrees(), epsilon = 1e-9);
        // Near vertical: the upper end clamps at 90.
        let v = paleolatitude_range(88.0, 5.0).unwrap();
        assert_abs_diff_eq!(v.high, 90.0, epsilon = 1e-12);
        assert!(paleolatitude_range(95.0, 5.0).is_err());
    }
}
