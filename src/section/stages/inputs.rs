//! Stage 0: read the project's settings, sampling table and steps table, and check that every
//! specimen names a site of the sampling table.

use super::RunLog;
use crate::error::{Error, Result};
use crate::model::{StepSet, StratAxis};
use crate::section::settings::SectionSettings;
use crate::section::{Project, ProjectFile, KNOWN_KEYS};
use crate::simulate::Settings;
use crate::sphere::{Bedding, GeoPoint};
use crate::table::{read_bedding, read_steps, strat_axis, Table};

/// One sampled level of the sampling table.
#[derive(Debug)]
pub(in crate::section) struct SiteInfo {
    pub site: String,
    pub location: GeoPoint,
    pub position: f64,
    pub bedding: Option<Bedding>,
}

/// What the later stages read: the settings in force, the stratigraphic axis, the sites sorted
/// by position, and the specimens' steps.
#[derive(Debug)]
pub(in crate::section) struct Inputs {
    pub settings: SectionSettings,
    pub axis: StratAxis,
    pub sites: Vec<SiteInfo>,
    pub set: StepSet,
}

impl Inputs {
    /// The site a specimen belongs to (checked when the inputs were read).
    pub fn site_of(&self, site: Option<&String>) -> &SiteInfo {
        self.sites.iter().find(|x| Some(&x.site) == site).expect("every specimen's site was checked")
    }
}

/// Parse one project file as a table.
pub(in crate::section) fn parse(f: &ProjectFile) -> Result<Table> {
    Ok(Table::parse(&f.name, &f.bytes)?)
}

/// Read the inputs; unknown settings keys become warnings.
///
/// # Errors
/// Unreadable files or rows (the message names the file, line and column); a specimen without a
/// site, or with a site the sampling table lacks.
pub(in crate::section) fn read_inputs(p: &Project, log: &mut RunLog) -> Result<Inputs> {
    let (settings, unknown) = match &p.settings {
        Some(f) => {
            let text = std::str::from_utf8(&f.bytes).map_err(|_| Error::NotText(f.name.clone()))?;
            SectionSettings::from_settings(&Settings::parse(&f.name, text)?)?
        }
        None => (SectionSettings::default(), vec![]),
    };
    for k in &unknown {
        log.warnings.push(format!("settings.toml: unknown key '{k}' ignored (known keys: {}).", KNOWN_KEYS.join(", ")));
    }
    let (axis, sites) = read_sampling(&p.sampling)?;
    let st = parse(&p.steps)?;
    let set = read_steps(&st)?;
    check_sites(p, &st, &set, &sites)?;
    log.head.specimens = set.specimens.len();
    log.head.sites = sites.len();
    log.head.locality = sites.first().map(|s| [s.location.lat, s.location.lon]);
    Ok(Inputs { settings, axis, sites, set })
}

fn check_sites(p: &Project, st: &Table, set: &StepSet, sites: &[SiteInfo]) -> Result<()> {
    for sp in &set.specimens {
        let line = sp.steps.first().map_or(st.header_line, |s| s.line);
        match &sp.site {
            None => {
                return Err(st
                    .error(
                        line,
                        Some("site"),
                        format!(
                            "specimen '{}' has no site; every specimen must name a site of {}",
                            sp.specimen, p.sampling.name
                        ),
                    )
                    .into())
            }
            Some(s) if !sites.iter().any(|x| &x.site == s) => {
                return Err(st.error(line, Some("site"), format!("site '{s}' is not in {}", p.sampling.name)).into())
            }
            _ => {}
        }
    }
    Ok(())
}

fn read_sampling(f: &ProjectFile) -> Result<(StratAxis, Vec<SiteInfo>)> {
    let t = parse(f)?;
    t.require_rows()?;
    let (sc, lat_c, lon_c) = (t.require("site")?, t.require("lat")?, t.require("lon")?);
    let Some((axis, pc)) = strat_axis(&t)? else {
        return Err(t
            .error(t.header_line, Some("height"), "a column 'height' (m, upward) or 'depth' (m, downward) is required")
            .into());
    };
    let mut out: Vec<(SiteInfo, usize)> = Vec::new();
    for row in &t.rows {
        let site = t.text(row, sc).trim().to_string();
        if site.is_empty() {
            return Err(t.error(row.line, Some("site"), "is empty; every sampled level needs a site name").into());
        }
        if let Some((_, l)) = out.iter().find(|(s, _)| s.site == site) {
            return Err(t.error(row.line, Some("site"), format!("'{site}' is already on line {l}")).into());
        }
        let lat = t.number_in(row, lat_c, -90.0, 90.0)?;
        let lon = t.number_in(row, lon_c, -180.0, 360.0)?;
        let position = t.number(row, pc)?;
        if let Some((s, l)) = out.iter().find(|(s, _)| s.position == position) {
            return Err(t
                .error(
                    row.line,
                    Some(axis.column()),
                    format!(
                        "{} {position} is also the level of site '{}' on line {l}; two sites cannot share one level",
                        axis.column(),
                        s.site
                    ),
                )
                .into());
        }
        let location = GeoPoint::new(lat, lon).map_err(|e| t.error(row.line, Some("lat"), e.to_string()))?;
        let bedding = read_bedding(&t, row)?;
        out.push((SiteInfo { site, location, position, bedding }, row.line));
    }
    let mut sites: Vec<SiteInfo> = out.into_iter().map(|(s, _)| s).collect();
    sites.sort_by(|a, b| a.position.total_cmp(&b.position));
    Ok((axis, sites))
}
