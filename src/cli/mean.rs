//! `lodestone mean`: Fisher mean per group.
//!
//! Without a figure the table streams through compact per-group sums and the output is written group by
//! group as it is computed ([`Streamed`]): memory holds a few dozen bytes per group and nothing per
//! row (with `--format json`, also the runs of adjacent file lines of each group).

use super::args::FrameArg;
use super::{jnum, Cell, Ctx, Output, Sheet, Streamed};
use anyhow::Result;
use clap::Args;
use lodestone::figures::{EqualAreaPlot, NetGroup};
use lodestone::model::{DirectionKind, DirectionRecord, DirectionSet};
use lodestone::sphere::Direction;
use lodestone::stats::{
    group_means, stream_group_sums, CircleSense, FisherStats, Frame, GroupMean, GroupSum, GroupSums, StreamedSums,
};
use lodestone::table::{read_directions, GroupBy, Table, TableStream};
use serde::ser::{Error as _, SerializeSeq, Serializer};
use serde::Serialize;
use serde_json::Value;
use std::io::Write;
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
            streamed = Some((Groups::Sums(groups), group_column));
        }
    }
    let (groups, group_column) = match streamed {
        Some(g) => g,
        None => {
            let table = Table::read(&a.file)?;
            let set = read_directions(&table, &by)?;
            let means = group_means(&set, frame, A95)?;
            ellipses = a.ellipse.map(|kind| {
                super::mean_ellipse::ellipses(kind, a.parametric, &set, &means, frame, &ctx.monte_carlo(a.resamples))
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
            (Groups::Whole(means), set.group_column.clone())
        }
    };
    let other = (a.confidence - 0.95).abs() > 1e-12;
    let mut head = Sheet::new(
        &format!("Fisher means ({} coordinates) of {}", frame.label(), a.file.display()),
        &["group", "n", "dec", "inc", "r", "k", "a95", "theta63"],
    );
    if other {
        head.columns.push(format!("alpha{}", (a.confidence * 100.0).round()));
    }
    if ellipses.is_some() {
        head.columns.extend(super::mean_ellipse::COLUMNS.iter().map(|c| c.to_string()));
    }
    Ok(Output::Streamed(Box::new(MeanOutput {
        head,
        file: a.file.display().to_string(),
        frame,
        group_column,
        confidence: a.confidence,
        other,
        groups,
        ellipses,
    })))
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

/// The groups of a run: compact streamed sums, or the whole-table means (figure, great circles).
enum Groups {
    Sums(GroupSums),
    Whole(Vec<GroupMean>),
}

/// A group's file lines: listed, or as the runs of adjacent lines of a streamed group.
enum Lines<'a> {
    Listed(&'a [usize]),
    Runs(GroupSum<'a>),
}

/// One group as the outputs see it.
struct GroupView<'a> {
    group: Option<&'a str>,
    stats: FisherStats,
    planes: usize,
    undefined: Option<&'a str>,
    sense: Option<lodestone::stats::CircleSense>,
    lines: Lines<'a>,
    /// Position among the groups.
    index: usize,
}

impl GroupView<'_> {
    fn name(&self) -> &str {
        self.group.unwrap_or("(all)")
    }
}

/// Everything `mean` writes; each group is computed when it is written.
struct MeanOutput {
    head: Sheet,
    file: String,
    frame: Frame,
    group_column: Option<String>,
    confidence: f64,
    /// A confidence level other than 0.95 was asked for: `alpha` is reported beside `a95`.
    other: bool,
    groups: Groups,
    /// Elliptical regions per group, when asked for (`--ellipse`).
    ellipses: Option<super::mean_ellipse::Ellipses>,
}

impl MeanOutput {
    fn views(&self) -> Box<dyn Iterator<Item = lodestone::error::Result<GroupView<'_>>> + '_> {
        match &self.groups {
            Groups::Sums(s) => Box::new(s.iter().enumerate().map(|(index, g)| {
                Ok(GroupView {
                    index,
                    group: g.group,
                    stats: g.stats(A95)?,
                    planes: 0,
                    undefined: None,
                    sense: None,
                    lines: Lines::Runs(g),
                })
            })),
            Groups::Whole(m) => Box::new(m.iter().enumerate().map(|(index, g)| {
                Ok(GroupView {
                    index,
                    group: g.group.as_deref(),
                    stats: g.stats.clone(),
                    planes: g.planes,
                    undefined: g.undefined.as_deref(),
                    sense: g.sense,
                    lines: Lines::Listed(&g.lines),
                })
            })),
        }
    }

    /// The cone at the requested confidence level (only when it is not 0.95).
    fn alpha(&self, g: &GroupView) -> Option<f64> {
        let s = &g.stats;
        if self.other && g.planes > 0 {
            // Combined mean of lines and great circles: N' = M + N/2 (McFadden & McElhinny 1988).
            let n_eff = (s.n - g.planes) as f64 + g.planes as f64 / 2.0;
            s.k.and_then(|k| lodestone::stats::mixed_cone(n_eff, s.r, k.0, self.confidence))
        } else if self.other {
            s.mean.and_then(|_| lodestone::stats::confidence_cone(s.n, s.r, self.confidence))
        } else {
            s.alpha
        }
    }
}

/// The notes of one group: how its mean was formed, and why a statistic is missing.
fn group_notes(g: &GroupView, f: &mut dyn FnMut(&str) -> std::io::Result<()>) -> std::io::Result<()> {
    let s = &g.stats;
    let name = g.name();
    if let Some(why) = g.undefined {
        f(&format!("{name}: no combined mean of lines and great circles: {why}."))?;
    } else if g.planes > 0 {
        f(&format!(
            "{name}: {} line(s) and {} great circle(s) combined (McFadden & McElhinny 1988); n counts both, k and a95 use N' = M + N/2.",
            s.n - g.planes, g.planes))?;
    }
    match g.sense {
        Some(CircleSense::FromPaths { toward, away }) => f(&format!(
            "{name}: great circles only; the sense of the mean follows the demagnetization paths ({toward} move toward it, {away} away)."))?,
        Some(CircleSense::Undetermined) => f(&format!(
            "{name}: great circles only fix an axis, not its sense; nothing in the data decides it, so the lower-hemisphere end is given and the opposite sense is equally possible."))?,
        None => {}
    }
    if g.undefined.is_some() {
        // Already explained by the note above.
    } else if s.n == 1 {
        f(&format!("{name}: one direction only; k, a95 and theta63 need at least two directions."))?;
    } else if s.mean.is_none() {
        f(&format!("{name}: the resultant vanishes (R ≈ 0): the directions cancel out and have no mean."))?;
    } else if s.k.is_none() && g.planes > 0 {
        f(&format!("{name}: two great circles and no line always meet, so their scatter is undefined; k, a95 and theta63 are empty."))?;
    } else if s.k.is_some_and(|k| k.is_infinite()) {
        f(&format!("{name}: all directions are identical; k is infinite and the cone has zero width."))?;
    } else if s.alpha.is_none() {
        f(&format!("{name}: too scattered for a confidence cone at this level."))?;
    }
    Ok(())
}

impl Streamed for MeanOutput {
    fn head(&self) -> &Sheet {
        &self.head
    }

    fn each_row(&self, f: &mut dyn FnMut(&[Cell]) -> std::io::Result<()>) -> std::io::Result<()> {
        let mut row = Vec::with_capacity(self.head.columns.len());
        for g in self.views() {
            let g = g.map_err(std::io::Error::other)?;
            let s = &g.stats;
            row.clear();
            row.extend([
                Cell::Text(g.name().to_string()),
                Cell::Int(s.n as i64),
                Cell::opt_azimuth(s.mean.map(|m| m.dec), 1),
                Cell::opt(s.mean.map(|m| m.inc), 1),
                Cell::Num(s.r, 4),
                Cell::opt(s.k.map(|k| k.0), 1),
                Cell::opt(s.alpha, 1),
                Cell::opt(s.theta63, 1),
            ]);
            if self.other {
                // As in JSON: a value that is not finite is left empty.
                row.push(Cell::opt(self.alpha(&g).filter(|x| x.is_finite()), 1));
            }
            if let Some(e) = &self.ellipses {
                row.extend(e.cells(g.index));
            }
            f(&row)?;
        }
        Ok(())
    }

    fn each_note(&self, f: &mut dyn FnMut(&str) -> std::io::Result<()>) -> std::io::Result<()> {
        for g in self.views() {
            let g = g.map_err(std::io::Error::other)?;
            group_notes(&g, f)?;
            if let Some(e) = &self.ellipses {
                e.note(g.index, g.name(), f)?;
            }
        }
        if let Some(e) = &self.ellipses {
            f(&e.caution())?;
        }
        Ok(())
    }

    fn write_json(&self, out: &mut dyn Write) -> std::io::Result<()> {
        super::write_json(
            &MeanJson {
                file: &self.file,
                frame: self.frame,
                group_column: self.group_column.as_deref(),
                confidence: self.confidence,
                groups: JsonGroups(self),
                notes: JsonNotes(self),
                ellipse_caution: self.ellipses.as_ref().map(|e| e.caution()),
            },
            out,
        )
    }
}

/// The JSON document of `mean`.
#[derive(Serialize)]
struct MeanJson<'a> {
    file: &'a str,
    frame: Frame,
    group_column: Option<&'a str>,
    confidence: f64,
    groups: JsonGroups<'a>,
    notes: JsonNotes<'a>,
    #[serde(skip_serializing_if = "Option::is_none")]
    ellipse_caution: Option<String>,
}

