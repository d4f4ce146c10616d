//! Fisher draws eight at a time, for the resultants of simulated sets (Watson's V_w).
//!
//! Eight xoshiro256++ generators run side by side (seeded from the replicate's own stream), each round
//! makes eight candidate draws, and the accepted ones are summed lane by lane. Every operation is an
//! integer operation or a correctly rounded `+ − × ÷ √`, including the logarithm (a fixed polynomial,
//! not the system library), so the 256-bit vector path and the portable path give the same numbers,
//! bit for bit, on every machine.

use super::FisherSampler;
use crate::fastmath::{estrin, ln_basic, ATANH, EXP_MAGIC_BITS, LN2_HI, LN2_LO, MANTISSA, ONE_BITS, TWO52};
use crate::sphere::Vec3;
use rand::Rng;

/// 2.0: a mantissa under this exponent gives a number in [2, 4).
const TWO_BITS: u64 = 0x4000_0000_0000_0000;
/// The top 32 bits of a 52-bit mantissa.
const HIGH32_AT_20: u64 = 0x000F_FFFF_FFF0_0000;

/// Lanes: two sets of four, so that two rounds of 256-bit work are in flight at once.
const LANES: usize = 8;

/// Eight Fisher samplers side by side (see the module documentation).
#[derive(Debug, Clone)]
pub(crate) struct FisherLanes {
    /// Generator states, `s[word][lane]`.
    s: [[u64; LANES]; 4],
    /// 1 − e^(−2κ).
    c: f64,
    inv_kappa: f64,
}

/// One round of eight candidate draws: the draw of lane l is (cx[l], y[l], z[l]) if `ok[l]`.
#[derive(Debug, Clone, Copy)]
struct Round {
    cx: [f64; LANES],
    y: [f64; LANES],
    z: [f64; LANES],
    ok: [bool; LANES],
}

impl FisherLanes {
    /// Eight generators seeded from `rng` (32 outputs), drawing from `sampler`'s distribution in its
    /// own frame (mean along +x).
    pub(crate) fn new<R: Rng + ?Sized>(sampler: &FisherSampler, rng: &mut R) -> Self {
        let mut s = [[0u64; LANES]; 4];
        for word in s.iter_mut() {
            for v in word.iter_mut() {
                *v = rng.next_u64();
            }
        }
        let stuck: [bool; LANES] = std::array::from_fn(|lane| s.iter().all(|word| word[lane] == 0));
        for (first, stuck) in s[0].iter_mut().zip(stuck) {
            if stuck {
                *first = 1; // xoshiro's one forbidden state
            }
        }
        let (c, inv_kappa) = sampler.lane_constants();
        Self { s, c, inv_kappa }
    }

    /// Draw from `sampler`'s distribution from now on (same generators): two sets with different κ
    /// can share one seeding.
    pub(crate) fn set_sampler(&mut self, sampler: &FisherSampler) {
        (self.c, self.inv_kappa) = sampler.lane_constants();
    }

