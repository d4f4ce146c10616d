//! Magnetozones: runs of consecutive levels of one polarity, with the uncertainty of each boundary.

use super::polarity::ZonePolarity;
use crate::error::TableError;
use crate::model::StratAxis;
use crate::table::{strat_axis, Table};

/// One boundary of a zone: where it is placed and the interval it must lie in.
///
/// # Units
/// Metres on the table's axis (height or depth); `low ≤ mid ≤ high` numerically.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Boundary {
    /// Midpoint of the sampling gap (the best single value).
    pub mid: f64,
    /// Lower end of the interval (the smaller position value).
    pub low: f64,
    /// Upper end of the interval (the larger position value).
    pub high: f64,
    /// True for a change of polarity inside the section; false where the zone meets the end of the section
    /// (then `low = high = mid` = the outermost level, and the true boundary lies beyond it).
    pub change: bool,
}

impl Boundary {
    fn between(a: f64, b: f64) -> Boundary {
        let (low, high) = if a <= b { (a, b) } else { (b, a) };
        Boundary { mid: 0.5 * (low + high), low, high, change: true }
    }
    fn end(p: f64) -> Boundary {
        Boundary { mid: p, low: p, high: p, change: false }
    }
    /// Width of the interval (the sampling gap), m.
    pub fn width(&self) -> f64 {
        self.high - self.low
    }
}

/// A magnetozone.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Magnetozone {
    /// Polarity (N, R or I for a run of intermediate levels).
    pub polarity: ZonePolarity,
    /// Number of levels in the zone.
    pub n_levels: usize,
    /// False when the zone rests on fewer levels than the minimum asked for (a single-level zone).
    pub confirmed: bool,
    /// Stratigraphic base (the older side: lower height, or greater depth).
    pub base: Boundary,
    /// Stratigraphic top (the younger side).
    pub top: Boundary,
    /// Index of the zone's first level in the sorted level list (by increasing position), if known.
    pub first_level: Option<usize>,
}

/// The zones of a section, listed by increasing position value (bottom up for height, top down for depth).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct ZoneColumn {
    /// Height or depth.
    pub axis: StratAxis,
    /// The zones.
    pub zones: Vec<Magnetozone>,
}

impl ZoneColumn {
    /// The zones from youngest to oldest (top of the section first).
    pub fn young_to_old(&self) -> Vec<&Magnetozone> {
        match self.axis {
            StratAxis::Height => self.zones.iter().rev().collect(),
            StratAxis::Depth => self.zones.iter().collect(),
        }
    }
    /// "Up" coordinate (growing younger): height as is, depth negated.
    pub fn up(&self, position: f64) -> f64 {
        match self.axis {
            StratAxis::Height => position,
            StratAxis::Depth => -position,
        }
    }
}

/// Group levels into magnetozones.
///
/// `positions` must be strictly increasing; `polarities` gives each level's class. A zone of fewer than
/// `min_levels` levels is kept as its own zone with `confirmed = false`; nothing is merged. Each internal
/// boundary lies in the gap between the last level of one zone and the first level of the next, so its
/// interval is exactly that sampling gap.
///
/// # References
/// Common practice in magnetostratigraphy (Opdyke & Channell 1996, ch. 5): boundaries are placed within
/// the gap between the nearest levels of opposite polarity.
pub fn build_zones(
    axis: StratAxis,
    positions: &[f64],
    polarities: &[ZonePolarity],
    min_levels: usize,
) -> crate::Result<ZoneColumn> {
    if positions.len() != polarities.len() {
        return Err(crate::Error::LengthMismatch {
            left_what: "positions",
            left: positions.len(),
            right_what: "polarities",
            right: polarities.len(),
        });
    }
    if positions.is_empty() {
        return Err(crate::Error::TooFew { what: "a polarity column", needed: 1, got: 0, unit: "levels" });
    }
    if let Some(w) = positions.windows(2).find(|w| !(w[1] > w[0])) {
        return Err(crate::Error::invalid(
            "positions",
            format!("{} then {}", w[0], w[1]),
            format!("positions must be strictly increasing, found {} then {}", w[0], w[1]),
        ));
    }
    let mut zones = Vec::new();
    let mut f = 0;
    while f < positions.len() {
        let mut l = f;
        while l + 1 < positions.len() && polarities[l + 1] == polarities[f] {
            l += 1;
        }
        let lower =
            if f == 0 { Boundary::end(positions[0]) } else { Boundary::between(positions[f - 1], positions[f]) };
        let upper = if l + 1 == positions.len() {
            Boundary::end(positions[l])
        } else {
            Boundary::between(positions[l], positions[l + 1])
        };
        let (base, top) = match axis {
            StratAxis::Height => (lower, upper),
            StratAxis::Depth => (upper, lower),
        };
        let n = l - f + 1;
        zones.push(Magnetozone {
            polarity: polarities[f],
            n_levels: n,
            confirmed: n >= min_levels.max(1),
            base,
            top,
            first_level: Some(f),
        });
        f = l + 1;
    }
    Ok(ZoneColumn { axis, zones })
}

