//! The Monte Carlo engine shared by every resampling and simulation in lodestone.
//!
//! Each replicate `i` draws from its own random stream, seeded from `(seed, i)` through SplitMix64
//! mixing, so a run gives the same answer for any number of threads and any scheduling. Replicates run
//! in parallel on the current rayon pool and results come back in replicate order.
//!
//! The library never prints: progress is reported through the [`Progress`] trait, which the command
//! layer implements with a terminal progress bar (and a silent no-op when output is piped).

use rand::SeedableRng;
use rayon::prelude::*;

/// The generator used for every replicate: xoshiro256++ (Blackman & Vigna 2021), fast and with
/// independent-looking streams from well-mixed seeds.
pub type McRng = rand::rngs::Xoshiro256PlusPlus;

/// Default seed for every random result (contract: `--seed`, default 1).
pub const DEFAULT_SEED: u64 = 1;

/// SplitMix64 finaliser (Steele, Lea & Flood 2014): a bijective 64-bit mixer.
pub fn splitmix64(mut z: u64) -> u64 {
    z = z.wrapping_add(0x9E37_79B9_7F4A_7C15);
    z = (z ^ (z >> 30)).wrapping_mul(0xBF58_476D_1CE4_E5B9);
    z = (z ^ (z >> 27)).wrapping_mul(0x94D0_49BB_1331_11EB);
    z ^ (z >> 31)
}

/// The random stream of replicate `index` under `seed`; `stream` separates independent uses of the
/// same seed inside one computation (e.g. a bootstrap and a simulation in one test).
pub fn replicate_rng(seed: u64, stream: u64, index: u64) -> McRng {
    let mut bytes = [0u8; 32];
    let mut s = splitmix64(seed ^ splitmix64(stream.wrapping_add(0x51ED_2701)));
    s = splitmix64(s ^ index.wrapping_mul(0xD6E8_FEB8_6659_FD93));
    for chunk in bytes.chunks_mut(8) {
        s = splitmix64(s);
        chunk.copy_from_slice(&s.to_le_bytes());
    }
    McRng::from_seed(bytes)
}

/// Receives progress reports from long computations.
pub trait Progress: Sync {
    /// A run of `total` replicates is starting.
    fn start(&self, _label: &str, _total: u64) {}
    /// `n` more replicates finished.
    fn advance(&self, _n: u64) {}
    /// The run finished.
    fn finish(&self) {}
}

/// A progress sink that ignores everything.
#[derive(Debug, Clone, Copy, Default)]
pub struct Silent;
impl Progress for Silent {}

/// Settings shared by every Monte Carlo computation.
#[derive(Clone, Copy)]
pub struct MonteCarlo<'a> {
    /// Seed of the whole computation.
    pub seed: u64,
    /// Number of resamples or simulations.
    pub resamples: usize,
    /// Where progress goes.
    pub progress: &'a dyn Progress,
}

impl std::fmt::Debug for MonteCarlo<'_> {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        f.debug_struct("MonteCarlo").field("seed", &self.seed).field("resamples", &self.resamples).finish()
    }
}

impl<'a> MonteCarlo<'a> {
    /// Silent settings with the given seed and number of resamples.
    pub fn new(seed: u64, resamples: usize) -> MonteCarlo<'static> {
        MonteCarlo { seed, resamples, progress: &Silent }
    }

    /// Run `f(rng, i)` for replicates `i = 0 … resamples − 1` on stream `stream`, in parallel,
    /// returning results in replicate order. Identical for any thread count.
    pub fn run<T, F>(&self, label: &str, stream: u64, f: F) -> Vec<T>
    where
        T: Send,
        F: Fn(&mut McRng, usize) -> T + Sync + Send,
    {
        let n = self.resamples;
        self.progress.start(label, n as u64);
        let chunk = 64usize;
        let out: Vec<T> = (0..n.div_ceil(chunk))
            .into_par_iter()
            .flat_map_iter(|c| {
                let lo = c * chunk;
                let hi = (lo + chunk).min(n);
                let part: Vec<T> = (lo..hi)
                    .map(|i| {
                        let mut rng = replicate_rng(self.seed, stream, i as u64);
                        f(&mut rng, i)
                    })
                    .collect();
                self.progress.advance((hi - lo) as u64);
                part
            })
            .collect();
        self.progress.finish();
        out
    }
}

/// Empirical quantile (type 7 of Hyndman & Fan 1996, the default of R and NumPy) of sorted data.
pub fn quantile_sorted(sorted: &[f64], q: f64) -> f64 {
    if sorted.is_empty() {
        return f64::NAN;
    }
    let h = (sorted.len() - 1) as f64 * q.clamp(0.0, 1.0);
    let lo = h.floor() as usize;
    let hi = h.ceil() as usize;
    sorted[lo] + (h - lo as f64) * (sorted[hi] - sorted[lo])
}

#[cfg(test)]
mod tests {
    use super::*;
    use rand::RngExt;

    #[test]
    fn same_answer_for_any_thread_count() {
        let mc = MonteCarlo::new(42, 1000);
        let draw = |r: &mut McRng, _i: usize| r.random::<f64>();
        let one = rayon::ThreadPoolBuilder::new().num_threads(1).build().unwrap().install(|| mc.run("t", 0, draw));
        let two = rayon::ThreadPoolBuilder::new().num_threads(2).build().unwrap().install(|| mc.run("t", 0, draw));
        assert_eq!(one, two);
        let other_stream = mc.run("t", 1, draw);
        assert_ne!(one, other_stream);
        let other_seed = MonteCarlo::new(43, 1000).run("t", 0, draw);
        assert_ne!(one, other_seed);
    }

    #[test]
    fn quantiles_match_numpy_default() {
        // numpy.quantile([1, 2, 3, 4], 0.25) = 1.75 (linear interpolation, NumPy's default method).
        assert_eq!(quantile_sorted(&[1.0, 2.0, 3.0, 4.0], 0.25), 1.75);
        assert_eq!(quantile_sorted(&[1.0, 2.0, 3.0, 4.0], 1.0), 4.0);
    }
}
