//! `lodestone test …`: field tests (reversal, fold, randomness, common mean).

use super::args::FrameArg;
use super::{Ctx, Presentation};
use anyhow::Result;
use clap::{Args, Subcommand};
use lodestone::fieldtests::{self, FoldOptions};
use lodestone::model::{DirectionKind, DirectionSet};
use lodestone::present::{self, test_labels::TestLabels};
use lodestone::sphere::{Bedding, Vec3};
use lodestone::stats::Frame;
use lodestone::table::{read_directions, GroupBy, Table};
use lodestone::TableError;
use std::path::{Path, PathBuf};

/// Confidence level of every field test (the published classes and tables are at 95 %).
const CONFIDENCE: f64 = 0.95;

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
    match lodestone::montecarlo::check_resamples(n) {
        Ok(_) => Ok(()),
        Err(_) => anyhow::bail!("--resamples must be at least {}, got {n}", lodestone::montecarlo::MIN_RESAMPLES),
    }
}

/// The labels of a test run on `file` in `frame`.
fn labels<'a>(file: &'a str, frame: FrameArg, resamples: usize, ctx: &Ctx) -> TestLabels<'a> {
    TestLabels { file, frame: Frame::from(frame).label(), confidence: CONFIDENCE, seed: ctx.global.seed, resamples }
}

fn reversal(a: OneFile, ctx: &mut Ctx) -> Result<Presentation> {
    check_resamples(a.resamples)?;
    ctx.inputs.add(&a.file);
    let set = load(&a.file)?;
    let v = vectors(&set, a.frame)?;
    let t = fieldtests::reversal_test(&v, &ctx.monte_carlo(a.resamples), CONFIDENCE)?;
    let lines: Vec<usize> = set.records.iter().map(|r| r.line).collect();
    let file = a.file.display().to_string();
    Ok(present::mean_comparison::reversal(&t, &lines, &labels(&file, a.frame, a.resamples, ctx)))
}

fn common_mean(a: TwoFiles, ctx: &mut Ctx) -> Result<Presentation> {
    check_resamples(a.resamples)?;
    ctx.inputs.add(&a.a);
    ctx.inputs.add(&a.b);
    let (sa, sb) = (load(&a.a)?, load(&a.b)?);
    let (va, vb) = (vectors(&sa, a.frame)?, vectors(&sb, a.frame)?);
    let c = fieldtests::compare_means(&va, &vb, &ctx.monte_carlo(a.resamples), CONFIDENCE)?;
    let (fa, fb) = (a.a.display().to_string(), a.b.display().to_string());
    let both = format!("{fa} {fb}");
    Ok(present::mean_comparison::common_mean(&c, [&fa, &fb], &labels(&both, a.frame, a.resamples, ctx)))
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
    if let Some(path) = &a.plot {
        let fig = lodestone::figures::FoldPlot::from_test(
            &t,
            a.file.file_name().map(|s| s.to_string_lossy().to_string()).unwrap_or_default(),
        );
        super::write_figure(&fig, path, &ctx.inputs)?;
    }
    Ok(present::fold_test::fold(&t, &opt, &a.file.display().to_string(), ctx.global.seed, a.resamples))
}

fn random(a: RandomArgs, ctx: &mut Ctx) -> Result<Presentation> {
    ctx.inputs.add(&a.file);
    let set = load(&a.file)?;
    let v = vectors(&set, a.frame)?;
    let t = fieldtests::randomness_test(&v, CONFIDENCE)?;
    Ok(present::randomness_test::random(&t, &a.file.display().to_string(), Frame::from(a.frame).label()))
}
