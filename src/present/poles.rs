//! Presenter of the poles of a set of sites: the VGP of each site with dp, dm and its paleolatitude
//! range, the paleopole of the VGPs (K, A95) and the VGP scatter S_B with its bootstrap interval.
//! The section's VGP and paleopole tables are built here too, from the same cells.

use super::test_labels::json_notes;
use super::{cautions, json_num, Cell, Presentation, Sheet};
use crate::model::SiteSet;
use crate::poles::{Paleopole, PoleOval, PoleSummary, Scatter, ScatterInterval, Vgp};
use crate::sphere::Direction;
use serde::Serialize;

/// What the run was asked: the source's name, whether VGPs were aligned to one polarity, and the
/// bootstrap's settings.
pub struct PoleLabels<'a> {
    /// The sites table's name.
    pub file: &'a str,
    /// VGPs aligned to one polarity before averaging.
    pub northern: bool,
    /// Seed of the bootstrap.
    pub seed: u64,
    /// Resamples asked for.
    pub resamples: usize,
}

#[derive(Serialize)]
struct SiteJson<'a> {
    site: &'a str,
    line: usize,
    lat: f64,
    lon: f64,
    dec: f64,
    inc: f64,
    plat: f64,
    plon: f64,
    #[serde(serialize_with = "json_num::opt")]
    dp: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    dm: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    a95: Option<f64>,
    paleolat: f64,
    #[serde(serialize_with = "json_num::opt")]
    paleolat_low: Option<f64>,
    #[serde(serialize_with = "json_num::opt")]
    paleolat_high: Option<f64>,
    colatitude: f64,
    kept: bool,
}

#[derive(Serialize)]
struct PoleJson {
    n: usize,
    plat: f64,
    plon: f64,
    r: f64,
    #[serde(serialize_with = "json_num::one")]
    k: f64,
    #[serde(serialize_with = "json_num::opt")]
    a95: Option<f64>,
}

#[derive(Serialize)]
struct MeanPoleJson {
    plat: f64,
    plon: f64,
}

#[derive(Serialize)]
struct ScatterJson<'a> {
    cutoff: String,
    #[serde(serialize_with = "json_num::opt")]
    s: Option<f64>,
    s_low: f64,
    s_high: f64,
    s_total: f64,
    #[serde(serialize_with = "json_num::opt")]
    within_term: Option<f64>,
    n_used: usize,
    n_removed: usize,
    removed: Vec<&'a str>,
    #[serde(serialize_with = "json_num::opt")]
    threshold: Option<f64>,
    mean_pole: MeanPoleJson,
    resamples: usize,
    seed: u64,
    polarity_aligned: bool,
}

#[derive(Serialize)]
struct PolesJson<'a> {
    file: &'a str,
    northern: bool,
    sites: Vec<SiteJson<'a>>,
    pole: Option<PoleJson>,
    scatter: Option<ScatterJson<'a>>,
    notes: Vec<String>,
}

/// The VGP cells `dec`, `inc`, `plat`, `plon`, `dp`, `dm`, `paleolat` of a site.
fn vgp_cells(d: Direction, v: &Vgp, oval: Option<PoleOval>) -> [Cell; 7] {
    [
        Cell::Azimuth(d.dec, 1),
        Cell::Num(d.inc, 1),
        Cell::Num(v.pole.lat, 1),
        Cell::Azimuth(v.pole.lon, 1),
        Cell::opt(oval.map(|o| o.dp), 1),
        Cell::opt(oval.map(|o| o.dm), 1),
        Cell::Num(v.paleolat, 1),
    ]
}

/// The sites without an α95 (no dp, dm or paleolatitude range).
pub fn missing_ovals<'a>(set: &'a SiteSet, sum: &PoleSummary) -> Vec<&'a str> {
    set.records.iter().zip(&sum.sites).filter(|(_, sp)| sp.a95.is_none()).map(|(r, _)| r.site.as_str()).collect()
}

