//! The paleopole: Fisher mean of virtual geomagnetic poles, with K and A95.

use crate::error::{Error, Result};
use crate::sphere::GeoPoint;
use crate::stats::{FisherAccumulator, Precision};

/// A mean pole with its Fisher statistics.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Paleopole {
    /// Number of VGPs averaged.
    pub n: usize,
    /// The mean pole.
    pub pole: GeoPoint,
    /// Resultant length R of the unit pole vectors.
    pub r: f64,
    /// Precision K = (N − 1)/(N − R) (infinite when all VGPs coincide).
    pub k: Precision,
    /// Semi-angle of the 95 % confidence cone about the mean pole, degrees; `None` when the VGPs are
    /// too scattered for a cone.
    pub a95: Option<f64>,
}

/// The VGP mapped to the northern hemisphere: its antipode when it lies south of the equator.
///
/// Returns the point and whether it was flipped. A VGP exactly on the equator is left as is.
pub fn northern(p: GeoPoint) -> (GeoPoint, bool) {
    if p.lat < 0.0 {
        (GeoPoint::from_vector(p.to_vector() * -1.0).expect("unit"), true)
    } else {
        (p, false)
    }
}

/// Fisher mean of VGPs treated as unit vectors.
///
/// # Formula
/// As for directions: R = |Σ pᵢ|, mean = Σ pᵢ/R, K = (N − 1)/(N − R),
/// cos A95 = 1 − ((N − R)/R)(20^{1/(N−1)} − 1).
///
/// # Errors
/// `TooFew` for fewer than two VGPs; `Undefined` when the poles cancel (R ≈ 0, e.g. a mixed-polarity set
/// that was not mapped to one hemisphere).
///
/// # References
/// Fisher (1953); Butler (1992), §7.2 (paleomagnetic poles from VGPs).
pub fn paleopole(vgps: &[GeoPoint]) -> Result<Paleopole> {
    if vgps.len() < 2 {
        return Err(Error::TooFew { what: "a paleopole (mean of VGPs)", needed: 2, got: vgps.len(), unit: "sites" });
    }
    let mut acc = FisherAccumulator::default();
    for p in vgps {
        acc.push(p.to_vector());
    }
    let s = acc.finish(0.95)?;
    let pole = match s.mean {
        Some(_) => GeoPoint::from_vector(acc.sum).expect("non-zero resultant"),
        None => {
            return Err(Error::Undefined(
                "the VGPs cancel out (resultant ≈ 0) and have no mean pole; map them to one hemisphere first".into(),
            ))
        }
    };
    Ok(Paleopole { n: s.n, pole, r: s.r, k: s.k.expect("n >= 2"), a95: s.alpha })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn symmetric_ring_about_the_pole() {
        // Four poles at colatitude 10 deg, 90 deg apart: the mean is the geographic pole and
        // R = 4 cos 10 deg (vector addition by hand), so K = 3 / (4 - 4 cos 10 deg).
        let v: Vec<GeoPoint> = [0.0, 90.0, 180.0, 270.0].iter().map(|&lon| GeoPoint::new(80.0, lon).unwrap()).collect();
        let p = paleopole(&v).unwrap();
        assert_abs_diff_eq!(p.pole.lat, 90.0, epsilon = 1e-9);
        assert_abs_diff_eq!(p.r, 4.0 * 10f64.to_radians().cos(), epsilon = 1e-12);
        assert_abs_diff_eq!(p.k.0, 3.0 / (4.0 - 4.0 * 10f64.to_radians().cos()), epsilon = 1e-9);
        // Fisher (1953) cone with p = 0.05 evaluated by hand.
        let r = p.r;
        let a95 = (1.0 - (4.0 - r) / r * (20f64.powf(1.0 / 3.0) - 1.0)).acos().to_degrees();
        assert_abs_diff_eq!(p.a95.unwrap(), a95, epsilon = 1e-9);
    }

    #[test]
    fn edges() {
        let one = [GeoPoint::new(70.0, 10.0).unwrap()];
        assert!(matches!(paleopole(&one), Err(Error::TooFew { got: 1, .. })));
        let a = GeoPoint::new(70.0, 10.0).unwrap();
        let (b, flipped) = northern(GeoPoint::new(-70.0, 190.0).unwrap());
        assert!(flipped);
        assert_abs_diff_eq!(b.lat, 70.0, epsilon = 1e-9);
        assert_abs_diff_eq!(b.lon, 10.0, epsilon = 1e-9);
        // Antipodal pair without mapping: undefined; identical pair: K infinite, A95 = 0.
        let anti = GeoPoint::new(-70.0, 190.0).unwrap();
        assert!(matches!(paleopole(&[a, anti]), Err(Error::Undefined(_))));
        let same = paleopole(&[a, a]).unwrap();
        assert!(same.k.is_infinite());
        assert_eq!(same.a95, Some(0.0));
        // Longitudes near 0/360 average across the seam.
        let seam = paleopole(&[GeoPoint::new(60.0, 359.0).unwrap(), GeoPoint::new(60.0, 1.0).unwrap()]).unwrap();
        assert!(seam.pole.lon < 1e-9 || seam.pole.lon > 360.0 - 1e-9);
    }
}
