//! Numerical tolerances, kept in one place.
//!
//! Each constant says what it guards. Tests use [`ANGLE_DEG`] and [`RELATIVE`] for comparisons with
//! published values that are themselves rounded.

/// Below this resultant length (as a fraction of N) a set of unit vectors is treated as having no
/// defined mean direction (antipodal or isotropic sets, R → 0).
pub const RESULTANT_FRACTION: f64 = 1e-9;

/// N − R below this is treated as zero: all directions identical, precision k infinite.
pub const IDENTICAL: f64 = 1e-12;

/// Vector norms below this are treated as zero (no direction).
pub const ZERO_NORM: f64 = 1e-300;

/// Default comparison tolerance for angles in tests, degrees.
pub const ANGLE_DEG: f64 = 1e-9;

/// Default relative tolerance for derived quantities in tests.
pub const RELATIVE: f64 = 1e-12;

/// Two bootstrap bounds of a unit-vector component closer than this count as touching (overlapping):
/// bounds computed from identical sets can differ in the last bits through summation order.
pub const BOUND_OVERLAP: f64 = 1e-12;
