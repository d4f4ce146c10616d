//! Stratigraphic levels: one VGP latitude per height (or depth), read from a directions table or a
//! table of VGP latitudes.
//!
//! Rules (documented in the README):
//! - A table with a `vgp_lat` column gives one level per row; `dec`/`inc` are then not used. A position
//!   that appears twice is refused (both lines are named): one level cannot have two VGP latitudes.
//! - Otherwise the table is a directions table with `lat`/`lon` on every row. Rows at one position are the
//!   specimens of one level: their Fisher mean is taken, then its VGP. They must share site coordinates
//!   (and the site name, when a `site` column exists); a conflict is refused naming both lines.
//! - Rows may come in any order (top down, bottom up, by sample number); levels are sorted by position.
//!   A note says when sorting changed the order.
//! - Rows with bedding are tilt-corrected before the VGP is computed, unless in-situ directions are asked
//!   for. Rows of kind `plane` carry no direction and are left out (counted in a note).

use crate::error::TableError;
use crate::model::{DirectionKind, StratAxis};
use crate::poles::vgp;
use crate::sphere::{Direction, GeoPoint};
use crate::stats::fisher_mean;
use crate::table::{read_directions, strat_axis, GroupBy, Table};

/// One stratigraphic level.
///
/// # Units
/// Position in metres (height up, or depth down); angles in degrees.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Level {
    /// Height or depth, m.
    pub position: f64,
    /// VGP latitude, degrees.
    pub vgp_lat: f64,
    /// Mean direction used (None when the table gave `vgp_lat` directly).
    pub direction: Option<Direction>,
    /// Number of rows averaged.
    pub n: usize,
    /// α95 of the level: from the Fisher mean when n ≥ 2, else from an `a95` column.
    pub a95: Option<f64>,
    /// Maximum angular deviation from a `mad` column (single-row levels).
    pub mad: Option<f64>,
    /// Source lines of the rows.
    pub lines: Vec<usize>,
}

/// The levels of one section, sorted by increasing position.
#[derive(Debug, Clone, PartialEq)]
pub struct LevelSet {
    /// File name for messages.
    pub source: String,
    /// Height or depth.
    pub axis: StratAxis,
    /// Levels by increasing position value.
    pub levels: Vec<Level>,
    /// Remarks for the user (sorting, rows left out).
    pub notes: Vec<String>,
}

/// Options of [`read_levels`].
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct LevelOptions {
    /// Use in-situ (geographic) directions even where bedding is given.
    pub in_situ: bool,
}

