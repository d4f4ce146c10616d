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

/// Fewest resamples of the field tests' Monte Carlo and of the shallowing search's intervals, in every
/// front end (the verbs, the `section` settings, the Python package): with fewer, the 2.5 % and
/// 97.5 % percentiles rest on two or three draws.
pub const MIN_RESAMPLES: usize = 100;

/// `n`, when it is at least [`MIN_RESAMPLES`].
///
/// # Errors
/// [`crate::Error::TooFew`] (unit `resamples`) below it.
pub fn check_resamples(n: usize) -> crate::error::Result<usize> {
    if n < MIN_RESAMPLES {
        return Err(crate::Error::TooFew {
            what: "a percentile interval",
            needed: MIN_RESAMPLES,
            got: n,
            unit: "resamples",
        });
    }
    Ok(n)
}

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
        self.run_with(label, stream, || (), |_, rng, i| f(rng, i))
    }

    /// [`MonteCarlo::run`] with a scratch value made by `init` for each parallel task (a run of at least
    /// 16 replicates) and handed to every replicate of the task (buffers reused instead of allocated
    /// per replicate).
    /// The results must not depend on what an earlier replicate left in the scratch.
    pub fn run_with<S, T, I, F>(&self, label: &str, stream: u64, init: I, f: F) -> Vec<T>
    where
        T: Send,
        I: Fn() -> S + Sync + Send,
        F: Fn(&mut S, &mut McRng, usize) -> T + Sync + Send,
    {
        let n = self.resamples;
        self.progress.start(label, n as u64);
        // An indexed parallel map (results written in place, in replicate order), at least 16
        // replicates per task; a scratch value per task.
        let out: Vec<T> = (0..n)
            .into_par_iter()
            .with_min_len(16)
            .map_init(&init, |scratch, i| {
                let mut rng = replicate_rng(self.seed, stream, i as u64);
                let r = f(scratch, &mut rng, i);
                self.advance_past(i, i + 1);
                r
            })
            .collect();
        self.progress.finish();
        out
    }

    /// Progress for replicates `lo..hi` done, reported in steps of 64 replicates (and the remainder
    /// when the last replicate is done), so that the sink is called rarely.
    fn advance_past(&self, lo: usize, hi: usize) {
        const STEP: usize = 64;
        let crossed = hi / STEP - lo / STEP;
        if crossed > 0 {
            self.progress.advance((crossed * STEP) as u64);
        }
        let n = self.resamples;
        if hi == n && !n.is_multiple_of(STEP) {
            self.progress.advance((n % STEP) as u64);
        }
    }

    /// [`MonteCarlo::run_with`] for work that is cheaper done several replicates at a time: `f(scratch,
    /// rngs, first)` gets the streams of replicates `first …` (`batch` of them, fewer at the end) and
    /// returns their results in order. Each replicate still draws from its own stream, so the results
    /// are those of a one-at-a-time run and identical for any thread count.
    ///
    /// # Panics
    /// If `f` returns a different number of results than it got streams (a bug in the caller).
    pub fn run_batched<S, T, I, F>(&self, label: &str, stream: u64, batch: usize, init: I, f: F) -> Vec<T>
    where
        T: Send,
        I: Fn() -> S + Sync + Send,
        F: Fn(&mut S, &mut [McRng], usize) -> Vec<T> + Sync + Send,
    {
        let (n, batch) = (self.resamples, batch.max(1));
        self.progress.start(label, n as u64);
        let parts: Vec<Vec<T>> = (0..n.div_ceil(batch))
            .into_par_iter()
            .with_min_len(16usize.div_ceil(batch))
            .map_init(&init, |scratch, g| {
                let (lo, hi) = (g * batch, ((g + 1) * batch).min(n));
                let mut rngs: Vec<McRng> = (lo..hi).map(|i| replicate_rng(self.seed, stream, i as u64)).collect();
                let r = f(scratch, &mut rngs, lo);
                assert_eq!(r.len(), hi - lo, "a batch of {} replicates returned {} results", hi - lo, r.len());
                self.advance_past(lo, hi);
                r
            })
            .collect();
        self.progress.finish();
        parts.into_iter().flatten().collect()
    }
}

