//! `lodestone mean`: Fisher mean per group.

use super::{jnum, Cell, Ctx, Report, Section};
use anyhow::Result;
use clap::Args;
use lodestone::figures::{EqualAreaPlot, NetGroup};
use lodestone::stats::{group_means, stream_group_means, Frame, GroupMean, StreamedGroup, StreamedMeans};
use lodestone::table::{read_directions, GroupBy, Table, TableStream};
use serde_json::json;
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct MeanArgs {
    /// Directions table (CSV with dec, inc; optional site, bedding, …).
    pub file: PathBuf,
    /// Group by this column (default: site, or the whole file when there is no site column).
    #[arg(long, conflicts_with = "whole")]
    pub by: Option<String>,
    /// Treat the whole file as one group, whatever its columns.
    #[arg(long)]
    pub whole: bool,
    /// Coordinate frame: geo (in situ) or tilt (bedding-corrected; needs bedding columns).
    #[arg(long, value_enum, default_value_t = FrameArg::Geo)]
    pub frame: FrameArg,
    /// Confidence level of the cone reported as `alpha` (α95 is always reported).
    #[arg(long, default_value_t = 0.95)]
    pub confidence: f64,
    /// Write an equal-area figure (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

#[derive(Debug, Clone, Copy, clap::ValueEnum)]
pub enum FrameArg {
    Geo,
    Tilt,
}

pub fn run(a: MeanArgs, ctx: &mut Ctx) -> Result<Report> {
    if !(a.confidence > 0.0 && a.confidence < 1.0) {
        anyhow::bail!("--confidence must lie strictly between 0 and 1, got {}", a.confidence);
    }
    ctx.inputs.add(&a.file);
    let by = match (&a.by, a.whole) {
        (Some(c), _) => GroupBy::Column(c.clone()),
        (None, true) => GroupBy::None,
        (None, false) => GroupBy::Default,
    };
    let frame = match a.frame {
        FrameArg::Geo => Frame::Geo,
        FrameArg::Tilt => Frame::Tilt,
    };
    // Without a figure the table streams through per-group accumulators (memory does not grow with the
    // row count); the figure needs the points, and great circles need the whole group at once.
    let mut streamed = None;
    if a.plot.is_none() {
        let mut stream = TableStream::open(&a.file)?;
        let keep_lines = ctx.global.format == super::Format::Json;
        if let StreamedMeans::Means { group_column, groups, .. } = stream_group_means(&mut stream, &by, frame, 0.95, keep_lines)? {
            let means: Vec<GroupMean> = groups
                .into_iter()
                .map(|g| if keep_lines { g.into() } else { GroupMean { lines: Vec::new(), ..StreamedGroup::into(g) } })
                .collect();
            streamed = Some((means, group_column));
        }
    }
    let (set, means, group_column) = match streamed {
        Some((means, group_column)) => (None, means, group_column),
        None => {
            let table = Table::read(&a.file)?;
            let set = read_directions(&table, &by)?;
            let means = group_means(&set, frame, 0.95)?;
            let group_column = set.group_column.clone();
            (Some(set), means, group_column)
        }
    };
    let other = (a.confidence - 0.95).abs() > 1e-12;
    let mut sec = Section::new(
        &format!("Fisher means ({} coordinates) of {}", if frame == Frame::Geo { "geographic" } else { "tilt-corrected" }, a.file.display()),
        &["group", "n", "dec", "inc", "r", "k", "a95", "theta63"],
    );
    let mut groups = Vec::new();
    let mut notes = Vec::new();
    for g in &means {
        let s = &g.stats;
        let name = g.group.clone().unwrap_or_else(|| "(all)".into());
        let alpha = if other && g.planes > 0 {
            // Combined mean of lines and great circles: N' = M + N/2 (McFadden & McElhinny 1988).
            let n_eff = (s.n - g.planes) as f64 + g.planes as f64 / 2.0;
            s.k.and_then(|k| lodestone::stats::mixed_cone(n_eff, s.r, k.0, a.confidence))
        } else if other {
            s.mean.and_then(|_| lodestone::stats::confidence_cone(s.n, s.r, a.confidence))
        } else {
            s.alpha
        };
        sec.rows.push(vec![
            Cell::Text(name.clone()),
            Cell::Int(s.n as i64),
            Cell::opt(s.mean.map(|m| m.dec), 1),
            Cell::opt(s.mean.map(|m| m.inc), 1),
            Cell::Num(s.r, 4),
            Cell::opt(s.k.map(|k| k.0), 1),
            Cell::opt(s.alpha, 1),
            Cell::opt(s.theta63, 1),
        ]);
        let mut j = json!({
            "group": g.group, "n": s.n,
            "dec": jnum(s.mean.map(|m| m.dec)), "inc": jnum(s.mean.map(|m| m.inc)),
            "r": s.r, "k": jnum(s.k.map(|k| k.0)), "a95": jnum(s.alpha), "theta63": jnum(s.theta63),
            "lines": g.lines,
            "planes": g.planes,
        });
        if other {
            j["alpha"] = jnum(alpha);
        }
        groups.push(j);
        if let Some(why) = &g.undefined {
            notes.push(format!("{name}: no combined mean of lines and great circles: {why}."));
        } else if g.planes > 0 {
            notes.push(format!(
                "{name}: {} line(s) and {} great circle(s) combined (McFadden & McElhinny 1988); n counts both, k and a95 use N' = M + N/2.",
                s.n - g.planes, g.planes));
        }
        if g.undefined.is_some() {
            // Already explained by the note above.
        } else if s.n == 1 {
            notes.push(format!("{name}: one direction only; k, a95 and theta63 need at least two directions."));
        } else if s.mean.is_none() {
            notes.push(format!("{name}: the resultant vanishes (R ≈ 0): the directions cancel out and have no mean."));
        } else if s.k.is_some_and(|k| k.is_infinite()) {
            notes.push(format!("{name}: all directions are identical; k is infinite and the cone has zero width."));
        } else if s.alpha.is_none() {
            notes.push(format!("{name}: too scattered for a confidence cone at this level."));
        }
    }
    if other {
        sec.columns.push(format!("alpha{}", (a.confidence * 100.0).round()));
        for (row, g) in sec.rows.iter_mut().zip(&groups) {
            row.push(Cell::opt(g["alpha"].as_f64(), 1));
        }
    }
    if let Some(path) = &a.plot {
        let fig = EqualAreaPlot {
            title: format!("{} — {} coordinates", a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default(),
                if frame == Frame::Geo { "geographic" } else { "tilt-corrected" }),
            cone_label: "α95".into(),
            groups: means
                .iter()
                .map(|g| NetGroup {
                    label: g.group.clone().unwrap_or_else(|| "all".into()),
                    points: g
                        .lines
                        .iter()
                        .filter_map(|l| set.as_ref().and_then(|s| s.records.iter().find(|r| r.line == *l)))
                        .map(|r| match frame {
                            Frame::Geo => r.direction,
                            Frame::Tilt => lodestone::sphere::Direction::from_vector(r.bedding.expect("checked").untilt(r.direction.to_vector())).expect("unit"),
                        })
                        .collect(),
                    mean: g.stats.mean.map(|m| (m, g.stats.alpha)),
                })
                .collect(),
        };
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(Report {
        json: json!({
            "file": a.file.display().to_string(),
            "frame": frame,
            "group_column": group_column,
            "confidence": a.confidence,
            "groups": groups,
            "notes": notes,
        }),
        sections: vec![sec],
        csv_section: 0,
        notes,
    })
}
