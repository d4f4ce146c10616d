//! `lodestone test …`: field tests (reversal, fold, randomness, common mean).

use super::args::FrameArg;
use super::{jnum, Cell, Ctx, Presentation, Sheet};
use anyhow::Result;
use clap::{Args, Subcommand};
use lodestone::fieldtests::{self, FoldOptions, MeanComparison};
use lodestone::model::{DirectionKind, DirectionSet};
use lodestone::sphere::{Bedding, Vec3};
use lodestone::stats::Frame;
use lodestone::table::{read_directions, GroupBy, Table};
use lodestone::TableError;
use serde_json::{json, Value};
use std::path::{Path, PathBuf};

/// Confidence level of every field test (the published classes and tables are at 95 %).
const CONFIDENCE: f64 = 0.95;

/// The caution printed with every field test.
const CAUTION: &str = "This is a statistical statement about a model of these directions (Fisher distributions or \
bootstrap resampling), not proof of when the rocks were magnetized; local practice and the published literature decide.";

#[derive(Debug, Args)]
pub struct TestArgs {
    #[command(subcommand)]
    pub kind: TestKind,
}

#[derive(Debug, Subcommand)]
pub enum TestKind {
    /// Are the two polarity modes antipodal? (McFadden & McElhinny 1990, Watson's V_w, bootstrap)
    Reversal(OneFile),
    /// Do two files share a mean direction? (same three approaches)
    CommonMean(TwoFiles),
    /// Bootstrap fold test (incremental untilting) and the classic precision ratio; needs bedding.
    Fold(FoldArgs),
    /// Are the directions random? (Watson 1956, as in conglomerate tests)
    Random(RandomArgs),
}

#[derive(Debug, Args)]
pub struct OneFile {
    /// Directions table (one row = one direction: a site mean or a specimen, as the file gives).
    pub file: PathBuf,
    /// Coordinate frame.
    #[arg(long, value_enum, default_value_t = FrameArg::Geo)]
    pub frame: FrameArg,
    /// Number of bootstrap resamples and of simulated pairs for V_w.
    #[arg(long, default_value_t = 1000)]
    pub resamples: usize,
}

#[derive(Debug, Args)]
pub struct TwoFiles {
    /// First directions table.
    pub a: PathBuf,
    /// Second directions table.
    pub b: PathBuf,
    /// Coordinate frame.
    #[arg(long, value_enum, default_value_t = FrameArg::Geo)]
    pub frame: FrameArg,
    /// Number of bootstrap resamples and of simulated pairs for V_w.
    #[arg(long, default_value_t = 1000)]
    pub resamples: usize,
}

#[derive(Debug, Args)]
pub struct FoldArgs {
    /// Directions table with bedding columns on every row.
    pub file: PathBuf,
    /// Number of bootstrap resamples.
    #[arg(long, default_value_t = 1000)]
    pub resamples: usize,
    /// Write the untilting curves and the distribution of their maxima (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
}

#[derive(Debug, Args)]
pub struct RandomArgs {
    /// Directions table.
    pub file: PathBuf,
    /// Coordinate frame.
    #[arg(long, value_enum, default_value_t = FrameArg::Geo)]
    pub frame: FrameArg,
}

pub fn run(a: TestArgs, ctx: &mut Ctx) -> Result<Presentation> {
    match a.kind {
        TestKind::Reversal(o) => reversal(o, ctx),
        TestKind::CommonMean(o) => common_mean(o, ctx),
        TestKind::Fold(o) => fold(o, ctx),
        TestKind::Random(o) => random(o, ctx),
    }
}

fn load(path: &Path) -> Result<DirectionSet> {
    let t = Table::read(path)?;
    let set = read_directions(&t, &GroupBy::None)?;
    if let Some(r) = set.records.iter().find(|r| r.kind == DirectionKind::Plane) {
        return Err(TableError::value(
            set.source.as_str(),
            r.line,
            Some("kind"),
            "is 'plane'; field tests take directions (kind = line) only",
        )
        .into());
    }
    Ok(set)
}

fn bedding_of(set: &DirectionSet) -> Result<Vec<Bedding>> {
    set.records
        .iter()
        .map(|r| {
            r.bedding.ok_or_else(|| {
                TableError::value(
                    set.source.as_str(),
                    r.line,
                    Some("bed_dip"),
                    "no bedding on this row; this test needs bed_dip_dir (or bed_strike) and bed_dip",
                )
                .into()
            })
        })
        .collect()
}

fn vectors(set: &DirectionSet, frame: FrameArg) -> Result<Vec<Vec3>> {
    let geo = set.records.iter().map(|r| r.direction.to_vector());
    match frame {
        FrameArg::Geo => Ok(geo.collect()),
        FrameArg::Tilt => Ok(geo.zip(bedding_of(set)?).map(|(u, b)| b.untilt(u)).collect()),
    }
}

