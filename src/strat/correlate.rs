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
//!   per problem (`RunTables`; n × n entries for n chrons).
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
use super::polarity::ZonePolarity;
use super::zones::ZoneColumn;
use crate::table::{Polarity, TimeScale};
use crate::{Error, Result};
use rayon::prelude::*;
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
        Self {
            miss_penalty: 2.0,
            hiatus_penalty: 6.0,
            skip_penalty: 2.0,
            rate_spread: 0.25,
            candidates: 5,
            anchors: vec![],
        }
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
    /// Precomputed run geometry (see [`RunTables`]).
    tab: RunTables,
    /// Polarity of each chron (a compact copy for the inner loops).
    cpol: Vec<Polarity>,
}

/// ln of a duration interval [d_min, d_max] as used by the rate term: (ln d_min or −∞, ln max(d_max, 1e-12)).
#[derive(Debug, Clone, Copy, Default)]
struct LnSpan {
    lo: f64,
    hi: f64,
}
impl LnSpan {
    fn new(d_min: f64, d_max: f64) -> LnSpan {
        LnSpan { lo: if d_min > 0.0 { d_min.ln() } else { f64::NEG_INFINITY }, hi: d_max.max(1e-12).ln() }
    }
}

/// Chron side of a run: durations for both readings and the missing chrons.
#[derive(Debug, Clone, Copy, Default)]
struct ChronRun {
    /// Durations with the missing chrons (unsampled reading).
    u: LnSpan,
    /// Durations without them (hiatus reading).
    h: LnSpan,
    missing: usize,
    mdur: f64,
}

/// Column side of a run: polarity, ignored zones and ln of the thickness interval.
#[derive(Debug, Clone, Copy)]
struct GapRun {
    cp: Polarity,
    skipped: usize,
    /// ln T_min (or −∞) and ln max(T_max, 1e-12).
    t: LnSpan,
}

