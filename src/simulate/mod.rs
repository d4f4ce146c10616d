//! Synthetic data from stated models: polarity time scales from renewal models, and sampled sections
//! (levels, specimens, stepwise demagnetization) written as a project folder.
//!
//! Everything random runs on the shared Monte Carlo engine's seeded streams, so the same seed gives
//! the same folder, byte for byte, on any number of threads.

mod accumulation;
mod planning;
mod project;
mod section;
mod timescale;
mod truth;

pub use accumulation::{parse_rates, AccumulationHistory, AccumulationSpan, RateSegment};
pub use planning::{catch_probability, chron_thickness, sampling_plan, PlanRow, PLAN_LENGTHS};
pub use project::{
    project_files, sampling_csv, settings_text, steps_csv, timescale_csv, Setting, SettingValue, Settings, PICKS_FILE,
    SAMPLING_FILE, SETTINGS_FILE, STEPS_FILE, TIMESCALE_FILE, TRUTH_FILE,
};
pub use section::{
    simulate_section, treatment_defaults, Overprint, RecordedChron, SectionModel, SyntheticLevel, SyntheticSection,
    SyntheticSpecimen, SyntheticStep, TreatmentDefaults, TrueTie, Unblocking, LEVEL_STREAM, MAX_SPECIMENS,
    SPECIMEN_STREAM,
};
pub use timescale::{
    section_timescale_span, simulate_timescale, FirstPolarity, TimeScaleModel, TimeScaleSource, AGE_QUANTUM,
    BURN_IN_INTERVALS, TIMESCALE_STREAM,
};
pub use truth::truth_document;

#[cfg(test)]
mod tests;
