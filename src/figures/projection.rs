//! The equal-area (Lambert azimuthal, Schmidt) projection of directions onto the unit net, and its
//! inverse: what every net figure draws with.

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
