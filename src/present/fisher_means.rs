//! Presenter of the Fisher means of groups of directions (`lodestone mean`), written group by group
//! as each is computed: memory holds a few dozen bytes per group and nothing per row when the groups
//! come as streamed sums. With ellipses, each group's elliptical 95 % region (Kent 1982, or a
//! bootstrap after Tauxe et al. 1991) is added to the table, the JSON and the notes.

use super::{json_num, Cell, Sheet, Streamed};
use crate::dirstats::{EllipseMethod, GroupEllipses, KentEllipse};
use crate::stats::{CircleSense, FisherStats, Frame, GroupMean, GroupSum, GroupSums};
use serde::ser::{Error as _, SerializeSeq, Serializer};
use serde::Serialize;
use std::io::Write;

/// Confidence level of the reported α95 (and of the `alpha` the library gives).
const A95: f64 = 0.95;

/// Extra columns of the text and CSV tables with ellipses.
pub const ELLIPSE_COLUMNS: [&str; 6] = ["major", "minor", "major_dec", "major_inc", "minor_dec", "minor_inc"];

/// The groups of a run: compact streamed sums, or the whole-table means (figure, great circles).
pub enum MeanGroups {
    /// Streamed per-group sums.
    Sums(GroupSums),
    /// Whole-table means.
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
    sense: Option<crate::stats::CircleSense>,
    lines: Lines<'a>,
    /// Position among the groups.
    index: usize,
}

impl GroupView<'_> {
    fn name(&self) -> &str {
        self.group.unwrap_or("(all)")
    }
}

/// The Fisher means of the groups of a directions table, as written: each group is computed when it
/// is written.
pub struct FisherMeans {
    head: Sheet,
    file: String,
    frame: Frame,
    group_column: Option<String>,
    confidence: f64,
    /// A confidence level other than 0.95 was asked for: `alpha` is reported beside `a95`.
    other: bool,
    groups: MeanGroups,
    /// Elliptical regions per group, when asked for.
    ellipses: Option<GroupEllipses>,
}

/// The means `groups` of the table `file` in `frame` (grouped by `group_column`), with the cone at
/// `confidence` beside α95 when it is not 0.95, and the groups' `ellipses` if asked for.
pub fn fisher_means(
    file: &str,
    frame: Frame,
    group_column: Option<String>,
    confidence: f64,
    groups: MeanGroups,
    ellipses: Option<GroupEllipses>,
) -> FisherMeans {
    let other = (confidence - 0.95).abs() > 1e-12;
    let mut head = Sheet::new(
        &format!("Fisher means ({} coordinates) of {file}", frame.label()),
        &["group", "n", "dec", "inc", "r", "k", "a95", "theta63"],
    );
    if other {
        head.columns.push(format!("alpha{}", (confidence * 100.0).round()));
    }
    if ellipses.is_some() {
        head.columns.extend(ELLIPSE_COLUMNS.iter().map(|c| c.to_string()));
    }
    FisherMeans { head, file: file.to_string(), frame, group_column, confidence, other, groups, ellipses }
}

impl FisherMeans {
    fn views(&self) -> Box<dyn Iterator<Item = crate::error::Result<GroupView<'_>>> + '_> {
        match &self.groups {
            MeanGroups::Sums(s) => Box::new(s.iter().enumerate().map(|(index, g)| {
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
            MeanGroups::Whole(m) => Box::new(m.iter().enumerate().map(|(index, g)| {
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
            s.k.and_then(|k| crate::stats::mixed_cone(n_eff, s.r, k.0, self.confidence))
        } else if self.other {
            s.mean.and_then(|_| crate::stats::confidence_cone(s.n, s.r, self.confidence))
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

impl Streamed for FisherMeans {
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
                row.extend(ellipse_cells(e, g.index));
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
                ellipse_note(e, g.index, g.name(), f)?;
            }
        }
        if let Some(e) = &self.ellipses {
            f(&ellipse_caution(e))?;
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
                ellipse_caution: self.ellipses.as_ref().map(ellipse_caution),
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
struct JsonGroups<'a>(&'a FisherMeans);

/// A JSON array filled by `each` from every group in turn.
fn seq_per_group<S: Serializer>(
    m: &FisherMeans,
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
                dec: s.mean.map(|m| m.dec),
                inc: s.mean.map(|m| m.inc),
                r: s.r,
                k: s.k.map(|k| k.0),
                a95: s.alpha,
                theta63: s.theta63,
                lines: JsonLines(&g.lines),
                planes: g.planes,
                alpha: self.0.other.then(|| self.0.alpha(g)),
                ellipse: self.0.ellipses.as_ref().map(|e| ellipse_json(e, g.index)),
            })
        })
    }
}

/// One group in JSON.
#[derive(Serialize)]
struct JsonGroup<'a> {
    group: Option<&'a str>,
    n: usize,
    #[serde(serialize_with = "json_num::opt")]
    dec: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    inc: Option<f64>,
    r: f64,
    #[serde(serialize_with = "json_num::opt")]
    k: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    a95: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    theta63: Option<f64>,
    lines: JsonLines<'a>,
    planes: usize,
    #[serde(skip_serializing_if = "Option::is_none", serialize_with = "opt_num")]
    alpha: Option<Option<f64>>,
    #[serde(skip_serializing_if = "Option::is_none")]
    ellipse: Option<Option<EllipseJson>>,
}

/// A number that may be missing (null), of a field that may be left out.
fn opt_num<S: Serializer>(v: &Option<Option<f64>>, s: S) -> std::result::Result<S::Ok, S::Error> {
    json_num::opt(&v.flatten(), s)
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
struct JsonNotes<'a>(&'a FisherMeans);

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
                let _ = ellipse_note(e, g.index, g.name(), &mut push);
            }
            err.map_or(Ok(()), Err)
        })
    }
}

