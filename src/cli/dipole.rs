//! `lodestone dipole vadm|vdm|gauss`: dipole moments from intensity or from Gauss coefficients.

use super::{Ctx, Presentation};
use anyhow::Result;
use clap::{Args, Subcommand};
use lodestone::poles::{gauss_dipole, vadm, vdm};
use lodestone::present;

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
    Ok(match a.what {
        DipoleWhat::Vadm { intensity, lat } => present::dipole::vadm(intensity, lat, vadm(intensity, lat)?),
        DipoleWhat::Vdm { intensity, inc } => {
            let m = vdm(intensity, inc)?;
            let plat = lodestone::poles::paleolatitude_range(inc, 0.0)?.paleolat;
            present::dipole::vdm(intensity, inc, plat, m)
        }
        DipoleWhat::Gauss { g10, g11, h11 } => present::dipole::gauss(g10, g11, h11, &gauss_dipole(g10, g11, h11)?),
    })
}
