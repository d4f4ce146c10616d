//! `lodestone components`: principal-component fits per specimen from a steps table.

use super::{Ctx, Presentation};
use anyhow::{bail, Context, Result};
use clap::Args;
use lodestone::demag::{
    fit_automatically, fit_range, AutoRule, AutomaticFits, AutomaticRule, LastComponentRule, SpecimenFit,
};
use lodestone::figures::VectorEndpointPlot;
use lodestone::model::{Anchor, FitKind};
use lodestone::model::{SpecimenSteps, StepSet, Treatment};
use lodestone::present::{
    self,
    components::{ComponentFits, RuleView},
};
use lodestone::table::{read_picks, read_steps, Table};
use std::path::{Path, PathBuf};

#[derive(Debug, Args)]
pub struct ComponentsArgs {
    /// Steps table (CSV with specimen, step, dec, inc, moment; optional treatment, site, height/depth, bedding).
    pub steps: PathBuf,
    /// Picks table (specimen, from, to; optional kind, anchor): the fit range of each specimen.
    #[arg(long, conflicts_with_all = ["from", "auto"])]
    pub picks: Option<PathBuf>,
    /// First step of the range fitted for every specimen (with --to).
    #[arg(long, requires = "to", allow_negative_numbers = true, required_unless_present_any = ["picks", "auto"])]
    pub from: Option<f64>,
    /// Last step of the range fitted for every specimen (with --from).
    #[arg(long, requires = "from", allow_negative_numbers = true)]
    pub to: Option<f64>,
    /// What --from/--to fits: a line or a plane (great circle).
    #[arg(long, value_enum, default_value_t = KindArg::Line, conflicts_with = "picks")]
    pub kind: KindArg,
    /// Constrain fits through the origin (steps are not centred). With --picks, the table's anchor column decides.
    #[arg(long, conflicts_with = "picks")]
    pub anchor: bool,
    /// Choose each specimen's line segment automatically (see --min-steps, --max-mad, --max-dang).
    #[arg(long, conflicts_with = "from")]
    pub auto: bool,
    /// Automatic rule: `last` isolates the last component (a line grown down from the last steps
    /// while each lower step fits within the noise, else a great circle); `longest` takes the
    /// longest straight run heading for the origin (the earlier rule).
    #[arg(long, value_enum, default_value_t = RuleArg::Last, requires = "auto")]
    pub rule: RuleArg,
    /// Automatic rule `last`: significance level of the test that a lower step departs from the line.
    #[arg(long, default_value_t = 0.05, requires = "auto")]
    pub alpha: f64,
    /// Automatic rule: fewest consecutive steps in a segment.
    #[arg(long, default_value_t = 3, requires = "auto")]
    pub min_steps: usize,
    /// Automatic rule: largest accepted MAD, degrees (default 15 for `--rule last`, 5 for `--rule longest`).
    #[arg(long, requires = "auto")]
    pub max_mad: Option<f64>,
    /// Automatic rule: largest accepted DANG, degrees.
    #[arg(long, default_value_t = 10.0, requires = "auto")]
    pub max_dang: f64,
    /// Write one figure per specimen into this folder (created if missing).
    #[arg(long)]
    pub plot: Option<PathBuf>,
    /// Figure format for --plot.
    #[arg(long, value_enum, default_value_t = PlotFormat::Svg)]
    pub plot_format: PlotFormat,
    /// Let --plot use a folder that already holds files: figures of the same names are replaced, other
    /// files are left alone.
    #[arg(long, requires = "plot")]
    pub force: bool,
}

#[derive(Debug, Clone, Copy, clap::ValueEnum)]
pub enum KindArg {
    Line,
    Plane,
}

#[derive(Debug, Clone, Copy, PartialEq, Eq, clap::ValueEnum)]
pub enum RuleArg {
    Last,
    Longest,
}

#[derive(Debug, Clone, Copy, clap::ValueEnum)]
pub enum PlotFormat {
    Svg,
    Png,
}

