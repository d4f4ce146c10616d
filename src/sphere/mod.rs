//! Sphere geometry: vectors, directions, rotations, tilt correction and specimen orientation.

mod direction;
mod geo;
mod rotation;
mod specimen_frame;
mod tilt;
mod vector;

pub use direction::{angle_between, wrap360, Direction};
pub use geo::GeoPoint;
pub use rotation::{rotate_about, rotate_unit, Rotation};
pub use specimen_frame::SpecimenOrientation;
pub use tilt::{Bedding, Untilting};
pub use vector::Vec3;

#[cfg(test)]
mod tests;
