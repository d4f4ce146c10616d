//! `lodestone mean`: Fisher mean per group.
//!
//! Without a figure the table streams through compact per-group sums and the output is written group by
//! group as it is computed (the presenter [`lodestone::present::fisher_means`] is streamed): memory
//! holds a few dozen bytes per group and nothing per row (with `--format json`, also the runs of
//! adjacent file lines of each group).

use super::args::FrameArg;
use super::{Ctx, Output};
use anyhow::Result;
use clap::Args;
use lodestone::dirstats::group_ellipses;
use lodestone::figures::{EqualAreaPlot, NetGroup};
use lodestone::model::{DirectionKind, DirectionRecord, DirectionSet};
use lodestone::present::fisher_means::{fisher_means, MeanGroups};
use lodestone::sphere::Direction;
use lodestone::stats::{group_means, stream_group_sums, Frame, GroupMean, StreamedSums};
use lodestone::table::{read_directions, GroupBy, Table, TableStream};
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
    /// Add an elliptical 95 % confidence region to each group: kent or bootstrap.
    #[arg(long, value_enum)]
    pub ellipse: Option<super::mean_ellipse::EllipseArg>,
    /// With --ellipse bootstrap: draw Fisher pseudo-samples (parametric) instead of resampling the data.
    #[arg(long, requires = "ellipse")]
    pub parametric: bool,
    /// With --ellipse bootstrap: the number of pseudo-samples.
    #[arg(long, default_value_t = 1000)]
    pub resamples: usize,
}

/// Confidence level of the reported α95 (and of the `alpha` the library gives).
const A95: f64 = 0.95;

pub fn run(a: MeanArgs, ctx: &mut Ctx) -> Result<Output> {
    if !(a.confidence > 0.0 && a.confidence < 1.0) {
        anyhow::bail!("--confidence must lie strictly between 0 and 1, got {}", a.confidence);
    }
    ctx.inputs.add(&a.file);
    let by = match (&a.by, a.whole) {
        (Some(c), _) => GroupBy::Column(c.clone()),
        (None, true) => GroupBy::None,
        (None, false) => GroupBy::Default,
    };
    let frame = Frame::from(a.frame);
    // Without a figure the table streams through per-group sums (memory does not grow with the row
    // count); the figure needs the points, and great circles need the whole group at once.
    let mut streamed = None;
    let mut ellipses = None;
    if a.plot.is_none() && a.ellipse.is_none() {
        let mut stream = TableStream::open(&a.file)?;
        let keep_lines = ctx.global.format == super::Format::Json;
        if let StreamedSums::Sums { group_column, groups, .. } = stream_group_sums(&mut stream, &by, frame, keep_lines)?
        {
            streamed = Some((MeanGroups::Sums(groups), group_column));
        }
    }
    let (groups, group_column) = match streamed {
        Some(g) => g,
        None => {
            let table = Table::read(&a.file)?;
            let set = read_directions(&table, &by)?;
            let means = group_means(&set, frame, A95)?;
            ellipses = a.ellipse.map(|kind| {
                let method = super::mean_ellipse::method(kind, a.parametric);
                group_ellipses(method, &set, &means, frame, &ctx.monte_carlo(a.resamples))
            });
            if let Some(path) = &a.plot {
                let fig = EqualAreaPlot {
                    title: format!(
                        "{} — {} coordinates",
                        a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default(),
                        frame.label()
                    ),
                    cone_label: "α95".into(),
                    groups: means.iter().map(|g| net_group(g, &set, frame)).collect(),
                };
                match &ellipses {
                    Some(e) => super::write_figure(&super::mean_ellipse::with_ellipses(fig, e), path, &ctx.inputs)?,
                    None => super::write_figure(&fig, path, &ctx.inputs)?,
                }
            }
            (MeanGroups::Whole(means), set.group_column.clone())
        }
    };
    let file = a.file.display().to_string();
    let means = fisher_means(&file, frame, group_column, a.confidence, groups, ellipses);
    Ok(Output::Streamed(Box::new(means)))
}

/// A group on the net: its lines as points, its planes as great circles (by their poles), and the mean
/// of both together, all in the chosen frame.
fn net_group(g: &GroupMean, set: &DirectionSet, frame: Frame) -> NetGroup {
    let in_frame = |r: &DirectionRecord| match frame {
        Frame::Geo => r.direction,
        Frame::Tilt => {
            Direction::from_vector(r.bedding.expect("checked").untilt(r.direction.to_vector())).expect("unit")
        }
    };
    let records: Vec<&DirectionRecord> =
        g.lines.iter().filter_map(|l| set.records.iter().find(|r| r.line == *l)).collect();
    let of_kind = |k: DirectionKind| records.iter().filter(|r| r.kind == k).map(|r| in_frame(r)).collect();
    NetGroup {
        label: g.group.clone().unwrap_or_else(|| "all".into()),
        points: of_kind(DirectionKind::Line),
        circles: of_kind(DirectionKind::Plane),
        mean: g.stats.mean.map(|m| (m, g.stats.alpha)),
    }
}
