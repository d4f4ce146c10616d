//! Helpers shared by the non-criterion comparison benches (`compare`, `compare_renewal`).

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
