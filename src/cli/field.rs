//! `lodestone field series|at|context`: the present field from a spherical-harmonic model.

use super::{Ctx, Presentation};
use anyhow::{Context as _, Result};
use clap::{Args, Subcommand};
use lodestone::field::{
    field_at, field_context, field_series, FieldModel, Frame, PaleoRecord, SeriesOptions, Site, DEFAULT_LOW_THRESHOLD,
};
use lodestone::field::{intensity_grid, intensity_low};
use lodestone::figures::{FieldSeriesFigure, IntensityMap};
use lodestone::model::TimeScale;
use lodestone::present::field as present;
use lodestone::table::Table;
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct FieldArgs {
    #[command(subcommand)]
    pub what: FieldWhat,
}

#[derive(Debug, Subcommand)]
pub enum FieldWhat {
    /// Per epoch: dipole moment and its change, tilt, geomagnetic pole, dip poles and their speed,
    /// the surface-intensity low (minimum, area below a threshold, separate minima, drift).
    Series(SeriesArgs),
    /// Field elements X, Y, Z, H, F, D, I at one point and year.
    At(AtArgs),
    /// The present dipole moment and its change beside a paleointensity record (not a forecast).
    Context(ContextArgs),
}

#[derive(Debug, Args)]
pub struct SeriesArgs {
    /// Field-model table (epoch, degree, order, g, h); default the bundled IGRF-14.
    pub model: Option<PathBuf>,
    /// First year (default the model's first epoch).
    #[arg(long, allow_hyphen_values = true)]
    pub from: Option<f64>,
    /// Last year (default the model's last epoch).
    #[arg(long, allow_hyphen_values = true)]
    pub to: Option<f64>,
    /// Years between epochs.
    #[arg(long, default_value_t = 5.0)]
    pub every: f64,
    /// Threshold of the surface-intensity low's area and minima, nT.
    #[arg(long, default_value_t = DEFAULT_LOW_THRESHOLD)]
    pub low_threshold: f64,
    /// Time-series figure of moment, dip-pole speeds and the low (.svg or .png).
    #[arg(long)]
    pub plot: Option<PathBuf>,
    /// Map of F at the reference sphere for the last year of the series, contours and the low marked.
    #[arg(long)]
    pub map: Option<PathBuf>,
}

#[derive(Debug, Args)]
pub struct AtArgs {
    /// Field-model table; default the bundled IGRF-14.
    pub model: Option<PathBuf>,
    /// Decimal year.
    #[arg(long, allow_hyphen_values = true)]
    pub year: f64,
    /// Latitude, degrees (geodetic, WGS84, unless --geocentric).
    #[arg(long, allow_hyphen_values = true)]
    pub lat: f64,
    /// Longitude east, degrees.
    #[arg(long, allow_hyphen_values = true)]
    pub lon: f64,
    /// Altitude, km (above the WGS84 ellipsoid; above the 6371.2 km sphere with --geocentric).
    #[arg(long, default_value_t = 0.0, allow_hyphen_values = true)]
    pub altitude: f64,
    /// Latitude and altitude are geocentric (sphere of radius 6371.2 km).
    #[arg(long)]
    pub geocentric: bool,
}

#[derive(Debug, Args)]
pub struct ContextArgs {
    /// Field-model table; default the bundled IGRF-14.
    pub model: Option<PathBuf>,
    /// Paleointensity record (age in Ma, vadm in A·m², optional vadm_sigma).
    #[arg(long)]
    pub record: PathBuf,
    /// Polarity time scale (young, old, polarity), to count drops followed by a reversal.
    #[arg(long)]
    pub timescale: Option<PathBuf>,
    /// Time after a drop within which a polarity boundary counts as following it, Myr.
    #[arg(long, default_value_t = 0.05)]
    pub within: f64,
}

pub fn run(a: FieldArgs, ctx: &mut Ctx) -> Result<Presentation> {
    match a.what {
        FieldWhat::Series(s) => series(s, ctx),
        FieldWhat::At(s) => at(s, ctx),
        FieldWhat::Context(s) => context(s, ctx),
    }
}

fn load_model(path: &Option<PathBuf>, ctx: &mut Ctx) -> Result<FieldModel> {
    match path {
        None => Ok(FieldModel::igrf14()),
        Some(p) => {
            ctx.inputs.add(p);
            Ok(FieldModel::read(p)?)
        }
    }
}

fn at(a: AtArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let model = load_model(&a.model, ctx)?;
    let frame = if a.geocentric { Frame::Geocentric } else { Frame::Geodetic };
    let site = Site::new(a.lat, a.lon, a.altitude, frame)?;
    let e = field_at(&model.at(a.year)?, &site);
    Ok(present::field_at(&model, a.year, &site, a.altitude, &e))
}

fn series(a: SeriesArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let model = load_model(&a.model, ctx)?;
    let opts = SeriesOptions::within(&model, a.from, a.to, a.every, a.low_threshold)?;
    let to = opts.to;
    let rows = field_series(&model, &opts)?;
    if let Some(p) = &a.plot {
        let title =
            format!("The present field through time ({}): a description of a model, not a forecast", model.name);
        super::write_figure(&FieldSeriesFigure { title, epochs: rows.clone() }, p, &ctx.inputs)?;
    }
    if let Some(p) = &a.map {
        let year = rows.last().map_or(to, |r| r.year);
        let c = model.at(year)?;
        let grid = intensity_grid(&c, 2.0)?;
        let low = intensity_low(&c, a.low_threshold, 1.0)?;
        let title = format!("Total intensity at the reference sphere, {year} ({})", model.name);
        let fig = IntensityMap { title, grid, interval: 4000.0, threshold: a.low_threshold, minima: low.minima };
        super::write_figure(&fig, p, &ctx.inputs)?;
    }
    Ok(present::field_series(&model, &rows, to, a.low_threshold))
}

fn context(a: ContextArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let model = load_model(&a.model, ctx)?;
    ctx.inputs.add(&a.record);
    let record = PaleoRecord::from_table(&Table::read(&a.record)?)?;
    let ts = match &a.timescale {
        Some(p) => {
            ctx.inputs.add(p);
            Some(TimeScale::from_table(&Table::read(p)?).with_context(|| format!("reading {}", p.display()))?)
        }
        None => None,
    };
    let c = field_context(&model, &record, ts.as_ref(), a.within)?;
    Ok(present::field_context(&model, &record.source, &c))
}