/// Column names of the zones table, in the order `column --format csv` prints them (after `zone`).
pub const ZONE_COLUMNS: [&str; 11] =
    ["zone", "polarity", "n_levels", "status", "base", "base_low", "base_high", "top", "top_low", "top_high", "axis"];

/// Status word of a zone in the zones table.
pub fn status_word(z: &Magnetozone) -> &'static str {
    if z.confirmed {
        "confirmed"
    } else {
        "single-level"
    }
}

/// Read a zones table (what `column --format csv` prints): `polarity`, `n_levels`, `base`, `base_low`,
/// `base_high`, `top`, `top_low`, `top_high`, and `axis` (`height` or `depth`; default `height`);
/// optional `status` (`confirmed` / `single-level`; default: confirmed when `n_levels ≥ 2`).
///
/// Refused, naming the line and column: unknown polarity codes, a boundary outside its own interval, zones
/// that overlap or leave a gap between them (each zone's base interval must be the top interval of the zone
/// below), two zones of one polarity next to each other, and a mixture of axes.
pub fn read_zones(t: &Table) -> Result<ZoneColumn, TableError> {
    t.require_rows()?;
    let cols: Vec<usize> = ["polarity", "n_levels", "base", "base_low", "base_high", "top", "top_low", "top_high"]
        .iter()
        .map(|c| t.require(c))
        .collect::<Result<_, _>>()?;
    let axis_c = t.col("axis");
    let status_c = t.col("status");
    let mut axis: Option<StratAxis> = None;
    if axis_c.is_none() {
        if let Some((a, _)) = strat_axis(t)? {
            axis = Some(a);
        }
    }
    let mut rows = Vec::new();
    for row in &t.rows {
        let code = t.text(row, cols[0]);
        let polarity = ZonePolarity::parse(code).ok_or_else(|| {
            t.error(row.line, Some("polarity"), format!("'{code}' is not a polarity code (N, R or I)"))
        })?;
        let n = t.number(row, cols[1])?;
        if n < 1.0 || n.fract() != 0.0 {
            return Err(t.error(
                row.line,
                Some("n_levels"),
                format!("{n} is not a whole number of levels (1 or more)"),
            ));
        }
        let v: Vec<f64> = cols[2..].iter().map(|&c| t.number(row, c)).collect::<Result<_, _>>()?;
        for (b, name) in [(0, "base"), (3, "top")] {
            if !(v[b + 1] <= v[b] && v[b] <= v[b + 2]) {
                return Err(t.error(
                    row.line,
                    Some(name),
                    format!("{} is not within [{}_low, {}_high] = [{}, {}]", v[b], name, name, v[b + 1], v[b + 2]),
                ));
            }
        }
        let this_axis = match t.opt_text(row, axis_c).map(|s| s.to_lowercase()).as_deref() {
            None => axis.unwrap_or(StratAxis::Height),
            Some("height") => StratAxis::Height,
            Some("depth") => StratAxis::Depth,
            Some(o) => return Err(t.error(row.line, Some("axis"), format!("'{o}' is not 'height' or 'depth'"))),
        };
        if *axis.get_or_insert(this_axis) != this_axis {
            return Err(t.error(row.line, Some("axis"), "all zones must use one axis (height or depth)"));
        }
        let confirmed = match t.opt_text(row, status_c).map(|s| s.to_lowercase()).as_deref() {
            None => n >= 2.0,
            Some("confirmed") => true,
            Some("single-level") | Some("unconfirmed") => false,
            Some(o) => {
                return Err(t.error(row.line, Some("status"), format!("'{o}' is not 'confirmed' or 'single-level'")))
            }
        };
        let bnd = |m: f64, lo: f64, hi: f64| Boundary { mid: m, low: lo, high: hi, change: hi > lo };
        rows.push((
            row.line,
            Magnetozone {
                polarity,
                n_levels: n as usize,
                confirmed,
                base: bnd(v[0], v[1], v[2]),
                top: bnd(v[3], v[4], v[5]),
                first_level: None,
            },
        ));
    }
    let axis = axis.unwrap_or(StratAxis::Height);
    // Sort by position (the base for height, the top for depth, both the smaller-valued end).
    let key = |z: &Magnetozone| match axis {
        StratAxis::Height => z.base.low,
        StratAxis::Depth => z.top.low,
    };
    rows.sort_by(|a, b| key(&a.1).total_cmp(&key(&b.1)));
    let n = rows.len();
    for i in 0..n {
        let (line, z) = &rows[i];
        // The boundary at the smaller-valued end must match the previous zone's larger-valued end.
        let (lower, upper) = match axis {
            StratAxis::Height => (z.base, z.top),
            StratAxis::Depth => (z.top, z.base),
        };
        if i == 0 && lower.change {
            return Err(t.error(*line, None, "the first zone's outer boundary must be the section end (low = high)"));
        }
        if i + 1 == n && upper.change {
            return Err(t.error(*line, None, "the last zone's outer boundary must be the section end (low = high)"));
        }
        if i > 0 {
            let (pline, p) = &rows[i - 1];
            let pu = match axis {
                StratAxis::Height => p.top,
                StratAxis::Depth => p.base,
            };
            let same = (pu.low - lower.low).abs() < 1e-9 && (pu.high - lower.high).abs() < 1e-9;
            if !same {
                let what = if lower.low < pu.high { "overlaps" } else { "does not meet" };
                return Err(t.error(*line, None, format!(
                    "this zone {what} the zone on line {pline}: the boundary between them must be the same interval in both rows ([{}, {}] vs [{}, {}])",
                    pu.low, pu.high, lower.low, lower.high)));
            }
            if p.polarity == z.polarity {
                return Err(t.error(
                    *line,
                    Some("polarity"),
                    format!("this zone has the same polarity as the zone on line {pline}; they would be one zone"),
                ));
            }
        }
    }
    Ok(ZoneColumn { axis, zones: rows.into_iter().map(|r| r.1).collect() })
}

