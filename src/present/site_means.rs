//! The section's table of site means in both frames: each site's Fisher mean in geographic and in
//! tilt-corrected coordinates, at the decimals `lodestone mean` shows.

use super::{Cell, Sheet};
use crate::stats::GroupMean;

/// One site of the table.
pub struct SiteMeans<'a> {
    /// Site name.
    pub site: &'a str,
    /// Height or depth of the site, m.
    pub position: f64,
    /// Geographic and tilt-corrected means, when the site has accepted components.
    pub means: Option<(&'a GroupMean, &'a GroupMean)>,
    /// Whether the site's mean is used downstream.
    pub used: bool,
}

/// The mean cells `dec`, `inc`, `k`, `a95` of one frame (empty without a mean).
fn frame_cells(g: Option<&GroupMean>) -> [Cell; 4] {
    let s = g.map(|g| &g.stats);
    let mean = s.and_then(|s| s.mean);
    [
        Cell::opt_azimuth(mean.map(|m| m.dec), 1),
        Cell::opt(mean.map(|m| m.inc), 1),
        Cell::opt(s.and_then(|s| s.k.map(|k| k.0)), 1),
        Cell::opt(s.and_then(|s| s.alpha), 1),
    ]
}

/// The table of `sites`, with the level under the column `axis`.
pub fn site_means_sheet(axis: &str, sites: &[SiteMeans]) -> Sheet {
    let mut s = Sheet::new(
        "Site means, geographic and tilt-corrected",
        &[
            "site", axis, "n", "planes", "dec_geo", "inc_geo", "k_geo", "a95_geo", "dec_tilt", "inc_tilt", "k_tilt",
            "a95_tilt", "used",
        ],
    );
    for site in sites {
        let (g, t) = site.means.unzip();
        let mut row = vec![
            Cell::Text(site.site.to_string()),
            Cell::Num(site.position, 3),
            Cell::Int(g.map_or(0, |g| g.stats.n) as i64),
            Cell::Int(g.map_or(0, |g| g.planes) as i64),
        ];
        row.extend(frame_cells(g));
        row.extend(frame_cells(t));
        row.push(Cell::Text(if site.used { "yes" } else { "no" }.into()));
        s.push(row);
    }
    s
}
