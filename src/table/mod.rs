//! Input tables: the shared CSV reader and the typed row models.

mod directions;
mod picks;
mod reader;
mod sites;
mod steps;
mod stream;
mod timescale;

pub use directions::{
    read_bedding, read_directions, strat_axis, DirectionColumns, DirectionKind, DirectionRecord, DirectionRow,
    DirectionSet, GroupBy, StratAxis,
};
pub use picks::{read_picks, Pick};
pub use reader::{Cells, Columns, Row, Table};
pub use sites::{read_sites, SiteRecord, SiteSet};
pub use steps::{read_steps, SpecimenSteps, StepRecord, StepSet, Treatment};
pub use stream::{is_layout_fault, StreamRow, TableStream};
pub use timescale::{Chron, Polarity, TimeScale, AGE_TOLERANCE};

#[cfg(test)]
mod tests;
