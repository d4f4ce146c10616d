//! Points on the Earth treated as a unit sphere: latitude/longitude ↔ vector, the direct and inverse
//! great-circle problems.

use super::direction::{angle_between, wrap360};
use super::vector::Vec3;
use crate::error::{check_range, Result};

/// A geographic point (site, pole).
///
/// # Units
/// Degrees. Latitude in [-90, 90]; longitude east-positive, stored in [0, 360) (any range accepted
/// by [`GeoPoint::new`] is wrapped).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct GeoPoint {
    /// Latitude, degrees.
    pub lat: f64,
    /// Longitude east, degrees, [0, 360).
    pub lon: f64,
}

impl GeoPoint {
    /// A validated point: latitude must lie in [-90, 90]; longitude finite, wrapped to [0, 360).
    pub fn new(lat: f64, lon: f64) -> Result<Self> {
        check_range("latitude", lat, -90.0, 90.0, "[-90, 90]")?;
        check_range("longitude", lon, -720.0, 720.0, "[-720, 720]")?;
        Ok(Self { lat, lon: wrap360(lon) })
    }

    /// Unit position vector in an Earth-centred frame (x toward 0°E on the equator, y toward 90°E,
    /// z toward the north pole).
    pub fn to_vector(self) -> Vec3 {
        let (la, lo) = (self.lat.to_radians(), self.lon.to_radians());
        Vec3::new(la.cos() * lo.cos(), la.cos() * lo.sin(), la.sin())
    }

    /// The point of a position vector; `None` for a zero vector. At the poles the longitude is 0.
    pub fn from_vector(v: Vec3) -> Option<Self> {
        let u = v.normalized()?;
        let lat = u.z.clamp(-1.0, 1.0).asin().to_degrees();
        let lon = if u.x.abs() < 1e-15 && u.y.abs() < 1e-15 { 0.0 } else { wrap360(u.y.atan2(u.x).to_degrees()) };
        Some(Self { lat, lon })
    }

    /// Local north and east unit vectors at this point. At a geographic pole "north" is taken along the
    /// 0° meridian direction of approach (the limit along the point's longitude), so azimuths stay defined.
    pub fn local_frame(self) -> (Vec3, Vec3) {
        let (la, lo) = (self.lat.to_radians(), self.lon.to_radians());
        let north = Vec3::new(-la.sin() * lo.cos(), -la.sin() * lo.sin(), la.cos());
        let east = Vec3::new(-lo.sin(), lo.cos(), 0.0);
        (north, east)
    }

    /// Direct problem: the point at angular `distance_deg` from here along initial azimuth `azimuth_deg`
    /// (clockwise from north).
    ///
    /// # Formula
    /// q = cos Δ · p + sin Δ · (cos α · n̂ + sin α · ê), with n̂, ê the local north and east vectors.
    /// No branch is needed for paths that cross a pole.
    ///
    /// # References
    /// Any text on spherical trigonometry; checked in tests against GeographicLib's formulas on a unit
    /// sphere (Karney 2013, *J. Geodesy* 87, 43–55).
    pub fn destination(self, azimuth_deg: f64, distance_deg: f64) -> GeoPoint {
        let p = self.to_vector();
        let (n, e) = self.local_frame();
        let (sa, ca) = azimuth_deg.to_radians().sin_cos();
        let (sd, cd) = distance_deg.to_radians().sin_cos();
        let q = p * cd + (n * ca + e * sa) * sd;
        GeoPoint::from_vector(q).expect("unit vector")
    }

    /// Inverse problem: angular distance (degrees, [0, 180]) and initial azimuth (degrees, [0, 360))
    /// from here to `other`.
    pub fn distance_azimuth(self, other: GeoPoint) -> (f64, f64) {
        let (p, q) = (self.to_vector(), other.to_vector());
        let dist = angle_between(p, q);
        let (n, e) = self.local_frame();
        let az = wrap360(q.dot(e).atan2(q.dot(n)).to_degrees());
        (dist, az)
    }
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn direct_and_inverse_agree() {
        let a = GeoPoint::new(41.6, -116.15).unwrap();
        for &(az, d) in &[(0.0, 30.0), (45.0, 60.0), (200.0, 120.0), (359.0, 170.0)] {
            let b = a.destination(az, d);
            let (dd, aa) = a.distance_azimuth(b);
            assert_abs_diff_eq!(dd, d, epsilon = 1e-9);
            assert_abs_diff_eq!(aa, az, epsilon = 1e-9);
        }
        // Due north by 90 degrees from the equator reaches the pole (exact).
        assert_abs_diff_eq!(GeoPoint::new(0.0, 10.0).unwrap().destination(0.0, 90.0).lat, 90.0, epsilon = 1e-12);
        // Over the pole: from (80N, 0E) north by 20 degrees lands on (80N, 180E).
        let q = GeoPoint::new(80.0, 0.0).unwrap().destination(0.0, 20.0);
        assert_abs_diff_eq!(q.lat, 80.0, epsilon = 1e-9);
        assert_abs_diff_eq!(q.lon, 180.0, epsilon = 1e-9);
    }
}
