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

#[cfg(test)]
mod tests;
