//! `lodestone expected`: the direction a geocentric dipole with a given pole produces at a site (the
//! inverse of the VGP), for one site or for every site of a sites table.

use super::{Cell, Ctx, Presentation, Sheet};
use anyhow::{bail, Result};
use clap::Args;
use lodestone::poles::{expected_direction, expected_oval};
use lodestone::sphere::GeoPoint;
use lodestone::table::{read_sites, Table};
use serde_json::json;
use std::path::PathBuf;

#[derive(Debug, Args)]
pub struct ExpectedArgs {
    /// Pole latitude, degrees.
    #[arg(long, allow_hyphen_values = true)]
    pub pole_lat: f64,
    /// Pole longitude, degrees east.
    #[arg(long, allow_hyphen_values = true)]
    pub pole_lon: f64,
    /// A95 of the pole, degrees: adds the uncertainty of the expected declination and inclination.
    #[arg(long)]
    pub a95: Option<f64>,
    /// Site latitude, degrees (with --lon).
    #[arg(long, allow_hyphen_values = true, requires = "lon", conflicts_with = "sites")]
    pub lat: Option<f64>,
    /// Site longitude, degrees east (with --lat).
    #[arg(long, allow_hyphen_values = true, requires = "lat")]
    pub lon: Option<f64>,
    /// A sites table: every site gets its expected direction and the difference from its observed one.
    #[arg(long)]
    pub sites: Option<PathBuf>,
}

pub fn run(a: ExpectedArgs, ctx: &mut Ctx) -> Result<Presentation> {
    let pole = GeoPoint::new(a.pole_lat, a.pole_lon).map_err(|e| anyhow::anyhow!("--pole-lat/--pole-lon: {e}"))?;
    if let Some(x) = a.a95 {
        lodestone::error::check_range("--a95", x, 0.0, 90.0, "[0, 90]")?;
    }
    let mut sec = Sheet::new(
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
    let mut rows = Vec::new();
    let mut add = |name: String, site: GeoPoint, obs: Option<lodestone::sphere::Direction>| -> Result<()> {
        let e = expected_direction(site, pole);
        let ov = a.a95.map(|x| expected_oval(site, pole, x)).transpose()?;
        let angle = obs.map(|o| o.angle_to(e));
        let rotation = obs.map(|o| (o.dec - e.dec + 540.0).rem_euclid(360.0) - 180.0);
        let flattening = obs.map(|o| e.inc - o.inc);
        sec.rows.push(vec![
            Cell::Text(name.clone()),
            Cell::Num(site.lat, 2),
            Cell::Azimuth(site.lon, 2),
            Cell::Azimuth(e.dec, 1),
            Cell::Num(e.inc, 1),
            Cell::opt(ov.and_then(|o| o.delta_dec), 1),
            Cell::opt(ov.map(|o| o.delta_inc), 1),
            Cell::opt_azimuth(obs.map(|o| o.dec), 1),
            Cell::opt(obs.map(|o| o.inc), 1),
            Cell::opt(angle, 1),
            Cell::opt(rotation, 1),
            Cell::opt(flattening, 1),
        ]);
        rows.push(json!({
            "site": name, "lat": site.lat, "lon": site.lon, "dec": e.dec, "inc": e.inc,
            "delta_dec": super::jnum(ov.and_then(|o| o.delta_dec)), "delta_inc": super::jnum(ov.map(|o| o.delta_inc)),
            "obs_dec": super::jnum(obs.map(|o| o.dec)), "obs_inc": super::jnum(obs.map(|o| o.inc)),
            "angle": super::jnum(angle), "rotation": super::jnum(rotation), "flattening": super::jnum(flattening),
        }));
        Ok(())
    };
    match (&a.sites, a.lat, a.lon) {
        (Some(path), _, _) => {
            ctx.inputs.add(path);
            let set = read_sites(&Table::read(path)?)?;
            for r in &set.records {
                add(r.site.clone(), r.location, Some(r.direction))?;
            }
        }
        (None, Some(la), Some(lo)) => {
            let site = GeoPoint::new(la, lo).map_err(|e| anyhow::anyhow!("--lat/--lon: {e}"))?;
            add("(site)".into(), site, None)?;
        }
        _ => bail!("give a site with --lat and --lon, or a sites table with --sites"),
    }
    let notes = vec![
        "Expected directions assume a geocentric dipole whose axis passes through the pole; rotation = observed − expected declination, flattening = expected − observed inclination.".to_string(),
    ];
    Ok(Presentation {
        json: json!({"pole": {"plat": pole.lat, "plon": pole.lon, "a95": super::jnum(a.a95)}, "sites": rows, "notes": notes}),
        sheets: vec![sec],
        main_sheet: 0,
        cautions: vec![],
        notes,
    })
}