/// The sheet of the sites' VGPs (`poles`' main sheet, and the Python package's `vgps` columns):
/// `site`, `lat`, `lon`, `dec`, `inc`, `plat`, `plon`, `dp`, `dm`, `paleolat`, `paleolat_low`,
/// `paleolat_high`.
pub fn sites_sheet(set: &SiteSet, sum: &PoleSummary, title: &str) -> Sheet {
    let mut sites = Sheet::new(
        title,
        &["site", "lat", "lon", "dec", "inc", "plat", "plon", "dp", "dm", "paleolat", "paleolat_low", "paleolat_high"],
    );
    for (r, sp) in set.records.iter().zip(&sum.sites) {
        let mut row = vec![Cell::Text(r.site.clone()), Cell::Num(r.location.lat, 2), Cell::Azimuth(r.location.lon, 2)];
        row.extend(vgp_cells(r.direction, &sp.vgp, sp.oval));
        row.extend([Cell::opt(sp.range.map(|x| x.low), 1), Cell::opt(sp.range.map(|x| x.high), 1)]);
        sites.push(row);
    }
    sites
}

/// The VGPs, paleopole and scatter `sum` of the sites `set`.
pub fn poles(set: &SiteSet, sum: &PoleSummary, l: &PoleLabels) -> Presentation {
    let sites = sites_sheet(set, sum, &format!("Virtual geomagnetic poles of {}", l.file));
    let kept = sum.kept_sites();
    let mut sites_json = Vec::new();
    for (i, (r, sp)) in set.records.iter().zip(&sum.sites).enumerate() {
        sites_json.push(SiteJson {
            site: &r.site,
            line: r.line,
            lat: r.location.lat,
            lon: r.location.lon,
            dec: r.direction.dec,
            inc: r.direction.inc,
            plat: sp.vgp.pole.lat,
            plon: sp.vgp.pole.lon,
            dp: sp.oval.map(|o| o.dp),
            dm: sp.oval.map(|o| o.dm),
            a95: sp.a95,
            paleolat: sp.vgp.paleolat,
            paleolat_low: sp.range.map(|x| x.low),
            paleolat_high: sp.range.map(|x| x.high),
            colatitude: sp.vgp.colatitude,
            kept: kept[i],
        });
    }
    let missing = missing_ovals(set, sum);
    let Some(pp) = sum.pole.as_ref() else {
        let notes = one_site_notes(l.file, &missing);
        let cautions = vec![cautions::ONE_VGP.to_string()];
        let json = PolesJson {
            file: l.file,
            northern: l.northern,
            sites: sites_json,
            pole: None,
            scatter: None,
            notes: json_notes(&notes, &cautions),
        };
        return presentation(&json, vec![sites], notes, cautions);
    };
    let (sc, boot) = (sum.scatter.as_ref(), sum.interval.as_ref());
    let removed: Vec<&str> = sc.map_or_else(Vec::new, |sc| {
        set.records.iter().zip(&sc.kept).filter(|(_, k)| !**k).map(|(r, _)| r.site.as_str()).collect()
    });
    let notes = notes(sum, &removed, &missing, l);
    let cautions = vec![cautions::POLES.to_string()];
    let pole = pole_sheet(pp);
    let mut scatter = Sheet::new(
        "VGP scatter about the mean pole (polarity-aligned VGPs)",
        &["cutoff", "s", "s_low", "s_high", "s_total", "n_used", "n_removed", "threshold"],
    );
    scatter.push(scatter_row(&sum.cutoff.name(), sc, boot));
    let json = PolesJson {
        file: l.file,
        northern: l.northern,
        sites: sites_json,
        pole: Some(PoleJson { n: pp.n, plat: pp.pole.lat, plon: pp.pole.lon, r: pp.r, k: pp.k.0, a95: pp.a95 }),
        scatter: sc.zip(boot).map(|(sc, boot)| scatter_json(sc, boot, removed, l.seed)),
        notes: json_notes(&notes, &cautions),
    };
    presentation(&json, vec![sites, pole, scatter], notes, cautions)
}

/// The scatter and its interval as JSON.
fn scatter_json<'a>(sc: &Scatter, boot: &ScatterInterval, removed: Vec<&'a str>, seed: u64) -> ScatterJson<'a> {
    ScatterJson {
        cutoff: sc.cutoff.name(),
        s: sc.s,
        s_low: boot.low,
        s_high: boot.high,
        s_total: sc.s_total,
        within_term: sc.within_term,
        n_used: sc.n_used,
        n_removed: sc.n_removed,
        removed,
        threshold: sc.threshold,
        mean_pole: MeanPoleJson { plat: sc.mean_pole.lat, plon: sc.mean_pole.lon },
        resamples: boot.resamples,
        seed,
        polarity_aligned: true,
    }
}