#[cfg(test)]
mod tests {
    use super::*;
    use ZonePolarity::*;

    #[test]
    fn boundaries_are_the_sampling_gaps_on_either_axis() {
        let pos = [1.0, 2.0, 3.5, 4.0, 7.0, 7.5];
        let pol = [Normal, Normal, Reversed, Normal, Normal, Intermediate];
        let c = build_zones(StratAxis::Height, &pos, &pol, 2).unwrap();
        assert_eq!(c.zones.len(), 4);
        let r = &c.zones[1];
        assert_eq!((r.base.low, r.base.high, r.top.low, r.top.high), (2.0, 3.5, 3.5, 4.0));
        assert!(!r.confirmed && c.zones[0].confirmed && !c.zones[0].base.change);
        assert_eq!(c.zones[0].base.mid, 1.0);
        let d = build_zones(StratAxis::Depth, &pos, &pol, 2).unwrap();
        // With depth, the base is the deeper end.
        assert_eq!((d.zones[1].base.low, d.zones[1].base.high), (3.5, 4.0));
        assert_eq!((d.zones[1].top.low, d.zones[1].top.high), (2.0, 3.5));
        assert!(build_zones(StratAxis::Height, &[1.0, 1.0], &[Normal, Normal], 2).is_err());
    }

    #[test]
    fn zones_table_is_validated() {
        let h = "polarity,n_levels,base,base_low,base_high,top,top_low,top_high\n";
        let ok = format!("{h}N,2,0,0,0,1.5,1,2\nR,3,1.5,1,2,5,5,5\n");
        let c = read_zones(&Table::parse("z.csv", ok.as_bytes()).unwrap()).unwrap();
        assert_eq!(c.zones.len(), 2);
        assert!(c.zones[0].top.change && !c.zones[1].top.change);
        let over = format!("{h}N,2,0,0,0,1.5,1,2\nR,3,0.9,0.5,1,5,5,5\n");
        let e = read_zones(&Table::parse("z.csv", over.as_bytes()).unwrap()).unwrap_err();
        assert!(e.to_string().contains("overlaps the zone on line 2"), "{e}");
        let same = format!("{h}N,2,0,0,0,1.5,1,2\nN,3,1.5,1,2,5,5,5\n");
        assert!(read_zones(&Table::parse("z.csv", same.as_bytes()).unwrap())
            .unwrap_err()
            .to_string()
            .contains("same polarity"));
    }
}
