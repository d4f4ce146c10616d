//! Directions (declination, inclination) and their unit vectors.

use super::vector::Vec3;
use crate::error::{Error, Result};

/// A direction given by declination and inclination.
///
/// # Units
/// Degrees. Declination clockwise from geographic north in [0, 360); inclination positive down,
/// in [-90, 90].
///
/// # Formula
/// Unit vector (x north, y east, z down):
/// x = cos I cos D, y = cos I sin D, z = sin I.
///
/// # References
/// Butler (1992), *Paleomagnetism: Magnetic Domains to Geologic Terranes*, §5.1 (direction cosines).
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Direction {
    /// Declination, degrees, [0, 360).
    pub dec: f64,
    /// Inclination, degrees, [-90, 90].
    pub inc: f64,
}

/// Wrap an angle in degrees to [0, 360).
pub fn wrap360(deg: f64) -> f64 {
    let w = deg.rem_euclid(360.0);
    // rem_euclid can return 360.0 for tiny negative inputs because of rounding.
    if w >= 360.0 {
        0.0
    } else {
        w
    }
}

impl Direction {
    /// A validated direction: inclination must lie in [-90, 90]; declination is wrapped to [0, 360).
    pub fn new(dec: f64, inc: f64) -> Result<Self> {
        if !dec.is_finite() {
            return Err(Error::OutOfRange { name: "declination", value: dec, range: "a finite number of degrees" });
        }
        crate::error::check_range("inclination", inc, -90.0, 90.0, "[-90, 90]")?;
        Ok(Self { dec: wrap360(dec), inc })
    }

    /// The unit vector of this direction (x north, y east, z down).
    pub fn to_vector(self) -> Vec3 {
        let (d, i) = (self.dec.to_radians(), self.inc.to_radians());
        Vec3::new(i.cos() * d.cos(), i.cos() * d.sin(), i.sin())
    }

    /// The direction of a vector; `None` for a zero (or non-finite) vector.
    ///
    /// # Formula
    /// D = atan2(y, x), I = asin(z / |v|).
    pub fn from_vector(v: Vec3) -> Option<Self> {
        let u = v.normalized()?;
        let inc = u.z.clamp(-1.0, 1.0).asin().to_degrees();
        let dec = if u.x.abs() < 1e-15 && u.y.abs() < 1e-15 { 0.0 } else { u.y.atan2(u.x).to_degrees() };
        Some(Self { dec: wrap360(dec), inc })
    }

    /// The opposite direction (D + 180°, −I).
    pub fn antipode(self) -> Self {
        Self { dec: wrap360(self.dec + 180.0), inc: -self.inc }
    }

    /// Angle between two directions, degrees, in [0, 180].
    ///
    /// # Formula
    /// atan2(|a × b|, a · b), which stays accurate for nearly parallel and nearly antiparallel pairs.
    pub fn angle_to(self, other: Direction) -> f64 {
        angle_between(self.to_vector(), other.to_vector())
    }
}

/// Angle between two (not necessarily unit) vectors, degrees, in [0, 180].
pub fn angle_between(a: Vec3, b: Vec3) -> f64 {
    a.cross(b).norm().atan2(a.dot(b)).to_degrees()
}
