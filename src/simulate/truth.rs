//! The truth file of a synthetic project folder (`truth.json`): the model, the accumulation history,
//! the true ties, chrons, levels and specimens, for comparing what a run recovers with what was
//! simulated (read back by `section`).

use super::{SectionModel, SyntheticSection};
use crate::model::TimeScale;
use serde_json::json;

/// The `truth.json` document of a synthetic section drawn from `m` over the time scale `ts`
/// (`source` says where the time scale came from; `seed` is the run's seed).
pub fn truth_document(
    m: &SectionModel,
    sec: &SyntheticSection,
    ts: &TimeScale,
    source: &serde_json::Value,
    seed: u64,
) -> serde_json::Value {
    let levels: Vec<_> = sec
        .levels
        .iter()
        .map(|l| {
            json!({
                "site": l.site, "height": l.height, "depth": l.depth, "age": l.age, "polarity": l.polarity,
                "chron": l.chron, "chron_name": ts.chrons[l.chron].name,
                "field_tilt": l.field_tilt, "field_geo": l.field_geo, "bedding": l.bedding,
            })
        })
        .collect();
    let specimens: Vec<_> = sec
        .specimens
        .iter()
        .map(|s| {
            json!({"specimen": s.name, "site": sec.levels[s.level].site, "characteristic_tilt": s.characteristic_tilt,
            "characteristic_geo": s.characteristic_geo, "moment": s.moment})
        })
        .collect();
    json!({
        "what": "the true model behind a synthetic project folder (lodestone simulate section)",
        "seed": seed,
        "timescale": source,
        "model": m,
        "axis": m.axis,
        "thickness": sec.history.thickness(),
        "accumulation": sec.history.spans,
        "ties": sec.ties,
        "chrons": sec.chrons,
        "levels": levels,
        "specimens": specimens,
    })
}