/// A file name made from a specimen name: letters, digits, `.`, `-`, `_` kept; anything else `_`.
fn sanitise(name: &str) -> String {
    let s: String =
        name.chars().map(|c| if c.is_ascii_alphanumeric() || "-_.".contains(c) { c } else { '_' }).collect();
    let s = s.trim_start_matches('.').to_string();
    if s.is_empty() {
        "specimen".into()
    } else {
        s
    }
}

fn unit_of(sp: &SpecimenSteps) -> &'static str {
    let count = |t: Treatment| sp.steps.iter().filter(|s| s.treatment == Some(t)).count();
    let (af, th) = (count(Treatment::Af), count(Treatment::Thermal));
    if af == 0 && th == 0 {
        ""
    } else if af >= th {
        Treatment::Af.unit()
    } else {
        Treatment::Thermal.unit()
    }
}

/// No fits yet, by `method`.
fn fitted(method: &'static str) -> ComponentFits {
    ComponentFits { method, ..Default::default() }
}

pub fn run(a: ComponentsArgs, ctx: &mut Ctx) -> Result<Presentation> {
    // The rule's own default limit (the library's), unless given.
    let rule_name = if a.rule == RuleArg::Last { "last" } else { "longest" };
    let max_mad = a.max_mad.unwrap_or(AutomaticRule::by_name(rule_name)?.max_mad());
    if a.auto && (a.min_steps < 2 || !(max_mad >= 0.0) || !(a.max_dang >= 0.0)) {
        bail!("--min-steps must be at least 2 and --max-mad, --max-dang non-negative");
    }
    ctx.inputs.add(&a.steps);
    if let Some(p) = &a.picks {
        ctx.inputs.add(p);
    }
    let set: StepSet = read_steps(&Table::read(&a.steps)?)?;
    let mut notes = Vec::new();
    let fitted = match &a.picks {
        Some(pp) => by_picks(pp, &set)?,
        None if a.auto && a.rule == RuleArg::Last => by_last_rule(&a, max_mad, &set, &mut notes)?,
        None if a.auto => by_longest_run(&a, max_mad, &set, &mut notes)?,
        None => by_range(&a, &set)?,
    };
    if let Some(dir) = &a.plot {
        write_plots(dir, &set, &fitted.fits, a.plot_format, a.force, ctx)?;
    }
    Ok(present::components::components(&set, &fitted, &a.steps.display().to_string(), notes))
}

fn anchor_of(a: &ComponentsArgs) -> Anchor {
    if a.anchor {
        Anchor::Origin
    } else {
        Anchor::Free
    }
}

/// One fit per pick; a pick that cannot be fitted is an error naming the picks file and line.
fn by_picks(pp: &Path, set: &StepSet) -> Result<ComponentFits> {
    let mut out = fitted("picks");
    let pt = Table::read(pp)?;
    let picks = read_picks(&pt, set)?;
    for p in &picks {
        let sp = set.get(&p.specimen).expect("checked by read_picks");
        let f =
            fit_range(sp, p.from, p.to, p.kind, p.anchor).map_err(|e| pt.error(p.line, Some("from"), e.to_string()))?;
        out.fits.push(f);
    }
    for sp in &set.specimens {
        if !picks.iter().any(|p| p.specimen == sp.specimen) {
            out.unfitted.push((sp.specimen.clone(), format!("no pick in {}", pp.display())));
        }
    }
    Ok(out)
}

