//! Presenters of the dipole moments: VADM and VDM from a paleointensity, and the geocentric dipole
//! of degree-1 Gauss coefficients.

use super::{Cell, Presentation, Sheet};
use crate::poles::{GaussDipole, EARTH_RADIUS_M, IGRF_REFERENCE_RADIUS_M};
use serde::Serialize;

/// JSON of a VADM.
#[derive(Serialize)]
struct VadmJson<'a> {
    kind: &'static str,
    intensity: f64,
    lat: f64,
    moment: f64,
    radius_m: f64,
    notes: &'a [String],
}

/// JSON of a VDM.
#[derive(Serialize)]
struct VdmJson<'a> {
    kind: &'static str,
    intensity: f64,
    inc: f64,
    paleolat: f64,
    moment: f64,
    radius_m: f64,
    notes: &'a [String],
}

/// JSON of a Gauss dipole.
#[derive(Serialize)]
struct GaussJson<'a> {
    kind: &'static str,
    g10: f64,
    g11: f64,
    h11: f64,
    b0: f64,
    moment: f64,
    tilt: f64,
    pole_lat: f64,
    pole_lon: f64,
    reversed: bool,
    radius_m: f64,
    notes: &'a [String],
}

/// A moment in A·m², shown with four decimals of mantissa.
fn moment_cell(m: f64) -> Cell {
    Cell::Text(format!("{m:.4e}"))
}

fn one_sheet(json: serde_json::Value, sheet: Sheet, notes: Vec<String>) -> Presentation {
    Presentation { json, sheets: vec![sheet], main_sheet: 0, notes, cautions: vec![] }
}

/// The virtual axial dipole moment `moment` (A·m²) of `intensity` µT at site latitude `lat`°.
pub fn vadm(intensity: f64, lat: f64, moment: f64) -> Presentation {
    let notes = vec![format!("VADM assumes a geocentric axial dipole at the site's present latitude; Earth radius {EARTH_RADIUS_M} m, μ0 = 4π × 10⁻⁷ H/m.")];
    let mut s = Sheet::new("Virtual axial dipole moment", &["kind", "intensity_ut", "lat", "moment"]);
    s.push(vec![Cell::Text("vadm".into()), Cell::Num(intensity, 2), Cell::Num(lat, 2), moment_cell(moment)]);
    let json = VadmJson { kind: "vadm", intensity, lat, moment, radius_m: EARTH_RADIUS_M, notes: &notes };
    one_sheet(serde_json::to_value(json).expect("plain data"), s, notes)
}

/// The virtual dipole moment `moment` (A·m²) of `intensity` µT with inclination `inc`°, whose
/// magnetic latitude is `paleolat`°.
pub fn vdm(intensity: f64, inc: f64, paleolat: f64, moment: f64) -> Presentation {
    let notes = vec![format!("VDM uses the magnetic (paleo)latitude {paleolat:.2}° from tan I = 2 tan λ; Earth radius {EARTH_RADIUS_M} m, μ0 = 4π × 10⁻⁷ H/m.")];
    let mut s = Sheet::new("Virtual dipole moment", &["kind", "intensity_ut", "inc", "paleolat", "moment"]);
    s.push(vec![
        Cell::Text("vdm".into()),
        Cell::Num(intensity, 2),
        Cell::Num(inc, 2),
        Cell::Num(paleolat, 2),
        moment_cell(moment),
    ]);
    let json = VdmJson { kind: "vdm", intensity, inc, paleolat, moment, radius_m: EARTH_RADIUS_M, notes: &notes };
    one_sheet(serde_json::to_value(json).expect("plain data"), s, notes)
}

/// The geocentric dipole `d` of the coefficients (g10, g11, h11), nT.
pub fn gauss(g10: f64, g11: f64, h11: f64, d: &GaussDipole) -> Presentation {
    let mut notes = vec![format!(
        "Geocentric dipole of the degree-1 coefficients at the reference radius {IGRF_REFERENCE_RADIUS_M} m (IGRF convention)."
    )];
    if d.reversed {
        notes.push("g10 > 0: the dipole points the other way from today's field; the north geomagnetic pole (where the field points down) lies in the southern hemisphere.".into());
    }
    let mut s = Sheet::new("Geocentric dipole", &["kind", "b0_nt", "moment", "tilt", "pole_lat", "pole_lon"]);
    s.push(vec![
        Cell::Text("gauss".into()),
        Cell::Num(d.b0_nt, 1),
        moment_cell(d.moment),
        Cell::Num(d.tilt, 2),
        Cell::Num(d.pole.lat, 2),
        Cell::Azimuth(d.pole.lon, 2),
    ]);
    let json = GaussJson {
        kind: "gauss",
        g10,
        g11,
        h11,
        b0: d.b0_nt,
        moment: d.moment,
        tilt: d.tilt,
        pole_lat: d.pole.lat,
        pole_lon: d.pole.lon,
        reversed: d.reversed,
        radius_m: IGRF_REFERENCE_RADIUS_M,
        notes: &notes,
    };
    one_sheet(serde_json::to_value(json).expect("plain data"), s, notes)
}
