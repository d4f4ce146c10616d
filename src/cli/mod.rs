//! The command layer: parse the command line, call the library, write the result.
//!
//! Exit codes: 0 success · 1 bad data or failed computation (message on stderr) · 2 bad command line.

mod args;
mod column;
mod components;
mod correlate;
mod demo;
mod dipole;
mod expected;
mod field;
mod hazard;
mod intervals;
mod io;
mod mean;
mod mean_ellipse;
mod output;
mod poles;
mod progress;
mod psv;
mod rate;
mod review;
mod section;
mod simulate;
mod test;
mod unflatten;

use clap::{Args, Parser, Subcommand};
#[allow(unused_imports)]
pub use io::{prepare_out_dir, write_atomic, write_figure, Inputs};
#[allow(unused_imports)]
pub use lodestone::present::write_json;
#[allow(unused_imports)]
pub use lodestone::present::{jnum, Cell, Presentation, Sheet, Streamed};
pub use output::Format;
pub use output::{write_output, Output};

/// Options accepted anywhere on the command line.
#[derive(Debug, Clone, Args)]
pub struct Global {
    /// Output format: table (for people), csv (the main table), json (everything).
    #[arg(long, global = true, help_heading = "Global options", value_enum, default_value_t = Format::Table)]
    pub format: Format,
    /// Seed of every random result; the same seed gives the same answer on any number of threads.
    #[arg(long, global = true, help_heading = "Global options", default_value_t = lodestone::montecarlo::DEFAULT_SEED)]
    pub seed: u64,
    /// Worker threads for Monte Carlo work (default: all cores). Results do not depend on it.
    #[arg(long, global = true, help_heading = "Global options")]
    pub threads: Option<usize>,
    /// No progress bars.
    #[arg(long, global = true, help_heading = "Global options")]
    pub quiet: bool,
}

/// lodestone: paleomagnetic directions, field tests, poles, polarity columns and reversal statistics.
#[derive(Debug, Parser)]
#[command(name = "lodestone", version, about, long_about = None, propagate_version = true)]
pub struct Cli {
    #[command(flatten)]
    global: Global,
    #[command(subcommand)]
    verb: Verb,
}

#[derive(Debug, Subcommand)]
#[allow(clippy::large_enum_variant, reason = "parsed once per run; boxing the arguments would buy nothing")]
enum Verb {
    // In the order of the job: components → means → field tests → poles → column → correlation →
    // reversal statistics → simulation → the whole chain; the tools beside the chain come last.
    /// Principal-component lines and planes per specimen from stepwise demagnetization (MAD, DANG).
    Components(components::ComponentsArgs),
    /// Fisher mean per site (or per --by column), with k, α95 and θ63.
    Mean(mean::MeanArgs),
    /// Field tests: reversal, common-mean, fold, random.
    Test(test::TestArgs),
    /// Virtual geomagnetic pole per site, paleopole (K, A95) and VGP scatter S_B.
    Poles(poles::PolesArgs),
    /// Polarity of each level from its VGP latitude, and the magnetozones with boundary intervals.
    Column(column::ColumnArgs),
    /// Rank correlations of a polarity column with a time scale; ties, age model, accumulation rates.
    Correlate(correlate::CorrelateArgs),
    /// Renewal-model fits (exponential, gamma, Weibull, lognormal, inverse Gaussian) to polarity intervals.
    Intervals(intervals::IntervalsArgs),
    /// Hazard and P(reversal within a horizon | none so far) from the fitted models (not a forecast).
    Hazard(hazard::HazardArgs),
    /// Reversal rate through time, Laplace trend test and clustering test.
    Rate(rate::RateArgs),
    /// Synthetic time scales and synthetic sampled sections (project folders) from a stated model.
    Simulate(simulate::SimulateArgs),
    /// The whole chain on a project folder: tables, figures and an HTML report.
    Section(section::SectionArgs),
    /// Run `section` on the embedded invented demo section.
    Demo(demo::DemoArgs),
    /// Dipole moments: VADM, VDM, or moment, tilt and pole of Gauss coefficients.
    Dipole(dipole::DipoleArgs),
    /// Direction expected at a site (or every site of a table) from a given pole.
    Expected(expected::ExpectedArgs),
    /// A local browser page to review and set each specimen's fit (saved to the folder's picks.csv).
    Review(review::ReviewArgs),
    /// The present field from a spherical-harmonic model (default the bundled IGRF-14): series, a point, context.
    Field(field::FieldArgs),
    /// Inclination-shallowing correction of sedimentary directions (elongation/inclination, or a given factor).
    Unflatten(unflatten::UnflattenArgs),
    /// VGP scatter per group against paleolatitude, with S(λ)² = a² + (bλ)² fitted.
    Psv(psv::PsvArgs),
}

