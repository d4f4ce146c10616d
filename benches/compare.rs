//! Timings of the Rust side of the side-by-side comparison (run by `benches/compare.py`, which writes
//! the shared inputs and runs the NumPy/SciPy baseline on the same files). Not a criterion bench: it
//! prints one `name seconds` line per item (median of the runs).
//!
//! Run alone: `LODESTONE_COMPARE_DIR=DIR cargo bench --bench compare`.

mod common;

use common::time;
use lodestone::fieldtests::{bootstrap_overlap, fold_test, watson_v, FoldOptions};
use lodestone::montecarlo::{replicate_rng, MonteCarlo};
use lodestone::sphere::{Bedding, Direction, Vec3};
use lodestone::stats::{fisher_mean, FisherSampler};
use rand::RngExt;
use std::path::Path;

fn read_rows(path: &Path) -> Vec<Vec<f64>> {
    let text = std::fs::read_to_string(path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    text.lines().skip(1).filter(|l| !l.trim().is_empty()).map(|l| l.split(',').map(|c| c.trim().parse().unwrap()).collect()).collect()
}

fn vectors(path: &Path) -> Vec<Vec3> {
    read_rows(path).iter().map(|r| Vec3::new(r[0], r[1], r[2])).collect()
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
    let beds: Vec<Bedding> = fold_rows.iter().map(|r| Bedding::from_dip_direction(r[3], r[4], false).unwrap()).collect();
    let fisher_rows = read_rows(&dir.join("fisher1e6.csv"));
    let dirs: Vec<Direction> = fisher_rows.iter().map(|r| Direction::new(r[0], r[1]).unwrap()).collect();
    drop(fisher_rows);

    println!("fisher_mean_1e6 {:.6}", time(5, || fisher_mean(&dirs, 0.95).unwrap()));
    for &t in &threads {
        let pool = rayon::ThreadPoolBuilder::new().num_threads(t).build().unwrap();
        pool.install(|| {
            let mc = MonteCarlo::new(1, 10_000);
            println!("bootstrap_n200_10000_t{t} {:.6}", time(21, || bootstrap_overlap(&rev200.0, &rev200.1, &mc, 0.95).unwrap()));
            let mc = MonteCarlo::new(1, 50_000);
            println!("bootstrap_n1000_50000_t{t} {:.6}", time(3, || bootstrap_overlap(&rev1000.0, &rev1000.1, &mc, 0.95).unwrap()));
            let mc = MonteCarlo::new(1, 1000);
            println!("fold_n100_1000x161_t{t} {:.6}", time(21, || fold_test(&fold_v, &beds, &mc, &FoldOptions::default()).unwrap()));
            let mc = MonteCarlo::new(1, 10_000);
            println!("watson_v_n200_10000_t{t} {:.6}", time(21, || watson_v(&rev200.0, &rev200.1, &mc, 0.95).unwrap()));
        });
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