/// Uniform indices in `0..n` for resampling with replacement, two per 64-bit draw of the generator.
///
/// # Formula
/// Lemire's multiply-and-shift: for a 32-bit uniform x, ⌊x·n / 2³²⌋ is an index; the few x whose low
/// product word falls below (2³² − n) mod n are redrawn, which makes every index exactly equally likely.
/// The high and the low 32 bits of one generator output give two indices.
///
/// # References
/// Lemire, D. (2019), Fast random integer generation in an interval, *ACM Trans. Model. Comput. Simul.*
/// 29(1), 3.
#[derive(Debug, Clone, Copy)]
pub struct UniformIndex {
    n: u64,
    threshold: u32,
}

impl UniformIndex {
    /// Indices in `0..n`; `None` when `n` is 0 or does not fit in 32 bits.
    pub fn new(n: usize) -> Option<Self> {
        let n32 = u32::try_from(n).ok().filter(|&m| m > 0)?;
        Some(Self { n: n as u64, threshold: n32.wrapping_neg() % n32 })
    }

    #[inline]
    fn bound<R: rand::Rng + ?Sized>(&self, x: u32, rng: &mut R) -> u32 {
        let mut m = x as u64 * self.n;
        while (m as u32) < self.threshold {
            m = (rng.next_u64() >> 32) * self.n;
        }
        (m >> 32) as u32
    }

    /// Fill `out` with independent uniform indices.
    #[inline]
    pub fn fill<R: rand::Rng + ?Sized>(&self, rng: &mut R, out: &mut [u32]) {
        let mut pairs = out.chunks_exact_mut(2);
        for p in &mut pairs {
            let r = rng.next_u64();
            p[0] = self.bound((r >> 32) as u32, rng);
            p[1] = self.bound(r as u32, rng);
        }
        if let [last] = pairs.into_remainder() {
            *last = self.bound((rng.next_u64() >> 32) as u32, rng);
        }
    }
}

/// Position of the type-7 quantile `q` in `len` (≥ 1) sorted values: the lower index and the fraction
/// of the way to the next one.
fn type7_position(len: usize, q: f64) -> (usize, f64) {
    let h = (len - 1) as f64 * q.clamp(0.0, 1.0);
    let lo = h.floor();
    (lo as usize, h - lo)
}

/// Empirical quantile (type 7 of Hyndman & Fan 1996, the default of R and NumPy) of sorted data.
pub fn quantile_sorted(sorted: &[f64], q: f64) -> f64 {
    if sorted.is_empty() {
        return f64::NAN;
    }
    let (lo, frac) = type7_position(sorted.len(), q);
    let hi = if frac > 0.0 { lo + 1 } else { lo };
    sorted[lo] + frac * (sorted[hi] - sorted[lo])
}

/// Empirical quantile (type 7, as [`quantile_sorted`]) of unsorted data, found by selection in
/// linear time (see [`quantiles_select`]). NaN sorts last (`f64::total_cmp`).
pub fn quantile_select(data: &[f64], q: f64) -> f64 {
    quantiles_select(data, &[q])[0]
}

/// Empirical quantiles (type 7, as [`quantile_sorted`]) of unsorted data at the levels `qs`, in the
/// order given, found by selection in linear time without sorting. NaN sorts last (`f64::total_cmp`);
/// with no data every quantile is NaN.
///
/// The values are selected as integers that order like `f64::total_cmp` (`order_key`), which
/// compare faster than floating point; each level after the first is selected among the values above
/// the previous one.
pub fn quantiles_select(data: &[f64], qs: &[f64]) -> Vec<f64> {
    let mut keys: Vec<u64> = data.iter().map(|&x| order_key(x)).collect();
    quantiles_of_keys(&mut keys, qs)
}

