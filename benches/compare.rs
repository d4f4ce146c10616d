//! Timings of the Rust side of the side-by-side comparison (run by `benches/compare.py`, which writes
//! the shared inputs and runs the NumPy/SciPy baseline on the same files). Not a criterion bench: it
//! prints one `name seconds` line per item (median of the runs).
//!
//! Run alone: `LODESTONE_COMPARE_DIR=DIR cargo bench --bench compare`.

mod common;

use common::{time, time_alternating};
use lodestone::fieldtests::{bootstrap_overlap, fold_test, watson_v, FoldOptions};
use lodestone::montecarlo::{replicate_rng, MonteCarlo};
use lodestone::sphere::{Bedding, Direction, Vec3};
use lodestone::stats::{fisher_mean, FisherSampler};
use rand::RngExt;
use rayon::prelude::*;
use std::hint::black_box;
use std::path::Path;

fn read_rows(path: &Path) -> Vec<Vec<f64>> {
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    text.lines()
        .skip(1)
        .filter(|l| !l.trim().is_empty())
        .map(|l| l.split(',').map(|c| c.trim().parse().unwrap()).collect())
        .collect()
}

fn vectors(path: &Path) -> Vec<Vec3> {
    read_rows(path).iter().map(|r| Vec3::new(r[0], r[1], r[2])).collect()
}

/// One of 64 independent units of a perfectly parallel floating-point job (multiplies and adds on
/// 16 kB in the first-level cache, the shape of the fold test's sums): its 1 → 2 thread speed-up is
/// what this machine allows any such job, printed beside the others' for comparison.
fn ceiling_unit(seed: u64) -> f64 {
    let data: Vec<f64> = (0..2048u64).map(|i| ((i * 2_654_435_761 + seed) % 1000) as f64 * 1e-3).collect();
    let mut acc = [[0.0f64; 32]; 4];
    for rep in 0..50 {
        for row in data.chunks_exact(32) {
            for (r, a) in acc.iter_mut().enumerate() {
                let c = (r + rep) as f64 * 0.25;
                for (x, y) in a.iter_mut().zip(row) {
                    *x += c * y;
                }
            }
        }
    }
    acc.iter().flatten().sum()
}

/// Busy-wait for `us` microseconds.
fn spin_us(us: u64) {
    let t = std::time::Instant::now();
    while t.elapsed() < std::time::Duration::from_micros(us) {
        std::hint::spin_loop();
    }
}

fn main() {
    let dir = std::env::var("LODESTONE_COMPARE_DIR").unwrap_or_else(|_| "target/compare".into());
    let dir = Path::new(&dir);
    if !dir.join("rev200_a.csv").exists() {
        eprintln!("no inputs in {}: run benches/compare.py (it writes them)", dir.display());
        return;
    }
    let threads: Vec<usize> = vec![1, 2];
    let rev200 = (vectors(&dir.join("rev200_a.csv")), vectors(&dir.join("rev200_b.csv")));
    let rev1000 = (vectors(&dir.join("rev1000_a.csv")), vectors(&dir.join("rev1000_b.csv")));
    let fold_rows = read_rows(&dir.join("fold100.csv"));
    let fold_v: Vec<Vec3> = fold_rows.iter().map(|r| Vec3::new(r[0], r[1], r[2])).collect();
    let beds: Vec<Bedding> =
        fold_rows.iter().map(|r| Bedding::from_dip_direction(r[3], r[4], false).unwrap()).collect();
    let fisher_rows = read_rows(&dir.join("fisher1e6.csv"));
    let dirs: Vec<Direction> = fisher_rows.iter().map(|r| Direction::new(r[0], r[1]).unwrap()).collect();
    drop(fisher_rows);

    println!("fisher_mean_1e6 {:.6}", time(5, || fisher_mean(&dirs, 0.95).unwrap()));
    // One and two threads in alternating blocks of calls, so that both see the same states of the
    // machine (this virtual machine's speed drifts within seconds); the medians of each.
    let pools: Vec<rayon::ThreadPool> =
        threads.iter().map(|&t| rayon::ThreadPoolBuilder::new().num_threads(t).build().unwrap()).collect();
    let paired = |name: &str, per: usize, f: &(dyn Fn() + Sync)| {
        let times = time_alternating(5, per, &pools, f);
        for (t, s) in threads.iter().zip(times) {
            println!("{name}_t{t} {s:.6}");
        }
    };
    let mc = MonteCarlo::new(1, 10_000);
    paired("bootstrap_n200_10000", 9, &|| {
        black_box(bootstrap_overlap(&rev200.0, &rev200.1, &mc, 0.95).unwrap());
    });
    let mc50 = MonteCarlo::new(1, 50_000);
    paired("bootstrap_n1000_50000", 1, &|| {
        black_box(bootstrap_overlap(&rev1000.0, &rev1000.1, &mc50, 0.95).unwrap());
    });
    let mc1 = MonteCarlo::new(1, 1000);
    paired("fold_n100_1000x161", 9, &|| {
        black_box(fold_test(&fold_v, &beds, &mc1, &FoldOptions::default()).unwrap());
    });
    paired("watson_v_n200_10000", 9, &|| {
        black_box(watson_v(&rev200.0, &rev200.1, &mc, 0.95).unwrap());
    });
    paired("parallel_ceiling", 9, &|| {
        black_box((0..64u64).into_par_iter().map(ceiling_unit).sum::<f64>());
    });
    // What it costs to start a two-thread job on a pool idle for 5 ms (its threads asleep): the wall
    // time of two 200 µs halves joined, less 200 µs; for comparison, the same with the pool just used.
    for idle_ms in [0, 5] {
        let mut o: Vec<f64> = (0..21)
            .map(|_| {
                std::thread::sleep(std::time::Duration::from_millis(idle_ms));
                let s = std::time::Instant::now();
                pools[1].install(|| rayon::join(|| spin_us(200), || spin_us(200)));
                s.elapsed().as_secs_f64() * 1e6 - 200.0
            })
            .collect();
        o.sort_by(f64::total_cmp);
        println!("start_two_threads_after_{idle_ms}ms_idle_us {:.0}", o[10]);
    }
    // Draw speed: Fisher draws by the inverse CDF (`sample`: two uniforms, a logarithm, a sine and a cosine
    // each, then a rotation) and by the four-lane trigonometry-free method (`resultant`, summed in the
    // sampler's frame, as V_w uses it), against a bare loop of the generator's uniforms.
    let n = 10_000_000;
    let s = FisherSampler::new(Direction { dec: 0.0, inc: 60.0 }, 20.0).unwrap();
    let t_fisher = time(3, || {
        let mut rng = replicate_rng(1, 0, 0);
        (0..n).fold(Vec3::ZERO, |a, _| a + s.sample(&mut rng))
    });
    let t_fast = time(3, || {
        let mut rng = replicate_rng(1, 0, 0);
        s.resultant(&mut rng, n)
    });
    let t_bare = time(3, || {
        let mut rng = replicate_rng(1, 0, 0);
        (0..2 * n).fold(0.0f64, |a, _| a + rng.random::<f64>())
    });
    println!("fisher_draws_per_s {:.0}", n as f64 / t_fisher);
    println!("fisher_fast_draws_per_s {:.0}", n as f64 / t_fast);
    println!("bare_uniform_pairs_per_s {:.0}", n as f64 / t_bare);
}
