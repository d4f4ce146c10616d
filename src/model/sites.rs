//! Site means: a site's location and mean direction, with its statistics when known.

use super::strat_axis::StratAxis;
use crate::sphere::{Direction, GeoPoint};

/// One row of a sites table.
#[derive(Debug, Clone, PartialEq)]
pub struct SiteRecord {
    /// Line in the file.
    pub line: usize,
    /// Site name.
    pub site: String,
    /// Site location (longitude wrapped to [0, 360)).
    pub location: GeoPoint,
    /// Site-mean direction.
    pub direction: Direction,
    /// Number of directions in the mean, if given.
    pub n: Option<usize>,
    /// Fisher precision k of the site mean, if given.
    pub k: Option<f64>,
    /// α95 of the site mean, degrees, if given.
    pub a95: Option<f64>,
    /// Height or depth in metres (see [`SiteSet::axis`]).
    pub position: Option<f64>,
}

/// A whole sites table.
#[derive(Debug, Clone, PartialEq)]
pub struct SiteSet {
    /// File name for messages.
    pub source: String,
    /// Which position column the table has, if any.
    pub axis: Option<StratAxis>,
    /// The rows, in file order.
    pub records: Vec<SiteRecord>,
}