    /// Next output of each lane's xoshiro256++ (Blackman & Vigna 2021).
    #[inline(always)]
    #[allow(
        clippy::needless_range_loop,
        reason = "one index per lane across five arrays, in the form the compiler vectorizes"
    )]
    fn next(&mut self) -> [u64; LANES] {
        let mut out = [0u64; LANES];
        for l in 0..LANES {
            let [mut s0, mut s1, mut s2, mut s3] = [self.s[0][l], self.s[1][l], self.s[2][l], self.s[3][l]];
            out[l] = s0.wrapping_add(s3).rotate_left(23).wrapping_add(s0);
            let t = s1 << 17;
            s2 ^= s0;
            s3 ^= s1;
            s1 ^= s2;
            s0 ^= s3;
            s2 ^= t;
            s3 = s3.rotate_left(45);
            [self.s[0][l], self.s[1][l], self.s[2][l], self.s[3][l]] = [s0, s1, s2, s3];
        }
        out
    }

    /// One round, portable path.
    ///
    /// # Formula
    /// U from the top 52 bits of one output: x = 1 − cos θ = min(2, −ln(1 − U (1 − e^(−2κ)))/κ) (the
    /// inverse CDF of the Fisher distribution of cos θ); (a, b) uniform in [−1, 1)² from the high and the
    /// low 32 bits of
    /// a second output, accepted when 0 < s = a² + b² < 1; the draw is (1 − x, a f, b f) with
    /// f = √(x (2 − x)/s), so (a, b)/√s is the azimuth's cosine and sine.
    #[inline(always)]
    fn round(&mut self) -> Round {
        let r1 = self.next();
        let r2 = self.next();
        let mut out = Round { cx: [0.0; LANES], y: [0.0; LANES], z: [0.0; LANES], ok: [false; LANES] };
        for l in 0..LANES {
            let u = f64::from_bits((r1[l] >> 12) | ONE_BITS) - 1.0;
            let x = (-ln_basic(1.0 - u * self.c) * self.inv_kappa).min(2.0);
            let sin2 = x * (2.0 - x);
            let a = f64::from_bits(((r2[l] >> 12) & HIGH32_AT_20) | TWO_BITS) - 3.0;
            let b = f64::from_bits(((r2[l] << 20) & HIGH32_AT_20) | TWO_BITS) - 3.0;
            let s = a * a + b * b;
            let f = (sin2 / s).sqrt();
            out.cx[l] = 1.0 - x;
            out.y[l] = a * f;
            out.z[l] = b * f;
            out.ok[l] = s < 1.0 && s > 0.0;
        }
        out
    }

    /// The resultant of the next `n` accepted draws (taken round by round, lanes in order), summed per
    /// lane and then ((lane 0 + lane 1) + (lane 2 + lane 3)).
    pub(crate) fn resultant(&mut self, n: usize) -> Vec3 {
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx512f") {
            // SAFETY: the processor supports AVX-512F (checked just above).
            return unsafe { self.resultant_avx512(n) };
        }
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx2") {
            // SAFETY: the processor supports AVX2 (checked just above).
            return unsafe { self.resultant_avx2(n) };
        }
        self.resultant_portable(n)
    }

    fn resultant_portable(&mut self, n: usize) -> Vec3 {
        let mut acc = [[0.0f64; LANES]; 3];
        let mut done = 0usize;
        while done < n {
            let r = self.round();
            let mut keep = r.ok;
            trim(&mut keep, n - done);
            for l in 0..LANES {
                let k = keep[l];
                acc[0][l] += if k { r.cx[l] } else { 0.0 };
                acc[1][l] += if k { r.y[l] } else { 0.0 };
                acc[2][l] += if k { r.z[l] } else { 0.0 };
                done += k as usize;
            }
        }
        let h = |v: [f64; LANES]| ((v[0] + v[1]) + (v[2] + v[3])) + ((v[4] + v[5]) + (v[6] + v[7]));
        Vec3::new(h(acc[0]), h(acc[1]), h(acc[2]))
    }

    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx2")]
    unsafe fn resultant_avx2(&mut self, n: usize) -> Vec3 {
        use std::arch::x86_64::*;
        // Lanes 0–3 form set A, lanes 4–7 set B; each set is one 256-bit register per state word.
        // SAFETY (loads and stores): every pointer is to four consecutive u64 inside `self.s`.
        let load =
            |w: usize, half: usize| unsafe { _mm256_loadu_si256(self.s[w][4 * half..].as_ptr() as *const __m256i) };
        let mut st: [[__m256i; 4]; 2] =
            [[load(0, 0), load(1, 0), load(2, 0), load(3, 0)], [load(0, 1), load(1, 1), load(2, 1), load(3, 1)]];
        let rotl23 = |x: __m256i| _mm256_or_si256(_mm256_slli_epi64::<23>(x), _mm256_srli_epi64::<41>(x));
        let rotl45 = |x: __m256i| _mm256_or_si256(_mm256_slli_epi64::<45>(x), _mm256_srli_epi64::<19>(x));
        let next = |s: &mut [__m256i; 4]| {
            let out = _mm256_add_epi64(rotl23(_mm256_add_epi64(s[0], s[3])), s[0]);
            let t = _mm256_slli_epi64::<17>(s[1]);
            s[2] = _mm256_xor_si256(s[2], s[0]);
            s[3] = _mm256_xor_si256(s[3], s[1]);
            s[1] = _mm256_xor_si256(s[1], s[2]);
            s[0] = _mm256_xor_si256(s[0], s[3]);
            s[2] = _mm256_xor_si256(s[2], t);
            s[3] = rotl45(s[3]);
            out
        };
        let one_bits = _mm256_set1_epi64x(ONE_BITS as i64);
        let mantissa = _mm256_set1_epi64x(MANTISSA as i64);
        let high32 = _mm256_set1_epi64x(HIGH32_AT_20 as i64);
        let two_bits = _mm256_set1_epi64x(TWO_BITS as i64);
        let exp_magic = _mm256_set1_epi64x(EXP_MAGIC_BITS as i64);
        let pd = _mm256_set1_pd;
        let (one, two, three, half) = (pd(1.0), pd(2.0), pd(3.0), pd(0.5));
        let (c, inv_kappa) = (pd(self.c), pd(self.inv_kappa));
        let zero = _mm256_setzero_pd();
        // One round of four lanes: (1 − x, a f, b f) and the acceptance mask; the operations of
        // `round` and `ln_basic`, in the same order.
        let round4 = |s: &mut [__m256i; 4]| {
            let r1 = next(s);
            let r2 = next(s);
            let u = _mm256_sub_pd(_mm256_castsi256_pd(_mm256_or_si256(_mm256_srli_epi64::<12>(r1), one_bits)), one);
            let w = _mm256_sub_pd(one, _mm256_mul_pd(u, c));
            let bits = _mm256_castpd_si256(w);
            let e0 = _mm256_sub_pd(
                _mm256_sub_pd(
                    _mm256_castsi256_pd(_mm256_or_si256(_mm256_srli_epi64::<52>(bits), exp_magic)),
                    pd(TWO52),
                ),
                pd(1023.0),
            );
            let m0 = _mm256_castsi256_pd(_mm256_or_si256(_mm256_and_si256(bits, mantissa), one_bits));
            let big = _mm256_cmp_pd::<_CMP_GT_OQ>(m0, pd(std::f64::consts::SQRT_2));
            let m = _mm256_blendv_pd(m0, _mm256_mul_pd(m0, half), big);
            let e = _mm256_blendv_pd(e0, _mm256_add_pd(e0, one), big);
            let f = _mm256_div_pd(_mm256_sub_pd(m, one), _mm256_add_pd(m, one));
            let f2 = _mm256_mul_pd(f, f);
            let p = estrin(f2, |k| pd(ATANH[k]), |a, b| _mm256_add_pd(a, b), |a, b| _mm256_mul_pd(a, b));
            let lnw = _mm256_add_pd(
                _mm256_mul_pd(e, pd(LN2_HI)),
                _mm256_add_pd(_mm256_mul_pd(_mm256_mul_pd(two, f), p), _mm256_mul_pd(e, pd(LN2_LO))),
            );
            // x = min(−ln w · (1/κ), 2): −ln w by flipping the sign bit, as `-` does.
            let x = _mm256_min_pd(_mm256_mul_pd(_mm256_xor_pd(lnw, pd(-0.0)), inv_kappa), two);
            let sin2 = _mm256_mul_pd(x, _mm256_sub_pd(two, x));
            let a = _mm256_sub_pd(
                _mm256_castsi256_pd(_mm256_or_si256(_mm256_and_si256(_mm256_srli_epi64::<12>(r2), high32), two_bits)),
                three,
            );
            let b = _mm256_sub_pd(
                _mm256_castsi256_pd(_mm256_or_si256(_mm256_and_si256(_mm256_slli_epi64::<20>(r2), high32), two_bits)),
                three,
            );
            let s2 = _mm256_add_pd(_mm256_mul_pd(a, a), _mm256_mul_pd(b, b));
            let fct = _mm256_sqrt_pd(_mm256_div_pd(sin2, s2));
            let ok = _mm256_and_pd(_mm256_cmp_pd::<_CMP_LT_OQ>(s2, one), _mm256_cmp_pd::<_CMP_GT_OQ>(s2, zero));
            (_mm256_sub_pd(one, x), _mm256_mul_pd(a, fct), _mm256_mul_pd(b, fct), ok)
        };
        let lane_mask = |bits: u32| {
            _mm256_castsi256_pd(_mm256_set_epi64x(
                -((bits >> 3 & 1) as i64),
                -((bits >> 2 & 1) as i64),
                -((bits >> 1 & 1) as i64),
                -((bits & 1) as i64),
            ))
        };
        let mut acc = [[zero; 3]; 2];
        let mut done = 0usize;
        while done < n {
            let ra = round4(&mut st[0]);
            let rb = round4(&mut st[1]);
            let bits = _mm256_movemask_pd(ra.3) as u32 | (_mm256_movemask_pd(rb.3) as u32) << 4;
            let count = bits.count_ones() as usize;
            let (ka, kb) = if done + count <= n {
                done += count;
                (ra.3, rb.3)
            } else {
                let mut keep: [bool; LANES] = std::array::from_fn(|l| bits >> l & 1 != 0);
                done += trim(&mut keep, n - done);
                let kbits = keep.iter().enumerate().fold(0u32, |m, (l, &k)| m | (k as u32) << l);
                (lane_mask(kbits & 15), lane_mask(kbits >> 4))
            };
            // Values added where kept and +0 elsewhere (the portable path adds 0.0 too).
            for (accs, (r, k)) in acc.iter_mut().zip([(ra, ka), (rb, kb)]) {
                accs[0] = _mm256_add_pd(accs[0], _mm256_and_pd(r.0, k));
                accs[1] = _mm256_add_pd(accs[1], _mm256_and_pd(r.1, k));
                accs[2] = _mm256_add_pd(accs[2], _mm256_and_pd(r.2, k));
            }
        }
        for (half, set) in st.iter().enumerate() {
            for (w, v) in set.iter().enumerate() {
                // SAFETY: four consecutive u64 inside `self.s`.
                unsafe { _mm256_storeu_si256(self.s[w][4 * half..].as_mut_ptr() as *mut __m256i, *v) };
            }
        }
        let lanes = |a: __m256d, b: __m256d| {
            let mut v = [0.0f64; LANES];
            // SAFETY: eight f64 in `v`.
            unsafe {
                _mm256_storeu_pd(v.as_mut_ptr(), a);
                _mm256_storeu_pd(v[4..].as_mut_ptr(), b);
            }
            ((v[0] + v[1]) + (v[2] + v[3])) + ((v[4] + v[5]) + (v[6] + v[7]))
        };
        Vec3::new(lanes(acc[0][0], acc[1][0]), lanes(acc[0][1], acc[1][1]), lanes(acc[0][2], acc[1][2]))
    }

    /// [`FisherLanes::resultant`] with the eight lanes in one 512-bit register: the same operations on
    /// the same lanes in the same order as the portable path.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx512f")]
    unsafe fn resultant_avx512(&mut self, n: usize) -> Vec3 {
        use std::arch::x86_64::*;
        // SAFETY (loads and stores): every pointer is to the eight u64 of one state word.
        let mut st: [__m512i; 4] =
            std::array::from_fn(|w| unsafe { _mm512_loadu_si512(self.s[w].as_ptr() as *const __m512i) });
        let one_bits = _mm512_set1_epi64(ONE_BITS as i64);
        let mantissa = _mm512_set1_epi64(MANTISSA as i64);
        let high32 = _mm512_set1_epi64(HIGH32_AT_20 as i64);
        let two_bits = _mm512_set1_epi64(TWO_BITS as i64);
        let exp_magic = _mm512_set1_epi64(EXP_MAGIC_BITS as i64);
        let pd = _mm512_set1_pd;
        let (one, two, three, half) = (pd(1.0), pd(2.0), pd(3.0), pd(0.5));
        let (c, inv_kappa) = (pd(self.c), pd(self.inv_kappa));
        let zero = _mm512_setzero_pd();
        let (mut ax, mut ay, mut az) = (zero, zero, zero);
        let mut done = 0usize;
        while done < n {
            let mut next = || {
                let out = _mm512_add_epi64(_mm512_rol_epi64::<23>(_mm512_add_epi64(st[0], st[3])), st[0]);
                let t = _mm512_slli_epi64::<17>(st[1]);
                st[2] = _mm512_xor_si512(st[2], st[0]);
                st[3] = _mm512_xor_si512(st[3], st[1]);
                st[1] = _mm512_xor_si512(st[1], st[2]);
                st[0] = _mm512_xor_si512(st[0], st[3]);
                st[2] = _mm512_xor_si512(st[2], t);
                st[3] = _mm512_rol_epi64::<45>(st[3]);
                out
            };
            let r1 = next();
            let r2 = next();
            let u = _mm512_sub_pd(_mm512_castsi512_pd(_mm512_or_si512(_mm512_srli_epi64::<12>(r1), one_bits)), one);
            let w = _mm512_sub_pd(one, _mm512_mul_pd(u, c));
            let bits = _mm512_castpd_si512(w);
            let e0 = _mm512_sub_pd(
                _mm512_sub_pd(
                    _mm512_castsi512_pd(_mm512_or_si512(_mm512_srli_epi64::<52>(bits), exp_magic)),
                    pd(TWO52),
                ),
                pd(1023.0),
            );
            let m0 = _mm512_castsi512_pd(_mm512_or_si512(_mm512_and_si512(bits, mantissa), one_bits));
            let big = _mm512_cmp_pd_mask::<_CMP_GT_OQ>(m0, pd(std::f64::consts::SQRT_2));
            let m = _mm512_mask_blend_pd(big, m0, _mm512_mul_pd(m0, half));
            let e = _mm512_mask_blend_pd(big, e0, _mm512_add_pd(e0, one));
            let f = _mm512_div_pd(_mm512_sub_pd(m, one), _mm512_add_pd(m, one));
            let f2 = _mm512_mul_pd(f, f);
            let p = estrin(f2, |k| pd(ATANH[k]), |a, b| _mm512_add_pd(a, b), |a, b| _mm512_mul_pd(a, b));
            let lnw = _mm512_add_pd(
                _mm512_mul_pd(e, pd(LN2_HI)),
                _mm512_add_pd(_mm512_mul_pd(_mm512_mul_pd(two, f), p), _mm512_mul_pd(e, pd(LN2_LO))),
            );
            // −ln w by flipping the sign bit, as `-` does.
            let neg = _mm512_castsi512_pd(_mm512_xor_si512(_mm512_castpd_si512(lnw), _mm512_set1_epi64(i64::MIN)));
            let x = _mm512_min_pd(_mm512_mul_pd(neg, inv_kappa), two);
            let sin2 = _mm512_mul_pd(x, _mm512_sub_pd(two, x));
            let a = _mm512_sub_pd(
                _mm512_castsi512_pd(_mm512_or_si512(_mm512_and_si512(_mm512_srli_epi64::<12>(r2), high32), two_bits)),
                three,
            );
            let b = _mm512_sub_pd(
                _mm512_castsi512_pd(_mm512_or_si512(_mm512_and_si512(_mm512_slli_epi64::<20>(r2), high32), two_bits)),
                three,
            );
            let s2 = _mm512_add_pd(_mm512_mul_pd(a, a), _mm512_mul_pd(b, b));
            let fct = _mm512_sqrt_pd(_mm512_div_pd(sin2, s2));
            let ok = _mm512_cmp_pd_mask::<_CMP_LT_OQ>(s2, one) & _mm512_cmp_pd_mask::<_CMP_GT_OQ>(s2, zero);
            let count = ok.count_ones() as usize;
            let keep = if done + count <= n {
                done += count;
                ok
            } else {
                let mut keep: [bool; LANES] = std::array::from_fn(|l| ok >> l & 1 != 0);
                done += trim(&mut keep, n - done);
                keep.iter().enumerate().fold(0u8, |m, (l, &k)| m | (k as u8) << l)
            };
            // Values added where kept and +0 elsewhere (the portable path adds 0.0 too).
            ax = _mm512_add_pd(ax, _mm512_maskz_mov_pd(keep, _mm512_sub_pd(one, x)));
            ay = _mm512_add_pd(ay, _mm512_maskz_mov_pd(keep, _mm512_mul_pd(a, fct)));
            az = _mm512_add_pd(az, _mm512_maskz_mov_pd(keep, _mm512_mul_pd(b, fct)));
        }
        for (w, v) in st.iter().enumerate() {
            // SAFETY: the eight u64 of one state word.
            unsafe { _mm512_storeu_si512(self.s[w].as_mut_ptr() as *mut __m512i, *v) };
        }
        let h = |v: __m512d| {
            let mut a = [0.0f64; LANES];
            // SAFETY: eight f64.
            unsafe { _mm512_storeu_pd(a.as_mut_ptr(), v) };
            ((a[0] + a[1]) + (a[2] + a[3])) + ((a[4] + a[5]) + (a[6] + a[7]))
        };
        Vec3::new(h(ax), h(ay), h(az))
    }
}