/// An integer that orders like `f64::total_cmp`: negative numbers with all bits flipped, others with
/// the sign bit set.
#[inline]
pub(crate) fn order_key(x: f64) -> u64 {
    let b = x.to_bits();
    if b >> 63 == 1 {
        !b
    } else {
        b | 1 << 63
    }
}

/// The number whose [`order_key`] is `k`.
#[inline]
fn from_order_key(k: u64) -> f64 {
    f64::from_bits(if k >> 63 == 1 { k & !(1 << 63) } else { !k })
}

/// [`quantiles_select`] of the numbers whose [`order_key`]s are `keys` (reordered).
pub(crate) fn quantiles_of_keys(keys: &mut [u64], qs: &[f64]) -> Vec<f64> {
    if keys.is_empty() {
        return vec![f64::NAN; qs.len()];
    }
    let mut order: Vec<usize> = (0..qs.len()).collect();
    order.sort_by(|&i, &j| qs[i].clamp(0.0, 1.0).total_cmp(&qs[j].clamp(0.0, 1.0)));
    let mut out = vec![f64::NAN; qs.len()];
    // keys[..settled] hold the smallest `settled` values in order statistics' places.
    let mut settled = 0;
    for j in order {
        let (lo, frac) = type7_position(keys.len(), qs[j]);
        if lo >= settled {
            keys[settled..].select_nth_unstable(lo - settled);
            settled = lo + 1;
        }
        let x_lo = from_order_key(keys[lo]);
        out[j] = if frac == 0.0 {
            x_lo
        } else {
            // The next order statistic is the least value above position `lo`.
            let x_hi = keys[lo + 1..].iter().copied().min().map_or(x_lo, from_order_key);
            x_lo + frac * (x_hi - x_lo)
        };
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use rand::RngExt;

    #[test]
    fn the_resample_floor_is_one_rule() {
        assert_eq!(check_resamples(MIN_RESAMPLES).unwrap(), 100);
        assert_eq!(check_resamples(1000).unwrap(), 1000);
        let e = check_resamples(99).unwrap_err();
        assert!(matches!(e, crate::Error::TooFew { needed: 100, got: 99, unit: "resamples", .. }), "{e:?}");
        assert!(check_resamples(0).is_err());
    }

    #[test]
    fn batched_runs_equal_one_at_a_time() {
        // Any batch size (dividing the run or not), any thread count: the results of `run`.
        let mc = MonteCarlo::new(7, 203);
        let draw = |r: &mut McRng, i: usize| (i, r.random::<u64>());
        let plain = mc.run("t", 4, draw);
        for threads in [1, 2] {
            let pool = rayon::ThreadPoolBuilder::new().num_threads(threads).build().unwrap();
            for batch in [1, 4, 7, 203, 500] {
                let got = pool.install(|| {
                    mc.run_batched(
                        "t",
                        4,
                        batch,
                        || (),
                        |_, rngs, first| rngs.iter_mut().enumerate().map(|(k, r)| draw(r, first + k)).collect(),
                    )
                });
                assert_eq!(got, plain, "batch {batch}, {threads} threads");
            }
        }
        // Progress adds up to the number of replicates, whatever the batch, and one at a time.
        struct Count(std::sync::atomic::AtomicU64);
        impl Progress for Count {
            fn advance(&self, n: u64) {
                self.0.fetch_add(n, std::sync::atomic::Ordering::Relaxed);
            }
        }
        for (n, batch) in [(203, 4), (256, 4), (1000, 7), (5, 8)] {
            let count = Count(std::sync::atomic::AtomicU64::new(0));
            let mc = MonteCarlo { seed: 1, resamples: n, progress: &count };
            mc.run_batched("t", 0, batch, || (), |_, rngs, _| vec![(); rngs.len()]);
            assert_eq!(
                count.0.load(std::sync::atomic::Ordering::Relaxed),
                n as u64,
                "{n} replicates in batches of {batch}"
            );
            mc.run("t", 0, |_, _| ());
            assert_eq!(
                count.0.load(std::sync::atomic::Ordering::Relaxed),
                2 * n as u64,
                "{n} replicates one at a time"
            );
        }
    }

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
    fn uniform_indices_are_uniform_and_in_range() {
        // Chi-square check of 600 000 indices over 0..6: the 0.999 point of χ²₅ is 20.515
        // (SciPy 1.17.1 stats.chi2.ppf(0.999, 5) = 20.515005652432873).
        let u = UniformIndex::new(6).unwrap();
        let mut rng = replicate_rng(3, 0, 0);
        let mut buf = [0u32; 1001];
        let mut count = [0u64; 6];
        for _ in 0..600 {
            u.fill(&mut rng, &mut buf[..1000]);
            buf[..1000].iter().for_each(|&i| count[i as usize] += 1);
        }
        let chi2: f64 = count.iter().map(|&c| (c as f64 - 1e5).powi(2) / 1e5).sum();
        assert!(chi2 < 20.515005652432873, "{count:?} {chi2}");
        // Odd lengths, n = 1 and the largest 32-bit n stay in range.
        for n in [1usize, 7, u32::MAX as usize] {
            let u = UniformIndex::new(n).unwrap();
            u.fill(&mut rng, &mut buf);
            assert!(buf.iter().all(|&i| (i as usize) < n), "{n}");
        }
        assert!(UniformIndex::new(0).is_none());
        assert!(UniformIndex::new(u32::MAX as usize + 1).is_none());
        // The rejection threshold (2³² − n) mod n: 2³² mod 6 = 4.
        assert_eq!(UniformIndex::new(6).unwrap().threshold, 4);
    }

    #[test]
    fn selection_equals_sorting() {
        let mut rng = replicate_rng(5, 0, 0);
        for len in [1usize, 2, 3, 10, 101, 1000] {
            let data: Vec<f64> = (0..len).map(|_| rng.random::<f64>()).collect();
            let mut sorted = data.clone();
            sorted.sort_by(f64::total_cmp);
            let qs = [0.0, 0.025, 0.5, 0.95, 0.975, 1.0];
            for q in qs {
                assert_eq!(quantile_select(&data, q), quantile_sorted(&sorted, q), "len {len}, q {q}");
            }
            // Several levels at once, given in any order.
            let rev: Vec<f64> = qs.iter().rev().copied().collect();
            let want: Vec<f64> = rev.iter().map(|&q| quantile_sorted(&sorted, q)).collect();
            assert_eq!(quantiles_select(&data, &rev), want, "len {len}");
        }
        // Negative values, zeros of both signs, infinities and NaN order as `total_cmp` does.
        let odd = [3.0, -0.0, f64::NAN, -2.5, 0.0, f64::NEG_INFINITY, 1e-300, -1e-300, f64::INFINITY];
        let mut sorted = odd.to_vec();
        sorted.sort_by(f64::total_cmp);
        for (k, want) in sorted.iter().enumerate() {
            let q = k as f64 / (odd.len() - 1) as f64;
            assert_eq!(quantile_select(&odd, q).to_bits(), want.to_bits(), "position {k}");
        }
        assert!(quantile_select(&[], 0.5).is_nan());
    }

    #[test]
    fn quantiles_match_numpy_default() {
        // numpy.quantile([1, 2, 3, 4], 0.25) = 1.75 (linear interpolation, NumPy's default method).
        assert_eq!(quantile_sorted(&[1.0, 2.0, 3.0, 4.0], 0.25), 1.75);
        assert_eq!(quantile_sorted(&[1.0, 2.0, 3.0, 4.0], 1.0), 4.0);
    }
}
