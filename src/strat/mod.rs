//! Magnetostratigraphy: polarity of each level, magnetozones with boundary uncertainties, and the
//! correlation of a column with a polarity time scale (ties, age model, accumulation rates).
//!
//! Flow: [`read_levels`] → [`classify`] per level → [`build_zones`] → [`correlate`].

mod agemodel;
mod correlate;
mod correlate_options;
mod levels;
mod polarity;
mod problem;
mod zones;

pub use agemodel::{AgePoint, Candidate, RunRate, Tie};
pub use correlate::{comparison_sentence, correlate, Correlation};
pub use correlate_options::{CorrelateOptions, DatedLevel, Reading};
pub use levels::{read_levels, Level, LevelOptions, LevelSet};
pub use polarity::{check_threshold, classify, ZonePolarity, DEFAULT_THRESHOLD};
pub use zones::{build_zones, read_zones, status_word, Boundary, Magnetozone, ZoneColumn, ZONE_COLUMNS};

/// Default minimum number of levels for a confirmed zone.
pub const DEFAULT_MIN_LEVELS: usize = 2;

/// Zone a level set with a threshold and a minimum zone size.
pub fn zone_levels(
    set: &LevelSet,
    threshold: f64,
    min_levels: usize,
) -> crate::Result<(Vec<ZonePolarity>, ZoneColumn)> {
    check_threshold(threshold)?;
    let pol: Vec<ZonePolarity> = set.levels.iter().map(|l| classify(l.vgp_lat, threshold)).collect();
    let pos: Vec<f64> = set.levels.iter().map(|l| l.position).collect();
    let col = build_zones(set.axis, &pos, &pol, min_levels)?;
    Ok((pol, col))
}

/// A column for a correlation: a zones table (as `column --format csv` writes it) read as it is, or a
/// levels table zoned with `threshold` and `min_levels`; the levels come back with the second.
pub fn read_column(
    t: &crate::table::Table,
    threshold: f64,
    min_levels: usize,
) -> crate::Result<(ZoneColumn, Option<LevelSet>)> {
    if is_zones_table(t) {
        return Ok((read_zones(t)?, None));
    }
    let set = read_levels(t, LevelOptions::default())?;
    let (_, col) = zone_levels(&set, threshold, min_levels)?;
    Ok((col, Some(set)))
}

/// A zones table has the `n_levels` and `base_low` columns of [`ZONE_COLUMNS`].
pub fn is_zones_table(t: &crate::table::Table) -> bool {
    t.col("n_levels").is_some() && t.col("base_low").is_some()
}

#[cfg(test)]
mod tests;