/// The `groups` array, serialised group by group.
struct JsonGroups<'a>(&'a MeanOutput);

/// A JSON array filled by `each` from every group in turn.
fn seq_per_group<S: Serializer>(
    m: &MeanOutput,
    ser: S,
    mut each: impl FnMut(&GroupView, &mut S::SerializeSeq) -> std::result::Result<(), S::Error>,
) -> std::result::Result<S::Ok, S::Error> {
    let mut seq = ser.serialize_seq(None)?;
    for g in m.views() {
        each(&g.map_err(S::Error::custom)?, &mut seq)?;
    }
    seq.end()
}

impl Serialize for JsonGroups<'_> {
    fn serialize<S: Serializer>(&self, ser: S) -> std::result::Result<S::Ok, S::Error> {
        seq_per_group(self.0, ser, |g, seq| {
            let s = &g.stats;
            seq.serialize_element(&JsonGroup {
                group: g.group,
                n: s.n,
                dec: jnum(s.mean.map(|m| m.dec)),
                inc: jnum(s.mean.map(|m| m.inc)),
                r: s.r,
                k: jnum(s.k.map(|k| k.0)),
                a95: jnum(s.alpha),
                theta63: jnum(s.theta63),
                lines: JsonLines(&g.lines),
                planes: g.planes,
                alpha: self.0.other.then(|| jnum(self.0.alpha(g))),
                ellipse: self.0.ellipses.as_ref().map(|e| e.json(g.index)),
            })
        })
    }
}

