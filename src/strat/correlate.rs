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
//! # References
//! Dynamic programming over ordered matches: Viterbi (1967), *IEEE Trans. Inf. Theory* 13, 260–269;
//! Needleman & Wunsch (1970), *J. Mol. Biol.* 48, 443–453. Judging a correlation to the time scale by the
//! steadiness of the implied accumulation rate is common practice (Opdyke & Channell 1996, *Magnetic
//! Stratigraphy*, Academic Press).

use super::agemodel::{build_candidate, Candidate};
use super::polarity::ZonePolarity;
use super::zones::ZoneColumn;
use crate::table::{Polarity, TimeScale};
use crate::{Error, Result};
use std::collections::HashMap;

/// A dated bed: the age at a position must fall within the chrons the candidate assigns there.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Anchor {
    /// Height or depth, m (same axis as the column).
    pub position: f64,
    /// Age, Ma.
    pub age: f64,
    /// Uncertainty of the age, Myr (half-width of the accepted interval; 0 for exact).
    pub uncertainty: f64,
}

/// Settings of [`correlate`].
#[derive(Debug, Clone, PartialEq)]
pub struct CorrelateOptions {
    /// Score added per missing chron, whatever its reading (default 2).
    pub miss_penalty: f64,
    /// Score added once per run read as containing a hiatus (default 6).
    pub hiatus_penalty: f64,
    /// Score added per single-level zone ignored (default 2).
    pub skip_penalty: f64,
    /// Accepted spread σ of the natural log of the accumulation rate (default 0.25).
    pub rate_spread: f64,
    /// Number of ranked candidates to return (default 5).
    pub candidates: usize,
    /// Dated beds.
    pub anchors: Vec<Anchor>,
}

impl Default for CorrelateOptions {
    fn default() -> Self {
        Self { miss_penalty: 2.0, hiatus_penalty: 6.0, skip_penalty: 2.0, rate_spread: 0.25, candidates: 5, anchors: vec![] }
    }
}

/// Which duration a run with missing chrons was given.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "lowercase")]
pub enum Reading {
    /// No chron is missing in the run.
    Complete,
    /// Missing chrons were too short to be sampled: their time is in the run.
    Unsampled,
    /// Missing chrons were removed by a hiatus: their time is not in the run.
    Hiatus,
}

/// A polarity boundary of the column, possibly spread over intermediate zones (internal, up coordinates).
#[derive(Debug, Clone, Copy)]
pub(crate) struct Gap {
    pub a: usize,
    pub c: usize,
    pub lo: f64,
    pub hi: f64,
}
impl Gap {
    pub fn mid(&self) -> f64 {
        0.5 * (self.lo + self.hi)
    }
}

/// The problem in internal form: units young → old in "up" coordinates (younger is larger).
pub(crate) struct Problem<'a> {
    pub col: &'a ZoneColumn,
    pub ts: &'a TimeScale,
    pub opts: &'a CorrelateOptions,
    pub pol: Vec<ZonePolarity>,
    pub confirmed: Vec<bool>,
    pub gaps: Vec<Gap>,
    pub u_top: f64,
    pub u_bottom: f64,
    /// Mean spacing of levels, m.
    pub spacing: f64,
    /// Prefix sums over chrons of (count, duration) for normal and reversed chrons.
    pre: [Vec<(usize, f64)>; 2],
    anchors_up: Vec<(f64, Anchor)>,
}

/// A candidate path: top chron, ties (gap index, chron boundary j between chron j and j + 1), bottom chron.
#[derive(Debug, Clone, PartialEq, Eq, Hash)]
pub(crate) struct Path {
    pub top: usize,
    pub ties: Vec<(usize, usize)>,
    pub bottom: usize,
}

/// Cost of one run at a given ln r, with the reading chosen.
#[derive(Debug, Clone, Copy)]
pub(crate) struct RunCost {
    pub rate_term: f64,
    pub missing: usize,
    pub skipped: usize,
    pub reading: Reading,
    pub miss_cost: f64,
}

fn pidx(p: Polarity) -> usize {
    match p {
        Polarity::Normal => 0,
        Polarity::Reversed => 1,
    }
}

