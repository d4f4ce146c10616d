//! Tilt (bedding) correction.

use super::rotation::{rotate_about, Rotation};
use super::vector::Vec3;
use crate::error::{check_range, Result};

/// Attitude of a bed.
///
/// # Units
/// Degrees. `dip_dir` is the azimuth toward which the bed dips, [0, 360); `dip` in [0, 90].
/// With the right-hand rule, strike = dip direction − 90°.
///
/// `overturned` marks a bed rotated past vertical: its measured dip δ toward `dip_dir` came from a
/// rotation of 180° − δ toward the opposite azimuth.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Bedding {
    /// Dip direction, degrees clockwise from north.
    pub dip_dir: f64,
    /// Dip, degrees below horizontal.
    pub dip: f64,
    /// True for an overturned bed.
    pub overturned: bool,
}

impl Bedding {
    /// From dip direction and dip.
    pub fn from_dip_direction(dip_dir: f64, dip: f64, overturned: bool) -> Result<Self> {
        check_range("bed_dip_dir", dip_dir, -360.0, 360.0, "[-360, 360]")?;
        check_range("bed_dip", dip, 0.0, 90.0, "[0, 90]")?;
        Ok(Self { dip_dir: super::wrap360(dip_dir), dip, overturned })
    }
    /// From strike (right-hand rule: the bed dips to the right when looking along strike) and dip.
    pub fn from_strike(strike: f64, dip: f64, overturned: bool) -> Result<Self> {
        check_range("bed_strike", strike, -360.0, 360.0, "[-360, 360]")?;
        Self::from_dip_direction(super::wrap360(strike + 90.0), dip, overturned)
    }
    /// Strike by the right-hand rule, degrees.
    pub fn strike(&self) -> f64 {
        super::wrap360(self.dip_dir - 90.0)
    }
    /// The horizontal unit vector along strike.
    fn strike_axis(&self) -> Vec3 {
        let s = self.strike().to_radians();
        Vec3::new(s.cos(), s.sin(), 0.0)
    }
    /// Total rotation (degrees, about the strike axis) that restores the bed to horizontal.
    fn restoring_angle(&self) -> f64 {
        if self.overturned {
            180.0 - self.dip
        } else {
            -self.dip
        }
    }

    /// Rotate a geographic vector into stratigraphic (tilt-corrected) coordinates.
    ///
    /// # Formula
    /// Rotation about the strike axis by −δ (normal bed) or 180° − δ (overturned bed), which brings the
    /// down-dip line back to horizontal.
    ///
    /// # References
    /// Butler (1992), §5.3 (structural correction); McElhinny & McFadden (2000), *Paleomagnetism:
    /// Continents and Oceans*, ch. 3.
    pub fn untilt(&self, v: Vec3) -> Vec3 {
        rotate_about(v, self.strike_axis(), self.restoring_angle())
    }

    /// The inverse of [`Bedding::untilt`]: stratigraphic → geographic.
    pub fn retilt(&self, v: Vec3) -> Vec3 {
        rotate_about(v, self.strike_axis(), -self.restoring_angle())
    }

    /// Partial untilting by a fraction `f` of the full correction (0 = geographic, 1 = fully
    /// untilted; values outside [0, 1] extrapolate), as used by incremental fold tests.
    pub fn partial(&self, f: f64) -> Rotation {
        Rotation::about(self.strike_axis(), self.restoring_angle() * f)
    }

    /// `self.partial(f).apply(v)` without building the matrix (one sine and cosine instead of three),
    /// for vectors untilted once each.
    pub fn partial_apply(&self, f: f64, v: Vec3) -> Vec3 {
        super::rotate_about(v, self.strike_axis(), self.restoring_angle() * f)
    }

    /// The axis and the full angle of the untilting, for turning many vectors by fractions of it:
    /// `rotate_unit(v, u.axis, s, c)` with `(s, c) = u.angle_deg(f).to_radians().sin_cos()` is
    /// [`Bedding::partial_apply`]`(f, v)`, bit for bit.
    pub fn untilting(&self) -> Untilting {
        let axis = self.strike_axis().normalized().expect("the strike axis is a horizontal unit vector");
        Untilting { axis, full_angle: self.restoring_angle() }
    }
}

/// The rotation that untilts a bed: about `axis` (unit, along strike) by `full_angle` degrees when
/// complete (see [`Bedding::untilting`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Untilting {
    /// Unit vector along strike.
    pub axis: Vec3,
    /// Rotation of the complete correction, degrees.
    pub full_angle: f64,
}

impl Untilting {
    /// Rotation angle of the fraction `f` of the correction, degrees.
    pub fn angle_deg(&self, f: f64) -> f64 {
        self.full_angle * f
    }
}
