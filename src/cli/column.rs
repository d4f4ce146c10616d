//! `lodestone column`: polarity per level and magnetozones.

use super::{jnum, Cell, Ctx, Presentation, Sheet};
use anyhow::Result;
use clap::Args;
use lodestone::figures::ColumnFigure;
use lodestone::strat::{
    read_levels, status_word, zone_levels, LevelOptions, LevelSet, ZoneColumn, ZonePolarity, ZONE_COLUMNS,
};
use lodestone::table::Table;
use serde_json::{json, Value};
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct ColumnArgs {
    /// Levels: a directions table with height or depth and lat/lon, or a table with a vgp_lat column.
    pub file: PathBuf,
    /// VGP latitude (degrees) at and beyond which a level is normal (north) or reversed (south).
    #[arg(long, default_value_t = lodestone::strat::DEFAULT_THRESHOLD)]
    pub threshold: f64,
    /// Zones resting on fewer levels than this are reported as single-level (unconfirmed) zones.
    #[arg(long, default_value_t = lodestone::strat::DEFAULT_MIN_LEVELS)]
    pub min_levels: usize,
    /// Use in-situ directions even where bedding columns are given (default: tilt-corrected).
    #[arg(long)]
    pub in_situ: bool,
    /// Write the polarity-column figure (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

/// The zones table section (what `--format csv` prints and `correlate` reads).
pub fn zones_section(col: &ZoneColumn, title: &str) -> (Sheet, Vec<Value>) {
    let mut sec = Sheet::new(title, &ZONE_COLUMNS);
    let mut js = Vec::new();
    for (i, z) in col.zones.iter().enumerate() {
        sec.rows.push(vec![
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
        js.push(json!({
            "zone": i + 1, "polarity": z.polarity.code(), "n_levels": z.n_levels, "status": status_word(z),
            "base": z.base.mid, "base_low": z.base.low, "base_high": z.base.high, "base_is_section_end": !z.base.change,
            "top": z.top.mid, "top_low": z.top.low, "top_high": z.top.high, "top_is_section_end": !z.top.change,
        }));
    }
    (sec, js)
}

pub fn run(a: ColumnArgs, ctx: &mut Ctx) -> Result<Presentation> {
    ctx.inputs.add(&a.file);
    let table = Table::read(&a.file)?;
    let set = read_levels(&table, LevelOptions { in_situ: a.in_situ })?;
    let (pol, col) = zone_levels(&set, a.threshold, a.min_levels)?;
    let axis = set.axis.column();
    let mut lev = Sheet::new(
        &format!("Levels of {} (VGP threshold {}°)", a.file.display(), a.threshold),
        &[axis, "vgp_lat", "polarity", "n", "a95", "mad"],
    );
    let mut levels = Vec::new();
    for (l, p) in set.levels.iter().zip(&pol) {
        lev.rows.push(vec![
            Cell::Num(l.position, 3),
            Cell::Num(l.vgp_lat, 1),
            Cell::Text(p.code().into()),
            Cell::Int(l.n as i64),
            Cell::opt(l.a95, 1),
            Cell::opt(l.mad, 1),
        ]);
        levels.push(json!({axis: l.position, "vgp_lat": l.vgp_lat, "polarity": p.code(), "n": l.n, "a95": jnum(l.a95), "mad": jnum(l.mad), "lines": l.lines}));
    }
    let (zsec, zones) = zones_section(&col, &format!("Magnetozones (listed by increasing {axis})"));
    let mut notes = set.notes.clone();
    notes.extend(column_notes(&set, &col, a.threshold, a.min_levels));
    if let Some(path) = &a.plot {
        let title = format!(
            "Polarity column — {}",
            a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default()
        );
        let fig = ColumnFigure::of_column(title, &set, &col, a.threshold);
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(Presentation {
        json: json!({
            "file": a.file.display().to_string(), "axis": axis, "threshold": a.threshold, "min_levels": a.min_levels,
            "levels": levels, "zones": zones, "notes": notes,
        }),
        sheets: vec![lev, zsec],
        main_sheet: 1,
        cautions: vec![],
        notes,
    })
}

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
