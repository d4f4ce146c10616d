//! The polarity column: each level's polarity and the magnetozones they form, as the `column` verb
//! prints them and the `section` run writes them (`levels` and `zones` tables).

use super::keyed::Keyed;
use super::{json_num, Cell, Presentation, Sheet};
use crate::strat::{status_word, LevelSet, ZoneColumn, ZonePolarity, ZONE_COLUMNS};
use serde::Serialize;

/// The labels a column's presentation needs besides the result.
#[derive(Debug, Clone, Copy)]
pub struct ColumnLabels<'a> {
    /// The levels file as given.
    pub file: &'a str,
    /// VGP latitude threshold of the polarity classes, degrees.
    pub threshold: f64,
    /// Fewest levels of a confirmed zone.
    pub min_levels: usize,
}

/// Which columns beyond the position, VGP latitude, polarity, n and α95 a levels sheet has.
#[derive(Debug, Clone, Copy)]
pub struct LevelColumns<'a> {
    /// A first `site` column with these names, one per level.
    pub sites: Option<&'a [String]>,
    /// A last `mad` column (the levels table's MAD; a section's levels are site means, which have
    /// none).
    pub mad: bool,
}

/// The levels sheet: position, VGP latitude, polarity class, n, α95 (and MAD) of each level; with
/// `cols.sites`, a first column names each level's site.
pub fn levels_sheet(set: &LevelSet, pol: &[ZonePolarity], title: &str, cols: LevelColumns) -> Sheet {
    let axis = set.axis.column();
    let mut names = vec![axis, "vgp_lat", "polarity", "n", "a95"];
    if cols.mad {
        names.push("mad");
    }
    if cols.sites.is_some() {
        names.insert(0, "site");
    }
    let mut sheet = Sheet::new(title, &names);
    for (i, (l, p)) in set.levels.iter().zip(pol).enumerate() {
        let mut row = vec![
            Cell::Num(l.position, 3),
            Cell::Num(l.vgp_lat, 1),
            Cell::Text(p.code().into()),
            Cell::Int(l.n as i64),
            Cell::opt(l.a95, 1),
        ];
        if cols.mad {
            row.push(Cell::opt(l.mad, 1));
        }
        if let Some(names) = cols.sites {
            row.insert(0, Cell::opt_text(names.get(i).map(String::as_str)));
        }
        sheet.push(row);
    }
    sheet
}

/// The zones sheet: the columns of [`ZONE_COLUMNS`] (the zones table `correlate` reads).
pub fn zones_sheet(col: &ZoneColumn, title: &str) -> Sheet {
    let mut sheet = Sheet::new(title, &ZONE_COLUMNS);
    for (i, z) in col.zones.iter().enumerate() {
        sheet.push(vec![
            Cell::Int(i as i64 + 1),
            Cell::Text(z.polarity.code().into()),
            Cell::Int(z.n_levels as i64),
            Cell::Text(status_word(z).into()),
            Cell::Num(z.base.mid, 3),
            Cell::Num(z.base.low, 3),
            Cell::Num(z.base.high, 3),
            Cell::Num(z.top.mid, 3),
            Cell::Num(z.top.low, 3),
            Cell::Num(z.top.high, 3),
            Cell::Text(col.axis.column().into()),
        ]);
    }
    sheet
}

/// Sentences reading the column: the classes, single-level and intermediate zones, where the
/// boundaries lie.
pub fn column_notes(set: &LevelSet, col: &ZoneColumn, threshold: f64, min_levels: usize) -> Vec<String> {
    let mut notes = Vec::new();
    let single = col.zones.iter().filter(|z| !z.confirmed && z.polarity != ZonePolarity::Intermediate).count();
    let inter = col.zones.iter().filter(|z| z.polarity == ZonePolarity::Intermediate).count();
    notes.push(format!(
        "{} levels, {} zones. A level is normal when its VGP latitude is at least {threshold}°, reversed at or below −{threshold}°, intermediate between.",
        set.levels.len(), col.zones.len()));
    if single > 0 {
        notes.push(format!("{single} zone(s) rest on fewer than {min_levels} levels: reported as single-level (unconfirmed), not merged."));
    }
    if inter > 0 {
        notes.push(format!("{inter} zone(s) of intermediate levels: transitional directions or unreliable levels; check them before reading them as field behaviour."));
    }
    notes.push("Each internal boundary lies somewhere in the sampling gap between the levels on either side (base_low…base_high, top_low…top_high).".into());
    notes
}

/// The polarity column as the `column` verb shows it: the levels sheet, the zones sheet (the main
/// one), the reading notes after the level reader's notes.
pub fn column(set: &LevelSet, pol: &[ZonePolarity], col: &ZoneColumn, labels: ColumnLabels<'_>) -> Presentation {
    let axis = set.axis.column();
    let title = format!("Levels of {} (VGP threshold {}°)", labels.file, labels.threshold);
    let lev = levels_sheet(set, pol, &title, LevelColumns { sites: None, mad: true });
    let zones = zones_sheet(col, &format!("Magnetozones (listed by increasing {axis})"));
    let mut notes = set.notes.clone();
    notes.extend(column_notes(set, col, labels.threshold, labels.min_levels));
    let view = ColumnView {
        file: labels.file,
        axis,
        threshold: labels.threshold,
        min_levels: labels.min_levels,
        levels: set
            .levels
            .iter()
            .zip(pol)
            .map(|(l, p)| LevelView {
                at: Keyed { name: axis, value: l.position },
                vgp_lat: l.vgp_lat,
                polarity: p.code(),
                n: l.n,
                a95: l.a95,
                mad: l.mad,
                lines: &l.lines,
            })
            .collect(),
        zones: zone_views(col),
        notes: &notes,
    };
    let json = serde_json::to_value(&view).expect("a column view serializes");
    Presentation { json, sheets: vec![lev, zones], main_sheet: 1, notes, cautions: vec![] }
}

