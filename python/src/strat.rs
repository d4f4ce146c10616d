//! Magnetostratigraphy: the polarity column of a levels table, its correlation with a time scale, and
//! the column figure (the library's own, as `column --plot` and `correlate --plot` draw it).

use crate::{arg_error, run_detached, Outcome, Source};
use lodestone::figures::{render, ColumnFigure, FigureFormat};
use lodestone::model::TimeScale;
use lodestone::present::cautions;
use lodestone::present::column::zones_sheet;
use lodestone::present::correlation::{candidates_sheet, runs_sheet, ties_sheet};
use lodestone::strat::{
    comparison_sentence, correlate as lib_correlate, read_column, read_levels, zone_levels, CorrelateOptions,
    Correlation, DatedLevel, LevelOptions, LevelSet, ZoneColumn, ZonePolarity,
};
use lodestone::table::Table;
use pyo3::prelude::*;
use pyo3::types::{PyBytes, PyDict};

/// The file name of a table for titles (`DataFrame` for a DataFrame).
fn short_name(t: &Table) -> String {
    std::path::Path::new(&t.name).file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default()
}

/// The zones as the columns of the zones table (the presenter's, as `column --format csv` prints
/// it), with `section_ends`: (top, base) of each zone is an end of the section, not a reversal.
fn zones_dict<'py>(py: Python<'py>, col: &ZoneColumn) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    d.set_item("columns", crate::sheets::columns(py, &zones_sheet(col, ""))?)?;
    d.set_item("section_ends", col.zones.iter().map(|z| (!z.top.change, !z.base.change)).collect::<Vec<_>>())?;
    Ok(d)
}

/// The levels as columns: position, VGP latitude, polarity, n, a95, mad (None where unknown).
fn level_columns<'py>(py: Python<'py>, set: &LevelSet, pol: &[ZonePolarity]) -> PyResult<Bound<'py, PyDict>> {
    let d = PyDict::new(py);
    d.set_item(set.axis.column(), set.levels.iter().map(|l| l.position).collect::<Vec<_>>())?;
    d.set_item("vgp_lat", set.levels.iter().map(|l| l.vgp_lat).collect::<Vec<_>>())?;
    d.set_item("polarity", pol.iter().map(|p| p.code()).collect::<Vec<_>>())?;
    d.set_item("n", set.levels.iter().map(|l| l.n).collect::<Vec<_>>())?;
    d.set_item("a95", set.levels.iter().map(|l| l.a95).collect::<Vec<_>>())?;
    d.set_item("mad", set.levels.iter().map(|l| l.mad).collect::<Vec<_>>())?;
    Ok(d)
}

/// Polarity per level and magnetozones (see `lodestone.polarity_column`).
#[pyfunction]
#[pyo3(signature = (levels, threshold, min_levels, in_situ))]
pub fn polarity_column<'py>(
    py: Python<'py>,
    levels: Source<'py>,
    threshold: f64,
    min_levels: usize,
    in_situ: bool,
) -> PyResult<Bound<'py, PyDict>> {
    let input = levels.input();
    let (set, pol, col) = run_detached(py, None, || {
        let set = read_levels(&input.table()?, LevelOptions { in_situ })?;
        let (pol, col) = zone_levels(&set, threshold, min_levels)?;
        Ok((set, pol, col))
    })?;
    let out = PyDict::new(py);
    out.set_item("axis", set.axis.column())?;
    out.set_item("levels", level_columns(py, &set, &pol)?)?;
    out.set_item("zones", zones_dict(py, &col)?)?;
    out.set_item("notes", set.notes.clone())?;
    Ok(out)
}

/// The settings of a correlation as the library takes them (checked there), from a dict.
#[derive(FromPyObject)]
#[pyo3(from_item_all)]
pub struct Settings {
    anchors: Vec<(f64, f64, f64)>,
    miss_penalty: f64,
    hiatus_penalty: f64,
    skip_penalty: f64,
    rate_spread: f64,
    candidates: usize,
    threshold: f64,
    min_levels: usize,
}

impl Settings {
    fn options(&self) -> Outcome<CorrelateOptions> {
        let anchors = self.anchors.iter().map(|&(p, a, e)| DatedLevel::new(p, a, e)).collect::<Result<_, _>>()?;
        Ok(CorrelateOptions {
            miss_penalty: self.miss_penalty,
            hiatus_penalty: self.hiatus_penalty,
            skip_penalty: self.skip_penalty,
            rate_spread: self.rate_spread,
            candidates: self.candidates,
            anchors,
        })
    }
}

/// Everything a correlation run produces.
struct Correlated {
    col: ZoneColumn,
    levels: Option<LevelSet>,
    ts: TimeScale,
    res: Correlation,
    names: (String, String),
}

