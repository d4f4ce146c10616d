//! Stage 5: the polarity of each used level and the magnetozones they form.

use super::inputs::Inputs;
use super::site_means::UsedSite;
use super::RunLog;
use crate::error::Result;
use crate::figures::{ColumnFigure, ScalePanel};
use crate::present::column::{levels_sheet, zones_sheet, LevelColumns};
use crate::section::stage::{draw, Stage};
use crate::section::tables::CsvTable;
use crate::section::Project;
use crate::strat::{zone_levels, Level, LevelSet, ZoneColumn, ZonePolarity};

/// Title of the zones table.
const ZONES_TITLE: &str = "Magnetozones (the zones table that `correlate` reads)";

/// The column as later stages need it: its levels, its zones, and where its stage record sits in
/// the run (the column figure, drawn after the correlation, is listed under it).
pub(in crate::section) struct Column {
    pub levels: LevelSet,
    pub zones: Option<ZoneColumn>,
    pub stage_index: usize,
}

/// Classify the levels and zone them; write the stage and the levels and zones tables.
pub(in crate::section) fn polarity_column(p: &Project, inp: &Inputs, used: &[UsedSite], log: &mut RunLog) -> Column {
    let s = &inp.settings;
    let mut stage = Stage::new("Polarity column and magnetozones");
    stage.method = format!(
        "Each used site is one level. A level is normal when its VGP latitude is at least {}°, reversed at or below −{}°, intermediate between. Consecutive levels of one class form a magnetozone; a zone of fewer than {} levels is reported as single-level, never merged. Each internal boundary lies somewhere in the sampling gap between its two levels.",
        s.vgp_threshold, s.vgp_threshold, s.min_levels);
    let levels = LevelSet {
        source: p.sampling.name.clone(),
        axis: inp.axis,
        levels: used
            .iter()
            .map(|u| Level {
                position: inp.sites[u.idx].position,
                vgp_lat: u.vgp_lat,
                direction: Some(u.tilt),
                n: u.n,
                a95: u.a95,
                mad: None,
                lines: vec![],
            })
            .collect(),
        notes: vec![],
    };
    let mut zones = None;
    if levels.levels.len() < 2 {
        let found = levels.levels.len();
        log.skip(&mut stage, format!("Skipped: a polarity column needs at least two used levels (found {found})."));
    } else {
        match zone_levels(&levels, s.vgp_threshold, s.min_levels) {
            Ok((pol, col)) => {
                let col_name = inp.axis.column();
                log.table(&mut stage, levels_table(inp, used, &levels, &pol));
                log.table(&mut stage, CsvTable::from_sheet("zones", zones_sheet(&col, ZONES_TITLE)));
                log.head.zones = col.zones.len();
                let code: String = col.zones.iter().map(|z| z.polarity.code()).collect::<Vec<_>>().join(" ");
                stage.result = format!(
                    "{} levels form {} magnetozones ({} single-level), listed by increasing {col_name}: {code}.",
                    levels.levels.len(),
                    col.zones.len(),
                    col.zones.iter().filter(|z| !z.confirmed).count()
                );
                zones = Some(col);
            }
            Err(e) => log.skip_on_error(&mut stage, "Polarity column", e),
        }
    }
    log.stages.push(stage);
    Column { levels, zones, stage_index: log.stages.len() - 1 }
}

fn levels_table(inp: &Inputs, used: &[UsedSite], levels: &LevelSet, pol: &[ZonePolarity]) -> CsvTable {
    let sites: Vec<String> = used.iter().map(|u| inp.sites[u.idx].site.clone()).collect();
    // A section's levels are site means: they have no MAD, so the sheet has no `mad` column.
    let cols = LevelColumns { sites: Some(&sites), mad: false };
    CsvTable::from_sheet("levels", levels_sheet(levels, pol, "Polarity of each level", cols))
}

/// The column figure: VGP latitude of each level and the zones, with the time scale and the best
/// correlation's ties when there is one; listed under the column's stage.
///
/// # Errors
/// Only a failure to draw.
pub(in crate::section) fn column_figure(
    inp: &Inputs,
    column: &Column,
    scale: Option<ScalePanel>,
    log: &mut RunLog,
) -> Result<()> {
    let Some(col) = &column.zones else { return Ok(()) };
    let with_scale = scale.is_some();
    let fig = ColumnFigure {
        title: if with_scale { "Polarity column and the best correlation".into() } else { "Polarity column".into() },
        axis: inp.axis,
        zones: col.zones.clone(),
        levels: column.levels.levels.iter().map(|l| (l.position, l.vgp_lat)).collect(),
        threshold: Some(inp.settings.vgp_threshold),
        scale,
    };
    let caption = if with_scale {
        "VGP latitude of each level, the magnetozones, and the time scale with the ties of the best correlation."
    } else {
        "VGP latitude of each level and the magnetozones."
    };
    let drawn = draw(&fig, "column", caption.into())?;
    log.stages[column.stage_index].figures.push(drawn.stem.clone());
    log.figures.push(drawn);
    Ok(())
}
