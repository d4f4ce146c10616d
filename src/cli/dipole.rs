//! `lodestone dipole vadm|vdm|gauss`: dipole moments from intensity or from Gauss coefficients.

use super::{Cell, Ctx, Presentation, Sheet};
use anyhow::Result;
use clap::{Args, Subcommand};
use lodestone::poles::{gauss_dipole, vadm, vdm, EARTH_RADIUS_M, IGRF_REFERENCE_RADIUS_M};
use serde_json::json;

#[derive(Debug, Args)]
pub struct DipoleArgs {
    #[command(subcommand)]
    pub what: DipoleWhat,
}

#[derive(Debug, Subcommand)]
pub enum DipoleWhat {
    /// Virtual axial dipole moment from a paleointensity and the site latitude.
    Vadm {
        /// Paleointensity, µT.
        #[arg(long)]
        intensity: f64,
        /// Site latitude, degrees.
        #[arg(long, allow_hyphen_values = true)]
        lat: f64,
    },
    /// Virtual dipole moment from a paleointensity and its inclination.
    Vdm {
        /// Paleointensity, µT.
        #[arg(long)]
        intensity: f64,
        /// Inclination, degrees (positive down).
        #[arg(long, allow_hyphen_values = true)]
        inc: f64,
    },
    /// Moment, tilt and north geomagnetic pole of degree-1 Gauss coefficients (nT).
    Gauss {
        #[arg(long, allow_hyphen_values = true)]
        g10: f64,
        #[arg(long, allow_hyphen_values = true)]
        g11: f64,
        #[arg(long, allow_hyphen_values = true)]
        h11: f64,
    },
}

pub fn run(a: DipoleArgs, _ctx: &mut Ctx) -> Result<Presentation> {
    let mut notes = Vec::new();
    let (json, sec) = match a.what {
        DipoleWhat::Vadm { intensity, lat } => {
            let m = vadm(intensity, lat)?;
            notes.push(format!("VADM assumes a geocentric axial dipole at the site's present latitude; Earth radius {EARTH_RADIUS_M} m, μ0 = 4π × 10⁻⁷ H/m."));
            let mut s = Sheet::new("Virtual axial dipole moment", &["kind", "intensity_ut", "lat", "moment"]);
            s.rows.push(vec![
                Cell::Text("vadm".into()),
                Cell::Num(intensity, 2),
                Cell::Num(lat, 2),
                Cell::Text(format!("{m:.4e}")),
            ]);
            (json!({"kind": "vadm", "intensity": intensity, "lat": lat, "moment": m, "radius_m": EARTH_RADIUS_M}), s)
        }
        DipoleWhat::Vdm { intensity, inc } => {
            let m = vdm(intensity, inc)?;
            let plat = lodestone::poles::paleolatitude_range(inc, 0.0)?.paleolat;
            notes.push(format!("VDM uses the magnetic (paleo)latitude {plat:.2}° from tan I = 2 tan λ; Earth radius {EARTH_RADIUS_M} m, μ0 = 4π × 10⁻⁷ H/m."));
            let mut s = Sheet::new("Virtual dipole moment", &["kind", "intensity_ut", "inc", "paleolat", "moment"]);
            s.rows.push(vec![
                Cell::Text("vdm".into()),
                Cell::Num(intensity, 2),
                Cell::Num(inc, 2),
                Cell::Num(plat, 2),
                Cell::Text(format!("{m:.4e}")),
            ]);
            (
                json!({"kind": "vdm", "intensity": intensity, "inc": inc, "paleolat": plat, "moment": m, "radius_m": EARTH_RADIUS_M}),
                s,
            )
        }
        DipoleWhat::Gauss { g10, g11, h11 } => {
            let d = gauss_dipole(g10, g11, h11)?;
            notes.push(format!("Geocentric dipole of the degree-1 coefficients at the reference radius {IGRF_REFERENCE_RADIUS_M} m (IGRF convention)."));
            if d.reversed {
                notes.push("g10 > 0: the dipole points the other way from today's field; the north geomagnetic pole (where the field points down) lies in the southern hemisphere.".into());
            }
            let mut s = Sheet::new("Geocentric dipole", &["kind", "b0_nt", "moment", "tilt", "pole_lat", "pole_lon"]);
            s.rows.push(vec![
                Cell::Text("gauss".into()),
                Cell::Num(d.b0_nt, 1),
                Cell::Text(format!("{:.4e}", d.moment)),
                Cell::Num(d.tilt, 2),
                Cell::Num(d.pole.lat, 2),
                Cell::Azimuth(d.pole.lon, 2),
            ]);
            (
                json!({"kind": "gauss", "g10": g10, "g11": g11, "h11": h11, "b0": d.b0_nt, "moment": d.moment,
                       "tilt": d.tilt, "pole_lat": d.pole.lat, "pole_lon": d.pole.lon, "reversed": d.reversed,
                       "radius_m": IGRF_REFERENCE_RADIUS_M}),
                s,
            )
        }
    };
    let mut json = json;
    json["notes"] = json!(notes);
    Ok(Presentation { json, sheets: vec![sec], main_sheet: 0, cautions: vec![], notes })
}
