//! Helpers shared by the non-criterion comparison benches (`compare`, `compare_renewal`).
//!
//! Each bench compiles this module on its own and uses only part of it.
#![allow(dead_code)]

use std::hint::black_box;
use std::time::Instant;

/// Median wall time (seconds) of `runs` calls after one warm-up call.
pub fn time<T>(runs: usize, mut f: impl FnMut() -> T) -> f64 {
    black_box(f());
    let mut t: Vec<f64> = (0..runs)
        .map(|_| {
            let s = Instant::now();
            black_box(f());
            s.elapsed().as_secs_f64()
        })
        .collect();
    t.sort_by(f64::total_cmp);
    t[runs / 2]
}

/// Median wall times (seconds) of `f` run inside each of `pools`, the pools taking turns in blocks
/// (`rounds` blocks of `per` timed calls in each pool, after one untimed call that wakes the pool's
/// threads), so that drifts of the machine's speed reach all pools alike while every timed call finds
/// its pool awake, as back-to-back calls do.
pub fn time_alternating(rounds: usize, per: usize, pools: &[rayon::ThreadPool], f: &(dyn Fn() + Sync)) -> Vec<f64> {
    let mut t = vec![Vec::with_capacity(rounds * per); pools.len()];
    for _ in 0..rounds {
        for (p, ts) in pools.iter().zip(t.iter_mut()) {
            p.install(f);
            for _ in 0..per {
                let s = Instant::now();
                p.install(f);
                ts.push(s.elapsed().as_secs_f64());
            }
        }
    }
    t.into_iter()
        .map(|mut ts| {
            ts.sort_by(f64::total_cmp);
            ts[ts.len() / 2]
        })
        .collect()
}
