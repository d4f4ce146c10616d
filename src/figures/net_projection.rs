//! The projection of the equal-area net: a direction to plot coordinates on the unit net.

use crate::sphere::Direction;

/// Plot coordinates of a direction on the unit equal-area net (north up, east right).
///
/// # Formula
/// r = √(1 − |sin I|) (Lambert azimuthal equal-area, scaled so the horizon has radius 1);
/// x = r sin D, y = r cos D. Upward directions (I < 0) plot at the same place as their reflection
/// through the horizontal and are drawn as open symbols.
///
/// # References
/// Lambert (1772); Snyder (1987), *Map Projections — A Working Manual*, USGS PP 1395, §24;
/// Butler (1992), §5.2 (equal-area projection in paleomagnetism).
pub fn project(d: Direction) -> (f64, f64) {
    let r = (1.0 - d.inc.to_radians().sin().abs()).max(0.0).sqrt();
    let dr = d.dec.to_radians();
    (r * dr.sin(), r * dr.cos())
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn lambert_radius() {
        // Lambert equal-area: r = sqrt(1 - |sin I|); horizon at 1, vertical at 0, I = 30 at sqrt(0.5)
        // (Snyder 1987, §24, with the projection scaled to unit horizon).
        assert_abs_diff_eq!(project(Direction { dec: 0.0, inc: 0.0 }).1, 1.0, epsilon = 1e-15);
        assert_abs_diff_eq!(project(Direction { dec: 90.0, inc: 30.0 }).0, 0.5f64.sqrt(), epsilon = 1e-12);
        assert_abs_diff_eq!(project(Direction { dec: 90.0, inc: -30.0 }).0, 0.5f64.sqrt(), epsilon = 1e-12);
        let p = project(Direction { dec: 0.0, inc: 90.0 });
        assert!(p.0.abs() < 1e-12 && p.1.abs() < 1e-12);
        // Equal-area property: the area inside r is proportional to 1 - cos(colatitude) (cap area).
        for inc in [10.0f64, 45.0, 80.0] {
            let r = project(Direction { dec: 0.0, inc }).1;
            assert_abs_diff_eq!(r * r, 1.0 - inc.to_radians().sin(), epsilon = 1e-12);
        }
    }
}
