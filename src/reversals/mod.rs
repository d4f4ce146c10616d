//! Statistics of the reversal record: polarity intervals from a time scale, renewal models fitted by
//! maximum likelihood with a right-censored open chron, goodness of fit with parametric-bootstrap
//! p-values, the hazard of a reversal given the time since the last, and the reversal rate through
//! time with trend and clustering tests.
//!
//! Every result here is a statistical statement about a model of the record, not a forecast.

pub mod gof;
pub mod hazard;
pub mod intervals;
pub mod models;
mod normal_quantile;
mod normal_tail;
pub mod optimize;
pub mod rate;
pub mod renewal;

pub use gof::{goodness_of_fit, goodness_of_fits, GoodnessOfFit};
pub use hazard::{
    assess_hazard, averaged_interval, hazard_at, p_within, HazardAssessment, HazardEstimate, ModelHazard, CAUTIONS,
    HAZARD_STREAM,
};
pub use intervals::{intervals, EdgeReading, Interval, IntervalOptions, IntervalRecord};
pub use models::{Fitted, Model, Sample};
pub use rate::{
    clustering_test, default_rate_step, laplace_test, rate_summary, windowed_rate, ClusteringTest, LaplaceTest,
    RatePoint, RateSummary,
};
pub use renewal::{fit_models, lr_test, LrTest, ModelFit, RenewalFits};