fn check_resamples(n: usize) -> Result<()> {
    if n < 100 {
        anyhow::bail!("--resamples must be at least 100, got {n}");
    }
    Ok(())
}

fn yes_no(b: bool, yes: &str, no: &str) -> String {
    if b {
        yes.into()
    } else {
        no.into()
    }
}

/// The three-approach table and JSON shared by the reversal and common-mean tests.
fn comparison_output(c: &MeanComparison, what: &str, title: &str) -> (Sheet, Value, Vec<String>) {
    let mut sec = Sheet::new(title, &["check", "value", "critical", "outcome"]);
    sec.rows.push(vec![
        Cell::Text("gamma (deg)".into()),
        Cell::Num(c.mm90.gamma, 2),
        Cell::Num(c.mm90.gamma_c, 2),
        Cell::Text(format!("class {}", c.mm90.class.name())),
    ]);
    sec.rows.push(vec![
        Cell::Text("V_w".into()),
        Cell::Num(c.watson.v_w, 2),
        Cell::Num(c.watson.v_crit, 2),
        Cell::Text(yes_no(c.watson.passed, "pass", "fail")),
    ]);
    let ov = c.bootstrap.overlap;
    sec.rows.push(vec![
        Cell::Text("bootstrap x/y/z".into()),
        Cell::Empty,
        Cell::Empty,
        Cell::Text(format!(
            "{} ({}/{}/{} overlap)",
            yes_no(c.bootstrap.passed, "pass", "fail"),
            yes_no(ov[0], "x", "-"),
            yes_no(ov[1], "y", "-"),
            yes_no(ov[2], "z", "-")
        )),
    ]);
    let b = &c.bootstrap;
    let j = json!({
        "n1": c.n1, "n2": c.n2,
        "gamma": c.mm90.gamma, "gamma_c": c.mm90.gamma_c, "class": c.mm90.class.name(),
        "gamma_c_common_k": c.mm90.gamma_c_common_k,
        "v_w": c.watson.v_w, "v_crit": c.watson.v_crit, "v_w_passed": c.watson.passed,
        "bootstrap": {
            "passed": b.passed, "overlap": b.overlap, "resamples": b.resamples,
            "set1": {"low": b.set1.low, "high": b.set1.high},
            "set2": {"low": b.set2.low, "high": b.set2.high},
        },
        "passed": c.passed,
        "mean1": {"dec": c.mean1.dec, "inc": c.mean1.inc, "r": c.r1, "k": c.k1},
        "mean2": {"dec": c.mean2.dec, "inc": c.mean2.inc, "r": c.r2, "k": c.k2},
    });
    let mut notes = Vec::new();
    let verdict = if c.passed {
        format!(
            "{what} agree within the 95 % limits: gamma = {:.1}° ≤ gamma_c = {:.1}°, class {}.",
            c.mm90.gamma,
            c.mm90.gamma_c,
            c.mm90.class.name()
        )
    } else {
        format!("{what} differ at the 95 % level: gamma = {:.1}° > gamma_c = {:.1}°.", c.mm90.gamma, c.mm90.gamma_c)
    };
    notes.push(verdict);
    if c.agree() {
        notes.push("Watson's V_w and the bootstrap give the same outcome.".into());
    } else {
        notes.push(format!(
            "The approaches disagree (angle test {}, V_w {}, bootstrap {}); `passed` follows the angle test (k1 = {:.0}, k2 = {:.0}).",
            yes_no(c.mm90.passed, "pass", "fail"),
            yes_no(c.watson.passed, "pass", "fail"),
            yes_no(c.bootstrap.passed, "pass", "fail"),
            c.k1,
            c.k2
        ));
    }
    notes.push(format!(
        "gamma_c is the angle at which V_w reaches its simulated critical value (McFadden & McElhinny 1990), valid for unequal precisions; the common-precision angle would be {:.1}°.",
        c.mm90.gamma_c_common_k
    ));
    if c.mm90.class == fieldtests::Mm90Class::Indeterminate {
        notes.push("gamma_c exceeds 20°: the data are too few or too scattered for the test to discriminate.".into());
    }
    (sec, j, notes)
}

