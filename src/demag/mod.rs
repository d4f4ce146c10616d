//! Demagnetization analysis: principal-component fits of lines and planes over chosen ranges of
//! steps, and an automatic, reproducible choice of the line segment.

mod auto;
mod automatic;
mod last_component;
mod pca;
mod ranges;

pub use auto::{auto_line, AutoOutcome, AutoRule};
pub use automatic::{fit_automatically, AutomaticFits, AutomaticRule};
pub use last_component::{last_component, AutoChoice, Grade, LastComponentRule, LastOutcome};
pub use pca::{fit_line, fit_plane, LineFit, PlaneFit};
pub use ranges::{fit_range, SpecimenFit};

#[cfg(test)]
mod tests;