impl<'a> Problem<'a> {
    pub fn new(col: &'a ZoneColumn, ts: &'a TimeScale, opts: &'a CorrelateOptions) -> Result<Problem<'a>> {
        let units = col.young_to_old();
        let up = |b: &super::zones::Boundary| {
            let (x, y) = (col.up(b.low), col.up(b.high));
            (x.min(y), x.max(y))
        };
        let pol: Vec<ZonePolarity> = units.iter().map(|z| z.polarity).collect();
        let confirmed: Vec<bool> = units.iter().map(|z| z.confirmed).collect();
        let m = units.len();
        let mut gaps = Vec::new();
        for a in 0..m {
            if pol[a] == ZonePolarity::Intermediate {
                continue;
            }
            for c in a + 1..m {
                if pol[c] == ZonePolarity::Intermediate {
                    continue;
                }
                if pol[c] != pol[a] {
                    gaps.push(Gap { a, c, lo: up(&units[c].top).0, hi: up(&units[a].base).1 });
                }
                break;
            }
        }
        if gaps.is_empty() {
            return Err(Error::Undefined(
                "the column has no change between normal and reversed polarity, so it cannot be tied to a time scale".into(),
            ));
        }
        if ts.chrons.len() < 2 {
            return Err(Error::TooFew { what: "a correlation", needed: 2, got: ts.chrons.len(), unit: "chrons" });
        }
        for (x, name) in [(opts.miss_penalty, "miss penalty"), (opts.hiatus_penalty, "hiatus penalty"), (opts.skip_penalty, "skip penalty")] {
            crate::error::check_range(name, x, 0.0, f64::MAX, "[0, ∞)")?;
        }
        crate::error::check_range("rate spread", opts.rate_spread, 1e-6, 10.0, "(0, 10]")?;
        let mut pre = [vec![(0usize, 0.0f64)], vec![(0usize, 0.0f64)]];
        for ch in &ts.chrons {
            for (k, p) in pre.iter_mut().enumerate() {
                let (n, d) = *p.last().expect("non-empty");
                let hit = pidx(ch.polarity) == k;
                p.push((n + hit as usize, d + if hit { ch.duration() } else { 0.0 }));
            }
        }
        let (u_top, u_bottom) = (up(&units[0].top).1, up(&units[m - 1].base).0);
        let n_levels: usize = units.iter().map(|z| z.n_levels).sum();
        let spacing = if n_levels > 1 { (u_top - u_bottom) / (n_levels - 1) as f64 } else { 0.0 };
        if !(spacing > 0.0) {
            return Err(Error::Undefined("the column has no thickness (one level, or all levels at one position)".into()));
        }
        let anchors_up = opts.anchors.iter().map(|a| (col.up(a.position), *a)).collect();
        Ok(Problem {
            col,
            ts,
            opts,
            u_top,
            u_bottom,
            spacing,
            pol,
            confirmed,
            gaps,
            pre,
            anchors_up,
        })
    }

    fn chron_pol(&self, k: usize) -> Polarity {
        self.ts.chrons[k].polarity
    }

    /// Chrons in s..=e not of polarity `p`: (count, total duration).
    fn missing(&self, s: usize, e: usize, p: Polarity) -> (usize, f64) {
        let o = pidx(p.flip());
        let (n1, d1) = self.pre[o][e + 1];
        let (n0, d0) = self.pre[o][s];
        (n1 - n0, d1 - d0)
    }

    /// Ignored single-level zones in zones z0..=z1 for a run of polarity `p`; None if a confirmed zone of
    /// the other polarity lies inside.
    pub fn skips(&self, z0: usize, z1: usize, p: ZonePolarity) -> Option<usize> {
        let mut n = 0;
        for z in z0..=z1 {
            let q = self.pol[z];
            if q == p || q == ZonePolarity::Intermediate {
                continue;
            }
            if self.confirmed[z] {
                return None;
            }
            n += 1;
        }
        Some(n)
    }

    fn anchors_ok(&self, u_hi: f64, u_lo: f64, age_young: f64, age_old: f64) -> bool {
        self.anchors_up.iter().all(|(u, a)| {
            !(*u <= u_hi && *u > u_lo) || (a.age >= age_young - a.uncertainty && a.age <= age_old + a.uncertainty)
        })
    }

    /// (δ/σ)²: δ = ln-distance between the durations [t_min/r, t_max/r] and [d_min, d_max] (0 if they meet).
    fn interval_term(&self, t_min: f64, t_max: f64, d_min: f64, d_max: f64, ln_r: f64) -> f64 {
        let lo = if t_min > 0.0 { t_min.ln() - ln_r } else { f64::NEG_INFINITY };
        let hi = t_max.max(1e-12).ln() - ln_r;
        let (dlo, dhi) = (if d_min > 0.0 { d_min.ln() } else { f64::NEG_INFINITY }, d_max.max(1e-12).ln());
        let delta = if lo > dhi { lo - dhi } else if hi < dlo { dlo - hi } else { 0.0 };
        (delta / self.opts.rate_spread).powi(2)
    }

    /// Interior run between gap g1 (tied at j1) and gap g2 (tied at j2) below it.
    pub fn interior(&self, g1: usize, j1: usize, g2: usize, j2: usize, ln_r: f64) -> Option<RunCost> {
        let (a, b) = (&self.gaps[g1], &self.gaps[g2]);
        if b.a < a.c || j2 <= j1 {
            return None;
        }
        let p = self.pol[a.c];
        let cp = p.as_chron()?;
        if self.pol[b.a] != p || self.chron_pol(j1 + 1) != cp || self.chron_pol(j2) != cp {
            return None;
        }
        let skipped = self.skips(a.c, b.a, p)?;
        let (t_young, t_old) = (self.ts.chrons[j1].old, self.ts.chrons[j2].old);
        if !self.anchors_ok(a.mid(), b.mid(), t_young, t_old) {
            return None;
        }
        let (t_min, t_max) = ((a.lo - b.hi).max(0.0), a.hi - b.lo);
        let (missing, mdur) = self.missing(j1 + 1, j2, cp);
        let d_incl = t_old - t_young;
        let term = |d: f64| self.interval_term(t_min, t_max, d, d, ln_r);
        Some(self.choose(term(d_incl), term(d_incl - mdur), missing, mdur, skipped, ln_r))
    }


    /// Top run: section top down to gap g tied at j, starting in chron s.
    pub fn top(&self, s: usize, g: usize, j: usize, ln_r: f64) -> Option<RunCost> {
        let gp = &self.gaps[g];
        let p = self.pol[gp.a];
        let cp = p.as_chron()?;
        if s > j || self.chron_pol(s) != cp || self.chron_pol(j) != cp {
            return None;
        }
        let skipped = self.skips(0, gp.a, p)?;
        let ch = &self.ts.chrons;
        if !self.anchors_ok(f64::INFINITY, gp.mid(), ch[s].young, ch[j].old) {
            return None;
        }
        let (missing, mdur) = self.missing(s, j, cp);
        let t = ((self.u_top - gp.hi).max(0.0), self.u_top - gp.lo);
        let (dmin, dmax) = (ch[j].old - ch[s].old, ch[j].old - ch[s].young);
        self.end_cost(t, dmin, dmax, missing, mdur, skipped, ln_r)
    }

    /// Bottom run: gap g tied at j down to the section bottom, ending in chron e.
    pub fn bottom(&self, g: usize, j: usize, e: usize, ln_r: f64) -> Option<RunCost> {
        let gp = &self.gaps[g];
        let p = self.pol[gp.c];
        let cp = p.as_chron()?;
        if e <= j || self.chron_pol(j + 1) != cp || self.chron_pol(e) != cp {
            return None;
        }
        let skipped = self.skips(gp.c, self.pol.len() - 1, p)?;
        let ch = &self.ts.chrons;
        if !self.anchors_ok(gp.mid(), f64::NEG_INFINITY, ch[j].old, ch[e].old) {
            return None;
        }
        let (missing, mdur) = self.missing(j + 1, e, cp);
        let t = ((gp.lo - self.u_bottom).max(0.0), gp.hi - self.u_bottom);
        let (dmin, dmax) = (ch[e].young - ch[j].old, ch[e].old - ch[j].old);
        self.end_cost(t, dmin, dmax, missing, mdur, skipped, ln_r)
    }

    #[allow(clippy::too_many_arguments)]
    fn end_cost(&self, t: (f64, f64), dmin: f64, dmax: f64, missing: usize, mdur: f64, skipped: usize, ln_r: f64) -> Option<RunCost> {
        let u = self.interval_term(t.0, t.1, dmin, dmax, ln_r);
        let h = self.interval_term(t.0, t.1, (dmin - mdur).max(0.0), dmax - mdur, ln_r);
        Some(self.choose(u, h, missing, mdur, skipped, ln_r))
    }

    /// Pick the better reading of a run's missing chrons (rate term with them / without them).
    fn choose(&self, unsampled: f64, hiatus: f64, missing: usize, mdur: f64, skipped: usize, ln_r: f64) -> RunCost {
        if missing == 0 {
            return RunCost { rate_term: unsampled, missing, skipped, reading: Reading::Complete, miss_cost: 0.0 };
        }
        let base = self.opts.miss_penalty * missing as f64;
        let cu = base + 2.0 * ln_r.exp() * mdur / self.spacing;
        let ch = base + self.opts.hiatus_penalty;
        if hiatus + ch < unsampled + cu {
            RunCost { rate_term: hiatus, missing, skipped, reading: Reading::Hiatus, miss_cost: ch }
        } else {
            RunCost { rate_term: unsampled, missing, skipped, reading: Reading::Unsampled, miss_cost: cu }
        }
    }

    pub fn penalty(&self, c: &RunCost) -> f64 {
        c.rate_term + c.miss_cost + self.opts.skip_penalty * c.skipped as f64
    }

    /// Every run of a path at ln r: top, interior…, bottom.
    pub fn path_runs(&self, p: &Path, ln_r: f64) -> Option<Vec<RunCost>> {
        let mut v = Vec::with_capacity(p.ties.len() + 1);
        let (g0, j0) = p.ties[0];
        v.push(self.top(p.top, g0, j0, ln_r)?);
        for w in p.ties.windows(2) {
            v.push(self.interior(w[0].0, w[0].1, w[1].0, w[1].1, ln_r)?);
        }
        let &(gl, jl) = p.ties.last().expect("at least one tie");
        v.push(self.bottom(gl, jl, p.bottom, ln_r)?);
        Some(v)
    }

    /// Score of a path at ln r.
    pub fn path_score(&self, p: &Path, ln_r: f64) -> Option<f64> {
        Some(self.path_runs(p, ln_r)?.iter().map(|c| self.penalty(c)).sum())
    }

    /// The ln r search range: every rate a single run could imply, widened by one σ-step.
    fn rate_range(&self) -> (f64, f64) {
        let h = (self.u_top - self.u_bottom).max(1e-6);
        let span = self.ts.old() - self.ts.young();
        let shortest = self.ts.chrons.iter().map(|c| c.duration()).fold(f64::INFINITY, f64::min);
        let thinnest = self
            .gaps
            .windows(2)
            .map(|w| w[0].mid() - w[1].mid())
            .chain([self.u_top - self.gaps[0].mid(), self.gaps[self.gaps.len() - 1].mid() - self.u_bottom])
            .filter(|t| *t > 0.0)
            .fold(h, f64::min);
        ((thinnest / span).ln() - 1.0, (h / shortest).ln() + 1.0)
    }

    /// Best ln r for a path and the score there: coarse scan then golden-section refinement.
    pub fn optimise(&self, p: &Path) -> Option<(f64, f64)> {
        let (lo, hi) = self.rate_range();
        let n = 120;
        let step = (hi - lo) / n as f64;
        let mut best = (f64::INFINITY, lo);
        for i in 0..=n {
            let x = lo + step * i as f64;
            let s = self.path_score(p, x)?;
            if s < best.0 {
                best = (s, x);
            }
        }
        let (mut a, mut b) = (best.1 - step, best.1 + step);
        let g = 0.5 * (5f64.sqrt() - 1.0);
        for _ in 0..60 {
            let (x1, x2) = (b - g * (b - a), a + g * (b - a));
            if self.path_score(p, x1)? < self.path_score(p, x2)? {
                b = x2;
            } else {
                a = x1;
            }
        }
        let x = 0.5 * (a + b);
        let s = self.path_score(p, x)?;
        Some(if s < best.0 { (s, x) } else { (best.0, best.1) })
    }
}

#[derive(Debug, Clone, Copy)]
enum Back {
    Start(usize),
    Node(usize, usize),
}

/// k-best Viterbi pass at a fixed ln r; returns up to k paths.
fn kbest(pb: &Problem, ln_r: f64, k: usize) -> Vec<Path> {
    let n = pb.ts.chrons.len();
    let mut nodes: Vec<(usize, usize)> = Vec::new();
    for (g, gp) in pb.gaps.iter().enumerate() {
        let (pa, pc) = (pb.pol[gp.a].as_chron(), pb.pol[gp.c].as_chron());
        for j in 0..n - 1 {
            if Some(pb.chron_pol(j)) == pa && Some(pb.chron_pol(j + 1)) == pc {
                nodes.push((g, j));
            }
        }
    }
    let mut best: Vec<Vec<(f64, Back)>> = Vec::with_capacity(nodes.len());
    let push = |list: &mut Vec<(f64, Back)>, c: f64, b: Back| {
        if list.len() < k || c < list[list.len() - 1].0 {
            let at = list.partition_point(|e| e.0 <= c);
            list.insert(at, (c, b));
            list.truncate(k);
        }
    };
    for (i, &(g, j)) in nodes.iter().enumerate() {
        let mut list = Vec::new();
        for s in 0..=j {
            if let Some(c) = pb.top(s, g, j, ln_r) {
                push(&mut list, pb.penalty(&c), Back::Start(s));
            }
        }
        for (i1, &(g1, j1)) in nodes[..i].iter().enumerate() {
            if pb.gaps[g1].c > pb.gaps[g].a || j1 >= j || best[i1].is_empty() {
                continue;
            }
            if let Some(c) = pb.interior(g1, j1, g, j, ln_r) {
                let pc = pb.penalty(&c);
                for (rank, e) in best[i1].iter().enumerate() {
                    push(&mut list, e.0 + pc, Back::Node(i1, rank));
                }
            }
        }
        best.push(list);
    }
    let mut ends: Vec<(f64, usize, usize, usize)> = Vec::new();
    for (i, &(g, j)) in nodes.iter().enumerate() {
        for e in j + 1..n {
            if let Some(c) = pb.bottom(g, j, e, ln_r) {
                let pc = pb.penalty(&c);
                for (rank, x) in best[i].iter().enumerate() {
                    ends.push((x.0 + pc, i, rank, e));
                }
            }
        }
    }
    ends.sort_by(|a, b| a.0.total_cmp(&b.0));
    ends.truncate(k);
    ends.into_iter()
        .map(|(_, mut i, mut rank, bottom)| {
            let mut ties = Vec::new();
            loop {
                ties.push(nodes[i]);
                match best[i][rank].1 {
                    Back::Start(s) => {
                        ties.reverse();
                        return Path { top: s, ties, bottom };
                    }
                    Back::Node(i1, r1) => {
                        i = i1;
                        rank = r1;
                    }
                }
            }
        })
        .collect()
}

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
    let pb = Problem::new(col, ts, opts)?;
    let (lo, hi) = pb.rate_range();
    let step = opts.rate_spread / 2.0;
    let n_grid = (((hi - lo) / step).ceil() as usize).clamp(8, 400);
    let k = opts.candidates.max(5) + 3;
    let mut seen: HashMap<Path, ()> = HashMap::new();
    let mut order: Vec<Path> = Vec::new();
    for i in 0..=n_grid {
        let x = lo + (hi - lo) * i as f64 / n_grid as f64;
        for p in kbest(&pb, x, k) {
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
    let mut scored: Vec<(f64, f64, Path)> = order.into_iter().filter_map(|p| pb.optimise(&p).map(|(s, x)| (s, x, p))).collect();
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