/// The presentation of `json` with its sheets, notes and cautions ([`cautions::POLES`], or
/// [`cautions::ONE_VGP`] for one site).
fn presentation(json: &PolesJson, sheets: Vec<Sheet>, notes: Vec<String>, cautions: Vec<String>) -> Presentation {
    let json_value = serde_json::to_value(json).expect("plain data");
    Presentation { json: json_value, sheets, main_sheet: 0, notes, cautions }
}

/// The paleopole's row: `n`, `plat`, `plon`, `k`, `a95`.
fn pole_row(pp: &Paleopole) -> Vec<Cell> {
    vec![
        Cell::Int(pp.n as i64),
        Cell::Num(pp.pole.lat, 1),
        Cell::Azimuth(pp.pole.lon, 1),
        Cell::Num(pp.k.0, 1),
        Cell::opt(pp.a95, 1),
    ]
}

/// The paleopole's sheet.
fn pole_sheet(pp: &Paleopole) -> Sheet {
    let mut s = Sheet::new("Paleopole (Fisher mean of the VGPs)", &["n", "plat", "plon", "k", "a95"]);
    s.push(pole_row(pp));
    s
}

/// The scatter's row: `cutoff`, `s`, `s_low`, `s_high`, `s_total`, `n_used`, `n_removed`,
/// `threshold` (empty where the scatter or its interval could not be computed).
fn scatter_row(cutoff: &str, sc: Option<&Scatter>, boot: Option<&ScatterInterval>) -> Vec<Cell> {
    vec![
        Cell::Text(cutoff.to_string()),
        Cell::opt(sc.and_then(|s| s.s), 2),
        Cell::opt(boot.map(|b| b.low), 2),
        Cell::opt(boot.map(|b| b.high), 2),
        Cell::opt(sc.map(|s| s.s_total), 2),
        sc.map_or(Cell::Empty, |s| Cell::Int(s.n_used as i64)),
        sc.map_or(Cell::Empty, |s| Cell::Int(s.n_removed as i64)),
        Cell::opt(sc.and_then(|s| s.threshold), 1),
    ]
}

/// The notes of a table of one site.
fn one_site_notes(file: &str, missing: &[&str]) -> Vec<String> {
    let mut notes = vec![format!(
        "{file} holds one site: its VGP is given, but a paleopole (a Fisher mean of VGPs) and the VGP scatter need at least two sites, so none is computed."
    )];
    if !missing.is_empty() {
        notes.push("dp, dm and the paleolatitude range are empty: the site has no a95 (or n and k).".into());
    }
    notes
}

/// Notes on the polarity, the missing ovals, the scatter and its interval.
fn notes(sum: &PoleSummary, removed: &[&str], missing: &[&str], l: &PoleLabels) -> Vec<String> {
    let mut notes = Vec::new();
    let n_sites = sum.sites.len();
    polarity_notes(sum, l.northern, n_sites, &mut notes);
    if !missing.is_empty() {
        notes.push(format!(
            "dp, dm and the paleolatitude range are empty for {} site(s) without a95 (or n and k): {}.",
            missing.len(),
            missing.join(", ")
        ));
    }
    if let Some(sc) = &sum.scatter {
        scatter_notes(sc, sum.interval.as_ref(), removed, n_sites, sum.missing_within(), &mut notes);
    }
    notes.extend(sum.scatter_note());
    if sum.interval.is_some() {
        notes.push(format!(
            "The scatter interval is a seeded bootstrap over sites (seed {}, {} resamples, 95 % percentile); it depends on the cutoff and on how sites were chosen, and is a statement about this sample, not about the field itself.",
            l.seed, l.resamples
        ));
    }
    notes
}