fn by_last_rule(a: &ComponentsArgs, max_mad: f64, set: &StepSet, notes: &mut Vec<String>) -> Result<ComponentFits> {
    let anchor = anchor_of(a);
    let rule = LastComponentRule {
        min_steps: a.min_steps,
        alpha: a.alpha,
        max_mad,
        max_dang: a.max_dang,
        anchor,
        planes: true,
    };
    let auto = fit_automatically(set, &AutomaticRule::Last(rule))?;
    notes.push(format!(
        "Automatic fits by the last-component rule: a {} line grown down from the last {} steps while each lower step lies on it within the noise (F-test at α = {}), accepted with MAD ≤ {}° and DANG ≤ {}°; otherwise a great circle through the origin (grade C). Check each choice on the figures (--plot).",
        anchor.as_str(), rule.min_steps, rule.alpha, rule.max_mad, rule.max_dang));
    let view = RuleView {
        rule: "last",
        min_steps: rule.min_steps,
        alpha: Some(rule.alpha),
        max_mad: rule.max_mad,
        max_dang: rule.max_dang,
        anchor,
    };
    Ok(automatic(auto, view))
}

fn by_longest_run(a: &ComponentsArgs, max_mad: f64, set: &StepSet, notes: &mut Vec<String>) -> Result<ComponentFits> {
    let anchor = anchor_of(a);
    let rule = AutoRule { min_steps: a.min_steps, max_mad, max_dang: a.max_dang, anchor };
    notes.push(format!(
        "Automatic segments: for each specimen, the longest run of at least {} consecutive steps whose {} line has MAD ≤ {}° and DANG ≤ {}°; \
         among runs of equal length the smaller MAD, then the earlier run. Check each choice on the figures (--plot).",
        rule.min_steps, anchor.as_str(), rule.max_mad, rule.max_dang));
    let view = RuleView {
        rule: "longest",
        min_steps: rule.min_steps,
        alpha: None,
        max_mad: rule.max_mad,
        max_dang: rule.max_dang,
        anchor,
    };
    Ok(automatic(fit_automatically(set, &AutomaticRule::Longest(rule))?, view))
}

/// The library's automatic fits as the presenter takes them.
fn automatic(auto: AutomaticFits, view: RuleView) -> ComponentFits {
    ComponentFits { fits: auto.fits, unfitted: auto.unfitted, grades: auto.grades, rule: Some(view), ..fitted("auto") }
}

fn by_range(a: &ComponentsArgs, set: &StepSet) -> Result<ComponentFits> {
    let mut out = fitted("range");
    let (from, to) = (a.from.expect("clap"), a.to.expect("clap"));
    if from > to {
        bail!("--from {from} is above --to {to}");
    }
    let kind = match a.kind {
        KindArg::Line => FitKind::Line,
        KindArg::Plane => FitKind::Plane,
    };
    for sp in &set.specimens {
        match fit_range(sp, from, to, kind, anchor_of(a)) {
            Ok(f) => out.fits.push(f),
            Err(e) => out.unfitted.push((sp.specimen.clone(), e.detail().to_string())),
        }
    }
    Ok(out)
}

fn write_plots(
    dir: &Path,
    set: &StepSet,
    fits: &[SpecimenFit],
    format: PlotFormat,
    force: bool,
    ctx: &Ctx,
) -> Result<()> {
    super::prepare_out_dir(dir, force, &ctx.inputs).with_context(|| format!("--plot {}", dir.display()))?;
    let ext = match format {
        PlotFormat::Svg => "svg",
        PlotFormat::Png => "png",
    };
    let mut used: Vec<String> = Vec::new();
    for sp in &set.specimens {
        let base = sanitise(&sp.specimen);
        let mut name = base.clone();
        let mut k = 2;
        while used.contains(&name.to_lowercase()) {
            name = format!("{base}-{k}");
            k += 1;
        }
        used.push(name.to_lowercase());
        let fig = VectorEndpointPlot {
            specimen: sp.specimen.clone(),
            unit: unit_of(sp).into(),
            steps: sp.steps.iter().map(|s| (s.step, s.vector())).collect(),
            fits: fits.iter().filter(|f| f.specimen == sp.specimen).cloned().collect(),
        };
        super::write_figure(&fig, &dir.join(format!("{name}.{ext}")), &ctx.inputs)?;
    }
    Ok(())
}
