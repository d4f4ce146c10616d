//! The correlation problem in internal form (units young → old, "up" coordinates), the rate-independent
//! tables of every run, and the score of a path at a rate. The model and the score are described in
//! module `strat::correlate`.

pub(super) mod kbest;
mod pairs;

use super::correlate_options::{CorrelateOptions, DatedLevel, Reading};
use super::polarity::ZonePolarity;
use super::zones::ZoneColumn;
use crate::model::{Polarity, TimeScale};
use crate::{Error, Result};
use pairs::{PairTable, Ranks};

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
    anchors_up: Vec<(f64, DatedLevel)>,
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

/// Chron side of a run: ln of its durations for both readings of its missing chrons (the missing chrons
/// themselves come from prefix sums, [`Problem::missing`]).
#[derive(Debug, Clone, Copy, Default)]
struct ChronRun {
    /// Durations with the missing chrons (unsampled reading).
    u: LnSpan,
    /// Durations without them (hiatus reading).
    h: LnSpan,
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
/// (logarithms, prefix-sum lookups, scans for ignored zones) were the bulk of the work. The chron tables
/// hold only the pairs a run can use ([`pairs`]): about n²/4 entries each for n alternating chrons, 32 bytes
/// an entry (8 MB per table for 1 000 chrons).
struct RunTables {
    /// Rank of each chron among those of its polarity (the index into the chron tables).
    ranks: Ranks,
    /// Interior run from chron boundary j1 to j2 (chrons j1 + 1..=j2): row j2, key j1 + 1.
    inter: PairTable,
    /// Top run over chrons s..=j: row j, key s.
    top: PairTable,
    /// Bottom run over chrons j + 1..=e: row j, key e.
    bottom: PairTable,
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
            ranks: Ranks::new(&[]),
            inter: PairTable::empty(),
            top: PairTable::empty(),
            bottom: PairTable::empty(),
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
        let cpol = &self.cpol;
        let ranks = Ranks::new(cpol);
        // Interior: row j2, key k = j1 + 1 in 1..=j2 of the polarity of chron j2.
        let inter = PairTable::build(
            &ranks,
            cpol,
            n,
            |j2| (1, j2 + 1),
            |j2| Some(cpol[j2]),
            |j2, k| {
                let j1 = k - 1;
                let (_, mdur) = self.missing(j1 + 1, j2, ch[j2].polarity);
                let d_incl = ch[j2].old - ch[j1].old;
                let (du, dh) = (d_incl, d_incl - mdur);
                ChronRun { u: LnSpan::new(du, du), h: LnSpan::new(dh, dh) }
            },
        );
        let spans = |dmin: f64, dmax: f64, mdur: f64| ChronRun {
            u: LnSpan::new(dmin, dmax),
            h: LnSpan::new((dmin - mdur).max(0.0), dmax - mdur),
        };
        // Top: row j, key s in 0..=j of the polarity of chron j.
        let top = PairTable::build(
            &ranks,
            cpol,
            n,
            |j| (0, j + 1),
            |j| Some(cpol[j]),
            |j, s| {
                let (_, mdur) = self.missing(s, j, ch[j].polarity);
                spans(ch[j].old - ch[s].old, ch[j].old - ch[s].young, mdur)
            },
        );
        // Bottom: row j, key e in j + 1..n of the polarity of chron j + 1.
        let bottom = PairTable::build(
            &ranks,
            cpol,
            n,
            |j| (j + 1, n),
            |j| cpol.get(j + 1).copied(),
            |j, e| {
                let (_, mdur) = self.missing(j + 1, e, ch[e].polarity);
                spans(ch[e].young - ch[j].old, ch[e].old - ch[j].old, mdur)
            },
        );
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
        RunTables { ranks, inter, top, bottom, gap_inter, gap_top, gap_bottom }
    }

    #[inline]
    fn chron_pol(&self, k: usize) -> Polarity {
        self.cpol[k]
    }

    /// Chrons in s..=e not of polarity `p`: (count, total duration).
    pub(super) fn missing(&self, s: usize, e: usize, p: Polarity) -> (usize, f64) {
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
        Some(self.run_cost(gr, self.tab.inter.get(&self.tab.ranks, j2, j1 + 1), j1 + 1, j2, ln_r, r))
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
        Some(self.run_cost(gr, self.tab.top.get(&self.tab.ranks, j, s), s, j, ln_r, r))
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
        Some(self.run_cost(gr, self.tab.bottom.get(&self.tab.ranks, j, e), j + 1, e, ln_r, r))
    }

    /// Cost of a run over chrons s..=e from its column side and chron side (the hiatus term is only
    /// needed, and only computed, when chrons are missing: [`Problem::choose`] ignores it otherwise).
    #[allow(clippy::too_many_arguments)]
    #[inline]
    fn run_cost(&self, gr: &GapRun, cr: &ChronRun, s: usize, e: usize, ln_r: f64, r: f64) -> RunCost {
        let (missing, mdur) = self.missing(s, e, gr.cp);
        let u = self.interval_term(gr.t, cr.u, ln_r);
        let h = if missing == 0 { u } else { self.interval_term(gr.t, cr.h, ln_r) };
        self.choose(u, h, missing, mdur, gr.skipped, r)
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
    pub(crate) fn rate_range(&self) -> (f64, f64) {
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
