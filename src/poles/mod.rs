//! Poles: virtual geomagnetic poles, expected directions, paleopoles and secular-variation scatter.

mod vgp;

pub use vgp::{colatitude_from_inclination, dipole_inclination, expected_direction, vgp, Vgp};
