//! Stage 1: the characteristic component of every specimen, from its picks or by the automatic
//! rule; fits whose MAD exceeds the settings' limit are rejected.

use super::inputs::{parse, Inputs};
use super::RunLog;
use crate::demag::{fit_range, SpecimenFit};
use crate::error::Result;
use crate::model::FitKind;
use crate::model::Pick;
use crate::present::components::{fits_sheet, FitColumns};
use crate::section::auto::{automatic_fit, rule_text};
use crate::section::stage::Stage;
use crate::section::tables::CsvTable;
use crate::section::Project;
use crate::table::read_picks;
use std::collections::BTreeMap;

/// The accepted fits, in the steps table's specimen order, with the automatic rule's grade of
/// each specimen it fitted.
pub(in crate::section) struct Fits {
    pub fits: Vec<SpecimenFit>,
    pub grades: BTreeMap<String, &'static str>,
}

/// Fit every specimen; write the stage, the components table and the rejections.
///
/// # Errors
/// An unreadable picks table.
pub(in crate::section) fn fit_specimens(p: &Project, inp: &Inputs, log: &mut RunLog) -> Result<Vec<SpecimenFit>> {
    let s = &inp.settings;
    let mut stage = Stage::new("Characteristic components");
    let picks = match &p.picks {
        Some(pf) => Some((pf, read_picks(&parse(pf)?, &inp.set)?)),
        None => None,
    };
    stage.method = match &picks {
        Some((pf, _)) => format!(
            "Principal-component fits (Kirschvink 1980) over the ranges chosen in {}: lines and planes, free or through the origin as each pick states; a specimen without a pick is fitted by the automatic rule: {}. A line with MAD above {}° is rejected.",
            pf.name, rule_text(s), s.max_mad),
        None => format!("No picks table: each specimen's characteristic component was chosen automatically by {}.", rule_text(s)),
    };
    let all = fit_all(inp, picks.as_ref().map(|(pf, ps)| (pf.name.as_str(), ps.as_slice())), log);
    let (fits, over): (Vec<SpecimenFit>, Vec<SpecimenFit>) = all.fits.into_iter().partition(|f| f.mad <= s.max_mad);
    for f in &over {
        log.reject(
            "specimen",
            &f.specimen,
            "components",
            format!("MAD {:.1}° exceeds max_mad = {}°", f.mad, s.max_mad),
        );
    }
    let mut fitted: Vec<&str> = fits.iter().map(|f| f.specimen.as_str()).collect();
    fitted.dedup();
    log.head.specimens_fitted = fitted.len();
    stage.result = format!("{} of {} specimens gave an accepted component ({} lines, {} planes); {} specimen rejections are listed in the table of rejections.",
        log.head.specimens_fitted, log.head.specimens, fits.iter().filter(|f| f.kind == FitKind::Line).count(),
        fits.iter().filter(|f| f.kind == FitKind::Plane).count(), log.rejected.len());
    log.table(&mut stage, components_table(inp, &fits, &all.grades));
    log.stages.push(stage);
    Ok(fits)
}

/// Every specimen's fits: one per pick (a pick that cannot be fitted is a rejection), or the
/// automatic rule's for a specimen without a pick.
fn fit_all(inp: &Inputs, picks: Option<(&str, &[Pick])>, log: &mut RunLog) -> Fits {
    let mut out = Fits { fits: Vec::new(), grades: BTreeMap::new() };
    for sp in &inp.set.specimens {
        let mine: Vec<&Pick> =
            picks.iter().flat_map(|(_, ps)| ps.iter().filter(|k| k.specimen == sp.specimen)).collect();
        for k in &mine {
            let name = picks.map_or("", |(n, _)| n);
            match fit_range(sp, k.from, k.to, k.kind, k.anchor) {
                Ok(f) => out.fits.push(f),
                Err(e) => log.reject("specimen", &sp.specimen, "components", format!("{name} line {}: {e}", k.line)),
            }
        }
        if mine.is_empty() {
            match automatic_fit(sp, &inp.settings) {
                Ok(c) => {
                    out.grades.insert(sp.specimen.clone(), c.grade.as_str());
                    out.fits.push(c.fit)
                }
                Err(why) => log.reject("specimen", &sp.specimen, "components", why),
            }
        }
    }
    out
}

fn components_table(inp: &Inputs, fits: &[SpecimenFit], grades: &BTreeMap<String, &'static str>) -> CsvTable {
    let grade = |s: &str| grades.get(s).map_or("pick", |g| g).to_string();
    let cols = FitColumns { levels_and_bedding: false, grade: Some(&grade) };
    let title = "Characteristic components per specimen (geographic coordinates)";
    CsvTable::from_sheet("components", fits_sheet(title, &inp.set, fits, &cols))
}
