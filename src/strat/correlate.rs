//! Correlation of a polarity column with a polarity time scale: a dynamic-programming search over tie
//! points, scored by how steady the implied accumulation rate is.
//!
//! # The model
//! The column is read from youngest to oldest. A *candidate* ties some of the column's polarity
//! boundaries to chron boundaries, in order. Between two ties lies a *run*: one or more zones of one
//! polarity (opposite-polarity single-level zones inside it are ignored at a cost, intermediate zones are
//! ignored freely) matched to a run of consecutive chrons that starts and ends with that polarity. Chrons
//! of the other polarity inside the run are *missing*: either a hiatus removed them or they were too short
//! to be sampled. The run's rate is its thickness over its duration; for a run with missing chrons both
//! readings are tried (the duration with them, "unsampled", and without them, "hiatus") and the better one
//! is kept and reported. A missing chron costs `P_miss`; read as unsampled it costs in addition
//! 2·d·r/Δ, which is −2 ln of the chance that no level falls in it when levels are spread like a Poisson
//! process with the column's mean spacing Δ (a chron of duration d spans d·r metres at rate r); read as a
//! hiatus, the run costs `P_hiatus` once (one hiatus may remove several chrons). The runs at the top and bottom of the section meet no tie on their outer side:
//! they only need their thickness to fit, at the candidate's rate, inside the chrons they are matched to.
//!
//! # Score (lower is better)
//! score = Σ_runs δᵢ² / σ² + missing-chron costs + P_skip · (ignored single-level zones), minimised over
//! the common rate r. Each boundary may lie anywhere in its sampling gap, so a run's thickness is an
//! interval [T_min, T_max] (T_min = distance between its outermost levels, T_max = distance between the
//! nearest levels outside it); δᵢ is the distance, in ln units, from the interval of durations that
//! thickness implies at rate r, [T_min/r, T_max/r], to the run's duration D (to the interval of possible
//! durations for the end runs); δᵢ = 0 when they overlap. σ is the accepted spread of ln rate. Read as
//! −2 ln L of a log-normal rate model plus penalties, score differences compare candidates like
//! likelihood-ratio statistics. Reported rates use the gap midpoints.
//!
//! # Search
//! For a fixed r the score is a sum over runs, so the best candidates come from a k-best Viterbi pass over
//! nodes (column boundary, chron boundary) in O(N² k) for N nodes. The pass is repeated over a log grid of
//! r (step σ/2); the union of the candidates is then rescored with r optimised for each, and ranked.
//!
//! The search is exact: none of the following changes a result, tie order included.
//! - Everything about a run that does not depend on r (logarithms of its thickness and duration
//!   intervals, its missing chrons, its ignored zones, which gap pairs a run can join) is computed once
//!   per problem (`RunTables`: only the chron pairs a run can use, about n²/4 per table for n chrons).
//! - Branch and bound inside each pass: a run costs at least `P_miss` · missing + `P_skip` · ignored,
//!   and the number of missing chrons only grows as a run reaches further back, so a walk over earlier
//!   nodes stops as soon as that floor (plus the least cost that could precede it) exceeds the worst
//!   entry of a full k-best list. Offers are ranked by (cost, order of a plain forward walk), so equal
//!   costs are broken as in that walk.
//! - The passes at different r are independent; they run in parallel (rayon) and are merged in grid
//!   order, and the rescoring keeps the order of the union.
//!
//! No setting trades accuracy for speed.
//!
//! # References
//! Dynamic programming over ordered matches: Viterbi (1967), *IEEE Trans. Inf. Theory* 13, 260–269;
//! Needleman & Wunsch (1970), *J. Mol. Biol.* 48, 443–453. Judging a correlation to the time scale by the
//! steadiness of the implied accumulation rate is common practice (Opdyke & Channell 1996, *Magnetic
//! Stratigraphy*, Academic Press).

use super::agemodel::{build_candidate, Candidate};
use super::correlate_options::CorrelateOptions;
use super::problem::kbest::kbest;
use super::problem::{Path, Problem};
use super::zones::ZoneColumn;
use crate::model::TimeScale;
use crate::{Error, Result};
use rayon::prelude::*;
use std::collections::HashMap;

/// The result of [`correlate`].
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Correlation {
    /// Ranked candidates, best first.
    pub candidates: Vec<Candidate>,
    /// Number of distinct candidates scored.
    pub n_scored: usize,
}

/// Rank correlations of a zone column with a time scale.
///
/// # Units
/// Positions in m, ages in Ma; rates in the candidates in cm/kyr.
///
/// # Formula and references
/// See the module documentation.
pub fn correlate(col: &ZoneColumn, ts: &TimeScale, opts: &CorrelateOptions) -> Result<Correlation> {
    opts.check()?;
    let pb = Problem::new(col, ts, opts)?;
    let (lo, hi) = pb.rate_range();
    let step = opts.rate_spread / 2.0;
    let n_grid = (((hi - lo) / step).ceil() as usize).clamp(8, 400);
    let k = opts.candidates.max(5) + 3;
    let mut seen: HashMap<Path, ()> = HashMap::new();
    let mut order: Vec<Path> = Vec::new();
    // The passes at each rate are independent: run them in parallel, then merge in grid order so the
    // union (and so the ranking, ties included) is the same as a serial run.
    let per_rate: Vec<Vec<Path>> =
        (0..=n_grid).into_par_iter().map(|i| kbest(&pb, lo + (hi - lo) * i as f64 / n_grid as f64, k)).collect();
    for paths in per_rate {
        for p in paths {
            if seen.insert(p.clone(), ()).is_none() {
                order.push(p);
            }
        }
    }
    if order.is_empty() {
        return Err(Error::Undefined(
            "no correlation fits: the column has more polarity changes than the time scale offers, or the anchors exclude every match".into(),
        ));
    }
    // Rescoring is per path; rayon's collect keeps the input order, and the sort below is stable.
    let mut scored: Vec<(f64, f64, Path)> =
        order.into_par_iter().filter_map(|p| pb.optimise(&p).map(|(s, x)| (s, x, p))).collect();
    scored.sort_by(|a, b| a.0.total_cmp(&b.0));
    let n_scored = scored.len();
    let candidates = scored
        .into_iter()
        .take(opts.candidates.max(1))
        .enumerate()
        .map(|(i, (s, x, p))| build_candidate(&pb, &p, i + 1, s, x))
        .collect();
    Ok(Correlation { candidates, n_scored })
}

/// One plain sentence comparing the best candidate with the runner-up.
///
/// The score is −2 ln L of the log-normal rate model plus penalties, so exp(−Δ/2) is read like a
/// likelihood ratio; the verbal scale (Δ < 2 weak, < 6 positive, < 10 strong, otherwise very strong)
/// follows the 2 ln B scale of Kass & Raftery (1995), *J. Am. Stat. Assoc.* 90, 773–795 (from memory).
pub fn comparison_sentence(c: &Correlation) -> String {
    match c.candidates.as_slice() {
        [] => "No candidate was found.".into(),
        [_] => "Only one candidate fits the column; there is no runner-up to compare with.".into(),
        [a, b, ..] => {
            let d = b.score - a.score;
            let word = if d < 2.0 {
                "hardly better than"
            } else if d < 6.0 {
                "positively better than"
            } else if d < 10.0 {
                "strongly better than"
            } else {
                "very strongly better than"
            };
            format!(
                "The best candidate (score {:.2}) is {word} the runner-up (score {:.2}): a score difference of {:.2}, so under the score's rate model the runner-up is about {:.3} times as likely.",
                a.score, b.score, d, (-d / 2.0).exp()
            )
        }
    }
}
