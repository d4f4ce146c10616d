//! The directions table: one direction (or great-circle pole) per row.

use super::reader::Table;
use crate::error::TableError;
use crate::sphere::{Bedding, Direction, SpecimenOrientation};

/// Which way the stratigraphic position column runs.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum StratAxis {
    /// `height` in metres, growing upward (younger upward).
    Height,
    /// `depth` in metres, growing downward (cores).
    Depth,
}

impl StratAxis {
    /// The column name.
    pub fn column(self) -> &'static str {
        match self {
            StratAxis::Height => "height",
            StratAxis::Depth => "depth",
        }
    }
}

/// Whether a row is a line (a direction) or a plane (given by its pole), for great-circle analysis.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum DirectionKind {
    /// A direction.
    Line,
    /// A great circle, given by its pole.
    Plane,
}

/// One row of a directions table.
#[derive(Debug, Clone, PartialEq)]
pub struct DirectionRecord {
    /// Line in the file.
    pub line: usize,
    /// Site name, if given.
    pub site: Option<String>,
    /// Specimen name, if given.
    pub specimen: Option<String>,
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
    pub group: Option<String>,
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

/// Which column to group by when reading a directions table.
#[derive(Debug, Clone, PartialEq, Eq, Default)]
pub enum GroupBy {
    /// `site` when that column exists, else the whole file.
    #[default]
    Default,
    /// This column, which must exist.
    Column(String),
    /// The whole file as one group.
    None,
}

/// Read the bedding columns of a row, if present (dip direction + dip, or strike + dip, optional
/// `overturned`). Shared by every table that carries bedding.
pub fn read_bedding(t: &Table, row: &super::Row) -> Result<Option<Bedding>, TableError> {
    let (dd, strike, dip, over) = (t.col("bed_dip_dir"), t.col("bed_strike"), t.col("bed_dip"), t.col("overturned"));
    let dd_v = t.opt_number_in(row, dd, -360.0, 360.0)?;
    let st_v = t.opt_number_in(row, strike, -360.0, 360.0)?;
    let dip_v = t.opt_number_in(row, dip, 0.0, 90.0)?;
    let overturned = t.flag(row, over)?;
    let b = match (dd_v, st_v, dip_v) {
        (None, None, None) => return Ok(None),
        (Some(_), Some(_), _) => {
            return Err(t.error(row.line, Some("bed_strike"), "give either bed_dip_dir or bed_strike, not both"))
        }
        (Some(d), None, Some(p)) => Bedding::from_dip_direction(d, p, overturned),
        (None, Some(s), Some(p)) => Bedding::from_strike(s, p, overturned),
        (_, _, None) => return Err(t.error(row.line, Some("bed_dip"), "is empty; expected the dip (0-90) with the dip direction or strike")),
        (None, None, Some(_)) => {
            return Err(t.error(row.line, Some("bed_dip_dir"), "is empty; expected a dip direction (or bed_strike) with bed_dip"))
        }
    };
    b.map(Some).map_err(|e| t.error(row.line, None, e.to_string()))
}

/// Which position column a table has: `height` or `depth` (both is an error).
pub fn strat_axis(t: &Table) -> Result<Option<(StratAxis, usize)>, TableError> {
    match (t.col("height"), t.col("depth")) {
        (Some(_), Some(_)) => Err(t.error(t.header_line, Some("depth"), "a table has either height or depth, not both")),
        (Some(i), None) => Ok(Some((StratAxis::Height, i))),
        (None, Some(i)) => Ok(Some((StratAxis::Depth, i))),
        (None, None) => Ok(None),
    }
}

/// Read a directions table.
///
/// Declinations are accepted in [-360, 360] and wrapped to [0, 360); inclinations and latitudes outside
/// [-90, 90] are refused; longitudes are accepted in [-180, 360].
pub fn read_directions(t: &Table, group_by: &GroupBy) -> Result<DirectionSet, TableError> {
    t.require_rows()?;
    let dec = t.require("dec")?;
    let inc = t.require("inc")?;
    let (site, specimen) = (t.col("site"), t.col("specimen"));
    let (lat, lon) = (t.col("lat"), t.col("lon"));
    let kind_c = t.col("kind");
    let axis = strat_axis(t)?;
    let (x_az, x_pl) = (t.col("x_az"), t.col("x_plunge"));
    let group_col = match group_by {
        GroupBy::Default => site.map(|_| "site".to_string()),
        GroupBy::Column(c) => {
            let c = c.trim().to_lowercase();
            t.require(&c)?;
            Some(c)
        }
        GroupBy::None => None,
    };
    let group_idx = group_col.as_deref().and_then(|c| t.col(c));
    let mut records = Vec::with_capacity(t.rows.len());
    for row in &t.rows {
        let d = t.number_in(row, dec, -360.0, 360.0)?;
        let i = t.number_in(row, inc, -90.0, 90.0)?;
        let mut direction = Direction::new(d, i).map_err(|e| t.error(row.line, Some("dec"), e.to_string()))?;
        if let (Some(a), Some(p)) = (t.opt_number(row, x_az)?, t.opt_number(row, x_pl)?) {
            let o = SpecimenOrientation::new(a, p).map_err(|e| t.error(row.line, Some("x_az"), e.to_string()))?;
            direction = o.direction_to_geographic(direction);
        }
        let kind = match t.opt_text(row, kind_c).map(|s| s.to_lowercase()).as_deref() {
            None | Some("line") => DirectionKind::Line,
            Some("plane") => DirectionKind::Plane,
            Some(other) => return Err(t.error(row.line, Some("kind"), format!("'{other}' is not 'line' or 'plane'"))),
        };
        records.push(DirectionRecord {
            line: row.line,
            site: t.opt_text(row, site),
            specimen: t.opt_text(row, specimen),
            direction,
            lat: t.opt_number_in(row, lat, -90.0, 90.0)?,
            lon: t.opt_number_in(row, lon, -180.0, 360.0)?,
            position: match axis {
                Some((_, i)) => t.opt_number(row, Some(i))?,
                None => None,
            },
            bedding: read_bedding(t, row)?,
            kind,
            group: t.opt_text(row, group_idx),
        });
    }
    Ok(DirectionSet { source: t.name.clone(), axis: axis.map(|a| a.0), group_column: group_col, records })
}
