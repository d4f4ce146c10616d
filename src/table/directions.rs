//! The directions table: one direction (or great-circle pole) per row.

use super::reader::{Cells, Columns, Table};
use crate::error::TableError;
use crate::model::{DirectionKind, DirectionRow, DirectionSet, StratAxis};
use crate::sphere::{Bedding, Direction, SpecimenOrientation};

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
pub fn read_bedding<T: Columns + ?Sized, R: Cells + ?Sized>(t: &T, row: &R) -> Result<Option<Bedding>, TableError> {
    BeddingColumns::locate(t).read(t, row)
}

/// The bedding columns of a table, found once from the header (see [`read_bedding`]).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub struct BeddingColumns {
    dd: Option<usize>,
    strike: Option<usize>,
    dip: Option<usize>,
    over: Option<usize>,
}

impl BeddingColumns {
    /// Find `bed_dip_dir`, `bed_strike`, `bed_dip` and `overturned`, where present.
    pub fn locate<T: Columns + ?Sized>(t: &T) -> Self {
        BeddingColumns {
            dd: t.col("bed_dip_dir"),
            strike: t.col("bed_strike"),
            dip: t.col("bed_dip"),
            over: t.col("overturned"),
        }
    }

    /// The bedding of a row, if it has any.
    pub fn read<T: Columns + ?Sized, R: Cells + ?Sized>(&self, t: &T, row: &R) -> Result<Option<Bedding>, TableError> {
        let BeddingColumns { dd, strike, dip, over } = *self;
        let dd_v = t.opt_number_in(row, dd, -360.0, 360.0)?;
        let st_v = t.opt_number_in(row, strike, -360.0, 360.0)?;
        let dip_v = t.opt_number_in(row, dip, 0.0, 90.0)?;
        let overturned = t.flag(row, over)?;
        let b = match (dd_v, st_v, dip_v) {
            (None, None, None) => return Ok(None),
            (Some(_), Some(_), _) => {
                return Err(t.error(row.line(), Some("bed_strike"), "give either bed_dip_dir or bed_strike, not both"))
            }
            (Some(d), None, Some(p)) => Bedding::from_dip_direction(d, p, overturned),
            (None, Some(s), Some(p)) => Bedding::from_strike(s, p, overturned),
            (_, _, None) => {
                return Err(t.error(
                    row.line(),
                    Some("bed_dip"),
                    "is empty; expected the dip (0-90) with the dip direction or strike",
                ))
            }
            (None, None, Some(_)) => {
                return Err(t.error(
                    row.line(),
                    Some("bed_dip_dir"),
                    "is empty; expected a dip direction (or bed_strike) with bed_dip",
                ))
            }
        };
        b.map(Some).map_err(|e| t.error(row.line(), None, e.to_string()))
    }
}

/// Which position column a table has: `height` or `depth` (both is an error).
pub fn strat_axis<T: Columns + ?Sized>(t: &T) -> Result<Option<(StratAxis, usize)>, TableError> {
    match (t.col("height"), t.col("depth")) {
        (Some(_), Some(_)) => {
            Err(t.error(t.header_line(), Some("depth"), "a table has either height or depth, not both"))
        }
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
    let cols = DirectionColumns::locate(t, group_by)?;
    let mut records = Vec::with_capacity(t.rows.len());
    for row in &t.rows {
        records.push(cols.parse(t, row)?.to_record());
    }
    Ok(DirectionSet { source: t.name.clone(), axis: cols.axis.map(|a| a.0), group_column: cols.group_column, records })
}

/// Where the columns of a directions table are, found once from the header; parses rows of a
/// [`Table`] or of a [`super::TableStream`] with the same checks and messages.
#[derive(Debug, Clone)]
pub struct DirectionColumns {
    dec: usize,
    inc: usize,
    site: Option<usize>,
    specimen: Option<usize>,
    lat: Option<usize>,
    lon: Option<usize>,
    kind: Option<usize>,
    /// Position column, if any.
    pub axis: Option<(StratAxis, usize)>,
    x_az: Option<usize>,
    x_plunge: Option<usize>,
    bedding: BeddingColumns,
    /// The grouping column used, if any (lower-cased).
    pub group_column: Option<String>,
    group: Option<usize>,
}

impl DirectionColumns {
    /// Find the columns (`dec` and `inc` required; the `--by` column required when named).
    pub fn locate<T: Columns + ?Sized>(t: &T, group_by: &GroupBy) -> Result<Self, TableError> {
        let dec = t.require("dec")?;
        let inc = t.require("inc")?;
        let site = t.col("site");
        let axis = strat_axis(t)?;
        let group_column = match group_by {
            GroupBy::Default => site.map(|_| "site".to_string()),
            GroupBy::Column(c) => {
                let c = c.trim().to_lowercase();
                t.require(&c)?;
                Some(c)
            }
            GroupBy::None => None,
        };
        let group = group_column.as_deref().and_then(|c| t.col(c));
        Ok(DirectionColumns {
            dec,
            inc,
            site,
            specimen: t.col("specimen"),
            lat: t.col("lat"),
            lon: t.col("lon"),
            kind: t.col("kind"),
            axis,
            x_az: t.col("x_az"),
            x_plunge: t.col("x_plunge"),
            bedding: BeddingColumns::locate(t),
            group_column,
            group,
        })
    }

    /// Parse and check one row.
    pub fn parse<'a, T: Columns + ?Sized, R: Cells + ?Sized>(
        &self,
        t: &T,
        row: &'a R,
    ) -> Result<DirectionRow<'a>, TableError> {
        let line = row.line();
        let d = t.number_in(row, self.dec, -360.0, 360.0)?;
        let i = t.number_in(row, self.inc, -90.0, 90.0)?;
        let mut direction = Direction::new(d, i).map_err(|e| t.error(line, Some("dec"), e.to_string()))?;
        if let (Some(a), Some(p)) = (t.opt_number(row, self.x_az)?, t.opt_number(row, self.x_plunge)?) {
            let o = SpecimenOrientation::new(a, p).map_err(|e| t.error(line, Some("x_az"), e.to_string()))?;
            direction = o.direction_to_geographic(direction);
        }
        let kind = match t.opt_str(row, self.kind) {
            None => DirectionKind::Line,
            Some(k) if k.eq_ignore_ascii_case("line") => DirectionKind::Line,
            Some(k) if k.eq_ignore_ascii_case("plane") => DirectionKind::Plane,
            Some(other) => {
                return Err(t.error(line, Some("kind"), format!("'{}' is not 'line' or 'plane'", other.to_lowercase())))
            }
        };
        Ok(DirectionRow {
            line,
            site: t.opt_str(row, self.site),
            specimen: t.opt_str(row, self.specimen),
            direction,
            lat: t.opt_number_in(row, self.lat, -90.0, 90.0)?,
            lon: t.opt_number_in(row, self.lon, -180.0, 360.0)?,
            position: match self.axis {
                Some((_, i)) => t.opt_number(row, Some(i))?,
                None => None,
            },
            bedding: self.bedding.read(t, row)?,
            kind,
            group: t.opt_str(row, self.group),
            path_end: None,
        })
    }
}
