//! From a specimen's own measurement frame to geographic coordinates.
//!
//! # Convention (lodestone's own)
//! A specimen carries a marked axis, its **x axis**, whose azimuth `x_az` (degrees clockwise from north)
//! and plunge `x_plunge` (degrees below horizontal, negative above) are measured in the field.
//! The specimen's y axis is horizontal, 90° clockwise from the x axis seen from above, and the z axis
//! completes a right-handed frame (z = x × y), pointing down when the x axis is horizontal.
//!
//! ```text
//!   seen from above (x_plunge = 0):            worked values (dec, inc in specimen frame → geographic)
//!
//!         north                                 x_az  x_plunge  specimen (D, I)  geographic (D, I)
//!           ^   x (x_az = 30°)                    0      0         (10, 20)         (10, 20)
//!           |  /                                  90     0         (0, 0)           (90, 0)
//!           | /                                   90     0         (90, 0)          (180, 0)
//!           |/____ y (x_az + 90°, horizontal)     0     90         (0, 0)           (0, 90)  [x points down]
//!           z: into the page (down)               0     90         (0, 90)          (180, 0)
//! ```
//! The last two rows are checked in the unit tests below.

use super::direction::Direction;
use super::vector::Vec3;
use crate::error::{check_range, Result};

/// Orientation of a specimen's marked x axis.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct SpecimenOrientation {
    /// Azimuth of the x axis, degrees clockwise from north.
    pub x_az: f64,
    /// Plunge of the x axis, degrees below horizontal, [-90, 90].
    pub x_plunge: f64,
}

impl SpecimenOrientation {
    /// Validated constructor.
    pub fn new(x_az: f64, x_plunge: f64) -> Result<Self> {
        check_range("x_az", x_az, -360.0, 360.0, "[-360, 360]")?;
        check_range("x_plunge", x_plunge, -90.0, 90.0, "[-90, 90]")?;
        Ok(Self { x_az, x_plunge })
    }

    /// The specimen axes expressed in geographic coordinates: (x, y, z).
    pub fn axes(&self) -> [Vec3; 3] {
        let (a, p) = (self.x_az.to_radians(), self.x_plunge.to_radians());
        let x = Vec3::new(a.cos() * p.cos(), a.sin() * p.cos(), p.sin());
        let y = Vec3::new(-a.sin(), a.cos(), 0.0);
        [x, y, x.cross(y)]
    }

    /// Convert a vector from the specimen frame to geographic coordinates.
    pub fn to_geographic(&self, v: Vec3) -> Vec3 {
        let [x, y, z] = self.axes();
        x * v.x + y * v.y + z * v.z
    }

    /// Convert a direction from the specimen frame to geographic coordinates.
    pub fn direction_to_geographic(&self, d: Direction) -> Direction {
        Direction::from_vector(self.to_geographic(d.to_vector())).expect("rotation keeps unit length")
    }
}
