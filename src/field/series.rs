//! The present field through time: per epoch the dipole, the dip poles, the surface-intensity low and
//! the power spectrum, with the speeds of the poles and of the low's minimum.

use super::dip::{dip_pole, DipPole};
use super::error::{check, FieldError, FieldResult};
use super::grid::{intensity_low, IntensityMinimum};
use super::model::FieldModel;
use super::synthesis::REFERENCE_RADIUS_KM;
use crate::poles::gauss_dipole;
use crate::sphere::GeoPoint;

/// A commonly used contour for the extent of the surface-intensity low, nT (common practice; e.g.
/// Pavón-Carrasco & De Santis 2016, *Front. Earth Sci.* 4:40, use 32 000 nT).
pub const DEFAULT_LOW_THRESHOLD: f64 = 32_000.0;

/// What [`field_series`] computes.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SeriesOptions {
    /// First year.
    pub from: f64,
    /// Last year (included when reached by whole steps).
    pub to: f64,
    /// Years between epochs.
    pub every: f64,
    /// Threshold of the low's area and minima, nT.
    pub low_threshold: f64,
    /// Grid cell of the low search, degrees.
    pub grid_step: f64,
}

impl SeriesOptions {
    /// Validated options; years within the model are checked when the series runs.
    pub fn new(from: f64, to: f64, every: f64, low_threshold: f64) -> FieldResult<Self> {
        check("every", every, 1e-3, 1e4, "[0.001, 10000] years")?;
        check("from", from, -1e5, 1e5, "[-100000, 100000]")?;
        check("to", to, from, 1e5, "[from, 100000]")?;
        check("low threshold", low_threshold, 0.0, 1e6, "[0, 1e6] nT")?;
        let n = ((to - from) / every + 1e-9).floor() + 1.0;
        if n > 100_000.0 {
            return Err(FieldError::OutOfRange { name: "number of epochs", value: n, range: "at most 100000" });
        }
        Ok(SeriesOptions { from, to, every, low_threshold, grid_step: 1.0 })
    }

    /// Options over `model`'s epochs: `from` and `to` as given, else the model's first and last
    /// epoch (the default window of the `field series` verb and the Python package alike).
    ///
    /// # Errors
    /// As [`SeriesOptions::new`].
    pub fn within(
        model: &FieldModel,
        from: Option<f64>,
        to: Option<f64>,
        every: f64,
        low_threshold: f64,
    ) -> FieldResult<Self> {
        let from = from.unwrap_or(model.epochs[0]);
        let to = to.unwrap_or(*model.epochs.last().expect("a model has an epoch"));
        SeriesOptions::new(from, to, every, low_threshold)
    }

    /// The years of the series.
    pub fn years(&self) -> Vec<f64> {
        let n = ((self.to - self.from) / self.every + 1e-9).floor() as usize + 1;
        (0..n).map(|k| self.from + k as f64 * self.every).collect()
    }
}

/// One epoch of the series.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct EpochSummary {
    /// Decimal year.
    pub year: f64,
    /// Dipole moment, A·m².
    pub moment: f64,
    /// Rate of change of the dipole moment, % per century (from the model's coefficient rates).
    pub moment_change: f64,
    /// Dipole tilt from the rotation axis, degrees.
    pub tilt: f64,
    /// North geomagnetic pole latitude, degrees.
    pub pole_lat: f64,
    /// North geomagnetic pole longitude, degrees.
    pub pole_lon: f64,
    /// Dip pole where I = +90° (geodetic), latitude.
    pub dip_north_lat: f64,
    /// Its longitude.
    pub dip_north_lon: f64,
    /// Its speed since the previous epoch, km/yr (none for the first epoch).
    pub dip_north_speed: Option<f64>,
    /// Dip pole where I = −90° (geodetic), latitude.
    pub dip_south_lat: f64,
    /// Its longitude.
    pub dip_south_lon: f64,
    /// Its speed since the previous epoch, km/yr.
    pub dip_south_speed: Option<f64>,
    /// Lowest F on the reference sphere, nT.
    pub low_f: f64,
    /// Its geocentric latitude, degrees.
    pub low_lat: f64,
    /// Its longitude, degrees.
    pub low_lon: f64,
    /// Area below the threshold, km².
    pub low_area: f64,
    /// Number of separate minima below the threshold.
    pub low_cells: usize,
    /// Speed of the lowest point since the previous epoch along the great circle, km/yr.
    pub low_speed: Option<f64>,
    /// Its westward speed (east–west part, positive to the west), km/yr.
    pub low_west_speed: Option<f64>,
    /// The separate minima below the threshold, lowest first.
    pub low_minima: Vec<IntensityMinimum>,
    /// Lowes–Mauersberger power per degree at the reference sphere, nT², degree 1 first.
    pub spectrum: Vec<f64>,
}