/// Shared context for a verb: global options, progress sink, and the input paths.
pub struct Ctx {
    /// Global options.
    pub global: Global,
    /// Progress sink for Monte Carlo work.
    pub progress: progress::Bar,
    /// Paths read by this run (outputs may not replace them).
    pub inputs: Inputs,
}

impl Ctx {
    /// Monte Carlo settings from the global options.
    pub fn monte_carlo(&self, resamples: usize) -> lodestone::montecarlo::MonteCarlo<'_> {
        lodestone::montecarlo::MonteCarlo { seed: self.global.seed, resamples, progress: &self.progress }
    }
}

/// Run the command line; returns the process exit code.
pub fn run() -> i32 {
    let cli = match Cli::try_parse() {
        Ok(c) => c,
        Err(e) => {
            let code = if e.use_stderr() { 2 } else { 0 };
            let _ = e.print();
            return code;
        }
    };
    let mut ctx = Ctx { progress: progress::Bar::new(cli.global.quiet), global: cli.global, inputs: Inputs::default() };
    let result = match ctx.global.threads {
        Some(n) if n > 0 => match rayon::ThreadPoolBuilder::new().num_threads(n).build() {
            Ok(pool) => pool.install(|| dispatch(cli.verb, &mut ctx)),
            Err(e) => Err(anyhow::anyhow!("cannot start {n} threads: {e}")),
        },
        Some(_) => Err(anyhow::anyhow!("--threads must be at least 1")),
        None => dispatch(cli.verb, &mut ctx),
    };
    match result {
        Ok(report) => {
            let stdout = std::io::stdout();
            let stderr = std::io::stderr();
            let mut out = std::io::BufWriter::new(stdout.lock());
            match write_output(&report, ctx.global.format, &mut out, &mut stderr.lock())
                .and_then(|()| std::io::Write::flush(&mut out))
            {
                Ok(()) => 0,
                Err(e) if e.kind() == std::io::ErrorKind::BrokenPipe => 0,
                Err(e) => {
                    eprintln!("error: cannot write the output: {e}");
                    1
                }
            }
        }
        Err(e) => {
            eprintln!("error: {e:#}");
            1
        }
    }
}

fn dispatch(verb: Verb, ctx: &mut Ctx) -> anyhow::Result<Output> {
    let report = match verb {
        // Written while it is produced (memory does not grow with the rows).
        Verb::Mean(a) => return mean::run(a, ctx),
        Verb::Poles(a) => poles::run(a, ctx),
        Verb::Dipole(a) => dipole::run(a, ctx),
        Verb::Expected(a) => expected::run(a, ctx),
        Verb::Components(a) => components::run(a, ctx),
        Verb::Column(a) => column::run(a, ctx),
        Verb::Correlate(a) => correlate::run(a, ctx),
        Verb::Simulate(a) => simulate::run(a, ctx),
        Verb::Test(a) => test::run(a, ctx),
        Verb::Section(a) => section::run_cli(a, ctx),
        Verb::Demo(a) => demo::run(a, ctx),
        Verb::Intervals(a) => intervals::run(a, ctx),
        Verb::Hazard(a) => hazard::run(a, ctx),
        Verb::Rate(a) => rate::run(a, ctx),
        Verb::Review(a) => review::run(a, ctx),
        Verb::Field(a) => field::run(a, ctx),
        Verb::Unflatten(a) => unflatten::run(a, ctx),
        Verb::Psv(a) => psv::run(a, ctx),
    };
    report.map(Output::Held)
}
