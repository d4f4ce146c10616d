//! Presenter of the principal-component fits of specimens (lines and planes from stepwise
//! demagnetization, with MAD and DANG), and the section's table of characteristic components,
//! built from the same cells.

use super::{json_num, Cell, Presentation, Sheet};
use crate::demag::SpecimenFit;
use crate::model::{Anchor, FitKind, StepSet};
use serde::ser::{SerializeMap, Serializer};
use serde::Serialize;

/// The automatic rule that chose the segments, as its JSON gives it.
#[derive(Debug, Clone, Serialize)]
pub struct RuleView {
    /// `last` or `longest`.
    pub rule: &'static str,
    /// Fewest consecutive steps in a segment.
    pub min_steps: usize,
    /// Significance level of the rule `last`.
    #[serde(skip_serializing_if = "Option::is_none")]
    pub alpha: Option<f64>,
    /// Largest accepted MAD, degrees.
    pub max_mad: f64,
    /// Largest accepted DANG, degrees.
    pub max_dang: f64,
    /// Whether lines are anchored at the origin.
    pub anchor: Anchor,
}

/// The fits of a steps table by one method.
#[derive(Debug, Clone, Default)]
pub struct ComponentFits {
    /// `picks`, `auto` or `range`.
    pub method: &'static str,
    /// The fits, in the steps table's specimen order.
    pub fits: Vec<SpecimenFit>,
    /// (specimen, reason) of the specimens not fitted.
    pub unfitted: Vec<(String, String)>,
    /// (specimen, grade, reason) of the last-component rule's fits.
    pub grades: Vec<(String, &'static str, String)>,
    /// The automatic rule, if one chose the fits.
    pub rule: Option<RuleView>,
}

/// A fit's level, under the steps table's axis name (`height` or `depth`).
struct Level(&'static str, Option<f64>);

impl Serialize for Level {
    fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
        struct Num(Option<f64>);
        impl Serialize for Num {
            fn serialize<S: Serializer>(&self, s: S) -> Result<S::Ok, S::Error> {
                json_num::opt(&self.0, s)
            }
        }
        let mut m = s.serialize_map(Some(1))?;
        m.serialize_entry(self.0, &Num(self.1))?;
        m.end()
    }
}

/// A fit's own fields as every front end gives them in JSON (the `components` verb's `fits[]`, the
/// review page's API): the kind of fit, its range and its direction with MAD and DANG (degrees).
#[derive(Debug, Clone, Copy, PartialEq, Serialize)]
pub struct FitView {
    /// `line` or `plane`.
    pub kind: FitKind,
    /// `free` or `origin`.
    pub anchor: Anchor,
    /// Steps used.
    pub n_steps: usize,
    /// First step of the range (mT or °C, as the steps table gives them).
    pub from: f64,
    /// Last step of the range.
    pub to: f64,
    /// Declination of the line, or of the plane's pole, degrees.
    pub dec: f64,
    /// Inclination, degrees.
    pub inc: f64,
    /// Maximum angular deviation, degrees.
    pub mad: f64,
    /// Deviation angle of a free line from the origin, degrees (none for planes and anchored lines).
    #[serde(serialize_with = "json_num::opt")]
    pub dang: Option<f64>,
}

impl From<&SpecimenFit> for FitView {
    fn from(f: &SpecimenFit) -> Self {
        FitView {
            kind: f.kind,
            anchor: f.anchor,
            n_steps: f.n_steps,
            from: f.from,
            to: f.to,
            dec: f.direction.dec,
            inc: f.direction.inc,
            mad: f.mad,
            dang: f.dang,
        }
    }
}

#[derive(Serialize)]
struct FitJson<'a> {
    specimen: &'a str,
    site: Option<&'a str>,
    #[serde(flatten)]
    fit: FitView,
    #[serde(flatten)]
    level: Option<Level>,
    #[serde(skip_serializing_if = "Option::is_none")]
    grade: Option<&'a str>,
    #[serde(skip_serializing_if = "Option::is_none")]
    reason: Option<&'a str>,
}

#[derive(Serialize)]
struct UnfittedJson<'a> {
    specimen: &'a str,
    reason: &'a str,
}

#[derive(Serialize)]
struct ComponentsJson<'a> {
    file: &'a str,
    method: &'static str,
    rule: Option<&'a RuleView>,
    fits: Vec<FitJson<'a>>,
    unfitted: Vec<UnfittedJson<'a>>,
    notes: &'a [String],
}

/// Which columns beyond the fit's own a fits sheet has.
pub struct FitColumns<'a> {
    /// The specimen's level (when the steps table has an axis) and bedding (when it has bedding).
    pub levels_and_bedding: bool,
    /// A `grade` column with this grade per specimen.
    pub grade: Option<&'a dyn Fn(&str) -> String>,
}

