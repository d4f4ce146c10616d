//! Poles: virtual geomagnetic poles, expected directions, paleopoles and secular-variation scatter.

mod vgp;

pub use vgp::{colatitude_from_inclination, dipole_inclination, expected_direction, vgp, Vgp};
mod align;
mod dipole;
mod oval;
mod paleopole;
mod scatter;
mod scatter_stage;
mod sites;
#[cfg(test)]
mod tests;

pub use align::{align_polarity, PolarityAlignment};
pub use dipole::{gauss_dipole, vadm, vdm, GaussDipole, EARTH_RADIUS_M, IGRF_REFERENCE_RADIUS_M, MU0};
pub use oval::{expected_oval, paleolatitude_range, pole_oval, vgp_oval, ExpectedOval, PaleolatitudeRange, PoleOval};
pub use paleopole::{northern, paleopole, Paleopole};
pub use scatter::{
    bootstrap_scatter, precision_from_a95, vgp_scatter, within_site_sw, Cutoff, Scatter, ScatterInterval, ScatterSite,
    WithinSite,
};
pub use scatter_stage::{assess_scatter, ScatterAssessment, MIN_SCATTER_RESAMPLES};
pub use sites::{pole_summary, site_a95, site_pole, PoleSummary, SitePole};
