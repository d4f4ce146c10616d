//! The cautions, each written once: what a result is and is not. Every front end (the verbs' notes,
//! the section's report and the Python package) prints these texts, so they cannot drift apart.

/// With every field test (reversal, common mean, fold, randomness).
pub const FIELD_TESTS: &str = "Field tests are statistical statements about a model of the directions \
(Fisher distributions or bootstrap resampling), not proof of when the rocks were magnetized; local practice and \
the published literature decide.";

/// With VGPs, the paleopole and the VGP scatter.
pub const POLES: &str = "VGPs and the paleopole rest on a model: a geocentric dipole field at the locality, \
averaged over enough time for secular variation to cancel. The scatter depends on the cutoff and on how sites were \
chosen.";

/// With every ranking of correlations to a time scale.
pub const CORRELATION: &str = "The ranking of correlations is a statistical statement about a steady-rate \
model, not proof of the correlation: independent age control (dated beds, biostratigraphy), local practice and the \
published literature decide.";

/// With every description of the present field from a spherical-harmonic model.
pub const PRESENT_FIELD: &str = "These numbers describe a model of the observed field (smoothed to its highest \
degree); they are not a forecast of a reversal. Local practice and the published literature decide what they mean.";

/// With the renewal fits, the hazard and the rate of reversals.
pub use crate::reversals::CAUTIONS as REVERSALS;
