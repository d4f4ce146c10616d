//! `lodestone expected`: the direction a geocentric dipole with a given pole produces at a site (the
//! inverse of the VGP), for one site or for every site of a sites table.

use super::{Ctx, Presentation};
use anyhow::{bail, Result};
use clap::Args;
use lodestone::poles::{expected_direction, expected_oval};
use lodestone::present::{self, expected::ExpectedAt};
use lodestone::sphere::GeoPoint;
use lodestone::table::{read_sites, Table};
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
    let mut rows = Vec::new();
    let mut add = |name: String, site: GeoPoint, observed: Option<lodestone::sphere::Direction>| -> Result<()> {
        let oval = a.a95.map(|x| expected_oval(site, pole, x)).transpose()?;
        rows.push(ExpectedAt { site: name, location: site, expected: expected_direction(site, pole), oval, observed });
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
    Ok(present::expected::expected(pole, a.a95, &rows))
}