/// Read the levels of a section from a directions table (with `lat`, `lon`) or a `vgp_lat` table, both
/// with `height` or `depth`. See the module documentation for the rules.
pub fn read_levels(t: &Table, opts: LevelOptions) -> Result<LevelSet, TableError> {
    t.require_rows()?;
    let Some((axis, pos_col)) = strat_axis(t)? else {
        return Err(t.error(
            t.header_line,
            Some("height"),
            "a column 'height' (m, upward) or 'depth' (m, downward) is required",
        ));
    };
    let a95_c = t.col("a95");
    let mad_c = t.col("mad");
    let mut notes = Vec::new();
    let mut raw: Vec<(f64, usize)> = Vec::new(); // (position, row index)
    for (i, row) in t.rows.iter().enumerate() {
        raw.push((t.number(row, pos_col)?, i));
    }
    let ascending = raw.windows(2).all(|w| w[0].0 <= w[1].0);
    let descending = raw.windows(2).all(|w| w[0].0 >= w[1].0);
    if descending && !ascending {
        notes.push(format!(
            "{}: rows run in decreasing {}; levels were sorted into increasing {}.",
            t.name,
            axis.column(),
            axis.column()
        ));
    } else if !ascending {
        notes.push(format!(
            "{}: rows are not in stratigraphic order; levels were sorted by {}.",
            t.name,
            axis.column()
        ));
    }
    raw.sort_by(|a, b| a.0.total_cmp(&b.0).then(a.1.cmp(&b.1)));
    let mut levels = Vec::new();
    if let Some(vc) = t.col("vgp_lat") {
        for w in raw.windows(2) {
            if w[0].0 == w[1].0 {
                let (l1, l2) = (t.rows[w[0].1].line, t.rows[w[1].1].line);
                let (first, second) = (l1.min(l2), l1.max(l2));
                return Err(t.error(
                    second,
                    Some(axis.column()),
                    format!(
                        "{} {} repeats line {first}: a table of VGP latitudes needs one row per level",
                        axis.column(),
                        w[1].0
                    ),
                ));
            }
        }
        for &(p, i) in &raw {
            let row = &t.rows[i];
            levels.push(Level {
                position: p,
                vgp_lat: t.number_in(row, vc, -90.0, 90.0)?,
                direction: None,
                n: 1,
                a95: t.opt_number_in(row, a95_c, 0.0, 180.0)?,
                mad: t.opt_number_in(row, mad_c, 0.0, 90.0)?,
                lines: vec![row.line],
            });
        }
        return Ok(LevelSet { source: t.name.clone(), axis, levels, notes });
    }
    let set = read_directions(t, &GroupBy::None)?;
    let (lat_c, lon_c) = (t.col("lat"), t.col("lon"));
    if lat_c.is_none() || lon_c.is_none() {
        let missing = if lat_c.is_none() { "lat" } else { "lon" };
        return Err(t.error(
            t.header_line,
            Some(missing),
            "a directions table needs the site 'lat' and 'lon' to give VGP latitudes (or give a 'vgp_lat' column)",
        ));
    }
    let site_c = t.col("site");
    let mut planes = 0usize;
    let mut k = 0;
    while k < raw.len() {
        let mut j = k;
        while j + 1 < raw.len() && raw[j + 1].0 == raw[k].0 {
            j += 1;
        }
        let pos = raw[k].0;
        let group: Vec<usize> = raw[k..=j].iter().map(|r| r.1).collect();
        let first = &set.records[group[0]];
        let mut dirs = Vec::new();
        let mut lines = Vec::new();
        for &gi in &group {
            let r = &set.records[gi];
            let (Some(lat), Some(lon)) = (r.lat, r.lon) else {
                let col = if r.lat.is_none() { "lat" } else { "lon" };
                return Err(t.error(r.line, Some(col), "is empty; every row needs the site coordinates"));
            };
            if lat != first.lat.unwrap_or(lat) || lon != first.lon.unwrap_or(lon) {
                return Err(t.error(
                    r.line,
                    Some("lat"),
                    format!(
                        "{} {} is also on line {} with other site coordinates; rows at one level must share lat/lon",
                        axis.column(),
                        pos,
                        first.line
                    ),
                ));
            }
            if site_c.is_some() && r.site != first.site {
                return Err(t.error(
                    r.line,
                    Some("site"),
                    format!(
                    "{} {} is also on line {} with site '{}'; two sites cannot share one level (a typing error in {}?)",
                    axis.column(), pos, first.line, first.site.clone().unwrap_or_default(), axis.column()),
                ));
            }
            if r.kind == DirectionKind::Plane {
                planes += 1;
                continue;
            }
            let d = match (r.bedding, opts.in_situ) {
                (Some(b), false) => Direction::from_vector(b.untilt(r.direction.to_vector())).unwrap_or(r.direction),
                _ => r.direction,
            };
            dirs.push(d);
            lines.push(r.line);
        }
        k = j + 1;
        if dirs.is_empty() {
            continue;
        }
        let site = GeoPoint::new(first.lat.unwrap_or(0.0), first.lon.unwrap_or(0.0))
            .map_err(|e| t.error(first.line, Some("lon"), e.to_string()))?;
        let (mean, a95) = if dirs.len() == 1 {
            (dirs[0], t.opt_number_in(&t.rows[group[0]], a95_c, 0.0, 180.0)?)
        } else {
            let s = fisher_mean(&dirs, 0.95).map_err(|e| t.error(lines[0], None, e.to_string()))?;
            let Some(m) = s.mean else {
                return Err(t.error(
                    lines[0],
                    Some("dec"),
                    format!(
                        "the {} directions at {} {} cancel out (no mean direction); check this level",
                        dirs.len(),
                        axis.column(),
                        pos
                    ),
                ));
            };
            (m, s.alpha)
        };
        let mad = if dirs.len() == 1 { t.opt_number_in(&t.rows[group[0]], mad_c, 0.0, 90.0)? } else { None };
        levels.push(Level {
            position: pos,
            vgp_lat: vgp(site, mean).pole.lat,
            direction: Some(mean),
            n: dirs.len(),
            a95,
            mad,
            lines,
        });
    }
    if planes > 0 {
        notes.push(format!("{planes} row(s) of kind 'plane' carry no direction and were left out."));
    }
    if levels.is_empty() {
        return Err(t.error(t.header_line, Some("kind"), "no row gives a direction (all are planes)"));
    }
    Ok(LevelSet { source: t.name.clone(), axis, levels, notes })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::poles::dipole_inclination;

    fn parse(s: &str) -> Result<LevelSet, TableError> {
        read_levels(&Table::parse("lv.csv", s.as_bytes()).unwrap(), LevelOptions::default())
    }

    #[test]
    fn axial_dipole_directions_give_polar_vgps_and_rows_at_one_height_are_averaged() {
        // A geocentric axial dipole direction (tan I = 2 tan λ, common practice) gives a VGP at the pole.
        let i = dipole_inclination(30.0);
        let s = format!("dec,inc,lat,lon,height\n0,{i},30,10,5\n180,{},30,10,1\n10,{i},30,10,5\n350,{i},30,10,5\n", -i);
        let l = parse(&s).unwrap();
        assert_eq!(l.levels.len(), 2);
        assert_eq!(l.levels[0].position, 1.0);
        assert!((l.levels[0].vgp_lat + 90.0).abs() < 1e-9);
        // Three rows at 5 m, symmetric about north: the Fisher mean points due north, slightly steeper than
        // the dipole inclination, so the VGP lies near the pole; the level has n = 3 and an α95.
        assert_eq!(l.levels[1].n, 3);
        assert!(l.levels[1].vgp_lat > 80.0 && l.levels[1].a95.is_some());
        assert!(l.notes[0].contains("sorted"), "{:?}", l.notes);
    }

    #[test]
    fn a_descending_table_is_sorted_with_a_note() {
        // The README promises a note whenever rows are re-sorted; a table written top down (strictly
        // decreasing height) is re-sorted too, so it must say so. A table already in increasing order
        // needs no note.
        let l = parse("vgp_lat,height\n80,3\n-70,2\n60,1\n").unwrap();
        assert_eq!(l.levels.iter().map(|v| v.position).collect::<Vec<_>>(), vec![1.0, 2.0, 3.0]);
        assert_eq!(l.notes.len(), 1, "{:?}", l.notes);
        assert!(l.notes[0].contains("decreasing height") && l.notes[0].contains("sorted"), "{:?}", l.notes);
        assert!(parse("vgp_lat,height\n60,1\n-70,2\n80,3\n").unwrap().notes.is_empty());
    }

    #[test]
    fn bad_levels_are_named() {
        let e = parse("vgp_lat,height\n80,1\n-70,2\n60,1\n").unwrap_err();
        assert_eq!(e.line, 4);
        assert!(e.to_string().contains("repeats line 2"), "{e}");
        let e = parse("dec,inc,lat,lon,site,height\n0,40,30,10,A,1\n0,40,30,10,B,1\n").unwrap_err();
        assert!(e.to_string().contains("two sites cannot share one level"), "{e}");
        let e = parse("dec,inc,height\n0,40,1\n").unwrap_err();
        assert!(e.to_string().contains("column 'lat'"), "{e}");
        let e = parse("dec,inc,lat,lon\n0,40,1,1\n").unwrap_err();
        assert!(e.to_string().contains("'height'"), "{e}");
        let e = parse("vgp_lat,depth\n95,1\n").unwrap_err();
        assert!(e.to_string().contains("column 'vgp_lat'"), "{e}");
    }
}
