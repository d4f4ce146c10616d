//! Directions (or great-circle poles) with their site, specimen, position and bedding.

use super::strat_axis::StratAxis;
use crate::sphere::{Bedding, Direction};

/// Whether a row is a line (a direction) or a plane (given by its pole), for great-circle analysis.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum DirectionKind {
    /// A direction.
    Line,
    /// A great circle, given by its pole.
    Plane,
}

/// One row of a directions table. `S` is the type of its text cells: owned (`String`, the default)
/// in a [`DirectionSet`], borrowed from the row (`&str`, [`DirectionRow`]) when a table is streamed.
#[derive(Debug, Clone, PartialEq)]
pub struct DirectionRecord<S = String> {
    /// Line in the file.
    pub line: usize,
    /// Site name, if given.
    pub site: Option<S>,
    /// Specimen name, if given.
    pub specimen: Option<S>,
    /// The direction in geographic coordinates (converted from the specimen frame when the row carries
    /// `x_az` and `x_plunge`).
    pub direction: Direction,
    /// Site latitude, degrees.
    pub lat: Option<f64>,
    /// Site longitude, degrees east (any range on input, kept as given).
    pub lon: Option<f64>,
    /// Height or depth in metres (see [`DirectionSet::axis`]).
    pub position: Option<f64>,
    /// Bedding attitude, if given.
    pub bedding: Option<Bedding>,
    /// Line or plane.
    pub kind: DirectionKind,
    /// Grouping key for means (the `--by` column, default `site`).
    pub group: Option<S>,
    /// For a plane: the last demagnetization step used in its fit (geographic coordinates), whose
    /// pole is then signed so that the path turns anticlockwise about it. It tells which way the path
    /// moves along the circle (see [`crate::stats::mixed_mean_with_paths`]); `None` when unknown.
    pub path_end: Option<Direction>,
}

/// One row of a streamed directions table, its text cells borrowed from the row.
pub type DirectionRow<'a> = DirectionRecord<&'a str>;

impl DirectionRow<'_> {
    /// The row with its text cells copied, for a [`DirectionSet`].
    pub fn to_record(&self) -> DirectionRecord {
        let own = |s: Option<&str>| s.map(str::to_string);
        DirectionRecord {
            line: self.line,
            site: own(self.site),
            specimen: own(self.specimen),
            direction: self.direction,
            lat: self.lat,
            lon: self.lon,
            position: self.position,
            bedding: self.bedding,
            kind: self.kind,
            group: own(self.group),
            path_end: self.path_end,
        }
    }
}

/// A whole directions table.
#[derive(Debug, Clone, PartialEq)]
pub struct DirectionSet {
    /// File name for messages.
    pub source: String,
    /// Which position column the table has, if any.
    pub axis: Option<StratAxis>,
    /// The grouping column used, if any.
    pub group_column: Option<String>,
    /// The rows.
    pub records: Vec<DirectionRecord>,
}
