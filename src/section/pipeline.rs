//! The stages of a `section` run, in order. Each stage records what it did (method, with its
//! parameters) and what it found (result), or why it was skipped.

use super::settings::SectionSettings;
use super::stage::{draw, Stage};
use super::tables::CsvTable;
use super::{FigureOutput, Headline, Project, ProjectFile, Rejection, SectionRun};
use crate::demag::{fit_range, FitKind, SpecimenFit};
use crate::error::{Error, Result};
use crate::fieldtests::{bedding_spread, fold_test, reversal_test, FoldOptions};
use crate::figures::{ColumnFigure, EqualAreaPlot, FoldPlot, MappedVgp, NetGroup, PolePlot, ScalePanel};
use crate::montecarlo::{MonteCarlo, Progress};
use crate::numbers::{fixed, fixed_or_empty};
use crate::poles::{
    align_polarity, bootstrap_scatter, paleopole, pole_oval, vgp, vgp_scatter, within_site_sw, ScatterSite, WithinSite,
};
use crate::simulate::Settings;
use crate::sphere::{Bedding, Direction, GeoPoint};
use crate::stats::{fisher_mean, group_means, Frame, GroupMean};
use crate::strat::{
    classify, comparison_sentence, correlate, status_word, zone_levels, CorrelateOptions, Level, LevelSet,
    ZonePolarity, ZONE_COLUMNS,
};
use crate::table::{
    read_bedding, read_picks, read_steps, strat_axis, DirectionKind, DirectionRecord, DirectionSet, StratAxis, Table,
    TimeScale,
};
use std::collections::BTreeMap;

/// Caution carried with every field test.
pub const FIELD_TEST_CAUTION: &str = "Field tests are statistical statements about a model of the directions \
(Fisher distributions or bootstrap resampling), not proof of when the rocks were magnetized; local practice and \
the published literature decide.";
/// Caution carried with the correlation.
pub const CORRELATION_CAUTION: &str = "The ranking of correlations is a statistical statement about a steady-rate \
model, not proof of the correlation: independent age control (dated beds, biostratigraphy), local practice and the \
published literature decide.";
/// Caution carried with the poles.
pub const POLE_CAUTION: &str = "VGPs and the paleopole rest on a model: a geocentric dipole field at the locality, \
averaged over enough time for secular variation to cancel. The scatter depends on the cutoff and on how sites were \
chosen.";

struct SiteInfo {
    site: String,
    location: GeoPoint,
    position: f64,
    bedding: Option<Bedding>,
}

struct UsedSite {
    idx: usize,
    geo: Direction,
    tilt: Direction,
    n: usize,
    k: Option<f64>,
    a95: Option<f64>,
    vgp_lat: f64,
    vgp_lon: f64,
    paleolat: f64,
    colat: f64,
    polarity: ZonePolarity,
}