/// Great-circle distance between two points on the reference sphere, km.
pub fn surface_distance_km(a: GeoPoint, b: GeoPoint) -> f64 {
    a.distance_azimuth(b).0.to_radians() * REFERENCE_RADIUS_KM
}

/// Westward displacement from `a` to `b` along the parallel of their mean latitude, km.
fn westward_km(a: GeoPoint, b: GeoPoint) -> f64 {
    let dlon = (b.lon - a.lon + 540.0).rem_euclid(360.0) - 180.0;
    -dlon.to_radians() * ((a.lat + b.lat) / 2.0).to_radians().cos() * REFERENCE_RADIUS_KM
}

/// The series of [`EpochSummary`] over the years of `opts`.
///
/// # Formula
/// Dipole: [`gauss_dipole`] of (g10, g11, h11); its change, 100 · 100 · (g·ġ)/|g|² % per century with
/// ġ the model's rate at the year. Dip poles: [`dip_pole`], each epoch started from the previous one.
/// Low: [`intensity_low`] on a 1° grid. Speeds: great-circle distance between successive epochs over
/// the years between them, on the sphere of radius 6371.2 km.
pub fn field_series(model: &FieldModel, opts: &SeriesOptions) -> FieldResult<Vec<EpochSummary>> {
    let years = opts.years();
    for &y in [years[0], *years.last().expect("one year at least")].iter() {
        model.at(y)?;
    }
    // The lows are independent of one another: computed in parallel (the result does not depend on the
    // number of threads); the dip poles follow in order, each search started from the previous pole.
    let lows: Vec<_> = {
        use rayon::prelude::*;
        years
            .par_iter()
            .map(|&y| model.at(y).and_then(|c| intensity_low(&c, opts.low_threshold, opts.grid_step)))
            .collect::<FieldResult<_>>()?
    };
    let mut out: Vec<EpochSummary> = Vec::with_capacity(years.len());
    let (mut north, mut south): (Option<GeoPoint>, Option<GeoPoint>) = (None, None);
    for (&year, low) in years.iter().zip(lows) {
        let c = model.at(year)?;
        let rate = model.rate(year)?;
        let (g10, g11, h11) = c.dipole_terms();
        let d = gauss_dipole(g10, g11, h11).map_err(|_| FieldError::OutOfRange {
            name: "degree-1 coefficients",
            value: g10,
            range: "not all zero",
        })?;
        let (r10, r11, s11) = rate.dipole_terms();
        let change = 1e4 * (g10 * r10 + g11 * r11 + h11 * s11) / (d.b0_nt * d.b0_nt);
        let dn = dip_pole(&c, DipPole::Down, north)?;
        let ds = dip_pole(&c, DipPole::Up, south)?;
        let prev = out.last();
        let lowp = GeoPoint { lat: low.minimum.lat, lon: low.minimum.lon };
        let speed =
            |a: Option<GeoPoint>, b: GeoPoint| prev.zip(a).map(|(p, a)| surface_distance_km(a, b) / (year - p.year));
        let prev_low = prev.map(|p| GeoPoint { lat: p.low_lat, lon: p.low_lon });
        out.push(EpochSummary {
            year,
            moment: d.moment,
            moment_change: change,
            tilt: d.tilt,
            pole_lat: d.pole.lat,
            pole_lon: d.pole.lon,
            dip_north_lat: dn.lat,
            dip_north_lon: dn.lon,
            dip_north_speed: speed(north, dn),
            dip_south_lat: ds.lat,
            dip_south_lon: ds.lon,
            dip_south_speed: speed(south, ds),
            low_f: low.minimum.f,
            low_lat: low.minimum.lat,
            low_lon: low.minimum.lon,
            low_area: low.area_km2,
            low_cells: low.minima.len(),
            low_speed: speed(prev_low, lowp),
            low_west_speed: prev.zip(prev_low).map(|(p, a)| westward_km(a, lowp) / (year - p.year)),
            low_minima: low.minima,
            spectrum: c.power_spectrum(),
        });
        (north, south) = (Some(dn), Some(ds));
    }
    Ok(out)
}
