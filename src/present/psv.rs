//! Presenter of the VGP scatter per group against paleolatitude and the fitted latitude model
//! S(λ)² = a² + (bλ)².

use super::test_labels::json_notes;
use super::{cautions, Cell, Presentation, Sheet};
use crate::dirstats::{GroupRemark, LatitudeFit, LatitudeModelInterval, PsvGroups, MIN_GROUP_SITES};
use serde::Serialize;

/// What the run was asked: the source's name, the grouping column and the cutoff as given.
pub struct PsvLabels<'a> {
    /// The sites table's name.
    pub file: &'a str,
    /// The grouping column.
    pub by: &'a str,
    /// The cutoff as given.
    pub cutoff: &'a str,
    /// Seed of the bootstrap.
    pub seed: u64,
}

#[derive(Serialize)]
struct GroupJson<'a> {
    group: &'a str,
    paleolat: f64,
    s: f64,
    s_low: f64,
    s_high: f64,
    n_used: usize,
    within_site_corrected: bool,
}

#[derive(Serialize)]
struct ModelJson {
    a: f64,
    b: f64,
    a_low: f64,
    a_high: f64,
    b_low: f64,
    b_high: f64,
    rms: f64,
    n_groups: usize,
    lat_unit: &'static str,
}

#[derive(Serialize)]
struct PsvJson<'a> {
    file: &'a str,
    by: &'a str,
    cutoff: &'a str,
    groups: Vec<GroupJson<'a>>,
    model: ModelJson,
    resamples: usize,
    seed: u64,
    notes: Vec<String>,
}

/// The groups `pg`, the fitted model `fit` and its bootstrap intervals `ci`.
pub fn psv(pg: &PsvGroups, fit: &LatitudeFit, ci: &LatitudeModelInterval, l: &PsvLabels) -> Presentation {
    let notes = notes(pg, ci, l.seed);
    let cautions = vec![cautions::PSV.to_string()];
    let title = format!("VGP scatter per group of {} (by '{}', cutoff {})", l.file, l.by, l.cutoff);
    let gsec = groups_sheet(pg, ci, &title);
    let mut groups = Vec::new();
    for (((g, b), n_used), within) in pg.groups.iter().zip(&ci.s_bounds).zip(&pg.n_used).zip(&pg.within_corrected) {
        groups.push(GroupJson {
            group: &g.name,
            paleolat: g.paleolat,
            s: g.s,
            s_low: b.0,
            s_high: b.1,
            n_used: *n_used,
            within_site_corrected: *within,
        });
    }
    let json = PsvJson {
        file: l.file,
        by: l.by,
        cutoff: l.cutoff,
        groups,
        model: ModelJson {
            a: fit.a,
            b: fit.b,
            a_low: ci.a_low,
            a_high: ci.a_high,
            b_low: ci.b_low,
            b_high: ci.b_high,
            rms: fit.rms,
            n_groups: fit.n_groups,
            lat_unit: "degrees",
        },
        resamples: ci.resamples,
        seed: l.seed,
        notes: json_notes(&notes, &cautions),
    };
    Presentation {
        json: serde_json::to_value(json).expect("plain data"),
        sheets: vec![gsec, model_sheet(fit, ci)],
        main_sheet: 0,
        notes,
        cautions,
    }
}

/// The sheet of the groups (`psv`'s main sheet, and the Python package's columns): `group`,
/// `paleolat`, `s`, `s_low`, `s_high`, `n_used`.
pub fn groups_sheet(pg: &PsvGroups, ci: &LatitudeModelInterval, title: &str) -> Sheet {
    let mut gsec = Sheet::new(title, &["group", "paleolat", "s", "s_low", "s_high", "n_used"]);
    for ((g, b), n_used) in pg.groups.iter().zip(&ci.s_bounds).zip(&pg.n_used) {
        gsec.push(vec![
            Cell::Text(g.name.clone()),
            Cell::Num(g.paleolat, 1),
            Cell::Num(g.s, 2),
            Cell::Num(b.0, 2),
            Cell::Num(b.1, 2),
            Cell::Int(*n_used as i64),
        ]);
    }
    gsec
}

/// The remarks on groups, the flipped VGPs, and how the model and its intervals were fitted.
fn notes(pg: &PsvGroups, ci: &LatitudeModelInterval, seed: u64) -> Vec<String> {
    let mut notes: Vec<String> = pg
        .remarks
        .iter()
        .map(|(name, remark)| match remark {
            GroupRemark::TooFewSites(n) => {
                format!("Group '{name}' has {n} site(s) and is left out (a scatter needs at least {MIN_GROUP_SITES}).")
            }
            GroupRemark::TooFewKept(n) => format!("Group '{name}' keeps {n} site(s) after the cutoff and is left out."),
            GroupRemark::WithinExceedsTotal => {
                format!("Group '{name}': the within-site term exceeds the total scatter; S is taken as 0.")
            }
        })
        .collect();
    if pg.flipped > 0 {
        notes.push(format!(
            "{} VGP(s) more than 90° from the principal axis of their group's VGPs were mapped to their antipodes (scatter of one polarity).",
            pg.flipped
        ));
    }
    if pg.groups.len() < 4 {
        notes.push(format!(
            "Only {} groups: a and b trade off against each other and the band is wide.",
            pg.groups.len()
        ));
    }
    notes.push(format!(
        "The latitude model is fitted by least squares of S² on λ² (a, b ≥ 0). Intervals: seeded bootstrap of sites within each group (seed {seed}, {} pseudo-samples, 2.5–97.5 %), group paleolatitudes held fixed.",
        ci.resamples
    ));
    notes
}

/// The sheet of the latitude model: `a`, `a_low`, `a_high`, `b`, `b_low`, `b_high`, `rms`,
/// `n_groups` (one row).
pub fn model_sheet(fit: &LatitudeFit, ci: &LatitudeModelInterval) -> Sheet {
    let mut msec = Sheet::new(
        "Latitude model S(λ)² = a² + (bλ)² (λ in degrees)",
        &["a", "a_low", "a_high", "b", "b_low", "b_high", "rms", "n_groups"],
    );
    msec.push(vec![
        Cell::Num(fit.a, 2),
        Cell::Num(ci.a_low, 2),
        Cell::Num(ci.a_high, 2),
        Cell::Num(fit.b, 3),
        Cell::Num(ci.b_low, 3),
        Cell::Num(ci.b_high, 3),
        Cell::Num(fit.rms, 2),
        Cell::Int(fit.n_groups as i64),
    ]);
    msec
}
