//! Presenters of the present field from a spherical-harmonic model: the elements at a point, the
//! series of epochs, and the present dipole beside a paleointensity record. The caution
//! ([`cautions::PRESENT_FIELD`]) closes each; the JSON `notes` list holds the notes and the caution,
//! in the order they are printed.

use super::{cautions, Cell, Presentation, Sheet};
use crate::field::{EpochSummary, FieldContext, FieldElements, FieldModel, Frame, Site};
use crate::numbers::scientific;
use serde::Serialize;

/// The model as the JSON of every `field` result names it.
#[derive(Serialize)]
struct ModelView<'a> {
    name: &'a str,
    degree: usize,
    first_epoch: f64,
    last_epoch: Option<&'a f64>,
    defined_from: f64,
    defined_to: f64,
}

impl<'a> ModelView<'a> {
    fn of(m: &'a FieldModel) -> Self {
        let (defined_from, defined_to) = m.span();
        ModelView {
            name: &m.name,
            degree: m.degree(),
            first_epoch: m.epochs[0],
            last_epoch: m.epochs.last(),
            defined_from,
            defined_to,
        }
    }
}

/// The model's last epoch, years.
fn last_epoch(m: &FieldModel) -> f64 {
    *m.epochs.last().expect("a field model has an epoch")
}

/// The notes followed by the cautions, as the JSON lists them.
fn all_notes(notes: &[String], cautions: &[String]) -> Vec<String> {
    notes.iter().chain(cautions).cloned().collect()
}

fn finish<T: Serialize>(view: &T, sheets: Vec<Sheet>, notes: Vec<String>, cautions: Vec<String>) -> Presentation {
    let json = serde_json::to_value(view).expect("a field view serializes");
    Presentation { json, sheets, main_sheet: 0, notes, cautions }
}

#[derive(Serialize)]
struct AtView<'a> {
    model: ModelView<'a>,
    year: f64,
    lat: f64,
    lon: f64,
    altitude: f64,
    frame: Frame,
    #[serde(flatten)]
    elements: &'a FieldElements,
    notes: Vec<String>,
}

/// The field elements `e` of `model` at `site` in `year` (`altitude` as the user gave it, km).
pub fn field_at(model: &FieldModel, year: f64, site: &Site, altitude: f64, e: &FieldElements) -> Presentation {
    let mut notes = vec![match site.frame {
        Frame::Geodetic => "Geodetic latitude on the WGS84 ellipsoid; X, Y, Z along the local ellipsoidal north, east and down.".to_string(),
        Frame::Geocentric => "Geocentric latitude; altitude above the sphere of radius 6371.2 km; X, Y, Z along the geocentric north, east and down.".to_string(),
    }];
    let last = last_epoch(model);
    if year > last {
        notes.push(format!("{year} is after the model's last epoch ({last}): the coefficients are carried forward with its secular variation, which is a short extrapolation, not a forecast."));
    }
    let cautions = vec![cautions::PRESENT_FIELD.to_string()];
    let mut s =
        Sheet::new("Field elements", &["year", "lat", "lon", "altitude", "x", "y", "z", "h", "f", "dec", "inc"]);
    s.push(vec![
        Cell::Num(year, 3),
        Cell::Num(site.lat, 4),
        Cell::Azimuth(site.lon, 4),
        Cell::Num(altitude, 3),
        Cell::Num(e.x, 1),
        Cell::Num(e.y, 1),
        Cell::Num(e.z, 1),
        Cell::Num(e.h, 1),
        Cell::Num(e.f, 1),
        Cell::Azimuth(e.dec, 2),
        Cell::Num(e.inc, 2),
    ]);
    let view = AtView {
        model: ModelView::of(model),
        year,
        lat: site.lat,
        lon: site.lon,
        altitude,
        frame: site.frame,
        elements: e,
        notes: all_notes(&notes, &cautions),
    };
    finish(&view, vec![s], notes, cautions)
}

#[derive(Serialize)]
struct SeriesView<'a> {
    model: ModelView<'a>,
    low_threshold: f64,
    epochs: &'a [EpochSummary],
    notes: Vec<String>,
}

