//! The cautions, each written once: what a result is and is not. Every front end (the verbs' notes,
//! the section's report and the Python package) prints these texts, so they cannot drift apart.

/// With every field test (reversal, common mean, fold, randomness).
pub const FIELD_TESTS: &str = "Field tests are statistical statements about a model of the directions \
(Fisher distributions or bootstrap resampling), not proof of when the rocks were magnetized; local practice and \
the published literature decide.";

/// With VGPs, the paleopole and the VGP scatter.
pub const POLES: &str = "VGPs and the paleopole rest on a model: a geocentric dipole field at the locality, \
averaged over enough time for secular variation to cancel. The scatter depends on the cutoff and on how sites were \
chosen. Local practice and the published literature decide.";

/// With the VGP of a table of one site (no paleopole, no scatter).
pub const ONE_VGP: &str = "A VGP rests on a model: a geocentric dipole field at the site; one site records one \
moment of the field, not a time average.";

/// With the VGP scatter per group and its latitude model.
pub const PSV: &str = "S(λ)² = a² + (bλ)² is a statistical model of paleosecular variation: groups of different \
ages, cutoffs or site selections are not comparable without care, and the fit describes these groups, not the field \
itself. Local practice and the published literature decide.";

/// With every inclination-shallowing correction (the elongation/inclination search or a given factor).
pub const UNFLATTEN: &str = "The correction rests on a model: that shallowing follows tan I_f = f tan I₀ for every \
direction and, for the elongation/inclination search, that the TK03 statistical field model describes the ancient \
field's scatter (with a given factor, that the factor is right). f and the corrected inclination are statements \
about that model, not measurements of compaction; local practice and the published literature decide whether it \
applies.";

/// With the reversal rate through time and its trend and clustering tests.
pub const RATE: &str = "The rate and its tests describe the reversals of this time scale in this window under a \
Poisson model; they are not a forecast of the next reversal. Local practice and the published literature decide \
how to read them.";

/// With every ranking of correlations to a time scale.
pub const CORRELATION: &str = "The ranking of correlations is a statistical statement about a steady-rate \
model, not proof of the correlation: independent age control (dated beds, biostratigraphy), local practice and the \
published literature decide.";

/// With every description of the present field from a spherical-harmonic model.
pub const PRESENT_FIELD: &str = "These numbers describe a model of the observed field (smoothed to its highest \
degree); they are not a forecast of a reversal. Local practice and the published literature decide what they mean.";

/// With a synthetic time scale (closing its notes).
pub const SYNTHETIC_TIMESCALE: &str =
    "Synthetic: a draw from the stated renewal model, not a record of the geomagnetic field.";

/// With a synthetic section (closing its notes).
pub const SYNTHETIC_SECTION: &str = "The data are synthetic draws from the stated model, for planning and testing; \
they say nothing about any real section.";

/// With the renewal fits, the hazard and the rate of reversals.
pub use crate::reversals::CAUTIONS as REVERSALS;
