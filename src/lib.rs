//! # lodestone
//!
//! Paleomagnetic reversal-record analysis: from stepwise demagnetization data to characteristic
//! directions, site means, field tests, virtual geomagnetic poles, polarity columns, correlation with
//! the geomagnetic polarity time scale, and the statistics of the reversal record itself.
//!
//! The library does no printing and never exits the process; the `lodestone` binary is a thin layer
//! over it. Angles are degrees at every public interface (radians only inside), in the frame
//! x = north, y = east, z = down.
//!
//! ## Index of methods
//!
//! | concept | item |
//! |---|---|
//! | direction ↔ unit vector, angle, antipode | [`sphere::Direction`], [`sphere::angle_between`] |
//! | rotation about an axis | [`sphere::rotate_about`], [`sphere::Rotation`] |
//! | tilt (bedding) correction, overturned beds | [`sphere::Bedding::untilt`] |
//! | specimen frame → geographic | [`sphere::SpecimenOrientation`] |
//! | symmetric 3 × 3 eigen-decomposition | [`linalg::sym_eigen`] |
//! | Fisher (1953) mean, R, k, α95, θ63 | [`stats::fisher_mean`], [`stats::FisherAccumulator`] |
//! | confidence cone at any level | [`stats::confidence_cone`] |
//! | means per site or group, geographic or tilt-corrected | [`stats::group_means`] |
//! | orientation matrix and principal axes | [`stats::orientation_matrix`], [`stats::principal_axes`] |
//! | Fisher random directions | [`stats::FisherSampler`] |
//! | seeded, thread-count-independent Monte Carlo | [`montecarlo::MonteCarlo`] |
//! | tables (CSV) and typed rows | [`table::Table`], [`table::read_directions`] |
//! | sites and poles on the sphere: direct/inverse problems | [`sphere::GeoPoint`] |
//! | virtual geomagnetic pole, expected direction | [`poles::vgp`], [`poles::expected_direction`] |
//! | polarity intervals, short-chron merging, censored open chron | [`reversals::intervals`] |
//! | renewal models (exponential, gamma, Weibull, lognormal, inverse Gaussian): censored MLE, CDF, hazard, sampler | [`reversals::Model`], [`reversals::Fitted`] |
//! | AIC, BIC, Akaike weights, likelihood-ratio test | [`reversals::fit_models`] |
//! | KS and AD goodness of fit, parametric bootstrap (Lilliefors) | [`reversals::goodness_of_fit`] |
//! | hazard, P(reversal within Δ \| none for T), model averaging | [`reversals::hazard_at`], [`reversals::averaged_interval`] |
//! | reversal rate through time, Laplace trend test, clustering test | [`reversals::windowed_rate`], [`reversals::laplace_test`], [`reversals::clustering_test`] |
//! | interval-length, hazard and rate figures | [`figures::IntervalFigure`], [`figures::HazardFigure`], [`figures::RateFigure`] |
//! | equal-area projection and figures | [`figures::project`], [`figures::EqualAreaPlot`], [`figures::render`] |
//!
//! ## References used throughout
//! - Fisher, R. A. (1953), Dispersion on a sphere. *Proc. R. Soc. Lond. A* 217, 295–305.
//! - Butler, R. F. (1992), *Paleomagnetism: Magnetic Domains to Geologic Terranes*. Blackwell.
//! - Fisher, N. I., Lewis, T. & Embleton, B. J. J. (1987), *Statistical Analysis of Spherical Data*. CUP.
#![warn(missing_docs)]

pub mod error;
pub mod figures;
pub mod linalg;
pub mod montecarlo;
pub mod poles;
pub mod reversals;
pub mod sphere;
pub mod stats;
pub mod table;
pub mod tolerance;

pub use error::{Error, Result, TableError};
