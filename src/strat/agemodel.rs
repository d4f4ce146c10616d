//! Age–position models and accumulation rates of a correlation candidate.

use super::correlate_options::Reading;
use super::problem::{Path, Problem};
use crate::model::StratAxis;
use crate::units::m_per_myr_to_cm_per_kyr;

/// A tie point: a polarity boundary of the column matched to a chron boundary.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Tie {
    /// Position of the boundary (midpoint of its sampling gap), m.
    pub position: f64,
    /// Interval the boundary lies in, m (smaller value).
    pub low: f64,
    /// Interval the boundary lies in, m (larger value).
    pub high: f64,
    /// Age of the chron boundary, Ma.
    pub age: f64,
    /// Chron above (younger) the boundary.
    pub chron_above: String,
    /// Chron below (older) the boundary.
    pub chron_below: String,
}

/// One run of a candidate: the stretch between two ties (or a tie and a section end).
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct RunRate {
    /// Younger end (position, m).
    pub top: f64,
    /// Older end (position, m).
    pub base: f64,
    /// Age at the top, Ma (extrapolated at the candidate's mean rate for the top run).
    pub age_young: f64,
    /// Age at the base, Ma (extrapolated for the bottom run).
    pub age_old: f64,
    /// Accumulation rate, cm/kyr (None for the end runs: they are not bounded by two ties).
    pub rate: Option<f64>,
    /// Chrons of the run, youngest first.
    pub chrons: Vec<String>,
    /// Names of the chrons missing in the run.
    pub missing: Vec<String>,
    /// How the missing chrons were read.
    pub reading: Reading,
    /// Single-level zones ignored in the run.
    pub skipped_zones: usize,
    /// True for a run bounded by a section end.
    pub end: bool,
}

/// A point of the age model.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct AgePoint {
    /// Position, m.
    pub position: f64,
    /// Age, Ma.
    pub age: f64,
}

/// A ranked correlation candidate.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct Candidate {
    /// Rank, 1 = best.
    pub rank: usize,
    /// Score (lower is better).
    pub score: f64,
    /// The common accumulation rate that minimises the score, cm/kyr.
    pub mean_rate: f64,
    /// Part of the score from rate scatter (end-run terms included).
    pub rate_misfit: f64,
    /// Number of missing chrons.
    pub missing_chrons: usize,
    /// Number of ignored single-level zones.
    pub skipped_zones: usize,
    /// Tie points, youngest first.
    pub ties: Vec<Tie>,
    /// Runs with their rates, youngest first.
    pub runs: Vec<RunRate>,
    /// Piecewise-linear age model: section top, ties, section bottom.
    pub age_model: Vec<AgePoint>,
}

impl Candidate {
    /// Age at a position by linear interpolation in the age model (None outside the section).
    pub fn age_at(&self, position: f64, axis: StratAxis) -> Option<f64> {
        let up = |p: f64| if axis == StratAxis::Height { p } else { -p };
        let u = up(position);
        self.age_model.windows(2).find_map(|w| {
            let (u0, u1) = (up(w[0].position), up(w[1].position));
            if u <= u0 + 1e-12 && u >= u1 - 1e-12 {
                let f = if u0 > u1 { (u0 - u) / (u0 - u1) } else { 0.0 };
                Some(w[0].age + f * (w[1].age - w[0].age))
            } else {
                None
            }
        })
    }
}

fn chron_name(pb: &Problem, k: usize) -> String {
    let c = &pb.ts.chrons[k];
    c.name.clone().unwrap_or_else(|| format!("{}–{} Ma ({})", c.young, c.old, c.polarity.code()))
}

/// Assemble the reported candidate for a path scored at ln r.
pub(crate) fn build_candidate(pb: &Problem, p: &Path, rank: usize, score: f64, ln_r: f64) -> Candidate {
    let runs_cost = pb.path_runs(p, ln_r).expect("a scored path is valid");
    let down = |u: f64| pb.col.up(u); // up() is its own inverse
    let ch = &pb.ts.chrons;
    let r = ln_r.exp(); // m per Myr
    let ties: Vec<Tie> = p
        .ties
        .iter()
        .map(|&(g, j)| {
            let gp = &pb.gaps[g];
            let (x, y) = (down(gp.lo), down(gp.hi));
            Tie {
                position: down(gp.mid()),
                low: x.min(y),
                high: x.max(y),
                age: ch[j].old,
                chron_above: chron_name(pb, j),
                chron_below: chron_name(pb, j + 1),
            }
        })
        .collect();
    // Chron ranges of each run.
    let mut ranges = vec![(p.top, p.ties[0].1)];
    for w in p.ties.windows(2) {
        ranges.push((w[0].1 + 1, w[1].1));
    }
    ranges.push((p.ties[p.ties.len() - 1].1 + 1, p.bottom));
    let n_runs = ranges.len();
    let mut runs = Vec::with_capacity(n_runs);
    for (i, (&(s, e), cost)) in ranges.iter().zip(&runs_cost).enumerate() {
        let u_hi = if i == 0 { pb.u_top } else { pb.gaps[p.ties[i - 1].0].mid() };
        let u_lo = if i + 1 == n_runs { pb.u_bottom } else { pb.gaps[p.ties[i].0].mid() };
        let polarity = ch[if i == 0 { e } else { s }].polarity;
        let missing: Vec<String> = (s..=e).filter(|&k| ch[k].polarity != polarity).map(|k| chron_name(pb, k)).collect();
        let mdur: f64 = (s..=e).filter(|&k| ch[k].polarity != polarity).map(|k| ch[k].duration()).sum();
        let hiatus = if cost.reading == Reading::Hiatus { mdur } else { 0.0 };
        let t = u_hi - u_lo;
        let (age_young, age_old, rate) = if i == 0 {
            let old = ch[e].old;
            let young =
                (old - t / r - if cost.reading == Reading::Hiatus { mdur } else { 0.0 }).clamp(ch[s].young, old);
            (young, old, None)
        } else if i + 1 == n_runs {
            let young = ch[s - 1].old;
            let old = (young + t / r + hiatus).clamp(young, ch[e].old);
            (young, old, None)
        } else {
            let (young, old) = (ch[s - 1].old, ch[e].old);
            (young, old, Some(m_per_myr_to_cm_per_kyr(t / (old - young - hiatus))))
        };
        runs.push(RunRate {
            top: down(u_hi),
            base: down(u_lo),
            age_young,
            age_old,
            rate,
            chrons: (s..=e).map(|k| chron_name(pb, k)).collect(),
            missing,
            reading: cost.reading,
            skipped_zones: cost.skipped,
            end: i == 0 || i + 1 == n_runs,
        });
    }
    let mut age_model = vec![AgePoint { position: down(pb.u_top), age: runs[0].age_young }];
    age_model.extend(ties.iter().map(|t| AgePoint { position: t.position, age: t.age }));
    age_model.push(AgePoint { position: down(pb.u_bottom), age: runs[n_runs - 1].age_old });
    Candidate {
        rank,
        score,
        mean_rate: m_per_myr_to_cm_per_kyr(r),
        rate_misfit: runs_cost.iter().map(|c| c.rate_term).sum(),
        missing_chrons: runs_cost.iter().map(|c| c.missing).sum(),
        skipped_zones: runs_cost.iter().map(|c| c.skipped).sum(),
        ties,
        runs,
        age_model,
    }
}