/// An ellipse in JSON.
#[derive(Serialize)]
struct EllipseJson {
    major: f64,
    minor: f64,
    major_dec: f64,
    major_inc: f64,
    minor_dec: f64,
    minor_inc: f64,
    method: &'static str,
    confidence: f64,
    centre_dec: f64,
    centre_inc: f64,
    #[serde(serialize_with = "json_num::one")]
    mean_resultant: f64,
}

/// The `ellipse` object of group `index` (null when it has none).
fn ellipse_json(e: &GroupEllipses, index: usize) -> Option<EllipseJson> {
    e.get(index).map(|x| EllipseJson {
        major: x.major,
        minor: x.minor,
        major_dec: x.major_axis.dec,
        major_inc: x.major_axis.inc,
        minor_dec: x.minor_axis.dec,
        minor_inc: x.minor_axis.inc,
        method: e.method.name(),
        confidence: x.confidence,
        centre_dec: x.mean.dec,
        centre_inc: x.mean.inc,
        mean_resultant: x.mean_resultant,
    })
}

/// The table cells of group `index`'s ellipse.
fn ellipse_cells(e: &GroupEllipses, index: usize) -> [Cell; 6] {
    let e = e.get(index);
    let f = |x: fn(&KentEllipse) -> f64| Cell::opt(e.map(x), 1);
    let az = |x: fn(&KentEllipse) -> f64| Cell::opt_azimuth(e.map(x), 1);
    [
        f(|e| e.major),
        f(|e| e.minor),
        az(|e| e.major_axis.dec),
        f(|e| e.major_axis.inc),
        az(|e| e.minor_axis.dec),
        f(|e| e.minor_axis.inc),
    ]
}

/// Why group `index` has no ellipse, or why its ellipse needs care.
fn ellipse_note(
    e: &GroupEllipses,
    index: usize,
    name: &str,
    f: &mut dyn FnMut(&str) -> std::io::Result<()>,
) -> std::io::Result<()> {
    match e.per_group.get(index) {
        Some(Err(why)) => f(&format!("{name}: no {} ellipse: {why}.", e.method.name())),
        Some(Ok(_)) if e.opposed.get(index).is_some_and(|&k| k > 0) => f(&format!(
            "{name}: {} direction(s) lie more than 90° from the mean (another polarity?); the ellipse assumes one unimodal set, so invert one polarity first or read it with care.",
            e.opposed[index]
        )),
        _ => Ok(()),
    }
}

/// What the ellipses are, in one sentence.
fn ellipse_caution(e: &GroupEllipses) -> String {
    match e.method {
        EllipseMethod::Kent => "Ellipses: Kent (1982) 95 % regions from the scatter of each group, a large-sample approximation; with few directions (fewer than about 25) read them as rough.".into(),
        m => format!(
            "Ellipses: 95 % regions fitted to the means of seeded bootstrap pseudo-samples ({}; Tauxe et al. 1991); they describe the sampling spread of the mean under that resampling, not the field.",
            if m == EllipseMethod::Bootstrap { "directions resampled with replacement" } else { "Fisher draws with the group's mean and k" }
        ),
    }
}