/// A sheet of fits: `specimen`, `site`, `kind`, `anchor`, `n_steps`, `from`, `to`, `dec`, `inc`,
/// `mad`, `dang`, then the columns `cols` asks for.
pub fn fits_sheet(title: &str, set: &StepSet, fits: &[SpecimenFit], cols: &FitColumns) -> Sheet {
    let (axis, bedding) = if cols.levels_and_bedding { (set.axis, set.has_bedding) } else { (None, false) };
    let mut columns = vec!["specimen", "site", "kind", "anchor", "n_steps", "from", "to", "dec", "inc", "mad", "dang"];
    columns.extend(axis.map(|a| a.column()));
    if bedding {
        columns.extend(["bed_dip_dir", "bed_dip", "overturned"]);
    }
    if cols.grade.is_some() {
        columns.push("grade");
    }
    let mut sec = Sheet::new(title, &columns);
    for f in fits {
        let sp = set.get(&f.specimen);
        let mut row = vec![
            Cell::Text(f.specimen.clone()),
            Cell::opt_text(sp.and_then(|s| s.site.as_deref())),
            Cell::Text(f.kind.as_str().into()),
            Cell::Text(f.anchor.as_str().into()),
            Cell::Int(f.n_steps as i64),
            Cell::Num(f.from, 1),
            Cell::Num(f.to, 1),
            Cell::Azimuth(f.direction.dec, 1),
            Cell::Num(f.direction.inc, 1),
            Cell::Num(f.mad, 1),
            Cell::opt(f.dang, 1),
        ];
        if axis.is_some() {
            row.push(Cell::opt(sp.and_then(|s| s.position), 2));
        }
        if bedding {
            let b = sp.and_then(|s| s.bedding);
            row.push(Cell::opt(b.map(|b| b.dip_dir), 1));
            row.push(Cell::opt(b.map(|b| b.dip), 1));
            row.push(Cell::Text(if b.is_some_and(|b| b.overturned) { "yes" } else { "no" }.into()));
        }
        if let Some(g) = cols.grade {
            row.push(Cell::Text(g(&f.specimen)));
        }
        sec.push(row);
    }
    sec
}

/// The fits `r` of the steps table `set` (named `file`); `notes` come first (how the fits were
/// chosen).
pub fn components(set: &StepSet, r: &ComponentFits, file: &str, mut notes: Vec<String>) -> Presentation {
    let grade_of = |s: &str| r.grades.iter().find(|(n, _, _)| n == s);
    let grade = |s: &str| grade_of(s).map_or("", |(_, g, _)| g).to_string();
    let graded = r.method == "auto" && r.rule.as_ref().is_some_and(|x| x.rule == "last");
    let cols = FitColumns { levels_and_bedding: true, grade: graded.then_some(&grade as &dyn Fn(&str) -> String) };
    let title = format!("Principal components of {file} ({} fits)", r.method);
    let mut sheets = vec![fits_sheet(&title, set, &r.fits, &cols)];
    if !r.unfitted.is_empty() {
        let mut u = Sheet::new("Specimens not fitted", &["specimen", "reason"]);
        for (s, why) in &r.unfitted {
            u.push(vec![Cell::Text(s.clone()), Cell::Text(why.clone())]);
            notes.push(format!("{s}: not fitted: {why}."));
        }
        sheets.push(u);
    }
    if r.fits.iter().any(|f| f.kind == FitKind::Line && f.anchor == Anchor::Free) {
        notes.push("Free lines point from the last step used toward the first (the component removed over the range); anchored lines point from the origin toward the steps.".into());
    }
    if r.fits.iter().any(|f| f.kind == FitKind::Plane) {
        notes.push(
            "For planes, dec and inc give the pole of the great circle; `lodestone mean` combines them with lines."
                .into(),
        );
    }
    let fits = r
        .fits
        .iter()
        .map(|f| {
            let sp = set.get(&f.specimen);
            let g = grade_of(&f.specimen);
            FitJson {
                specimen: &f.specimen,
                site: sp.and_then(|s| s.site.as_deref()),
                fit: FitView::from(f),
                level: set.axis.map(|a| Level(a.column(), sp.and_then(|s| s.position))),
                grade: g.map(|(_, g, _)| *g),
                reason: g.map(|(_, _, why)| why.as_str()),
            }
        })
        .collect();
    let json = ComponentsJson {
        file,
        method: r.method,
        rule: r.rule.as_ref(),
        fits,
        unfitted: r.unfitted.iter().map(|(s, why)| UnfittedJson { specimen: s, reason: why }).collect(),
        notes: &notes,
    };
    let json = serde_json::to_value(json).expect("plain data");
    Presentation { json, sheets, main_sheet: 0, notes, cautions: vec![] }
}