/// Notes on the VGPs of the other polarity and on which sites the paleopole uses.
fn polarity_notes(sum: &PoleSummary, northern: bool, n_sites: usize, notes: &mut Vec<String>) {
    let alignment = &sum.alignment;
    let n_south = alignment.flipped.iter().filter(|f| **f).count();
    let axis = format!("{:.1}°, {}°E", alignment.axis.lat, crate::numbers::azimuth(alignment.axis.lon, 1));
    if n_south > 0 {
        notes.push(if northern {
            format!("{n_south} VGP(s) lie more than 90° from the northern end of the VGPs' principal axis ({axis}) and were mapped to their antipodes before averaging (--northern).")
        } else {
            format!("{n_south} VGP(s) lie more than 90° from the northern end of the VGPs' principal axis ({axis}): the opposite polarity, reported as computed; add --northern to average all VGPs in one polarity.")
        });
    }
    if !northern && n_south > 0 && n_south < n_sites {
        notes.push("The paleopole averages VGPs of both hemispheres as given; with mixed polarity it is not meaningful without --northern.".into());
    }
    notes.push("The paleopole uses every site; the cutoff applies to the scatter only.".into());
}

/// Notes on the scatter: the cutoff, the within-site correction, negative bootstrap values.
fn scatter_notes(
    sc: &Scatter,
    boot: Option<&ScatterInterval>,
    removed: &[&str],
    n_sites: usize,
    missing_within: usize,
    notes: &mut Vec<String>,
) {
    notes.push(format!(
        "Scatter: polarity is aligned by the VGPs' principal axis (each VGP more than 90° from its northern end is replaced by its antipode), which holds for a mean pole at any latitude; cutoff {} removed {} of {} site(s){}.",
        sc.cutoff.name(),
        sc.n_removed,
        n_sites,
        if removed.is_empty() { String::new() } else { format!(" ({})", removed.join(", ")) }
    ));
    match (sc.within_term, sc.s) {
        (None, _) => notes.push(format!(
            "No within-site correction: {missing_within} site(s) lack n and k (or n and a95); s equals s_total."
        )),
        (Some(_), None) => notes.push("The within-site term exceeds the total scatter: S_B is undefined (the sites are too dispersed internally for this estimate).".into()),
        _ => {}
    }
    if let Some(boot) = boot.filter(|b| b.n_negative > 0) {
        notes.push(format!(
            "{} of {} bootstrap resamples had a negative S_B² and count as 0.",
            boot.n_negative, boot.resamples
        ));
    }
}

/// A used site of a section as its VGP table shows it.
pub struct LevelVgp<'a> {
    /// Site name.
    pub site: &'a str,
    /// Height or depth of the site, m.
    pub position: f64,
    /// Tilt-corrected site mean.
    pub direction: Direction,
    /// The site's VGP.
    pub vgp: Vgp,
    /// dp, dm when the site has an α95.
    pub oval: Option<PoleOval>,
    /// Polarity code of the VGP.
    pub polarity: &'a str,
}

/// The section's VGP table: the VGP cells of `poles` with the site's level (column `axis`) and
/// polarity.
pub fn level_vgp_sheet(axis: &str, sites: &[LevelVgp]) -> Sheet {
    let mut s = Sheet::new(
        "Virtual geomagnetic poles of the used sites (tilt-corrected)",
        &["site", axis, "dec", "inc", "plat", "plon", "dp", "dm", "paleolat", "polarity"],
    );
    for u in sites {
        let mut row = vec![Cell::Text(u.site.to_string()), Cell::Num(u.position, 3)];
        row.extend(vgp_cells(u.direction, &u.vgp, u.oval));
        row.push(Cell::Text(u.polarity.to_string()));
        s.push(row);
    }
    s
}

/// The section's paleopole table: the paleopole's row and the scatter's row side by side
/// (`cutoff` names the cutoff where the scatter could not be computed).
pub fn pole_scatter_sheet(pp: &Paleopole, cutoff: &str, sc: Option<&Scatter>, boot: Option<&ScatterInterval>) -> Sheet {
    let mut s = Sheet::new(
        "Paleopole and VGP scatter",
        &[
            "n",
            "plat",
            "plon",
            "k",
            "a95",
            "cutoff",
            "s",
            "s_low",
            "s_high",
            "s_total",
            "n_used",
            "n_removed",
            "threshold",
        ],
    );
    let cutoff = sc.map_or(cutoff.to_string(), |s| s.cutoff.name());
    let mut row = pole_row(pp);
    row.extend(scatter_row(&cutoff, sc, boot));
    s.push(row);
    s
}
