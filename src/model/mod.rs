//! The domain types: polarity and the polarity time scale, demagnetization treatments and steps, the
//! stratigraphic axis, directions, site means, chosen fits and the kind and anchor of a
//! principal-component fit. Nothing here reads or writes a file: the readers are in [`crate::table`].

mod directions;
mod fit;
mod pick;
mod polarity;
mod sites;
mod steps;
mod strat_axis;
mod timescale;
mod treatment;

pub use directions::{DirectionKind, DirectionRecord, DirectionRow, DirectionSet};
pub use fit::{Anchor, FitKind};
pub use pick::Pick;
pub use polarity::Polarity;
pub use sites::{SiteRecord, SiteSet};
pub use steps::{SpecimenSteps, StepRecord, StepSet};
pub use strat_axis::StratAxis;
pub use timescale::{Chron, TimeScale, AGE_TOLERANCE};
pub use treatment::Treatment;
