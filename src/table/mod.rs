//! Input tables: the shared CSV reader and the readers that turn rows into the domain types of
//! [`crate::model`].

mod directions;
mod picks;
mod reader;
mod sites;
mod steps;
mod stream;
mod timescale;

pub use directions::{read_bedding, read_directions, strat_axis, DirectionColumns, GroupBy};
pub use picks::read_picks;
pub use reader::{Cells, Columns, Row, Table};
pub use sites::read_sites;
pub use steps::read_steps;
pub use stream::{is_layout_fault, StreamRow, TableStream};

#[cfg(test)]
mod tests;