fn reversal(a: OneFile, ctx: &mut Ctx) -> Result<Presentation> {
    check_resamples(a.resamples)?;
    ctx.inputs.add(&a.file);
    let set = load(&a.file)?;
    let v = vectors(&set, a.frame)?;
    let mc = ctx.monte_carlo(a.resamples);
    let t = fieldtests::reversal_test(&v, &mc, CONFIDENCE)?;
    let c = &t.comparison;
    let (sec, mut j, mut notes) = comparison_output(
        c,
        "The two polarity modes",
        &format!("Reversal test of {} ({} coordinates)", a.file.display(), Frame::from(a.frame).label()),
    );
    let mut modes = Sheet::new("Polarity modes (split on the principal axis)", &["mode", "n", "dec", "inc", "k"]);
    modes.rows.push(vec![
        Cell::Text("1".into()),
        Cell::Int(c.n1 as i64),
        Cell::Azimuth(c.mean1.dec, 1),
        Cell::Num(c.mean1.inc, 1),
        Cell::Num(c.k1, 1),
    ]);
    modes.rows.push(vec![
        Cell::Text("2".into()),
        Cell::Int(c.n2 as i64),
        Cell::Azimuth(t.mode2_mean.dec, 1),
        Cell::Num(t.mode2_mean.inc, 1),
        Cell::Num(c.k2, 1),
    ]);
    let lines = |idx: &[usize]| idx.iter().map(|&i| set.records[i].line).collect::<Vec<_>>();
    j["split"] = json!({
        "axis_dec": t.split.axis.dec, "axis_inc": t.split.axis.inc,
        "mode1_lines": lines(&t.split.mode1), "mode2_lines": lines(&t.split.mode2),
        "mode2_mean_unflipped": {"dec": t.mode2_mean.dec, "inc": t.mode2_mean.inc},
    });
    notes.insert(0, format!(
        "Split on the principal axis (dec {:.1}, inc {:.1}): {} directions in mode 1, {} in mode 2 (mode 2 flipped to its antipode for the test).",
        t.split.axis.dec, t.split.axis.inc, c.n1, c.n2
    ));
    notes.push(CAUTION.into());
    finish(j, vec![sec, modes], notes, a.file.display().to_string(), a.frame, a.resamples, ctx)
}

fn common_mean(a: TwoFiles, ctx: &mut Ctx) -> Result<Presentation> {
    check_resamples(a.resamples)?;
    ctx.inputs.add(&a.a);
    ctx.inputs.add(&a.b);
    let (sa, sb) = (load(&a.a)?, load(&a.b)?);
    let (va, vb) = (vectors(&sa, a.frame)?, vectors(&sb, a.frame)?);
    let mc = ctx.monte_carlo(a.resamples);
    let c = fieldtests::compare_means(&va, &vb, &mc, CONFIDENCE)?;
    let (sec, j, mut notes) = comparison_output(
        &c,
        "The two mean directions",
        &format!(
            "Common-mean test of {} and {} ({} coordinates)",
            a.a.display(),
            a.b.display(),
            Frame::from(a.frame).label()
        ),
    );
    let mut means = Sheet::new("Means", &["file", "n", "dec", "inc", "k"]);
    for (p, n, m, k) in [(&a.a, c.n1, c.mean1, c.k1), (&a.b, c.n2, c.mean2, c.k2)] {
        means.rows.push(vec![
            Cell::Text(p.display().to_string()),
            Cell::Int(n as i64),
            Cell::Azimuth(m.dec, 1),
            Cell::Num(m.inc, 1),
            Cell::Num(k, 1),
        ]);
    }
    notes.push(CAUTION.into());
    finish(j, vec![sec, means], notes, format!("{} {}", a.a.display(), a.b.display()), a.frame, a.resamples, ctx)
}

fn finish(
    mut j: Value,
    sheets: Vec<Sheet>,
    notes: Vec<String>,
    file: String,
    frame: FrameArg,
    resamples: usize,
    ctx: &Ctx,
) -> Result<Presentation> {
    j["file"] = json!(file);
    j["frame"] = json!(Frame::from(frame).label());
    j["confidence"] = json!(CONFIDENCE);
    j["seed"] = json!(ctx.global.seed);
    j["resamples"] = json!(resamples);
    j["notes"] = json!(notes);
    Ok(Presentation { json: j, sheets, main_sheet: 0, cautions: vec![], notes })
}