/// Keep at most `left` of the accepted lanes, in lane order; returns how many are kept.
#[inline(always)]
fn trim(keep: &mut [bool; LANES], left: usize) -> usize {
    let mut taken = 0;
    for k in keep.iter_mut() {
        if *k {
            if taken < left {
                taken += 1;
            } else {
                *k = false;
            }
        }
    }
    taken
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::montecarlo::replicate_rng;
    use crate::sphere::Direction;

    #[test]
    fn vector_and_portable_paths_agree_bit_for_bit() {
        for (kappa, n) in [(0.3, 7usize), (5.0, 100), (30.0, 101), (1e6, 3)] {
            let s = FisherSampler::new(Direction::new(0.0, 0.0).unwrap(), kappa).unwrap();
            let mut rng_a = replicate_rng(8, 1, n as u64);
            let mut rng_b = rng_a.clone();
            let (mut la, mut lb) = (FisherLanes::new(&s, &mut rng_a), FisherLanes::new(&s, &mut rng_b));
            for _ in 0..3 {
                let mut lc = la.clone();
                let ra = la.resultant(n);
                let want = lb.resultant_portable(n);
                assert_eq!(
                    [ra.x, ra.y, ra.z].map(f64::to_bits),
                    [want.x, want.y, want.z].map(f64::to_bits),
                    "kappa {kappa}, n {n}"
                );
                // The 256-bit path too, where the dispatch above took the 512-bit one.
                #[cfg(target_arch = "x86_64")]
                if std::arch::is_x86_feature_detected!("avx2") {
                    // SAFETY: AVX2 present (checked just above).
                    let r2 = unsafe { lc.resultant_avx2(n) };
                    assert_eq!(
                        [r2.x, r2.y, r2.z].map(f64::to_bits),
                        [want.x, want.y, want.z].map(f64::to_bits),
                        "AVX2, kappa {kappa}, n {n}"
                    );
                }
                let _ = &mut lc;
            }
        }
    }

    /// Kolmogorov–Smirnov distance between a sample and a continuous CDF (the project's
    /// `reversals::gof::ks_statistic`, after sorting).
    fn ks(mut xs: Vec<f64>, cdf: impl Fn(f64) -> f64) -> f64 {
        xs.sort_by(f64::total_cmp);
        crate::reversals::gof::ks_statistic(&xs, cdf)
    }

    #[test]
    fn draws_follow_the_fisher_distribution() {
        // Accepted draws of the portable rounds: KS at the 0.1 % level against the exact CDF of cos θ,
        // F(c) = (e^(κ(c−1)) − e^(−2κ)) / (1 − e^(−2κ)), and the uniform azimuth (Fisher, Lewis &
        // Embleton 1987, §4.2); critical D·√N = 1.949474603504375 (SciPy 1.17.1 kstwobign.ppf(0.999)).
        // The resultant of n draws equals their sum (to rounding: it is summed lane by lane).
        for kappa in [0.5, 5.0, 50.0] {
            let s = FisherSampler::new(Direction::new(0.0, 0.0).unwrap(), kappa).unwrap();
            let mut lanes = FisherLanes::new(&s, &mut replicate_rng(12, 0, 0));
            let mut copy = lanes.clone();
            let mut draws = Vec::new();
            while draws.len() < 40_000 {
                let r = lanes.round();
                for l in 0..LANES {
                    if r.ok[l] && draws.len() < 40_000 {
                        draws.push(Vec3::new(r.cx[l], r.y[l], r.z[l]));
                    }
                }
            }
            let n = draws.len() as f64;
            assert!(draws.iter().all(|u| (u.norm() - 1.0).abs() < 1e-12));
            let em = (-2.0 * kappa).exp();
            let d_cos = ks(draws.iter().map(|u| u.x).collect(), |c| {
                (((kappa * (c - 1.0)).exp() - em) / (1.0 - em)).clamp(0.0, 1.0)
            });
            let d_phi = ks(draws.iter().map(|u| u.z.atan2(u.y)).collect(), |p| {
                (p + std::f64::consts::PI) / std::f64::consts::TAU
            });
            let crit = 1.949474603504375 / n.sqrt();
            assert!(d_cos < crit && d_phi < crit, "kappa {kappa}: D(cos) = {d_cos}, D(phi) = {d_phi}, critical {crit}");
            let sum = draws.iter().fold(Vec3::ZERO, |a, u| a + *u);
            let r = copy.resultant_portable(draws.len());
            assert!((r - sum).norm() < 1e-9 * n, "{r:?} {sum:?}");
        }
    }
}
