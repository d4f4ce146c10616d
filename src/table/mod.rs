//! Input tables: the shared CSV reader and the typed row models.

mod directions;
mod reader;

pub use directions::{
    read_bedding, read_directions, strat_axis, DirectionKind, DirectionRecord, DirectionSet, GroupBy, StratAxis,
};
pub use reader::{Row, Table};

#[cfg(test)]
mod tests;
