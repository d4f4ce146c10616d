//! Stage 4: the VGP of each used site, the paleopole of the polarity-aligned VGPs, and the VGP
//! scatter S_B with its bootstrap interval.

use super::inputs::Inputs;
use super::site_means::UsedSite;
use super::RunLog;
use crate::error::Result;
use crate::figures::{MappedVgp, PolePlot};
use crate::montecarlo::MonteCarlo;
use crate::numbers::{azimuth, fixed_or_empty};
use crate::poles::{
    align_polarity, assess_scatter, paleopole, pole_oval, Paleopole, ScatterAssessment, ScatterSite, Vgp, WithinSite,
};
use crate::present::cautions;
use crate::present::poles::{level_vgp_sheet, pole_scatter_sheet, LevelVgp};
use crate::section::stage::{draw, Stage};
use crate::section::tables::CsvTable;
use crate::sphere::GeoPoint;

/// VGPs, paleopole and scatter; write the stage, its tables and the VGP map.
///
/// # Errors
/// Only a failure to draw the map.
pub(in crate::section) fn poles(inp: &Inputs, used: &[UsedSite], mc: &MonteCarlo<'_>, log: &mut RunLog) -> Result<()> {
    let s = &inp.settings;
    let mut stage = Stage::new("Virtual geomagnetic poles, paleopole and scatter");
    stage.method = format!(
        "VGP of each used site from its tilt-corrected mean (geocentric axial dipole); dp, dm from α95. Paleopole: Fisher mean of the VGPs after aligning their polarity by the principal axis of the VGPs (each VGP more than 90° from its northern end replaced by its antipode). VGP scatter S_B about the mean pole with cutoff '{}', corrected for within-site scatter where every site has n ≥ 2 and k (McElhinny & McFadden 1997), with a {} % bootstrap interval over sites ({} resamples, seed {}).",
        s.scatter_cutoff, s.confidence * 100.0, s.resamples, s.seed);
    if !used.is_empty() {
        log.table(&mut stage, vgp_table(inp, used));
    }
    // Polarity aligned by the principal axis of the VGPs (not by hemisphere: see poles::align_polarity).
    let raw: Vec<GeoPoint> = used.iter().map(|u| GeoPoint::new(u.vgp_lat, u.vgp_lon).expect("valid VGP")).collect();
    let aligned: Vec<(GeoPoint, bool)> = match align_polarity(&raw) {
        Ok(a) => a.poles.into_iter().zip(a.flipped).collect(),
        Err(_) => Vec::new(),
    };
    if used.len() < 2 {
        log.skip(&mut stage, format!("Skipped: a paleopole needs at least two used sites (found {}).", used.len()));
    } else {
        match paleopole(&aligned.iter().map(|a| a.0).collect::<Vec<_>>()) {
            Ok(pp) => pole_and_scatter(inp, used, &aligned, &pp, mc, &mut stage, log)?,
            Err(e) => log.skip_on_error(&mut stage, "Paleopole", e),
        }
    }
    log.stages.push(stage);
    Ok(())
}

fn vgp_table(inp: &Inputs, used: &[UsedSite]) -> CsvTable {
    let rows: Vec<LevelVgp> = used
        .iter()
        .map(|u| LevelVgp {
            site: &inp.sites[u.idx].site,
            position: inp.sites[u.idx].position,
            direction: u.tilt,
            vgp: Vgp {
                pole: GeoPoint::new(u.vgp_lat, u.vgp_lon).expect("valid VGP"),
                colatitude: u.colat,
                paleolat: u.paleolat,
            },
            oval: u.a95.map(|a| pole_oval(u.colat, a)).transpose().ok().flatten(),
            polarity: u.polarity.code(),
        })
        .collect();
    CsvTable::from_sheet("vgps", level_vgp_sheet(inp.axis.column(), &rows))
}

/// The sites as the scatter sees them: the aligned pole, and the within-site dispersion by the
/// shared rule ([`WithinSite::from_site`]).
fn scatter_sites(used: &[UsedSite], aligned: &[(GeoPoint, bool)]) -> Result<Vec<ScatterSite>> {
    used.iter()
        .zip(aligned)
        .map(|(u, a)| Ok(ScatterSite { pole: a.0, within: WithinSite::from_site(Some(u.n), u.k, u.a95, u.paleolat)? }))
        .collect()
}

fn pole_and_scatter(
    inp: &Inputs,
    used: &[UsedSite],
    aligned: &[(GeoPoint, bool)],
    pp: &Paleopole,
    mc: &MonteCarlo<'_>,
    stage: &mut Stage,
    log: &mut RunLog,
) -> Result<()> {
    let s = &inp.settings;
    let sc_sites = scatter_sites(used, aligned)?;
    // The scatter stage of every front end; what the data cannot give is a warning here.
    let a = assess_scatter(&sc_sites, s.cutoff(), s.confidence, mc).unwrap_or_else(|e| ScatterAssessment {
        scatter: None,
        interval: None,
        failure: Some(e),
    });
    log.warnings.extend(a.note());
    let kept_flags = a.kept(used.len());
    let pt = match &a.scatter {
        Some(sc) => {
            let (lo, hi) = a.interval.map_or((None, None), |b| (Some(b.low), Some(b.high)));
            let s_b = sc.s.map_or_else(
                || format!("undefined (the within-site scatter exceeds the total, {:.1}°)", sc.s_total),
                |s| format!("{s:.1}°"),
            );
            stage.result = format!("Paleopole from {} sites: {:.1}°N, {}°E, K = {:.1}, A95 = {}. VGP scatter S_B = {s_b} ({}–{}°, {} sites used, {} removed by the cutoff).",
                pp.n, pp.pole.lat, azimuth(pp.pole.lon, 1), pp.k.0, fixed_or_empty(pp.a95, 1) + "°", fixed_or_empty(lo, 1), fixed_or_empty(hi, 1), sc.n_used, sc.n_removed);
            pole_scatter_sheet(pp, &s.scatter_cutoff, Some(sc), a.interval.as_ref())
        }
        None => {
            stage.result = format!(
                "Paleopole from {} sites: {:.1}°N, {}°E, K = {:.1}, A95 = {}°.",
                pp.n,
                pp.pole.lat,
                azimuth(pp.pole.lon, 1),
                pp.k.0,
                fixed_or_empty(pp.a95, 1)
            );
            pole_scatter_sheet(pp, &s.scatter_cutoff, None, None)
        }
    };
    log.head.pole = Some((pp.pole.lat, pp.pole.lon, pp.a95));
    log.table(stage, CsvTable::from_sheet("paleopole", pt));
    let fig = PolePlot {
        title: "VGPs and paleopole (polarity-aligned)".into(),
        centre: pp.pole,
        vgps: aligned.iter().zip(&kept_flags).map(|(a, k)| MappedVgp { pole: a.0, kept: *k, flipped: a.1 }).collect(),
        mean: Some((pp.pole, pp.a95)),
        cutoff: None,
    };
    log.figure(stage, draw(&fig, "vgps", "VGPs of the used sites (polarity aligned by their principal axis) on an azimuthal equal-area map centred on the paleopole, with its A95 circle.".into())?);
    log.cautions.push(cautions::POLES.into());
    Ok(())
}
