//! The present field from a spherical-harmonic model: synthesis of the main field at a point, the
//! dipole and the dip poles through time, the surface-intensity low, the power spectrum, and the
//! present dipole set beside a paleointensity record.
//!
//! The bundled model is IGRF-14 (an IAGA open standard; `records/fieldmodels/README.md`). Everything
//! here describes a model of the observed field; none of it is a forecast of a reversal.

mod coefficients;
mod context;
mod dip;
mod error;
mod grid;
mod legendre;
mod model;
mod series;
mod synthesis;

#[cfg(test)]
mod tests;

pub use coefficients::{index, Coefficients};
pub use context::{field_context, FieldContext, PaleoRecord};
pub use dip::{dip_pole, DipPole};
pub use error::{FieldError, FieldResult};
pub use grid::{intensity_grid, intensity_low, surface_intensity, IntensityGrid, IntensityLow, IntensityMinimum};
pub use legendre::schmidt;
pub use model::{FieldModel, IGRF14_TABLE, MAX_DEGREE, SV_YEARS};
pub use series::{field_series, surface_distance_km, EpochSummary, SeriesOptions, DEFAULT_LOW_THRESHOLD};
pub use synthesis::{
    field_at, spherical_components, FieldElements, Frame, Site, REFERENCE_RADIUS_KM, WGS84_A_KM, WGS84_F,
};
