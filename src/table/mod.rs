//! Input tables: the shared CSV reader and the typed row models.

mod directions;
mod reader;
mod sites;
mod timescale;

pub use directions::{
    read_bedding, read_directions, strat_axis, DirectionKind, DirectionRecord, DirectionSet, GroupBy, StratAxis,
};
pub use reader::{Row, Table};
pub use sites::{read_sites, SiteRecord, SiteSet};
pub use timescale::{Chron, Polarity, TimeScale, AGE_TOLERANCE};

#[cfg(test)]
mod tests;