/// Everything about a run that does not depend on the rate, computed once per problem instead of once
/// per (pair of nodes, rate): the search evaluates each run at every rate of the grid, so these values
/// (logarithms, prefix-sum lookups, scans for ignored zones) were the bulk of the work. Chron tables are
/// n × n for n chrons (48 bytes an entry: about 4 MB per table for 300 chrons).
struct RunTables {
    n: usize,
    /// Interior run from chron boundary j1 to j2 (chrons j1 + 1..=j2), at [j2·n + j1].
    inter: Vec<ChronRun>,
    /// Top run over chrons s..=j, at [j·n + s].
    top: Vec<ChronRun>,
    /// Bottom run over chrons j + 1..=e, at [j·n + e].
    bottom: Vec<ChronRun>,
    /// Interior run between gaps g1 and g2, at [g1·n_gaps + g2]; None if no run can join them.
    gap_inter: Vec<Option<GapRun>>,
    /// Top run down to gap g.
    gap_top: Vec<Option<GapRun>>,
    /// Bottom run from gap g.
    gap_bottom: Vec<Option<GapRun>>,
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
                "the column has no change between normal and reversed polarity, so it cannot be tied to a time scale"
                    .into(),
            ));
        }
        if ts.chrons.len() < 2 {
            return Err(Error::TooFew { what: "a correlation", needed: 2, got: ts.chrons.len(), unit: "chrons" });
        }
        for (x, name) in [
            (opts.miss_penalty, "miss penalty"),
            (opts.hiatus_penalty, "hiatus penalty"),
            (opts.skip_penalty, "skip penalty"),
        ] {
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
            return Err(Error::Undefined(
                "the column has no thickness (one level, or all levels at one position)".into(),
            ));
        }
        let anchors_up = opts.anchors.iter().map(|a| (col.up(a.position), *a)).collect();
        let empty = RunTables {
            n: 0,
            inter: vec![],
            top: vec![],
            bottom: vec![],
            gap_inter: vec![],
            gap_top: vec![],
            gap_bottom: vec![],
        };
        let mut pb = Problem {
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
            tab: empty,
            cpol: ts.chrons.iter().map(|c| c.polarity).collect(),
        };
        pb.tab = pb.run_tables();
        Ok(pb)
    }

    /// Build the rate-independent tables (same formulas as the rate terms below, evaluated once).
    fn run_tables(&self) -> RunTables {
        let ch = &self.ts.chrons;
        let n = ch.len();
        let mut inter = vec![ChronRun::default(); n * n];
        let mut top = vec![ChronRun::default(); n * n];
        let mut bottom = vec![ChronRun::default(); n * n];
        for j2 in 0..n {
            for j1 in 0..j2 {
                let (missing, mdur) = self.missing(j1 + 1, j2, ch[j2].polarity);
                let d_incl = ch[j2].old - ch[j1].old;
                let (du, dh) = (d_incl, d_incl - mdur);
                inter[j2 * n + j1] = ChronRun { u: LnSpan::new(du, du), h: LnSpan::new(dh, dh), missing, mdur };
            }
        }
        for j in 0..n {
            for s in 0..=j {
                let (missing, mdur) = self.missing(s, j, ch[j].polarity);
                let (dmin, dmax) = (ch[j].old - ch[s].old, ch[j].old - ch[s].young);
                top[j * n + s] = ChronRun {
                    u: LnSpan::new(dmin, dmax),
                    h: LnSpan::new((dmin - mdur).max(0.0), dmax - mdur),
                    missing,
                    mdur,
                };
            }
            for e in j + 1..n {
                let (missing, mdur) = self.missing(j + 1, e, ch[e].polarity);
                let (dmin, dmax) = (ch[e].young - ch[j].old, ch[e].old - ch[j].old);
                bottom[j * n + e] = ChronRun {
                    u: LnSpan::new(dmin, dmax),
                    h: LnSpan::new((dmin - mdur).max(0.0), dmax - mdur),
                    missing,
                    mdur,
                };
            }
        }
        let ng = self.gaps.len();
        let mut gap_inter = vec![None; ng * ng];
        for (g1, a) in self.gaps.iter().enumerate() {
            for (g2, b) in self.gaps.iter().enumerate() {
                if b.a < a.c {
                    continue;
                }
                let p = self.pol[a.c];
                let (Some(cp), true) = (p.as_chron(), self.pol[b.a] == p) else { continue };
                let Some(skipped) = self.skips(a.c, b.a, p) else { continue };
                let t = LnSpan::new((a.lo - b.hi).max(0.0), a.hi - b.lo);
                gap_inter[g1 * ng + g2] = Some(GapRun { cp, skipped, t });
            }
        }
        let last = self.pol.len() - 1;
        // A run from a gap to the top or the bottom of the column: zones z0..=z1 of the polarity of
        // zone `zone`, spanning `t`.
        let edge_run = |zone: usize, z0: usize, z1: usize, t: LnSpan| {
            let p = self.pol[zone];
            Some(GapRun { cp: p.as_chron()?, skipped: self.skips(z0, z1, p)?, t })
        };
        let gap_top = self
            .gaps
            .iter()
            .map(|gp| edge_run(gp.a, 0, gp.a, LnSpan::new((self.u_top - gp.hi).max(0.0), self.u_top - gp.lo)))
            .collect();
        let gap_bottom = self
            .gaps
            .iter()
            .map(|gp| edge_run(gp.c, gp.c, last, LnSpan::new((gp.lo - self.u_bottom).max(0.0), gp.hi - self.u_bottom)))
            .collect();
        RunTables { n, inter, top, bottom, gap_inter, gap_top, gap_bottom }
    }

    #[inline]
    fn chron_pol(&self, k: usize) -> Polarity {
        self.cpol[k]
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

    /// (δ/σ)²: δ = ln-distance between the durations [t_min/r, t_max/r] and [d_min, d_max] (0 if they meet),
    /// from the logarithms of the thickness interval `t` and of the duration interval `d`.
    #[inline]
    fn interval_term(&self, t: LnSpan, d: LnSpan, ln_r: f64) -> f64 {
        let (lo, hi) = (t.lo - ln_r, t.hi - ln_r);
        let delta = if lo > d.hi {
            lo - d.hi
        } else if hi < d.lo {
            d.lo - hi
        } else {
            0.0
        };
        (delta / self.opts.rate_spread).powi(2)
    }

    /// Interior run between gap g1 (tied at j1) and gap g2 (tied at j2) below it.
    pub fn interior(&self, g1: usize, j1: usize, g2: usize, j2: usize, ln_r: f64) -> Option<RunCost> {
        let gr = self.tab.gap_inter[g1 * self.gaps.len() + g2]?;
        self.interior_with(&gr, g1, j1, g2, j2, ln_r, ln_r.exp())
    }

    /// [`Problem::interior`] with the gap pair already looked up and r = exp(ln r) given.
    #[allow(clippy::too_many_arguments)]
    #[inline]
    fn interior_with(
        &self,
        gr: &GapRun,
        g1: usize,
        j1: usize,
        g2: usize,
        j2: usize,
        ln_r: f64,
        r: f64,
    ) -> Option<RunCost> {
        if j2 <= j1 || self.chron_pol(j1 + 1) != gr.cp || self.chron_pol(j2) != gr.cp {
            return None;
        }
        let ch = &self.ts.chrons;
        if !self.anchors_up.is_empty()
            && !self.anchors_ok(self.gaps[g1].mid(), self.gaps[g2].mid(), ch[j1].old, ch[j2].old)
        {
            return None;
        }
        Some(self.run_cost(gr, &self.tab.inter[j2 * self.tab.n + j1], ln_r, r))
    }

    /// Top run: section top down to gap g tied at j, starting in chron s.
    pub fn top(&self, s: usize, g: usize, j: usize, ln_r: f64) -> Option<RunCost> {
        let gr = self.tab.gap_top[g]?;
        self.top_with(&gr, s, g, j, ln_r, ln_r.exp())
    }

    #[inline]
    fn top_with(&self, gr: &GapRun, s: usize, g: usize, j: usize, ln_r: f64, r: f64) -> Option<RunCost> {
        if s > j || self.chron_pol(s) != gr.cp || self.chron_pol(j) != gr.cp {
            return None;
        }
        let ch = &self.ts.chrons;
        if !self.anchors_up.is_empty() && !self.anchors_ok(f64::INFINITY, self.gaps[g].mid(), ch[s].young, ch[j].old) {
            return None;
        }
        Some(self.run_cost(gr, &self.tab.top[j * self.tab.n + s], ln_r, r))
    }

    /// Bottom run: gap g tied at j down to the section bottom, ending in chron e.
    pub fn bottom(&self, g: usize, j: usize, e: usize, ln_r: f64) -> Option<RunCost> {
        let gr = self.tab.gap_bottom[g]?;
        self.bottom_with(&gr, g, j, e, ln_r, ln_r.exp())
    }

    #[inline]
    fn bottom_with(&self, gr: &GapRun, g: usize, j: usize, e: usize, ln_r: f64, r: f64) -> Option<RunCost> {
        if e <= j || self.chron_pol(j + 1) != gr.cp || self.chron_pol(e) != gr.cp {
            return None;
        }
        let ch = &self.ts.chrons;
        if !self.anchors_up.is_empty() && !self.anchors_ok(self.gaps[g].mid(), f64::NEG_INFINITY, ch[j].old, ch[e].old)
        {
            return None;
        }
        Some(self.run_cost(gr, &self.tab.bottom[j * self.tab.n + e], ln_r, r))
    }

    /// Cost of a run from its column side and chron side (the hiatus term is only needed, and only
    /// computed, when chrons are missing: [`Problem::choose`] ignores it otherwise).
    #[inline]
    fn run_cost(&self, gr: &GapRun, cr: &ChronRun, ln_r: f64, r: f64) -> RunCost {
        let u = self.interval_term(gr.t, cr.u, ln_r);
        let h = if cr.missing == 0 { u } else { self.interval_term(gr.t, cr.h, ln_r) };
        self.choose(u, h, cr.missing, cr.mdur, gr.skipped, r)
    }

    /// Pick the better reading of a run's missing chrons (rate term with them / without them); r = exp(ln r).
    #[inline]
    fn choose(&self, unsampled: f64, hiatus: f64, missing: usize, mdur: f64, skipped: usize, r: f64) -> RunCost {
        if missing == 0 {
            return RunCost { rate_term: unsampled, missing, skipped, reading: Reading::Complete, miss_cost: 0.0 };
        }
        let base = self.opts.miss_penalty * missing as f64;
        let cu = base + 2.0 * r * mdur / self.spacing;
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
        // Same runs, same order of summation as summing `path_runs`, without the allocation.
        let r = ln_r.exp();
        let (g0, j0) = p.ties[0];
        let mut sum = -0.0f64;
        let gt = self.tab.gap_top[g0]?;
        sum += self.penalty(&self.top_with(&gt, p.top, g0, j0, ln_r, r)?);
        let ng = self.gaps.len();
        for w in p.ties.windows(2) {
            let gr = self.tab.gap_inter[w[0].0 * ng + w[1].0]?;
            sum += self.penalty(&self.interior_with(&gr, w[0].0, w[0].1, w[1].0, w[1].1, ln_r, r)?);
        }
        let &(gl, jl) = p.ties.last().expect("at least one tie");
        let gb = self.tab.gap_bottom[gl]?;
        sum += self.penalty(&self.bottom_with(&gb, gl, jl, p.bottom, ln_r, r)?);
        Some(sum)
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

/// Insert (c, b) into a list kept sorted by cost and cut to k entries; an entry equal in cost to one
/// already there goes after it, so the list holds the first k of a stable sort of everything offered.
/// Returns false when the list is full and c does not improve it.
#[inline]
fn push_k<T: Copy>(list: &mut Vec<(f64, T)>, k: usize, c: f64, b: T) -> bool {
    let len = list.len();
    if len < k {
        list.push((c, b));
    } else if c < list[len - 1].0 {
        list[len - 1] = (c, b); // the dropped last entry costs more than c
    } else {
        return false;
    }
    // Move the new entry up past every entry costing more (never past an equal one).
    let mut i = list.len() - 1;
    while i > 0 && list[i - 1].0 > c {
        list.swap(i - 1, i);
        i -= 1;
    }
    true
}

/// As [`push_k`] for offers made in decreasing order of a tie-breaking sequence: an entry equal in
/// cost to one already there goes before it (so the list is the same as for the offers made in
/// increasing sequence with [`push_k`]).
#[inline]
fn push_k_before_equal<T: Copy>(list: &mut Vec<(f64, T)>, k: usize, c: f64, b: T) -> bool {
    let len = list.len();
    if len < k {
        list.push((c, b));
    } else if c <= list[len - 1].0 {
        list[len - 1] = (c, b);
    } else {
        return false;
    }
    let mut i = list.len() - 1;
    while i > 0 && list[i - 1].0 >= c {
        list.swap(i - 1, i);
        i -= 1;
    }
    true
}

/// Order of offers in a forward walk: top runs by s, then earlier nodes by index and rank.
#[inline]
fn seq(b: &Back) -> (usize, usize, usize) {
    match *b {
        Back::Start(s) => (0, s, 0),
        Back::Node(i, rank) => (1, i, rank),
    }
}

/// As [`push_k`] for offers made in any order: entries are ranked by (cost, [`seq`]), which is the
/// order [`push_k`] gives to offers made in forward order.
#[inline]
fn push_seq(list: &mut Vec<(f64, Back)>, k: usize, c: f64, b: Back) -> bool {
    let before = |x: &(f64, Back)| c < x.0 || (c == x.0 && seq(&b) < seq(&x.1));
    let len = list.len();
    if len < k {
        list.push((c, b));
    } else if before(&list[len - 1]) {
        list[len - 1] = (c, b);
    } else {
        return false;
    }
    let mut i = list.len() - 1;
    while i > 0 && before(&list[i - 1]) {
        list.swap(i - 1, i);
        i -= 1;
    }
    true
}

/// k-best Viterbi pass at a fixed ln r; returns up to k paths.
///
/// Exact: the lists offered to a node are walked in ascending cost, so the walk stops at the first
/// offer that cannot enter a full list (every later offer costs as much or more); predecessors are
/// taken only from gaps that a run can join (every other pair has no interior run at any rate).
fn kbest(pb: &Problem, ln_r: f64, k: usize) -> Vec<Path> {
    let n = pb.ts.chrons.len();
    let ng = pb.gaps.len();
    let r = ln_r.exp();
    let mut nodes: Vec<(usize, usize)> = Vec::new();
    // Nodes of gap g are nodes[first[g]..first[g + 1]], in increasing j.
    let mut first = Vec::with_capacity(ng + 1);
    for (g, gp) in pb.gaps.iter().enumerate() {
        first.push(nodes.len());
        let (pa, pc) = (pb.pol[gp.a].as_chron(), pb.pol[gp.c].as_chron());
        for j in 0..n - 1 {
            if Some(pb.chron_pol(j)) == pa && Some(pb.chron_pol(j + 1)) == pc {
                nodes.push((g, j));
            }
        }
    }
    first.push(nodes.len());
    let mut best: Vec<Vec<(f64, Back)>> = Vec::with_capacity(nodes.len());
    // pmin[i]: least cost in the lists of the nodes of i's gap up to i (∞ if none).
    let mut pmin: Vec<f64> = Vec::with_capacity(nodes.len());
    for &(g, j) in nodes.iter() {
        let mut list: Vec<(f64, Back)> = Vec::with_capacity(k + 1);
        if let Some(gt) = pb.tab.gap_top[g] {
            // Top runs, walked from s = j up the scale (so cheaper offers tend to come first). Ties in
            // cost are ordered by increasing s, as in a walk from s = 0, so the list is the same. A run
            // costs at least miss_penalty · missing + skip_penalty · skipped, and missing grows as s
            // falls: once that floor exceeds a full list's worst entry, no smaller s can enter.
            let sk = pb.opts.skip_penalty * gt.skipped as f64;
            for s in (0..=j).rev() {
                if list.len() == k {
                    let floor = pb.opts.miss_penalty * pb.tab.top[j * n + s].missing as f64 + sk;
                    if floor > list[k - 1].0 {
                        break;
                    }
                }
                if let Some(c) = pb.top_with(&gt, s, g, j, ln_r, r) {
                    push_k_before_equal(&mut list, k, pb.penalty(&c), Back::Start(s));
                }
            }
        }
        // Earlier nodes come from earlier gaps only (a gap cannot precede itself). They are walked
        // backwards (nearest chron boundary first, where runs are cheap), and offers are ranked by
        // (cost, position in the forward order), so the list is the one a forward walk gives. A run
        // from j1 costs at least miss_penalty · missing + skip_penalty · skipped, missing grows as j1
        // falls, and pmin bounds the best list of every node at or before j1: once best + floor
        // exceeds a full list's worst entry, no earlier node of that gap can enter.
        for g1 in (0..g).rev() {
            let Some(gr) = pb.tab.gap_inter[g1 * ng + g] else { continue };
            let sk = pb.opts.skip_penalty * gr.skipped as f64;
            for i1 in (first[g1]..first[g1 + 1]).rev() {
                let j1 = nodes[i1].1;
                if j1 >= j {
                    continue;
                }
                if list.len() == k {
                    let floor = pb.opts.miss_penalty * pb.tab.inter[j * n + j1].missing as f64 + sk;
                    if pmin[i1] + floor > list[k - 1].0 {
                        break;
                    }
                }
                if best[i1].is_empty() {
                    continue;
                }
                if let Some(c) = pb.interior_with(&gr, g1, j1, g, j, ln_r, r) {
                    let pc = pb.penalty(&c);
                    for (rank, e) in best[i1].iter().enumerate() {
                        if !push_seq(&mut list, k, e.0 + pc, Back::Node(i1, rank)) {
                            break;
                        }
                    }
                }
            }
        }
        let here = list.first().map_or(f64::INFINITY, |e| e.0);
        let before = if pmin.len() > first[g] { pmin[pmin.len() - 1] } else { f64::INFINITY };
        pmin.push(if here < before { here } else { before });
        best.push(list);
    }
    // The k best complete paths, first k of a stable sort by cost (as push_k keeps them).
    let mut ends: Vec<(f64, (usize, usize, usize))> = Vec::with_capacity(k + 1);
    for (i, &(g, j)) in nodes.iter().enumerate() {
        let Some(gb) = pb.tab.gap_bottom[g] else { continue };
        if best[i].is_empty() {
            continue;
        }
        // missing grows with e, so once best + the floor of the bottom run's cost reaches the worst of
        // a full list, no larger e can enter (entry needs a strictly lower cost).
        let sk = pb.opts.skip_penalty * gb.skipped as f64;
        for e in j + 1..n {
            if ends.len() == k {
                let floor = pb.opts.miss_penalty * pb.tab.bottom[j * n + e].missing as f64 + sk;
                if best[i][0].0 + floor >= ends[k - 1].0 {
                    break;
                }
            }
            if let Some(c) = pb.bottom_with(&gb, g, j, e, ln_r, r) {
                let pc = pb.penalty(&c);
                for (rank, x) in best[i].iter().enumerate() {
                    if !push_k(&mut ends, k, x.0 + pc, (i, rank, e)) {
                        break;
                    }
                }
            }
        }
    }
    ends.into_iter()
        .map(|(_, (mut i, mut rank, bottom))| {
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