/// The zones of a column as JSON views (numbered from 1 in the column's order).
fn zone_views(col: &ZoneColumn) -> Vec<ZoneView> {
    col.zones
        .iter()
        .enumerate()
        .map(|(i, z)| ZoneView {
            zone: i + 1,
            polarity: z.polarity.code(),
            n_levels: z.n_levels,
            status: status_word(z),
            base: z.base.mid,
            base_low: z.base.low,
            base_high: z.base.high,
            base_is_section_end: !z.base.change,
            top: z.top.mid,
            top_low: z.top.low,
            top_high: z.top.high,
            top_is_section_end: !z.top.change,
        })
        .collect()
}

#[derive(Serialize)]
struct ColumnView<'a> {
    file: &'a str,
    axis: &'a str,
    threshold: f64,
    min_levels: usize,
    levels: Vec<LevelView<'a>>,
    zones: Vec<ZoneView>,
    notes: &'a [String],
}

#[derive(Serialize)]
struct LevelView<'a> {
    #[serde(flatten)]
    at: Keyed<'a>,
    vgp_lat: f64,
    polarity: &'static str,
    n: usize,
    #[serde(serialize_with = "json_num::opt")]
    a95: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    mad: Option<f64>,
    lines: &'a [usize],
}

/// One magnetozone in JSON: its number, class, levels, status and boundary intervals.
#[derive(Serialize)]
struct ZoneView {
    zone: usize,
    polarity: &'static str,
    n_levels: usize,
    status: &'static str,
    base: f64,
    base_low: f64,
    base_high: f64,
    base_is_section_end: bool,
    top: f64,
    top_low: f64,
    top_high: f64,
    top_is_section_end: bool,
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::model::StratAxis;
    use crate::strat::{zone_levels, Level};

    /// Four invented levels: two normal, one intermediate, one reversed (VGP threshold 45°).
    fn set() -> LevelSet {
        let level = |position: f64, vgp_lat: f64, mad: Option<f64>| Level {
            position,
            vgp_lat,
            direction: None,
            n: 3,
            a95: Some(5.0),
            mad,
            lines: vec![],
        };
        LevelSet {
            source: "invented".into(),
            axis: StratAxis::Height,
            levels: vec![
                level(1.0, 80.0, Some(2.0)),
                level(2.0, 60.0, None),
                level(3.0, 10.0, None),
                level(4.0, -70.0, None),
            ],
            notes: vec![],
        }
    }

    #[test]
    fn the_sites_column_comes_first_and_the_rest_is_the_verbs_sheet() {
        let s = set();
        let (pol, _) = zone_levels(&s, 45.0, 2).unwrap();
        let plain = levels_sheet(&s, &pol, "t", LevelColumns { sites: None, mad: true });
        let names: Vec<String> = ["a", "b", "c", "d"].map(String::from).to_vec();
        let named = levels_sheet(&s, &pol, "t", LevelColumns { sites: Some(&names), mad: true });
        assert_eq!(named.columns[0], "site");
        assert_eq!(&named.columns[1..], &plain.columns[..]);
        for (n, p) in named.rows.iter().zip(&plain.rows) {
            assert_eq!(&n[1..], &p[..]);
        }
        assert_eq!(named.rows[2][0], Cell::Text("c".into()));
        assert_eq!(plain.rows[0][5], Cell::Num(2.0, 1));
        assert_eq!(plain.rows[1][5], Cell::Empty);
        let codes: Vec<&Cell> = plain.rows.iter().map(|r| &r[2]).collect();
        assert_eq!(codes, ["N", "N", "I", "R"].map(|c| Cell::Text(c.into())).iter().collect::<Vec<_>>());
        // Without the MAD column the sheet is the same less its last column.
        let no_mad = levels_sheet(&s, &pol, "t", LevelColumns { sites: None, mad: false });
        assert_eq!(no_mad.columns, plain.columns[..5]);
        for (a, b) in no_mad.rows.iter().zip(&plain.rows) {
            assert_eq!(&a[..], &b[..5]);
        }
    }

    #[test]
    fn json_puts_the_axis_first_in_every_level_and_follows_the_zones_sheet() {
        let s = set();
        let (pol, col) = zone_levels(&s, 45.0, 2).unwrap();
        let p = column(&s, &pol, &col, ColumnLabels { file: "f.csv", threshold: 45.0, min_levels: 2 });
        let first = p.json["levels"][0].as_object().unwrap();
        assert_eq!(first.keys().next().map(String::as_str), Some("height"));
        assert_eq!(first["mad"], 2.0);
        assert!(p.json["levels"][1]["mad"].is_null());
        let zones = &p.sheets[p.main_sheet];
        assert_eq!(zones.columns, ZONE_COLUMNS);
        assert_eq!(p.json["zones"].as_array().unwrap().len(), zones.rows.len());
        assert_eq!(p.json["notes"].as_array().unwrap().len(), p.notes.len());
        assert!(p.notes.iter().any(|n| n.contains("intermediate levels")), "{:?}", p.notes);
    }
}
