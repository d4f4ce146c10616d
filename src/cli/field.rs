//! `lodestone field series|at|context`: the present field from a spherical-harmonic model.

use super::{Cell, Ctx, Presentation, Sheet};
use anyhow::{Context as _, Result};
use clap::{Args, Subcommand};
use lodestone::field::{
    field_at, field_context, field_series, EpochSummary, FieldModel, Frame, PaleoRecord, SeriesOptions, Site,
    DEFAULT_LOW_THRESHOLD,
};
use lodestone::field::{intensity_grid, intensity_low};
use lodestone::figures::{FieldSeriesFigure, IntensityMap};
use lodestone::model::TimeScale;
use lodestone::table::Table;
use serde_json::json;
use std::path::PathBuf;

/// The caution every `field` verb prints.
pub const NOT_A_FORECAST: &str = "These numbers describe a model of the observed field (smoothed to its highest degree); they are not a forecast of a reversal. Local practice and the published literature decide what they mean.";

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

fn model_json(m: &FieldModel) -> serde_json::Value {
    let (first, last) = m.span();
    json!({"name": m.name, "degree": m.degree(), "first_epoch": m.epochs[0],
           "last_epoch": m.epochs.last(), "defined_from": first, "defined_to": last})
}

fn at(a: AtArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let model = load_model(&a.model, ctx)?;
    let frame = if a.geocentric { Frame::Geocentric } else { Frame::Geodetic };
    let site = Site::new(a.lat, a.lon, a.altitude, frame)?;
    let e = field_at(&model.at(a.year)?, &site);
    let mut notes = vec![match frame {
        Frame::Geodetic => "Geodetic latitude on the WGS84 ellipsoid; X, Y, Z along the local ellipsoidal north, east and down.".to_string(),
        Frame::Geocentric => "Geocentric latitude; altitude above the sphere of radius 6371.2 km; X, Y, Z along the geocentric north, east and down.".to_string(),
    }];
    let last = *model.epochs.last().expect("an epoch");
    if a.year > last {
        notes.push(format!("{} is after the model's last epoch ({last}): the coefficients are carried forward with its secular variation, which is a short extrapolation, not a forecast.", a.year));
    }
    notes.push(NOT_A_FORECAST.into());
    let mut s =
        Sheet::new("Field elements", &["year", "lat", "lon", "altitude", "x", "y", "z", "h", "f", "dec", "inc"]);
    s.rows.push(vec![
        Cell::Num(a.year, 3),
        Cell::Num(site.lat, 4),
        Cell::Azimuth(site.lon, 4),
        Cell::Num(a.altitude, 3),
        Cell::Num(e.x, 1),
        Cell::Num(e.y, 1),
        Cell::Num(e.z, 1),
        Cell::Num(e.h, 1),
        Cell::Num(e.f, 1),
        Cell::Azimuth(e.dec, 2),
        Cell::Num(e.inc, 2),
    ]);
    let json = json!({"model": model_json(&model), "year": a.year, "lat": site.lat, "lon": site.lon,
        "altitude": a.altitude, "frame": frame, "x": e.x, "y": e.y, "z": e.z, "h": e.h, "f": e.f,
        "dec": e.dec, "inc": e.inc, "notes": notes});
    Ok(Presentation { json, sheets: vec![s], main_sheet: 0, cautions: vec![], notes })
}

fn series(a: SeriesArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let model = load_model(&a.model, ctx)?;
    let from = a.from.unwrap_or(model.epochs[0]);
    let to = a.to.unwrap_or(*model.epochs.last().expect("an epoch"));
    let opts = SeriesOptions::new(from, to, a.every, a.low_threshold)?;
    let rows = field_series(&model, &opts)?;
    let mut notes = vec![
        "Dipole from g10, g11, h11 at the reference radius 6371.2 km; moment_change is its rate in % per century from the model's coefficient rates. Dip poles on the WGS84 surface (geodetic), where the horizontal field vanishes: dip_north where the field points down, dip_south where it points up.".to_string(),
        format!("The surface-intensity low: the lowest total intensity on the sphere of radius 6371.2 km (geocentric latitude), refined from a 1° grid; low_area is the area below {} nT; low_cells counts the separate minima below it; low_speed and low_west_speed are the drift of the lowest point since the previous epoch (km/yr; positive west).", a.low_threshold),
        "The model is linear in time between its epochs, so speeds between years of one interval are nearly constant and change in steps at the epochs.".to_string(),
    ];
    let last = *model.epochs.last().expect("an epoch");
    if to > last {
        notes.push(format!("Years after {last} (the model's last epoch) carry its coefficients forward with the secular variation: a short extrapolation, not a forecast."));
    }
    notes.push(NOT_A_FORECAST.into());
    let mut sheets = vec![series_section(&rows)];
    if let Some(last) = rows.last() {
        let mut sp = Sheet::new(
            &format!("Lowes–Mauersberger spectrum at the reference sphere, {}", last.year),
            &["degree", "power_nt2"],
        );
        for (k, p) in last.spectrum.iter().enumerate() {
            sp.rows.push(vec![Cell::Int(k as i64 + 1), Cell::Num(*p, 1)]);
        }
        sheets.push(sp);
    }
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
    let json = json!({"model": model_json(&model), "low_threshold": a.low_threshold, "epochs": rows, "notes": notes});
    Ok(Presentation { json, sheets, main_sheet: 0, cautions: vec![], notes })
}