fn parse(f: &ProjectFile) -> Result<Table> {
    Ok(Table::parse(&f.name, &f.bytes)?)
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

fn yn(b: bool) -> String {
    if b {
        "yes".into()
    } else {
        "no".into()
    }
}

/// Run the whole chain on a project. `progress` receives the Monte Carlo progress; `on_stage` is
/// called with each stage's name as it starts.
///
/// # Errors
/// Only unreadable inputs are errors (each names the file, line and column); a stage that cannot run
/// is skipped with a warning.
pub fn run(p: &Project, progress: &dyn Progress, on_stage: &mut dyn FnMut(&str)) -> Result<SectionRun> {
    run_with_truth(p, None, progress, on_stage)
}

/// [`run`], and where `truth` (the `truth.json` that `simulate section` writes beside a synthetic
/// folder) is given, a last stage comparing what the run recovered with the true model.
///
/// # Errors
/// As [`run`]; an unreadable `truth` is a warning, not an error.
pub fn run_with_truth(
    p: &Project,
    truth: Option<&ProjectFile>,
    progress: &dyn Progress,
    on_stage: &mut dyn FnMut(&str),
) -> Result<SectionRun> {
    let mut warnings: Vec<String> = Vec::new();
    let mut cautions: Vec<String> = Vec::new();
    let mut stages: Vec<Stage> = Vec::new();
    let mut tables: Vec<CsvTable> = Vec::new();
    let mut figures: Vec<FigureOutput> = Vec::new();
    let mut rejected: Vec<Rejection> = Vec::new();
    let mut head = Headline::default();

    // ---- Inputs and settings
    on_stage("reading the project");
    let (settings, unknown) = match &p.settings {
        Some(f) => {
            let text =
                std::str::from_utf8(&f.bytes).map_err(|_| Error::Invalid(format!("{}: not UTF-8 text", f.name)))?;
            SectionSettings::from_settings(&Settings::parse(&f.name, text)?)?
        }
        None => (SectionSettings::default(), vec![]),
    };
    for k in &unknown {
        warnings
            .push(format!("settings.toml: unknown key '{k}' ignored (known keys: {}).", super::KNOWN_KEYS.join(", ")));
    }
    let (axis, sites) = read_sampling(&p.sampling)?;
    let st = parse(&p.steps)?;
    let set = read_steps(&st)?;
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
    head.specimens = set.specimens.len();
    head.sites = sites.len();
    head.locality = sites.first().map(|s| [s.location.lat, s.location.lon]);
    let mc = MonteCarlo { seed: settings.seed, resamples: settings.resamples, progress };
    let col_name = axis.column();

    // ---- Component fits
    on_stage("component fits");
    let mut stage = Stage::new("Characteristic components");
    let mut fits: Vec<SpecimenFit> = Vec::new();
    let reject_sp = |name: &str, reason: String, rejected: &mut Vec<Rejection>| {
        rejected.push(Rejection { what: "specimen".into(), name: name.into(), stage: "components".into(), reason });
    };
    let picks = match &p.picks {
        Some(pf) => Some((pf, read_picks(&parse(pf)?, &set)?)),
        None => None,
    };
    let mut grades: BTreeMap<String, &'static str> = BTreeMap::new();
    stage.method = match &picks {
        Some((pf, _)) => format!(
            "Principal-component fits (Kirschvink 1980) over the ranges chosen in {}: lines and planes, free or through the origin as each pick states; a specimen without a pick is fitted by the automatic rule: {}. A line with MAD above {}° is rejected.",
            pf.name, super::rule_text(&settings), settings.max_mad),
        None => format!("No picks table: each specimen's characteristic component was chosen automatically by {}.", super::rule_text(&settings)),
    };
    for sp in &set.specimens {
        let mine: Vec<_> = picks.iter().flat_map(|(_, ps)| ps.iter().filter(|k| k.specimen == sp.specimen)).collect();
        for k in &mine {
            let name = &picks.as_ref().expect("a pick comes from a table").0.name;
            match fit_range(sp, k.from, k.to, k.kind, k.anchor) {
                Ok(f) => fits.push(f),
                Err(e) => reject_sp(&sp.specimen, format!("{name} line {}: {e}", k.line), &mut rejected),
            }
        }
        if mine.is_empty() {
            match super::automatic_fit(sp, &settings) {
                Ok(c) => {
                    grades.insert(sp.specimen.clone(), c.grade.as_str());
                    fits.push(c.fit)
                }
                Err(why) => reject_sp(&sp.specimen, why, &mut rejected),
            }
        }
    }
    let (accepted, over): (Vec<SpecimenFit>, Vec<SpecimenFit>) =
        fits.into_iter().partition(|f| f.mad <= settings.max_mad);
    for f in &over {
        reject_sp(&f.specimen, format!("MAD {:.1}° exceeds max_mad = {}°", f.mad, settings.max_mad), &mut rejected);
    }
    let fits = accepted;
    let mut ft = CsvTable::new(
        "components",
        "Characteristic components per specimen (geographic coordinates)",
        &["specimen", "site", "kind", "anchor", "n_steps", "from", "to", "dec", "inc", "mad", "dang", "grade"],
    );
    for f in &fits {
        let sp = set.get(&f.specimen).expect("fitted specimen exists");
        ft.push(vec![
            f.specimen.clone(),
            sp.site.clone().unwrap_or_default(),
            f.kind.as_str().into(),
            f.anchor.as_str().into(),
            f.n_steps.to_string(),
            fixed(f.from, 1),
            fixed(f.to, 1),
            fixed(f.direction.dec, 2),
            fixed(f.direction.inc, 2),
            fixed(f.mad, 2),
            fixed_or_empty(f.dang, 2),
            grades.get(&f.specimen).map_or("pick", |g| g).to_string(),
        ]);
    }
    let mut fitted: Vec<&str> = fits.iter().map(|f| f.specimen.as_str()).collect();
    fitted.dedup();
    head.specimens_fitted = fitted.len();
    stage.result = format!("{} of {} specimens gave an accepted component ({} lines, {} planes); {} specimen rejections are listed in the table of rejections.",
        head.specimens_fitted, head.specimens, fits.iter().filter(|f| f.kind == FitKind::Line).count(),
        fits.iter().filter(|f| f.kind == FitKind::Plane).count(), rejected.len());
    stage.tables.push(ft.stem.clone());
    tables.push(ft);
    stages.push(stage);

    // ---- Site means in both frames
    on_stage("site means");
    let mut stage = Stage::new("Site means");
    let flat = Bedding::from_dip_direction(0.0, 0.0, false)?;
    let records: Vec<DirectionRecord> = fits
        .iter()
        .enumerate()
        .map(|(i, f)| {
            let sp = set.get(&f.specimen).expect("fitted specimen exists");
            let s = sites.iter().find(|x| Some(&x.site) == sp.site.as_ref()).expect("checked above");
            DirectionRecord {
                line: i + 2,
                site: Some(s.site.clone()),
                specimen: Some(f.specimen.clone()),
                direction: f.direction,
                lat: Some(s.location.lat),
                lon: Some(s.location.lon),
                position: Some(s.position),
                bedding: Some(s.bedding.unwrap_or(flat)),
                kind: if f.kind == FitKind::Plane { DirectionKind::Plane } else { DirectionKind::Line },
                group: Some(s.site.clone()),
                path_end: if f.kind == FitKind::Plane { sp.steps.get(f.last).map(|st| st.direction) } else { None },
            }
        })
        .collect();
    let dset =
        DirectionSet { source: "components".into(), axis: Some(axis), group_column: Some("site".into()), records };
    let by_site = |frame: Frame| -> Result<BTreeMap<String, GroupMean>> {
        if dset.records.is_empty() {
            return Ok(BTreeMap::new());
        }
        Ok(group_means(&dset, frame, settings.confidence)?
            .into_iter()
            .map(|g| (g.group.clone().unwrap_or_default(), g))
            .collect())
    };
    let (geo, tilt) = (by_site(Frame::Geo)?, by_site(Frame::Tilt)?);
    stage.method = format!(
        "Fisher (1953) mean of each site's components in geographic and in tilt-corrected coordinates (bedding from {}); great circles are combined with lines after McFadden & McElhinny (1988). Cones at {} % confidence. A site is used downstream when it has a mean and its tilt-corrected α{:.0} is at most {}°; a site of one specimen is used without a cone.",
        p.sampling.name, settings.confidence * 100.0, settings.confidence * 100.0, settings.max_site_a95);
    let mut mt = CsvTable::new(
        "site-means",
        "Site means, geographic and tilt-corrected",
        &[
            "site", col_name, "n", "planes", "dec_geo", "inc_geo", "k_geo", "a95_geo", "dec_tilt", "inc_tilt",
            "k_tilt", "a95_tilt", "used",
        ],
    );
    let mut used: Vec<UsedSite> = Vec::new();
    for (idx, s) in sites.iter().enumerate() {
        let reject = |why: String, rejected: &mut Vec<Rejection>| {
            rejected.push(Rejection {
                what: "site".into(),
                name: s.site.clone(),
                stage: "site means".into(),
                reason: why,
            })
        };
        let (Some(g), Some(t)) = (geo.get(&s.site), tilt.get(&s.site)) else {
            reject("no specimen with an accepted component".into(), &mut rejected);
            mt.push(vec![
                s.site.clone(),
                fixed(s.position, 3),
                "0".into(),
                "0".into(),
                "".into(),
                "".into(),
                "".into(),
                "".into(),
                "".into(),
                "".into(),
                "".into(),
                "".into(),
                "no".into(),
            ]);
            continue;
        };
        let k = |m: &GroupMean| m.stats.k.map(|k| k.0);
        let ok = match (t.stats.mean, g.stats.mean, &t.undefined) {
            (_, _, Some(why)) => {
                reject(format!("no mean: {why}"), &mut rejected);
                false
            }
            (None, _, _) | (_, None, _) => {
                reject("the directions cancel out (no mean)".into(), &mut rejected);
                false
            }
            _ if t.stats.alpha.is_some_and(|a| a > settings.max_site_a95) => {
                reject(
                    format!(
                        "α{:.0} = {:.1}° exceeds max_site_a95 = {}°",
                        settings.confidence * 100.0,
                        t.stats.alpha.unwrap_or(0.0),
                        settings.max_site_a95
                    ),
                    &mut rejected,
                );
                false
            }
            _ => true,
        };
        mt.push(vec![
            s.site.clone(),
            fixed(s.position, 3),
            g.stats.n.to_string(),
            g.planes.to_string(),
            fixed_or_empty(g.stats.mean.map(|m| m.dec), 1),
            fixed_or_empty(g.stats.mean.map(|m| m.inc), 1),
            fixed_or_empty(k(g), 1),
            fixed_or_empty(g.stats.alpha, 1),
            fixed_or_empty(t.stats.mean.map(|m| m.dec), 1),
            fixed_or_empty(t.stats.mean.map(|m| m.inc), 1),
            fixed_or_empty(k(t), 1),
            fixed_or_empty(t.stats.alpha, 1),
            yn(ok),
        ]);
        if ok {
            let (gm, tm) = (g.stats.mean.expect("checked"), t.stats.mean.expect("checked"));
            let v = vgp(s.location, tm);
            used.push(UsedSite {
                idx,
                geo: gm,
                tilt: tm,
                n: t.stats.n,
                k: k(t),
                a95: t.stats.alpha,
                vgp_lat: v.pole.lat,
                vgp_lon: v.pole.lon,
                paleolat: v.paleolat,
                colat: v.colatitude,
                polarity: classify(v.pole.lat, settings.vgp_threshold),
            });
        }
    }
    head.sites_used = used.len();
    stage.result = format!("{} of {} sites have a usable mean.", used.len(), sites.len());
    stage.tables.push(mt.stem.clone());
    tables.push(mt);
    for (frame, stem, label) in
        [(Frame::Geo, "site-means-geo", "geographic"), (Frame::Tilt, "site-means-tilt", "tilt-corrected")]
    {
        let mut groups = Vec::new();
        for (pol, name) in [
            (ZonePolarity::Normal, "normal sites"),
            (ZonePolarity::Reversed, "reversed sites"),
            (ZonePolarity::Intermediate, "intermediate sites"),
        ] {
            let pts: Vec<Direction> = used
                .iter()
                .filter(|u| u.polarity == pol)
                .map(|u| if frame == Frame::Geo { u.geo } else { u.tilt })
                .collect();
            if pts.is_empty() {
                continue;
            }
            let mean = if pts.len() >= 2 && pol != ZonePolarity::Intermediate {
                fisher_mean(&pts, settings.confidence).ok().and_then(|s| s.mean.map(|m| (m, s.alpha)))
            } else {
                None
            };
            groups.push(NetGroup { label: name.into(), points: pts, circles: vec![], mean });
        }
        if groups.is_empty() {
            continue;
        }
        let fig = EqualAreaPlot {
            title: format!("Site means — {label} coordinates"),
            groups,
            cone_label: format!("α{:.0}", settings.confidence * 100.0),
        };
        figures.push(draw(&fig, stem, format!("Site means in {label} coordinates on a lower/upper-hemisphere equal-area net, with the Fisher mean and cone of each polarity.")) ?);
        stage.figures.push(stem.into());
    }
    stages.push(stage);

    // ---- Field tests
    on_stage("field tests");
    let mut stage = Stage::new("Field tests");
    let mut tt =
        CsvTable::new("field-tests", "Field tests (95 %)", &["test", "quantity", "value", "critical", "outcome"]);
    let mut methods = Vec::new();
    let mut results = Vec::new();
    let n_n = used.iter().filter(|u| u.polarity == ZonePolarity::Normal).count();
    let n_r = used.iter().filter(|u| u.polarity == ZonePolarity::Reversed).count();
    if n_n >= 2 && n_r >= 2 {
        let v: Vec<_> = used.iter().map(|u| u.tilt.to_vector()).collect();
        match reversal_test(&v, &mc, 0.95) {
            Ok(t) => {
                let c = &t.comparison;
                methods.push(format!("Reversal test on the tilt-corrected site means: the set is split into two modes on its principal axis, mode 2 is flipped, and the means are compared by the angle γ against γc with the classes of McFadden & McElhinny (1990), by Watson's V_w against a critical value simulated from Fisher sets, and by a bootstrap of Cartesian bounds (Tauxe et al. 1991); {} resamples, seed {}.", settings.resamples, settings.seed));
                tt.push(vec![
                    "reversal".into(),
                    "gamma (deg)".into(),
                    fixed(c.mm90.gamma, 2),
                    fixed(c.mm90.gamma_c, 2),
                    format!("class {}", c.mm90.class.name()),
                ]);
                tt.push(vec![
                    "reversal".into(),
                    "V_w".into(),
                    fixed(c.watson.v_w, 2),
                    fixed(c.watson.v_crit, 2),
                    if c.watson.passed { "pass".into() } else { "fail".into() },
                ]);
                tt.push(vec![
                    "reversal".into(),
                    "bootstrap overlap x/y/z".into(),
                    "".into(),
                    "".into(),
                    if c.bootstrap.passed { "pass".into() } else { "fail".into() },
                ]);
                results.push(format!(
                    "Reversal test ({} and {} sites): γ = {:.1}° against γc = {:.1}°, class {}; V_w {}; bootstrap {}.",
                    c.n1,
                    c.n2,
                    c.mm90.gamma,
                    c.mm90.gamma_c,
                    c.mm90.class.name(),
                    if c.watson.passed { "passes" } else { "fails" },
                    if c.bootstrap.passed { "passes" } else { "fails" }
                ));
            }
            Err(e) => warnings.push(format!("Reversal test skipped: {e}.")),
        }
    } else {
        warnings.push(format!(
            "Reversal test skipped: it needs at least two normal and two reversed sites (found {n_n} and {n_r})."
        ));
    }
    let beds: Vec<Bedding> = used.iter().map(|u| sites[u.idx].bedding.unwrap_or(flat)).collect();
    let spread = if beds.is_empty() { 0.0 } else { bedding_spread(&beds) };
    if used.len() >= 3 && spread >= 5.0 {
        let v: Vec<_> = used.iter().map(|u| u.geo.to_vector()).collect();
        match fold_test(&v, &beds, &mc, &FoldOptions::default()) {
            Ok(t) => {
                methods.push(format!("Fold test on the site means: bootstrap incremental untilting (Tauxe & Watson 1994) from −10 % to 150 %, {} resamples, seed {}; the classic precision ratio (McElhinny 1964) for comparison only.", settings.resamples, settings.seed));
                tt.push(vec![
                    "fold".into(),
                    "best untilting (%)".into(),
                    fixed(t.best_untilt, 0),
                    format!("{:.0} to {:.0}", t.ci_low, t.ci_high),
                    t.verdict.name().into(),
                ]);
                tt.push(vec![
                    "fold".into(),
                    "k_tilt / k_geo".into(),
                    fixed(t.classic.ratio, 2),
                    fixed(t.classic.f_crit, 2),
                    "comparison only".into(),
                ]);
                results.push(format!("Fold test: best untilting {:.0} % (95 % interval {:.0} to {:.0} %): {}. Bedding attitudes differ by up to {:.0}°.",
                    t.best_untilt, t.ci_low, t.ci_high, t.verdict.name(), t.bedding_spread));
                let fig = FoldPlot::from_test(&t, "site means".into());
                figures.push(draw(&fig, "fold", "Fold test: the leading eigenvalue against percent untilting for the data and bootstrap resamples, and the distribution of the resamples' maxima.".into())?);
                stage.figures.push("fold".into());
            }
            Err(e) => warnings.push(format!("Fold test skipped: {e}.")),
        }
    } else if used.len() < 3 {
        warnings.push(format!("Fold test skipped: it needs at least three sites (found {}).", used.len()));
    } else {
        warnings.push(format!("Fold test skipped: the bedding attitudes of the used sites differ by {spread:.1}° (less than 5°), so untilting cannot discriminate."));
    }
    stage.ran = !tt.rows.is_empty();
    stage.method =
        if methods.is_empty() { "No field test could run (see the warnings).".into() } else { methods.join(" ") };
    stage.result = if results.is_empty() { "Skipped.".into() } else { results.join(" ") };
    if stage.ran {
        cautions.push(FIELD_TEST_CAUTION.into());
        stage.tables.push(tt.stem.clone());
        tables.push(tt);
    }
    stages.push(stage);

    // ---- VGPs, paleopole, scatter
    on_stage("poles");
    let mut stage = Stage::new("Virtual geomagnetic poles, paleopole and scatter");
    stage.method = format!(
        "VGP of each used site from its tilt-corrected mean (geocentric axial dipole); dp, dm from α95. Paleopole: Fisher mean of the VGPs after aligning their polarity by the principal axis of the VGPs (each VGP more than 90° from its northern end replaced by its antipode). VGP scatter S_B about the mean pole with cutoff '{}', corrected for within-site scatter where every site has n ≥ 2 and k (McElhinny & McFadden 1997), with a {} % bootstrap interval over sites ({} resamples, seed {}).",
        settings.scatter_cutoff, settings.confidence * 100.0, settings.resamples, settings.seed);
    let mut vt = CsvTable::new(
        "vgps",
        "Virtual geomagnetic poles of the used sites (tilt-corrected)",
        &["site", col_name, "dec", "inc", "plat", "plon", "dp", "dm", "paleolat", "polarity"],
    );
    for u in &used {
        let oval = u.a95.map(|a| pole_oval(u.colat, a)).transpose().ok().flatten();
        vt.push(vec![
            sites[u.idx].site.clone(),
            fixed(sites[u.idx].position, 3),
            fixed(u.tilt.dec, 1),
            fixed(u.tilt.inc, 1),
            fixed(u.vgp_lat, 2),
            fixed(u.vgp_lon, 2),
            fixed_or_empty(oval.map(|o| o.dp), 1),
            fixed_or_empty(oval.map(|o| o.dm), 1),
            fixed(u.paleolat, 1),
            u.polarity.code().into(),
        ]);
    }
    if !used.is_empty() {
        stage.tables.push(vt.stem.clone());
        tables.push(vt);
    }
    // Polarity aligned by the principal axis of the VGPs (not by hemisphere: see poles::align_polarity).
    let raw: Vec<GeoPoint> = used.iter().map(|u| GeoPoint::new(u.vgp_lat, u.vgp_lon).expect("valid VGP")).collect();
    let aligned: Vec<(GeoPoint, bool)> = match align_polarity(&raw) {
        Ok(a) => a.poles.into_iter().zip(a.flipped).collect(),
        Err(_) => Vec::new(),
    };
    if used.len() >= 2 {
        match paleopole(&aligned.iter().map(|a| a.0).collect::<Vec<_>>()) {
            Ok(pp) => {
                let sc_sites: Vec<ScatterSite> = used
                    .iter()
                    .zip(&aligned)
                    .map(|(u, a)| ScatterSite {
                        pole: a.0,
                        within: match (u.n, u.k) {
                            (n, Some(k)) if n >= 2 && k.is_finite() => {
                                Some(WithinSite { n, sw: within_site_sw(k, u.paleolat) })
                            }
                            _ => None,
                        },
                    })
                    .collect();
                let mut pt = CsvTable::new(
                    "paleopole",
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
                    ],
                );
                let mut row = vec![
                    pp.n.to_string(),
                    fixed(pp.pole.lat, 2),
                    fixed(pp.pole.lon, 2),
                    fixed(pp.k.0, 1),
                    fixed_or_empty(pp.a95, 2),
                    settings.scatter_cutoff.clone(),
                ];
                let mut kept_flags = vec![true; used.len()];
                match vgp_scatter(&sc_sites, settings.cutoff()) {
                    Ok(sc) => {
                        kept_flags = sc.kept.clone();
                        let kept: Vec<ScatterSite> =
                            sc_sites.iter().zip(&sc.kept).filter(|(_, k)| **k).map(|(s, _)| *s).collect();
                        let boot = bootstrap_scatter(&kept, settings.confidence, &mc);
                        let (lo, hi) = boot.as_ref().map_or((None, None), |b| (Some(b.low), Some(b.high)));
                        if let Err(e) = &boot {
                            warnings.push(format!("Scatter interval skipped: {e}."));
                        }
                        row.extend([
                            fixed_or_empty(sc.s, 2),
                            fixed_or_empty(lo, 2),
                            fixed_or_empty(hi, 2),
                            fixed(sc.s_total, 2),
                            sc.n_used.to_string(),
                            sc.n_removed.to_string(),
                        ]);
                        let s_b = sc.s.map_or_else(
                            || format!("undefined (the within-site scatter exceeds the total, {:.1}°)", sc.s_total),
                            |s| format!("{s:.1}°"),
                        );
                        stage.result = format!("Paleopole from {} sites: {:.1}°N, {:.1}°E, K = {:.1}, A95 = {}. VGP scatter S_B = {s_b} ({}–{}°, {} sites used, {} removed by the cutoff).",
                            pp.n, pp.pole.lat, pp.pole.lon, pp.k.0, fixed_or_empty(pp.a95, 1) + "°", fixed_or_empty(lo, 1), fixed_or_empty(hi, 1), sc.n_used, sc.n_removed);
                    }
                    Err(e) => {
                        row.extend(["".into(), "".into(), "".into(), "".into(), "".into(), "".into()]);
                        warnings.push(format!("VGP scatter skipped: {e}."));
                        stage.result = format!(
                            "Paleopole from {} sites: {:.1}°N, {:.1}°E, K = {:.1}, A95 = {}°.",
                            pp.n,
                            pp.pole.lat,
                            pp.pole.lon,
                            pp.k.0,
                            fixed_or_empty(pp.a95, 1)
                        );
                    }
                }
                pt.push(row);
                head.pole = Some([pp.pole.lat, pp.pole.lon, pp.a95.unwrap_or(f64::NAN)]);
                stage.tables.push(pt.stem.clone());
                tables.push(pt);
                let fig = PolePlot {
                    title: "VGPs and paleopole (polarity-aligned)".into(),
                    centre: pp.pole,
                    vgps: aligned
                        .iter()
                        .zip(&kept_flags)
                        .map(|(a, k)| MappedVgp { pole: a.0, kept: *k, flipped: a.1 })
                        .collect(),
                    mean: Some((pp.pole, pp.a95)),
                    cutoff: None,
                };
                figures.push(draw(&fig, "vgps", "VGPs of the used sites (polarity aligned by their principal axis) on an azimuthal equal-area map centred on the paleopole, with its A95 circle.".into())?);
                stage.figures.push("vgps".into());
                cautions.push(POLE_CAUTION.into());
            }
            Err(e) => {
                stage.ran = false;
                stage.result = format!("Skipped: {e}.");
                warnings.push(format!("Paleopole skipped: {e}."));
            }
        }
    } else {
        stage.ran = false;
        stage.result = format!("Skipped: a paleopole needs at least two used sites (found {}).", used.len());
        warnings.push(stage.result.clone());
    }
    stages.push(stage);

    // ---- Polarity column and magnetozones
    on_stage("polarity column");
    let mut stage = Stage::new("Polarity column and magnetozones");
    stage.method = format!(
        "Each used site is one level. A level is normal when its VGP latitude is at least {}°, reversed at or below −{}°, intermediate between. Consecutive levels of one class form a magnetozone; a zone of fewer than {} levels is reported as single-level, never merged. Each internal boundary lies somewhere in the sampling gap between its two levels.",
        settings.vgp_threshold, settings.vgp_threshold, settings.min_levels);
    let levels = LevelSet {
        source: p.sampling.name.clone(),
        axis,
        levels: used
            .iter()
            .map(|u| Level {
                position: sites[u.idx].position,
                vgp_lat: u.vgp_lat,
                direction: Some(u.tilt),
                n: u.n,
                a95: u.a95,
                mad: None,
                lines: vec![],
            })
            .collect(),
        notes: vec![],
    };
    let mut column = None;
    if levels.levels.len() >= 2 {
        match zone_levels(&levels, settings.vgp_threshold, settings.min_levels) {
            Ok((pol, col)) => {
                let mut lt = CsvTable::new(
                    "levels",
                    "Polarity of each level",
                    &["site", col_name, "vgp_lat", "polarity", "n", "a95"],
                );
                for ((u, l), pz) in used.iter().zip(&levels.levels).zip(&pol) {
                    lt.push(vec![
                        sites[u.idx].site.clone(),
                        fixed(l.position, 3),
                        fixed(l.vgp_lat, 2),
                        pz.code().into(),
                        l.n.to_string(),
                        fixed_or_empty(l.a95, 1),
                    ]);
                }
                let mut zt =
                    CsvTable::new("zones", "Magnetozones (the zones table that `correlate` reads)", &ZONE_COLUMNS);
                for (i, z) in col.zones.iter().enumerate() {
                    zt.push(vec![
                        (i + 1).to_string(),
                        z.polarity.code().into(),
                        z.n_levels.to_string(),
                        status_word(z).into(),
                        fixed(z.base.mid, 3),
                        fixed(z.base.low, 3),
                        fixed(z.base.high, 3),
                        fixed(z.top.mid, 3),
                        fixed(z.top.low, 3),
                        fixed(z.top.high, 3),
                        col_name.into(),
                    ]);
                }
                head.zones = col.zones.len();
                let code: String = col.zones.iter().map(|z| z.polarity.code()).collect::<Vec<_>>().join(" ");
                stage.result = format!(
                    "{} levels form {} magnetozones ({} single-level), listed by increasing {col_name}: {code}.",
                    levels.levels.len(),
                    col.zones.len(),
                    col.zones.iter().filter(|z| !z.confirmed).count()
                );
                stage.tables.extend([lt.stem.clone(), zt.stem.clone()]);
                tables.extend([lt, zt]);
                column = Some(col);
            }
            Err(e) => {
                stage.ran = false;
                stage.result = format!("Skipped: {e}.");
                warnings.push(format!("Polarity column skipped: {e}."));
            }
        }
    } else {
        stage.ran = false;
        stage.result =
            format!("Skipped: a polarity column needs at least two used levels (found {}).", levels.levels.len());
        warnings.push(stage.result.clone());
    }
    stages.push(stage);

    // ---- Correlation and age model
    on_stage("correlation");
    let mut stage = Stage::new("Correlation with the time scale and age model");
    let mut scale_panel = None;
    match (&p.timescale, &column) {
        (None, _) => {
            stage.ran = false;
            stage.result = "Skipped: the project has no timescale.csv (add one, e.g. a copy of records/timescales/chrons-0-6ma.csv, to correlate the column).".into();
            warnings.push(stage.result.clone());
        }
        (Some(_), None) => {
            stage.ran = false;
            stage.result = "Skipped: there is no polarity column to correlate.".into();
            warnings.push(stage.result.clone());
        }
        (Some(tf), Some(col)) => {
            let ts = TimeScale::from_table(&parse(tf)?)?;
            let opts = CorrelateOptions::default();
            stage.method = format!(
                "Dynamic-programming correlation of the magnetozones with the chrons of {} ({} chrons, {:.3}–{:.3} Ma): boundaries are tied in order, chrons may be missing (penalty {} each, plus the Poisson cost of a short chron falling between levels; {} once for a run read as a hiatus), single-level zones may be left out (penalty {}); a candidate's score is the scatter of its implied accumulation rates in units of σ(ln rate) = {}, plus penalties; lower is better. The age of each level is interpolated between the best candidate's ties and extrapolated at its mean rate beyond them.",
                tf.name, ts.chrons.len(), ts.chrons.first().map_or(0.0, |c| c.young), ts.chrons.last().map_or(0.0, |c| c.old),
                opts.miss_penalty, opts.hiatus_penalty, opts.skip_penalty, opts.rate_spread);
            match correlate(col, &ts, &opts) {
                Ok(res) => {
                    let mut ct = CsvTable::new(
                        "correlations",
                        "Ranked correlations (lower score is better)",
                        &[
                            "rank",
                            "score",
                            "mean_rate_cm_kyr",
                            "ties",
                            "missing_chrons",
                            "skipped_zones",
                            "top_age",
                            "base_age",
                        ],
                    );
                    let mut tt = CsvTable::new(
                        "ties",
                        "Tie points of every candidate",
                        &["rank", col_name, "low", "high", "age", "chron_above", "chron_below"],
                    );
                    for c in &res.candidates {
                        let am = &c.age_model;
                        ct.push(vec![
                            c.rank.to_string(),
                            fixed(c.score, 3),
                            fixed(c.mean_rate, 3),
                            c.ties.len().to_string(),
                            c.missing_chrons.to_string(),
                            c.skipped_zones.to_string(),
                            fixed_or_empty(am.first().map(|a| a.age), 4),
                            fixed_or_empty(am.last().map(|a| a.age), 4),
                        ]);
                        for t in &c.ties {
                            tt.push(vec![
                                c.rank.to_string(),
                                fixed(t.position, 3),
                                fixed(t.low, 3),
                                fixed(t.high, 3),
                                fixed(t.age, 4),
                                t.chron_above.clone(),
                                t.chron_below.clone(),
                            ]);
                        }
                    }
                    let best = &res.candidates[0];
                    let mut at = CsvTable::new(
                        "age-model",
                        "Age of each level from the best correlation",
                        &["site", col_name, "age", "polarity"],
                    );
                    for u in &used {
                        let pos = sites[u.idx].position;
                        at.push(vec![
                            sites[u.idx].site.clone(),
                            fixed(pos, 3),
                            fixed_or_empty(best.age_at(pos, axis), 4),
                            u.polarity.code().into(),
                        ]);
                    }
                    let mut rt = CsvTable::new(
                        "rates",
                        "Runs and accumulation rates of the best correlation",
                        &["top", "base", "age_young", "age_old", "rate_cm_kyr", "reading", "missing_chrons"],
                    );
                    for r in &best.runs {
                        rt.push(vec![
                            fixed(r.top, 3),
                            fixed(r.base, 3),
                            fixed(r.age_young, 4),
                            fixed(r.age_old, 4),
                            fixed_or_empty(r.rate, 3),
                            format!("{:?}", r.reading).to_lowercase(),
                            r.missing.join(" "),
                        ]);
                    }
                    head.ties = best.ties.iter().map(|t| [t.position, t.age]).collect();
                    head.scores = res.candidates.iter().take(2).map(|c| c.score).collect();
                    stage.result = format!("Best candidate: {} ties, mean accumulation rate {:.2} cm/kyr, {} chrons missing, level ages {}–{} Ma. {}",
                        best.ties.len(), best.mean_rate, best.missing_chrons,
                        fixed_or_empty(best.age_model.first().map(|a| a.age), 3), fixed_or_empty(best.age_model.last().map(|a| a.age), 3), comparison_sentence(&res));
                    let (y0, y1) = best
                        .age_model
                        .iter()
                        .fold((f64::INFINITY, f64::NEG_INFINITY), |(x, y), p| (x.min(p.age), y.max(p.age)));
                    scale_panel = Some(ScalePanel {
                        chrons: ts
                            .chrons
                            .iter()
                            .filter(|c| c.old > y0 - 0.05 && c.young < y1 + 0.05)
                            .cloned()
                            .collect(),
                        ties: best.ties.iter().map(|t| (t.position, t.age)).collect(),
                        label: "best candidate".into(),
                    });
                    stage.tables.extend([ct.stem.clone(), tt.stem.clone(), at.stem.clone(), rt.stem.clone()]);
                    tables.extend([ct, tt, at, rt]);
                    cautions.push(CORRELATION_CAUTION.into());
                }
                Err(e) => {
                    stage.ran = false;
                    stage.result = format!("Skipped: {e}.");
                    warnings.push(format!("Correlation skipped: {e}."));
                }
            }
        }
    }
    if let Some(col) = &column {
        let with_scale = scale_panel.is_some();
        let fig = ColumnFigure {
            title: if with_scale {
                "Polarity column and the best correlation".into()
            } else {
                "Polarity column".into()
            },
            axis,
            zones: col.zones.clone(),
            levels: levels.levels.iter().map(|l| (l.position, l.vgp_lat)).collect(),
            threshold: Some(settings.vgp_threshold),
            scale: scale_panel,
        };
        figures.push(draw(&fig, "column", if with_scale {
            "VGP latitude of each level, the magnetozones, and the time scale with the ties of the best correlation.".into()
        } else { "VGP latitude of each level and the magnetozones.".into() })?);
        let i = stages.iter().position(|s| s.name.starts_with("Polarity")).expect("stage exists");
        stages[i].figures.push("column".into());
    }
    stages.push(stage);

    // ---- Reversal statistics of the time scale's span
    if let Some(tf) = &p.timescale {
        on_stage("reversal statistics");
        let ts = TimeScale::from_table(&parse(tf)?)?;
        let r = super::reversal_stats::reversal_statistics(&tf.name, &ts, &mc);
        head.intervals = r.n_intervals;
        head.open_chron = r.elapsed;
        warnings.extend(r.warnings);
        cautions.extend(r.cautions);
        tables.extend(r.tables);
        figures.extend(r.figures);
        stages.push(r.stage);
    }

    // ---- Rejections
    let mut jt = CsvTable::new(
        "rejected",
        "Specimens and sites rejected, with the reason",
        &["what", "name", "stage", "reason"],
    );
    for r in &rejected {
        jt.push(vec![r.what.clone(), r.name.clone(), r.stage.clone(), r.reason.clone()]);
    }
    tables.push(jt);

    let specimens = set
        .specimens
        .into_iter()
        .map(|sp| super::SpecimenRecord {
            fits: fits.iter().filter(|f| f.specimen == sp.specimen).cloned().collect(),
            rejected: rejected
                .iter()
                .filter(|r| r.what == "specimen" && r.name == sp.specimen)
                .map(|r| r.reason.clone())
                .collect(),
            steps: sp,
        })
        .collect();
    let mut out = SectionRun {
        specimens,
        settings,
        tables,
        figures,
        report: String::new(),
        stages,
        warnings,
        cautions,
        rejected,
        headline: head,
    };
    if let Some(t) = truth {
        on_stage("comparison with the true model");
        super::truth::compare_with_truth(&mut out, t);
    }
    on_stage("report");
    out.report = super::report_html(&out, &p.title, &project_files(p));
    Ok(out)
}

fn project_files(p: &Project) -> Vec<(String, usize)> {
    let mut v = vec![(p.steps.name.clone(), p.steps.bytes.len()), (p.sampling.name.clone(), p.sampling.bytes.len())];
    for f in [&p.picks, &p.timescale, &p.settings].into_iter().flatten() {
        v.push((f.name.clone(), f.bytes.len()));
    }
    v
}