/// One group in JSON.
#[derive(Serialize)]
struct JsonGroup<'a> {
    group: Option<&'a str>,
    n: usize,
    dec: Value,
    inc: Value,
    r: f64,
    k: Value,
    a95: Value,
    theta63: Value,
    lines: JsonLines<'a>,
    planes: usize,
    #[serde(skip_serializing_if = "Option::is_none")]
    alpha: Option<Value>,
    #[serde(skip_serializing_if = "Option::is_none")]
    ellipse: Option<Value>,
}

/// A group's file lines, written from the runs without listing them first.
struct JsonLines<'a>(&'a Lines<'a>);

impl Serialize for JsonLines<'_> {
    fn serialize<S: Serializer>(&self, ser: S) -> std::result::Result<S::Ok, S::Error> {
        match self.0 {
            Lines::Listed(l) => ser.collect_seq(l.iter()),
            Lines::Runs(g) => ser.collect_seq(g.lines()),
        }
    }
}

/// The `notes` array.
struct JsonNotes<'a>(&'a MeanOutput);

impl Serialize for JsonNotes<'_> {
    fn serialize<S: Serializer>(&self, ser: S) -> std::result::Result<S::Ok, S::Error> {
        seq_per_group(self.0, ser, |g, seq| {
            let mut err = None;
            let mut push = |n: &str| {
                if err.is_none() {
                    err = seq.serialize_element(n).err();
                }
                Ok(())
            };
            let _ = group_notes(g, &mut push);
            if let Some(e) = &self.0.ellipses {
                let _ = e.note(g.index, g.name(), &mut push);
            }
            err.map_or(Ok(()), Err)
        })
    }
}