fn series_section(rows: &[EpochSummary]) -> Sheet {
    let mut s = Sheet::new(
        "The present field through time",
        &[
            "year",
            "moment",
            "moment_change",
            "tilt",
            "pole_lat",
            "pole_lon",
            "dip_north_lat",
            "dip_north_lon",
            "dip_north_speed",
            "dip_south_lat",
            "dip_south_lon",
            "dip_south_speed",
            "low_f",
            "low_lat",
            "low_lon",
            "low_area",
            "low_cells",
            "low_speed",
            "low_west_speed",
        ],
    );
    for r in rows {
        s.rows.push(vec![
            Cell::Num(r.year, 2),
            Cell::Text(format!("{:.4e}", r.moment)),
            Cell::Num(r.moment_change, 2),
            Cell::Num(r.tilt, 2),
            Cell::Num(r.pole_lat, 2),
            Cell::Azimuth(r.pole_lon, 2),
            Cell::Num(r.dip_north_lat, 2),
            Cell::Azimuth(r.dip_north_lon, 2),
            Cell::opt(r.dip_north_speed, 1),
            Cell::Num(r.dip_south_lat, 2),
            Cell::Azimuth(r.dip_south_lon, 2),
            Cell::opt(r.dip_south_speed, 1),
            Cell::Num(r.low_f, 0),
            Cell::Num(r.low_lat, 2),
            Cell::Azimuth(r.low_lon, 2),
            Cell::Text(format!("{:.4e}", r.low_area)),
            Cell::Int(r.low_cells as i64),
            Cell::opt(r.low_speed, 1),
            Cell::opt(r.low_west_speed, 1),
        ]);
    }
    s
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
    let mut notes = vec![
        format!("A comparison of a model of today's field with a record of the past, not a forecast: the record's changes are taken over windows as long as the model's span ({:.0} years), but the record's ages are {:.4} Myr apart (median) and records are smoothed, which hides changes as fast as today's; an extreme percentile of the present change is expected for that reason alone.", c.window_myr * 1e6, c.record_spacing_myr),
        format!("drops_like_present counts separate episodes of the record with a {} of {:.2} % or more over {:.0} years.", if c.present_change < 0.0 { "fall" } else { "rise" }, c.present_change.abs(), c.window_myr * 1e6),
    ];
    if let (Some(n), Some(share)) = (c.drops_before_reversal, c.windows_before_reversal) {
        notes.push(format!("{n} of {} such episodes were followed by a polarity boundary within {} Myr; of all windows, {:.1} % were, for comparison.", c.drops_like_present, c.within_myr, 100.0 * share));
    }
    notes.push(NOT_A_FORECAST.into());
    let mut s = Sheet::new("The present dipole beside the record", &["quantity", "value"]);
    let mut row = |k: &str, v: Cell| s.rows.push(vec![Cell::Text(k.into()), v]);
    row("present_year", Cell::Num(c.present_year, 1));
    row("present_moment", Cell::Text(format!("{:.4e}", c.present_moment)));
    row("percentile", Cell::Num(c.percentile, 1));
    row("present_change", Cell::Num(c.present_change, 2));
    row("window_myr", Cell::Num(c.window_myr, 6));
    row("n_windows", Cell::Int(c.n_windows as i64));
    row("change_percentile", Cell::Num(c.change_percentile, 1));
    row("change_median", Cell::Num(c.change_quantiles[2], 3));
    row("drops_like_present", Cell::Int(c.drops_like_present as i64));
    row("drops_before_reversal", c.drops_before_reversal.map_or(Cell::Empty, |n| Cell::Int(n as i64)));
    let mut json = serde_json::to_value(&c)?;
    json["model"] = model_json(&model);
    json["record"] = json!(record.source);
    json["notes"] = json!(notes);
    Ok(Presentation { json, sheets: vec![s], main_sheet: 0, cautions: vec![], notes })
}