/// Read the column (zones or levels) and the time scale, and correlate them.
fn run_correlation(zones: &crate::Input<'_>, timescale: &crate::Input<'_>, s: &Settings) -> Outcome<Correlated> {
    let opts = s.options()?;
    let zt = zones.table()?;
    let tt = timescale.table()?;
    let ts = TimeScale::from_table(&tt)?;
    let (col, levels) = read_column(&zt, s.threshold, s.min_levels)?;
    let res = lib_correlate(&col, &ts, &opts)?;
    Ok(Correlated { col, levels, ts, res, names: (short_name(&zt), short_name(&tt)) })
}

/// Ranked correlations of a column with a time scale (see `lodestone.correlate`); the candidates
/// come back as JSON text of the library's own records (ties, runs, age model).
#[pyfunction]
#[pyo3(signature = (zones, timescale, settings))]
pub fn correlate<'py>(
    py: Python<'py>,
    zones: Source<'py>,
    timescale: Source<'py>,
    settings: Settings,
) -> PyResult<Bound<'py, PyDict>> {
    let (zi, ti) = (zones.input(), timescale.input());
    let c = run_correlation_detached(py, &zi, &ti, &settings)?;
    let out = PyDict::new(py);
    out.set_item("axis", c.col.axis.column())?;
    out.set_item("n_scored", c.res.n_scored)?;
    out.set_item("comparison", comparison_sentence(&c.res))?;
    out.set_item("levels_table", c.levels.is_some())?;
    out.set_item("notes", c.levels.map(|l| l.notes).unwrap_or_default())?;
    let text = serde_json::to_string(&c.res.candidates).map_err(|e| arg_error(e.to_string()))?;
    out.set_item("candidates", text)?;
    let sheets = PyDict::new(py);
    sheets.set_item("candidates", crate::sheets::columns(py, &candidates_sheet(&c.res, ""))?)?;
    sheets.set_item("ties", crate::sheets::columns(py, &ties_sheet(&c.res, c.col.axis))?)?;
    sheets.set_item("runs", crate::sheets::columns(py, &runs_sheet(&c.res.candidates[0]))?)?;
    out.set_item("sheets", sheets)?;
    out.set_item("caution", cautions::CORRELATION)?;
    out.set_item("zones", zones_dict(py, &c.col)?)?;
    Ok(out)
}

fn run_correlation_detached(
    py: Python<'_>,
    zi: &crate::Input<'_>,
    ti: &crate::Input<'_>,
    s: &Settings,
) -> PyResult<Correlated> {
    run_detached(py, None, || run_correlation(zi, ti, s))
}

/// The polarity-column figure as SVG text or PNG bytes (see `lodestone.column_figure`): with a
/// time scale, the column beside it with the best candidate's ties (as `correlate --plot`);
/// without, the column alone (as `column --plot`).
#[pyfunction]
#[pyo3(signature = (levels, timescale, settings, format, title = None))]
pub fn column_figure<'py>(
    py: Python<'py>,
    levels: Source<'py>,
    timescale: Option<Source<'py>>,
    settings: Settings,
    format: &str,
    title: Option<String>,
) -> PyResult<Bound<'py, PyAny>> {
    let fmt = match format {
        "svg" => FigureFormat::Svg,
        "png" => FigureFormat::Png,
        other => return Err(arg_error(format!("format must be 'svg' or 'png', got '{other}'"))),
    };
    let li = levels.input();
    let ti = timescale.as_ref().map(|t| t.input());
    let bytes = run_detached(py, None, || {
        let fig = match &ti {
            Some(ti) => {
                let c = run_correlation(&li, ti, &settings)?;
                let pts =
                    c.levels.map(|s| s.levels.iter().map(|l| (l.position, l.vgp_lat)).collect()).unwrap_or_default();
                let title = title.unwrap_or_else(|| format!("{} against {}", c.names.0, c.names.1));
                ColumnFigure::of_correlation(title, &c.col, pts, settings.threshold, &c.ts, &c.res.candidates[0])
            }
            None => {
                let t = li.table()?;
                let set = read_levels(&t, LevelOptions::default())?;
                let (_, col) = zone_levels(&set, settings.threshold, settings.min_levels)?;
                let title = title.unwrap_or_else(|| format!("Polarity column — {}", short_name(&t)));
                ColumnFigure::of_column(title, &set, &col, settings.threshold)
            }
        };
        Ok(render(&fig, fmt)?)
    })?;
    Ok(match fmt {
        FigureFormat::Svg => {
            String::from_utf8(bytes).map_err(|e| arg_error(e.to_string()))?.into_pyobject(py)?.into_any()
        }
        FigureFormat::Png => PyBytes::new(py, &bytes).into_any(),
    })
}
