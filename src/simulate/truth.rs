//! The truth file of a synthetic project folder (`truth.json`): the model, the accumulation history,
//! the true ties, chrons, levels and specimens, for comparing what a run recovers with what was
//! simulated (read back by `section`).

use super::{AccumulationSpan, RecordedChron, SectionModel, SyntheticSection, TimeScaleSource, TrueTie};
use crate::model::{Polarity, StratAxis, TimeScale};
use crate::sphere::{Bedding, Direction};
use serde::Serialize;

/// The `truth.json` document (see [`truth_document`]); its JSON keys are the file's format.
#[derive(Debug, Clone, Serialize)]
pub struct TruthDocument<'a> {
    what: &'static str,
    seed: u64,
    timescale: &'a TimeScaleSource,
    model: &'a SectionModel,
    axis: StratAxis,
    thickness: f64,
    accumulation: &'a [AccumulationSpan],
    ties: &'a [TrueTie],
    chrons: &'a [RecordedChron],
    levels: Vec<TrueLevel<'a>>,
    specimens: Vec<TrueSpecimen<'a>>,
}

/// One level as the truth file lists it.
#[derive(Debug, Clone, Serialize)]
struct TrueLevel<'a> {
    site: &'a str,
    height: f64,
    depth: f64,
    age: f64,
    polarity: Polarity,
    chron: usize,
    chron_name: &'a Option<String>,
    field_tilt: Direction,
    field_geo: Direction,
    bedding: Option<Bedding>,
}

/// One specimen as the truth file lists it.
#[derive(Debug, Clone, Serialize)]
struct TrueSpecimen<'a> {
    specimen: &'a str,
    site: &'a str,
    characteristic_tilt: Direction,
    characteristic_geo: Direction,
    moment: f64,
}

/// The `truth.json` document of a synthetic section drawn from `m` over the time scale `ts`
/// (`source` says where the time scale came from; `seed` is the run's seed).
pub fn truth_document<'a>(
    m: &'a SectionModel,
    sec: &'a SyntheticSection,
    ts: &'a TimeScale,
    source: &'a TimeScaleSource,
    seed: u64,
) -> TruthDocument<'a> {
    let levels = sec
        .levels
        .iter()
        .map(|l| TrueLevel {
            site: &l.site,
            height: l.height,
            depth: l.depth,
            age: l.age,
            polarity: l.polarity,
            chron: l.chron,
            chron_name: &ts.chrons[l.chron].name,
            field_tilt: l.field_tilt,
            field_geo: l.field_geo,
            bedding: l.bedding,
        })
        .collect();
    let specimens = sec
        .specimens
        .iter()
        .map(|s| TrueSpecimen {
            specimen: &s.name,
            site: &sec.levels[s.level].site,
            characteristic_tilt: s.characteristic_tilt,
            characteristic_geo: s.characteristic_geo,
            moment: s.moment,
        })
        .collect();
    TruthDocument {
        what: "the true model behind a synthetic project folder (lodestone simulate section)",
        seed,
        timescale: source,
        model: m,
        axis: m.axis,
        thickness: sec.history.thickness(),
        accumulation: &sec.history.spans,
        ties: &sec.ties,
        chrons: &sec.chrons,
        levels,
        specimens,
    }
}