/// The series `rows` of `model` (through the year `to`; the intensity low below `low_threshold` nT).
pub fn field_series(model: &FieldModel, rows: &[EpochSummary], to: f64, low_threshold: f64) -> Presentation {
    let mut notes = vec![
        "Dipole from g10, g11, h11 at the reference radius 6371.2 km; moment_change is its rate in % per century from the model's coefficient rates. Dip poles on the WGS84 surface (geodetic), where the horizontal field vanishes: dip_north where the field points down, dip_south where it points up.".to_string(),
        format!("The surface-intensity low: the lowest total intensity on the sphere of radius 6371.2 km (geocentric latitude), refined from a 1° grid; low_area is the area below {low_threshold} nT; low_cells counts the separate minima below it; low_speed and low_west_speed are the drift of the lowest point since the previous epoch (km/yr; positive west)."),
        "The model is linear in time between its epochs, so speeds between years of one interval are nearly constant and change in steps at the epochs.".to_string(),
    ];
    let last = last_epoch(model);
    if to > last {
        notes.push(format!("Years after {last} (the model's last epoch) carry its coefficients forward with the secular variation: a short extrapolation, not a forecast."));
    }
    let cautions = vec![cautions::PRESENT_FIELD.to_string()];
    let mut sheets = vec![series_sheet(rows)];
    if let Some(last) = rows.last() {
        let mut sp = Sheet::new(
            &format!("Lowes–Mauersberger spectrum at the reference sphere, {}", last.year),
            &["degree", "power_nt2"],
        );
        for (k, p) in last.spectrum.iter().enumerate() {
            sp.push(vec![Cell::Int(k as i64 + 1), Cell::Num(*p, 1)]);
        }
        sheets.push(sp);
    }
    let view =
        SeriesView { model: ModelView::of(model), low_threshold, epochs: rows, notes: all_notes(&notes, &cautions) };
    finish(&view, sheets, notes, cautions)
}

/// One row per epoch of the series.
fn series_sheet(rows: &[EpochSummary]) -> Sheet {
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
        s.push(vec![
            Cell::Num(r.year, 2),
            Cell::Text(scientific(r.moment, 4)),
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
            Cell::Text(scientific(r.low_area, 4)),
            Cell::Int(r.low_cells as i64),
            Cell::opt(r.low_speed, 1),
            Cell::opt(r.low_west_speed, 1),
        ]);
    }
    s
}

#[derive(Serialize)]
struct ContextView<'a> {
    #[serde(flatten)]
    context: &'a FieldContext,
    model: ModelView<'a>,
    record: &'a str,
    notes: Vec<String>,
}

/// The present dipole of `model` beside the paleointensity record named `record`.
pub fn field_context(model: &FieldModel, record: &str, c: &FieldContext) -> Presentation {
    let window_years = crate::units::myr_to_years(c.window_myr);
    let mut notes = vec![
        format!("A comparison of a model of today's field with a record of the past, not a forecast: the record's changes are taken over windows as long as the model's span ({window_years:.0} years), but the record's ages are {:.4} Myr apart (median) and records are smoothed, which hides changes as fast as today's; an extreme percentile of the present change is expected for that reason alone.", c.record_spacing_myr),
        format!("drops_like_present counts separate episodes of the record with a {} of {:.2} % or more over {window_years:.0} years.", if c.present_change < 0.0 { "fall" } else { "rise" }, c.present_change.abs()),
    ];
    if let (Some(n), Some(share)) = (c.drops_before_reversal, c.windows_before_reversal) {
        notes.push(format!("{n} of {} such episodes were followed by a polarity boundary within {} Myr; of all windows, {:.1} % were, for comparison.", c.drops_like_present, c.within_myr, 100.0 * share));
    }
    let cautions = vec![cautions::PRESENT_FIELD.to_string()];
    let mut s = Sheet::new("The present dipole beside the record", &["quantity", "value"]);
    let mut row = |k: &str, v: Cell| s.push(vec![Cell::Text(k.into()), v]);
    row("present_year", Cell::Num(c.present_year, 1));
    row("present_moment", Cell::Text(scientific(c.present_moment, 4)));
    row("percentile", Cell::Num(c.percentile, 1));
    row("present_change", Cell::Num(c.present_change, 2));
    row("window_myr", Cell::Num(c.window_myr, 6));
    row("n_windows", Cell::Int(c.n_windows as i64));
    row("change_percentile", Cell::Num(c.change_percentile, 1));
    row("change_median", Cell::Num(c.change_quantiles[2], 3));
    row("drops_like_present", Cell::Int(c.drops_like_present as i64));
    row("drops_before_reversal", c.drops_before_reversal.map_or(Cell::Empty, |n| Cell::Int(n as i64)));
    let view = ContextView { context: c, model: ModelView::of(model), record, notes: all_notes(&notes, &cautions) };
    finish(&view, vec![s], notes, cautions)
}
