//! Presenter of the directions expected at sites from a pole (the inverse of the VGP), with the
//! difference from each site's observed direction when there is one.

use super::{json_num, Cell, Presentation, Sheet};
use crate::poles::ExpectedOval;
use crate::sphere::{Direction, GeoPoint};
use serde::Serialize;

/// The direction expected at one site, and the observed one if known.
#[derive(Debug, Clone)]
pub struct ExpectedAt {
    /// Site name.
    pub site: String,
    /// Site location.
    pub location: GeoPoint,
    /// Direction of the dipole field at the site.
    pub expected: Direction,
    /// Half-ranges of the expected direction from the pole's A95, when given.
    pub oval: Option<ExpectedOval>,
    /// The site's observed direction, when given.
    pub observed: Option<Direction>,
}

impl ExpectedAt {
    /// Angle between observed and expected directions, degrees.
    pub fn angle(&self) -> Option<f64> {
        self.observed.map(|o| o.angle_to(self.expected))
    }
    /// Rotation: observed − expected declination, degrees in [−180, 180).
    pub fn rotation(&self) -> Option<f64> {
        self.observed.map(|o| (o.dec - self.expected.dec + 540.0).rem_euclid(360.0) - 180.0)
    }
    /// Flattening: expected − observed inclination, degrees.
    pub fn flattening(&self) -> Option<f64> {
        self.observed.map(|o| self.expected.inc - o.inc)
    }
}

#[derive(Serialize)]
struct PoleJson {
    plat: f64,
    plon: f64,
    #[serde(serialize_with = "json_num::opt")]
    a95: Option<f64>,
}

#[derive(Serialize)]
struct SiteJson<'a> {
    site: &'a str,
    lat: f64,
    lon: f64,
    dec: f64,
    inc: f64,
    #[serde(serialize_with = "json_num::opt")]
    delta_dec: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    delta_inc: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    obs_dec: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    obs_inc: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    angle: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    rotation: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    flattening: Option<f64>,
}

#[derive(Serialize)]
struct ExpectedJson<'a> {
    pole: PoleJson,
    sites: Vec<SiteJson<'a>>,
    notes: &'a [String],
}

/// The expected directions at `sites` from `pole` (known to within `a95`°, if given).
pub fn expected(pole: GeoPoint, a95: Option<f64>, sites: &[ExpectedAt]) -> Presentation {
    let mut sheet = Sheet::new(
        &format!("Expected directions from the pole {:.2}°, {:.2}°E", pole.lat, pole.lon),
        &[
            "site",
            "lat",
            "lon",
            "dec",
            "inc",
            "delta_dec",
            "delta_inc",
            "obs_dec",
            "obs_inc",
            "angle",
            "rotation",
            "flattening",
        ],
    );
    for s in sites {
        sheet.push(vec![
            Cell::Text(s.site.clone()),
            Cell::Num(s.location.lat, 2),
            Cell::Azimuth(s.location.lon, 2),
            Cell::Azimuth(s.expected.dec, 1),
            Cell::Num(s.expected.inc, 1),
            Cell::opt(s.oval.and_then(|o| o.delta_dec), 1),
            Cell::opt(s.oval.map(|o| o.delta_inc), 1),
            Cell::opt_azimuth(s.observed.map(|o| o.dec), 1),
            Cell::opt(s.observed.map(|o| o.inc), 1),
            Cell::opt(s.angle(), 1),
            Cell::opt(s.rotation(), 1),
            Cell::opt(s.flattening(), 1),
        ]);
    }
    let notes = vec![
        "Expected directions assume a geocentric dipole whose axis passes through the pole; rotation = observed − expected declination, flattening = expected − observed inclination.".to_string(),
    ];
    let json = ExpectedJson {
        pole: PoleJson { plat: pole.lat, plon: pole.lon, a95 },
        sites: sites
            .iter()
            .map(|s| SiteJson {
                site: &s.site,
                lat: s.location.lat,
                lon: s.location.lon,
                dec: s.expected.dec,
                inc: s.expected.inc,
                delta_dec: s.oval.and_then(|o| o.delta_dec),
                delta_inc: s.oval.map(|o| o.delta_inc),
                obs_dec: s.observed.map(|o| o.dec),
                obs_inc: s.observed.map(|o| o.inc),
                angle: s.angle(),
                rotation: s.rotation(),
                flattening: s.flattening(),
            })
            .collect(),
        notes: &notes,
    };
    Presentation {
        json: serde_json::to_value(json).expect("plain data"),
        sheets: vec![sheet],
        main_sheet: 0,
        notes,
        cautions: vec![],
    }
}