fn fold(a: FoldArgs, ctx: &mut Ctx) -> Result<Presentation> {
    check_resamples(a.resamples)?;
    ctx.inputs.add(&a.file);
    let set = load(&a.file)?;
    let beds = bedding_of(&set)?;
    let v = vectors(&set, FrameArg::Geo)?;
    let mc = ctx.monte_carlo(a.resamples);
    let opt = FoldOptions::default();
    let t = fieldtests::fold_test(&v, &beds, &mc, &opt)?;
    let p = &t.classic;
    let mut sec = Sheet::new(
        &format!("Fold test of {} ({} directions, {} resamples)", a.file.display(), t.n, a.resamples),
        &["best_untilt", "ci_low", "ci_high", "verdict", "k_geo", "k_tilt", "k_ratio", "f_crit"],
    );
    sec.rows.push(vec![
        Cell::Num(t.best_untilt, 0),
        Cell::Num(t.ci_low, 0),
        Cell::Num(t.ci_high, 0),
        Cell::Text(t.verdict.name().into()),
        Cell::Num(p.k_geo, 1),
        Cell::Num(p.k_tilt, 1),
        Cell::Num(p.ratio, 2),
        Cell::Num(p.f_crit, 2),
    ]);
    let mut notes = vec![format!(
        "Best untilting {:.0} % (95 % bootstrap interval {:.0} to {:.0} %): {}.",
        t.best_untilt,
        t.ci_low,
        t.ci_high,
        match t.verdict {
            fieldtests::FoldVerdict::PreFolding => "consistent with a magnetization acquired before folding",
            fieldtests::FoldVerdict::PostFolding => "consistent with a magnetization acquired after folding",
            fieldtests::FoldVerdict::SynFolding => "consistent with a magnetization acquired during folding",
            fieldtests::FoldVerdict::Inconclusive => "the interval does not single out pre-, syn- or post-folding",
        }
    )];
    if t.at_edge > 0.025 {
        notes.push(format!(
            "{:.0} % of the resamples peak at an end of the range ({:.0} to {:.0} %): the curve may keep rising beyond it.",
            100.0 * t.at_edge, opt.from, opt.to
        ));
    }
    if t.bedding_spread < 20.0 {
        notes.push(format!(
            "The bedding attitudes differ by at most {:.0}°: untilting turns the set almost rigidly, so the fold test has little power here.",
            t.bedding_spread
        ));
    }
    notes.push(format!(
        "Classic ratio k_tilt/k_geo = {:.2} against F = {:.2}: {}. Shown for comparison only: both k come from the same directions, so the F test does not strictly apply.",
        p.ratio,
        p.f_crit,
        if p.increase { "significant increase on untilting" } else if p.decrease { "significant decrease on untilting" } else { "no significant change" }
    ));
    notes.push(CAUTION.into());
    if let Some(path) = &a.plot {
        let fig = lodestone::figures::FoldPlot::from_test(
            &t,
            a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default(),
        );
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    let j = json!({
        "file": a.file.display().to_string(),
        "n": t.n,
        "best_untilt": t.best_untilt, "ci_low": t.ci_low, "ci_high": t.ci_high, "verdict": t.verdict.name(),
        "confidence": t.confidence,
        "range": {"from": opt.from, "to": opt.to, "step": opt.step},
        "at_edge": t.at_edge, "bedding_spread": t.bedding_spread,
        "classic": {"k_geo": jnum(Some(p.k_geo)), "k_tilt": jnum(Some(p.k_tilt)), "ratio": p.ratio, "f_crit": p.f_crit,
                    "increase": p.increase, "decrease": p.decrease},
        "seed": ctx.global.seed, "resamples": a.resamples,
        "notes": notes,
    });
    Ok(Presentation { json: j, sheets: vec![sec], main_sheet: 0, cautions: vec![], notes })
}

fn random(a: RandomArgs, ctx: &mut Ctx) -> Result<Presentation> {
    ctx.inputs.add(&a.file);
    let set = load(&a.file)?;
    let v = vectors(&set, a.frame)?;
    let t = fieldtests::randomness_test(&v, CONFIDENCE)?;
    let mut sec = Sheet::new(
        &format!("Randomness test of {} ({} coordinates)", a.file.display(), Frame::from(a.frame).label()),
        &["n", "r", "r0", "p_value", "random"],
    );
    sec.rows.push(vec![
        Cell::Int(t.n as i64),
        Cell::Num(t.r, 3),
        Cell::Num(t.r0, 3),
        Cell::Num(t.p_value, 4),
        Cell::Text(yes_no(t.random, "yes", "no")),
    ]);
    let notes = vec![
        if t.random {
            format!("R = {:.2} < R0 = {:.2}: randomness cannot be rejected at 95 % (p = {:.3}).", t.r, t.r0, t.p_value)
        } else {
            format!("R = {:.2} ≥ R0 = {:.2}: the directions are not random at 95 % (p = {:.3}).", t.r, t.r0, t.p_value)
        },
        CAUTION.into(),
    ];
    let j = json!({
        "file": a.file.display().to_string(), "frame": Frame::from(a.frame).label(),
        "n": t.n, "r": t.r, "r0": t.r0, "p_value": t.p_value, "random": t.random,
        "confidence": t.confidence, "route": t.route, "notes": notes,
    });
    Ok(Presentation { json: j, sheets: vec![sec], main_sheet: 0, cautions: vec![], notes })
}
