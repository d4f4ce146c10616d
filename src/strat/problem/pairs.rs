//! Compact storage of the chron side of runs: one entry per (row, key) pair that a run can use.
//!
//! A run starts and ends in chrons of its own polarity, so of the n × n (row, key) pairs of a chron
//! table only those whose key chron has the polarity the row asks for are ever read; on a scale whose
//! chrons alternate that is about a quarter of them (the lower or upper triangle, every other column).
//! Each row keeps its pairs in increasing key order, and a key's place in its row is its rank among the
//! chrons of its polarity, so a lookup is two loads and an add. Values are stored as before, so every
//! score is bitwise the same as with full tables.

use crate::model::Polarity;

/// ln of a run's duration interval for both readings of its missing chrons (see [`super::ChronRun`]).
pub(super) type Spans = super::ChronRun;

/// Rank of every chron among the chrons of its own polarity (0 for the youngest of each polarity), and
/// the number of chrons of each polarity before chron k, for k = 0..=n.
pub(super) struct Ranks {
    rank: Vec<u32>,
    before: [Vec<u32>; 2],
}

fn pidx(p: Polarity) -> usize {
    match p {
        Polarity::Normal => 0,
        Polarity::Reversed => 1,
    }
}

impl Ranks {
    pub fn new(pol: &[Polarity]) -> Ranks {
        let mut before = [vec![0u32], vec![0u32]];
        let mut rank = Vec::with_capacity(pol.len());
        for &p in pol {
            let o = pidx(p);
            rank.push(before[o][before[o].len() - 1]);
            for (k, b) in before.iter_mut().enumerate() {
                let last = b[b.len() - 1];
                b.push(last + (k == o) as u32);
            }
        }
        Ranks { rank, before }
    }
    /// Chrons of polarity `p` among chrons 0..k.
    fn count_before(&self, p: Polarity, k: usize) -> usize {
        self.before[pidx(p)][k] as usize
    }
}

/// A chron table stored by rows; row `r` holds the keys in `keys(r)` whose chron has polarity `pol(r)`.
pub(super) struct PairTable {
    /// Index of row r's entries: offset of its first entry, minus the rank of its first key.
    base: Vec<isize>,
    vals: Vec<Spans>,
}

impl PairTable {
    /// Build a table of `rows` rows; row r covers keys in `range(r)` (half-open) of polarity `pol(r)`,
    /// and `value(r, key)` gives each entry.
    pub fn build(
        ranks: &Ranks,
        cpol: &[Polarity],
        rows: usize,
        range: impl Fn(usize) -> (usize, usize),
        pol: impl Fn(usize) -> Option<Polarity>,
        mut value: impl FnMut(usize, usize) -> Spans,
    ) -> PairTable {
        let mut base = Vec::with_capacity(rows);
        let size: usize = (0..rows)
            .map(|r| match pol(r) {
                Some(p) => {
                    let (k0, k1) = range(r);
                    ranks.count_before(p, k1.max(k0)) - ranks.count_before(p, k0)
                }
                None => 0,
            })
            .sum();
        let mut vals = Vec::with_capacity(size);
        for r in 0..rows {
            let (k0, k1) = range(r);
            let Some(p) = pol(r) else {
                base.push(0);
                continue;
            };
            base.push(vals.len() as isize - ranks.count_before(p, k0) as isize);
            for key in (k0..k1).filter(|&k| cpol[k] == p) {
                vals.push(value(r, key));
            }
        }
        debug_assert_eq!(vals.len(), size);
        PairTable { base, vals }
    }

    /// The entry of (row, key); the key's chron must have the row's polarity and lie in the row's range.
    #[inline]
    pub fn get(&self, ranks: &Ranks, row: usize, key: usize) -> &Spans {
        &self.vals[(self.base[row] + ranks.rank[key] as isize) as usize]
    }

    /// A table of no rows.
    pub fn empty() -> PairTable {
        PairTable { base: vec![], vals: vec![] }
    }
}

#[cfg(test)]
mod tests {
    use super::super::LnSpan;
    use super::*;
    use Polarity::{Normal as N, Reversed as R};

    fn tag(x: f64) -> Spans {
        Spans { u: LnSpan { lo: x, hi: x }, h: LnSpan::default() }
    }

    #[test]
    fn every_pair_of_the_right_polarity_is_found_once() {
        // A scale with a repeated polarity (chrons 3 and 4), so ranks are not simply k / 2.
        let pol = [N, R, N, R, R, N, R, N];
        let ranks = Ranks::new(&pol);
        assert_eq!(ranks.rank, vec![0, 0, 1, 1, 2, 2, 3, 3]);
        let n = pol.len();
        let mut seen = Vec::new();
        let t = PairTable::build(
            &ranks,
            &pol,
            n,
            |r| (0, r + 1),
            |r| Some(pol[r]),
            |r, k| {
                seen.push((r, k));
                tag((r * 100 + k) as f64)
            },
        );
        for r in 0..n {
            for k in 0..=r {
                if pol[k] == pol[r] {
                    assert_eq!(t.get(&ranks, r, k).u.lo, (r * 100 + k) as f64, "row {r} key {k}");
                }
            }
        }
        let expected: usize = (0..n).map(|r| (0..=r).filter(|&k| pol[k] == pol[r]).count()).sum();
        assert_eq!(seen.len(), expected);
        assert_eq!(t.vals.len(), expected);
    }

    #[test]
    fn rows_starting_late_and_empty_rows() {
        // Bottom-run shape: row j covers keys j + 1..n of the polarity of chron j + 1 (none for the last row).
        let pol = [R, N, R, N, R, N];
        let ranks = Ranks::new(&pol);
        let n = pol.len();
        let t = PairTable::build(
            &ranks,
            &pol,
            n,
            |j| (j + 1, n),
            |j| pol.get(j + 1).copied(),
            |j, e| tag((j * 10 + e) as f64),
        );
        for j in 0..n - 1 {
            for e in j + 1..n {
                if pol[e] == pol[j + 1] {
                    assert_eq!(t.get(&ranks, j, e).u.lo, (j * 10 + e) as f64);
                }
            }
        }
        // 6 alternating chrons: rows hold 3, 2, 2, 1, 1, 0 entries.
        assert_eq!(t.vals.len(), 9);
    }
}
