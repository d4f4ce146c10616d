//! # lodestone
//!
//! Paleomagnetic reversal-record analysis: from stepwise demagnetization data to characteristic
//! directions, site means, field tests, virtual geomagnetic poles, polarity columns, correlation with
//! the geomagnetic polarity time scale, and the statistics of the reversal record itself.
//!
//! The library does no printing and never exits the process; the `lodestone` binary is a thin layer
//! over it. Angles are degrees at every public interface (radians only inside), in the frame
//! x = north, y = east, z = down.
//!
//! ## Index of methods
//!
//! | concept | item |
//! |---|---|
//! | direction ↔ unit vector, angle, antipode | [`sphere::Direction`], [`sphere::angle_between`] |
//! | rotation about an axis (also by a given sine and cosine) | [`sphere::rotate_about`], [`sphere::rotate_unit`], [`sphere::Rotation`] |
//! | tilt (bedding) correction, overturned beds; partial untilting | [`sphere::Bedding::untilt`], [`sphere::Bedding::partial_apply`], [`sphere::Bedding::untilting`] |
//! | specimen frame → geographic | [`sphere::SpecimenOrientation`] |
//! | symmetric 3 × 3 eigen-decomposition | [`linalg::sym_eigen`] |
//! | Fisher (1953) mean, R, k, α95, θ63 | [`stats::fisher_mean`], [`stats::FisherAccumulator`] |
//! | confidence cone at any level | [`stats::confidence_cone`] |
//! | means per site or group, geographic or tilt-corrected | [`stats::group_means`] |
//! | means per group streamed from a table in constant memory | [`stats::stream_group_means`] |
//! | compact per-group sums of a streamed table (tens of bytes per group) | [`stats::stream_group_sums`], [`stats::GroupSums`] |
//! | orientation matrix and principal axes | [`stats::orientation_matrix`], [`stats::principal_axes`] |
//! | Fisher random directions; resultants of simulated Fisher sets, eight generators side by side | [`stats::FisherSampler`], [`stats::FisherSampler::resultant`] |
//! | seeded, thread-count-independent Monte Carlo | [`montecarlo::MonteCarlo`], [`montecarlo::MonteCarlo::run_with`], [`montecarlo::MonteCarlo::run_batched`] |
//! | uniform resampling indices, quantiles by selection | [`montecarlo::UniformIndex`], [`montecarlo::quantile_select`], [`montecarlo::quantiles_select`] |
//! | largest eigenvalue of a symmetric 3 × 3 matrix (Newton on the cubic) | [`fieldtests::largest_eigenvalue`], [`fieldtests::largest_eigenvalues`] |
//! | the domain types: polarity, time scale, treatments and steps, stratigraphic axis, directions, sites, picks, fit kind and anchor | [`model::TimeScale`], [`model::StepSet`], [`model::DirectionSet`], [`model::SiteSet`], [`model::Pick`], [`model::FitKind`] |
//! | tables (CSV) read into the domain types | [`table::Table`], [`table::read_directions`], [`model::TimeScale::from_table`] |
//! | a table read one row at a time, same checks and messages | [`table::TableStream`], [`table::Columns`], [`table::DirectionColumns`] |
//! | sites and poles on the sphere: direct/inverse problems | [`sphere::GeoPoint`] |
//! | virtual geomagnetic pole, expected direction | [`poles::vgp`], [`poles::expected_direction`] |
//! | VGP confidence oval dp, dm; paleolatitude range | [`poles::pole_oval`], [`poles::paleolatitude_range`] |
//! | uncertainty of an expected direction (ΔD, ΔI) | [`poles::expected_oval`] |
//! | paleopole (Fisher mean of VGPs, K, A95) | [`poles::paleopole`], [`poles::northern`] |
//! | VGP scatter S_B, within-site correction, cutoffs, bootstrap | [`poles::vgp_scatter`], [`poles::bootstrap_scatter`] |
//! | VADM, VDM, dipole of Gauss coefficients | [`poles::vadm`], [`poles::vdm`], [`poles::gauss_dipole`] |
//! | sites table (site means) | [`table::read_sites`] |
//! | map of VGPs and paleopole | [`figures::PolePlot`] |
//! | principal-component lines and planes, MAD, DANG (Kirschvink 1980) | [`demag::fit_line`], [`demag::fit_plane`], [`demag::fit_range`] |
//! | automatic choice of a specimen's line segment (longest straight run) | [`demag::auto_line`], [`demag::AutoRule`] |
//! | the last (characteristic) component: F-test growth, great-circle fallback, grades | [`demag::last_component`], [`demag::LastComponentRule`] |
//! | moment-decay panel, labels that never overlap | [`figures::draw_decay`], [`figures::place_labels`] |
//! | steps and picks tables (stepwise demagnetization) | [`table::read_steps`], [`table::read_picks`] |
//! | combined mean of lines and great circles (McFadden & McElhinny 1988) | [`stats::mixed_mean`] |
//! | vector-endpoint diagram of a specimen | [`figures::VectorEndpointPlot`] |
//! | polarity per level from VGP latitude | [`strat::read_levels`], [`strat::classify`] |
//! | magnetozones with boundary uncertainties | [`strat::build_zones`], [`strat::read_zones`] |
//! | correlation with a time scale (dynamic programming), age model, rates | [`strat::correlate`], [`strat::Candidate`] |
//! | reversal test (McFadden & McElhinny 1990; Watson V_w; bootstrap) | [`fieldtests::reversal_test`] |
//! | common-mean test of two sets | [`fieldtests::compare_means`], [`fieldtests::mm90_critical_angle`] |
//! | Watson's V_w with simulated critical value | [`fieldtests::watson_v`] |
//! | bootstrap fold test (Tauxe & Watson 1994), precision ratio (McElhinny 1964) | [`fieldtests::fold_test`] |
//! | randomness of directions, exact R₀ (Watson 1956) | [`fieldtests::randomness_test`], [`fieldtests::watson_r0`] |
//! | polarity intervals, short-chron merging, censored open chron | [`reversals::intervals()`] |
//! | renewal models (exponential, gamma, Weibull, lognormal, inverse Gaussian): censored MLE, CDF, hazard, sampler | [`reversals::Model`], [`reversals::Fitted`] |
//! | AIC, BIC, Akaike weights, likelihood-ratio test | [`reversals::fit_models`] |
//! | KS and AD goodness of fit, parametric bootstrap (Lilliefors) | [`reversals::goodness_of_fit`] |
//! | hazard, P(reversal within Δ \| none for T), model averaging | [`reversals::hazard_at`], [`reversals::averaged_interval`]; the stage `hazard`, `section` and Python share: [`reversals::assess_hazard`], [`reversals::IntervalRecord::elapsed`] |
//! | reversal rate through time, Laplace trend test, clustering test | [`reversals::windowed_rate`], [`reversals::laplace_test`], [`reversals::clustering_test`] |
//! | interval-length, hazard and rate figures | [`figures::IntervalFigure`], [`figures::HazardFigure`], [`figures::RateFigure`] |
//! | equal-area projection and figures | [`figures::project`], [`figures::EqualAreaPlot`], [`figures::render`] |
//! | synthetic time scale from a renewal model (stated by its mean and shape: the fitted models' own type) | [`simulate::simulate_timescale`], [`reversals::Fitted::from_settings`] |
//! | accumulation-rate history, height ↔ age | [`simulate::AccumulationHistory`], [`simulate::parse_rates`] |
//! | synthetic section: levels, specimens, two-component demagnetization | [`simulate::simulate_section`] |
//! | probability that a sampling grid catches a chron | [`simulate::catch_probability`] |
//! | project folder: file names, settings file, table writers, every file of a synthetic folder | [`simulate::Settings`], [`simulate::steps_csv`], [`simulate::project_files`] |
//! | demagnetization kind; a synthetic section's default schedule | [`model::Treatment`], [`simulate::treatment_defaults`] |
//! | whole chain on a project folder: tables, figures, HTML report | [`section::run`], [`section::SectionRun`] |
//! | Kent (1982) elliptical confidence region; bootstrap ellipse (Tauxe et al. 1991) | [`dirstats::kent_ellipse`], [`dirstats::bootstrap_ellipse`] |
//! | TK03 giant-Gaussian-process field model, simulated; Schmidt Legendre functions | [`dirstats::Tk03`], [`dirstats::schmidt_legendre`] |
//! | elongation/inclination correction of shallowing (Tauxe & Kent 2004); a given factor (King 1955) | [`dirstats::unflatten_search`], [`dirstats::unflatten_factor`] |
//! | VGP scatter against latitude, S(λ)² = a² + (bλ)² with bootstrap | [`dirstats::fit_latitude_model`], [`dirstats::latitude_model_bootstrap`] |
//! | figures: elongation–inclination, S against latitude, ellipses on the net | [`figures::UnflattenFigure`], [`figures::LatitudeFigure`], [`figures::EllipseNet`] |
//! | one stage of the chain as reported (what ran, what it found) | [`section::Stage`] |
//! | correlation settings: penalties, rate spread, dated levels | [`strat::CorrelateOptions`], [`strat::DatedLevel`] |
//! | from a sites table to VGPs, paleopole and S_B (the stage `poles` and Python share) | [`poles::pole_summary`], [`poles::WithinSite::from_site`] |
//! | a column from a zones or levels table (the stage `correlate` and Python share) | [`strat::read_column`] |
//! | the truth file of a synthetic project folder | [`simulate::truth_document`] |
//! | errors: kinds with the offending value; kinds of table faults | [`Error`], [`TableError`], [`TableFault`] |
//! | units: accumulation rates (cm/kyr ↔ m/Myr), years ↔ Myr | [`units::cm_per_kyr_to_m_per_myr`], [`units::m_per_myr_to_cm_per_kyr`], [`units::years_to_myr`] |
//! | the number formatter of every table, CSV file and report | [`numbers::fixed`], [`numbers::push_csv`], [`numbers::scientific`] |
//! | what people read of a result: sheets, notes, cautions, JSON; the text/CSV/JSON writers | [`present::Presentation`], [`present::write_text`], [`present::write_csv`], [`present::write_json`] |
//! | one presenter per result type (directions, field tests, poles, column, correlation, renewal fits, hazard, rate, the present field, synthetic data, a section run) | [`present::mean_comparison`], [`present::poles`], [`present::correlation`], [`present::intervals`], [`present::field`], [`present::section_run`] |
//! | each caution written once | [`present::cautions`] |
//!
//! ## Where things go
//! A computation lives in the module of its concept (the table above), with `# Units`, `# Formula` and
//! `# References` and a test against an outside source. `model` holds the domain types (no file reading);
//! `table` reads tables into them; the command layer (`src/cli/`, not part of the library) parses arguments,
//! calls the library and hands the result to its presenter in `present`, whose sheets `section` also writes; the whole-output snapshot tests (`tests/snapshot_*.rs`) pin every
//! verb's output.
//!
//! ## References used throughout
//! - Fisher, R. A. (1953), Dispersion on a sphere. *Proc. R. Soc. Lond. A* 217, 295–305.
//! - Butler, R. F. (1992), *Paleomagnetism: Magnetic Domains to Geologic Terranes*. Blackwell.
//! - Fisher, N. I., Lewis, T. & Embleton, B. J. J. (1987), *Statistical Analysis of Spherical Data*. CUP.
#![warn(missing_docs)]
#![allow(
    clippy::neg_cmp_op_on_partial_ord,
    reason = "`!(x > a)` is written on purpose: it is true for NaN, so a NaN input is refused with the out-of-range values"
)]

pub mod demag;
pub mod dirstats;
pub mod error;
pub(crate) mod fastmath;
pub mod field;
pub mod fieldtests;
pub mod figures;
pub mod linalg;
pub mod model;
pub mod montecarlo;
pub mod numbers;
pub mod poles;
pub mod present;
pub mod reversals;
pub mod section;
pub mod simulate;
pub mod sphere;
pub mod stats;
pub mod strat;
pub mod table;
pub mod tolerance;
pub mod units;

pub use error::{Error, Result, TableError, TableFault};
