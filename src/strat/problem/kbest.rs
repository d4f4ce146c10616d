//! The k-best Viterbi pass at one rate, with branch and bound (the "Search" section of the `correlate` module).
//! A child of the problem's module, so it reads the run tables directly.

use super::{Path, Problem};

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
pub(crate) fn kbest(pb: &Problem, ln_r: f64, k: usize) -> Vec<Path> {
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
                    let floor = pb.opts.miss_penalty * pb.missing(s, j, pb.chron_pol(j)).0 as f64 + sk;
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
                    let floor = pb.opts.miss_penalty * pb.missing(j1 + 1, j, pb.chron_pol(j)).0 as f64 + sk;
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
                let floor = pb.opts.miss_penalty * pb.missing(j + 1, e, pb.chron_pol(e)).0 as f64 + sk;
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
