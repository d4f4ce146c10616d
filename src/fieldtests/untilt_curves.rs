//! τ₁ curves of incremental untilting: the numerical kernel of the bootstrap fold test.
//!
//! A resample of the fold test is a vector of counts (how often each direction was drawn). Its curve
//! is τ₁(f) = λ_max((1/N) Σ cᵢ Rᵢ(f) uᵢ (Rᵢ(f) uᵢ)ᵀ) at every untilting step f. The outer products
//! Rᵢ(f) uᵢ (Rᵢ(f) uᵢ)ᵀ do not depend on the resample, so they are computed once; a resample is then a
//! weighted sum of rows of numbers ([`UntiltCurves::tau1`]) and one largest eigenvalue per step.

use crate::sphere::{Bedding, Vec3};
use rayon::prelude::*;

/// Newton steps taken unconditionally (see [`largest_eigenvalue`]).
const FIXED_STEPS: usize = 3;

/// Constant factors, multiplied rather than divided by (divisions are the slow part of the cubic).
const THIRD: f64 = 1.0 / 3.0;
const SIXTH: f64 = 1.0 / 6.0;
const NINTH: f64 = 1.0 / 9.0;

/// Numbers stored per direction and step.
const COLS: usize = 5;

/// Columns summed together in registers (eight 256-bit vectors of four numbers).
const BLOCK: usize = 32;

/// Largest eigenvalue of a symmetric 3 × 3 matrix given as (a11, a22, a33, a12, a13, a23).
///
/// # Formula
/// With q = tr/3, p = √(Σ(aᵢᵢ − q)²/6 + off²/3) and B = (A − qI)/p, the eigenvalues are q + p t for the
/// roots t of the depressed characteristic cubic t³ − 3t − h = 0, h = det B ∈ [−2, 2]; the largest
/// root lies in [1, 2] (trigonometrically t = 2 cos(acos(h/2)/3)). It is found by Newton's method,
/// started on the tangent t₀ = 2 − (2 − h)/9 of that concave function of h (an upper bound of the
/// root): the cubic is convex and increasing on [1, 2], so the iterates fall monotonically onto the
/// root. Three steps are taken unconditionally (they reach the root to rounding for h ≥ 1.5, i.e. when
/// λ₂ and λ₃ are close to each other and well below λ₁, as in a clustered set), then convergence is
/// checked; otherwise the steps go on, guarded, from where they stopped, and the trigonometric form
/// takes over below t = 1.001 (near a double largest root, a girdle), where both forms lose about half
/// the digits to rounding and the trigonometric one is exact at the double root itself.
///
/// # References
/// Smith, O. K. (1961), Eigenvalues of a symmetric 3 × 3 matrix, *Commun. ACM* 4(4), 168 (the shift,
/// the scaling and the trigonometric form); Newton's method converges monotonically from above the
/// largest root of a polynomial with real roots (e.g. Press et al. (2007), *Numerical Recipes*, 3rd
/// ed., §9.5).
pub fn largest_eigenvalue(m: [f64; 6]) -> f64 {
    let c = Cubic::of(m);
    if c.degenerate {
        return c.q;
    }
    let (t, step) = c.newton_fixed();
    c.finish(t, step)
}

/// Largest eigenvalues of consecutive matrices `(a11, a22, a33, a12, a13, a23)` in `m` (length a
/// multiple of 6), each multiplied by `scale`, into `out`. Four matrices at a time run the same steps
/// side by side (the processor overlaps their divisions); the result is the same, bit for bit, as
/// [`largest_eigenvalue`] of each times `scale`.
pub fn largest_eigenvalues(m: &[f64], scale: f64, out: &mut [f64]) {
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the processor supports AVX2 (checked just above).
        return unsafe { largest_eigenvalues_avx2(m, scale, out) };
    }
    largest_eigenvalues_body(m, scale, out)
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn largest_eigenvalues_avx2(m: &[f64], scale: f64, out: &mut [f64]) {
    // No fused multiply-add: the same numbers as the portable path and as `largest_eigenvalue`.
    largest_eigenvalues_body(m, scale, out)
}

#[inline(always)]
fn largest_eigenvalues_body(m: &[f64], scale: f64, out: &mut [f64]) {
    let mut quads = m.chunks_exact(24).zip(out.chunks_exact_mut(4));
    for (m4, o4) in &mut quads {
        // Straight-line arithmetic on four lanes (the compiler turns it into vector instructions).
        let col = |k: usize| -> [f64; 4] { [m4[k], m4[6 + k], m4[12 + k], m4[18 + k]] };
        let (a, b, c, d, e, f) = (col(0), col(1), col(2), col(3), col(4), col(5));
        // The same operations as `Cubic::of` and `Cubic::start`, written out lane by lane: calling
        // `Cubic::of` per lane gives the same numbers but a slower fold test (12.4 against 8.9 ms on one
        // thread, measured), because the compiler then keeps the lanes apart.
        let lanes = |g: &dyn Fn(usize) -> f64| -> [f64; 4] { std::array::from_fn(g) };
        let off = lanes(&|j| d[j] * d[j] + e[j] * e[j] + f[j] * f[j]);
        let q = lanes(&|j| (a[j] + b[j] + c[j]) * THIRD);
        let (aa, bb, cc) = (lanes(&|j| a[j] - q[j]), lanes(&|j| b[j] - q[j]), lanes(&|j| c[j] - q[j]));
        let p2 = lanes(&|j| (aa[j] * aa[j] + bb[j] * bb[j] + cc[j] * cc[j] + 2.0 * off[j]) * SIXTH);
        let p = lanes(&|j| p2[j].sqrt());
        let det = lanes(&|j| aa[j] * (bb[j] * cc[j] - f[j] * f[j]) - d[j] * (d[j] * cc[j] - f[j] * e[j]) + e[j] * (d[j] * f[j] - bb[j] * e[j]));
        let h = lanes(&|j| (det[j] / (p2[j] * p[j])).clamp(-2.0, 2.0));
        let deg: [bool; 4] = std::array::from_fn(|j| !(p2[j] > 1e-300));
        let mut t = lanes(&|j| 2.0 - (2.0 - h[j]) * NINTH);
        let step = newton_x4(&mut t, &h);
        for j in 0..4 {
            let cub = Cubic { q: q[j], p: p[j], h: h[j], degenerate: deg[j] };
            o4[j] = scale * if deg[j] { q[j] } else { cub.finish(t[j], step[j]) };
        }
    }
    let done = out.len() / 4 * 4;
    for (k, o) in out[done..].iter_mut().enumerate() {
        let j = done + k;
        *o = scale * largest_eigenvalue(std::array::from_fn(|i| m[6 * j + i]));
    }
}

/// [`FIXED_STEPS`] Newton steps of [`Cubic::step`] on four lanes; returns the next step of each.
#[inline(always)]
fn newton_x4(t: &mut [f64; 4], h: &[f64; 4]) -> [f64; 4] {
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the processor supports AVX2 (checked just above).
        return unsafe { newton_x4_avx2(t, h) };
    }
    for _ in 0..FIXED_STEPS {
        for j in 0..4 {
            t[j] -= Cubic::step(t[j], h[j]);
        }
    }
    std::array::from_fn(|j| Cubic::step(t[j], h[j]))
}

/// [`newton_x4`] in 256-bit vectors: the same operations in the same order as [`Cubic::step`]
/// (multiplies, subtractions and one correctly rounded division per step; no fused multiply-add),
/// hence the same numbers.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn newton_x4_avx2(t: &mut [f64; 4], h: &[f64; 4]) -> [f64; 4] {
    use std::arch::x86_64::*;
    // SAFETY: the arrays hold four f64; unaligned loads and stores.
    let (mut tv, hv) = unsafe { (_mm256_loadu_pd(t.as_ptr()), _mm256_loadu_pd(h.as_ptr())) };
    let (one, three) = (_mm256_set1_pd(1.0), _mm256_set1_pd(3.0));
    let step = |tv: __m256d| {
        let tt = _mm256_mul_pd(tv, tv);
        let num = _mm256_sub_pd(_mm256_mul_pd(tv, _mm256_sub_pd(tt, three)), hv);
        let den = _mm256_mul_pd(three, _mm256_sub_pd(tt, one));
        _mm256_div_pd(num, den)
    };
    for _ in 0..FIXED_STEPS {
        tv = _mm256_sub_pd(tv, step(tv));
    }
    let mut next = [0.0; 4];
    unsafe {
        _mm256_storeu_pd(t.as_mut_ptr(), tv);
        _mm256_storeu_pd(next.as_mut_ptr(), step(tv));
    }
    next
}

/// The depressed cubic of a symmetric 3 × 3 matrix (see [`largest_eigenvalue`]).
#[derive(Debug, Clone, Copy)]
struct Cubic {
    q: f64,
    p: f64,
    h: f64,
    /// A multiple of the identity (p = 0): every eigenvalue is q.
    degenerate: bool,
}

impl Cubic {
    #[inline(always)]
    fn of(m: [f64; 6]) -> Self {
        let [a, b, c, d, e, f] = m;
        let off = d * d + e * e + f * f;
        let q = (a + b + c) * THIRD;
        let (aa, bb, cc) = (a - q, b - q, c - q);
        let p2 = (aa * aa + bb * bb + cc * cc + 2.0 * off) * SIXTH;
        let p = p2.sqrt();
        let det = aa * (bb * cc - f * f) - d * (d * cc - f * e) + e * (d * f - bb * e);
        let h = (det / (p2 * p)).clamp(-2.0, 2.0);
        Self { q, p, h, degenerate: !(p2 > 1e-300) }
    }

    #[inline(always)]
    fn start(&self) -> f64 {
        2.0 - (2.0 - self.h) * NINTH
    }

    /// One Newton step for t³ − 3t − h at t.
    #[inline(always)]
    fn step(t: f64, h: f64) -> f64 {
        let tt = t * t;
        (t * (tt - 3.0) - h) / (3.0 * (tt - 1.0))
    }

    #[inline(always)]
    fn newton_fixed(&self) -> (f64, f64) {
        let mut t = self.start();
        for _ in 0..FIXED_STEPS {
            t -= Self::step(t, self.h);
        }
        (t, Self::step(t, self.h))
    }

    /// The eigenvalue from the iterate `t` after the fixed steps, whose next step is `step`.
    #[inline(always)]
    fn finish(&self, t: f64, step: f64) -> f64 {
        if step.abs() <= 4.0 * f64::EPSILON * t && t > 1.001 {
            return self.q + self.p * t;
        }
        self.slow(t)
    }

    /// Guarded Newton steps on from `t` (above the root), then the trigonometric form near a double
    /// root.
    #[cold]
    fn slow(&self, mut t: f64) -> f64 {
        if !(t > 1.001 && t <= 2.0) {
            t = 2.0;
        }
        for _ in 0..100 {
            let step = Self::step(t, self.h);
            if !(step > 4.0 * f64::EPSILON * t) {
                if t > 1.001 {
                    return self.q + self.p * t;
                }
                break;
            }
            t -= step;
            if t < 1.001 {
                break;
            }
        }
        self.q + 2.0 * self.p * ((self.h / 2.0).acos() / 3.0).cos()
    }
}

/// The outer products of every direction at every untilting step, packed for [`UntiltCurves::tau1`].
#[derive(Debug, Clone)]
pub(crate) struct UntiltCurves {
    n: usize,
    n_steps: usize,
    /// Numbers laid out [column block][direction][BLOCK]: for one block of 32 columns, the numbers of
    /// all directions are contiguous. Columns run step by step, five per step (xx, yy, xy, xz, yz; zz
    /// is not stored: for unit vectors Σ c zz = Σ c − Σ c xx − Σ c yy); the last block is padded with
    /// zeros.
    packed: Vec<f64>,
}

impl UntiltCurves {
    /// Directions `v` (geographic) with their beddings, untilted by every percentage in `steps`.
    pub(crate) fn new(v: &[Vec3], beds: &[Bedding], steps: &[f64]) -> Self {
        let n = v.len();
        let blocks = (steps.len() * COLS).div_ceil(BLOCK);
        // The rows (one per direction) are computed in parallel, then packed.
        let rows: Vec<Vec<f64>> = v
            .par_iter()
            .zip(beds)
            .map(|(u, b)| {
                let mut row = Vec::with_capacity(steps.len() * COLS);
                for pct in steps {
                    let w = b.partial_apply(pct / 100.0, *u);
                    row.extend_from_slice(&[w.x * w.x, w.y * w.y, w.x * w.y, w.x * w.z, w.y * w.z]);
                }
                row
            })
            .collect();
        let mut packed = vec![0.0f64; blocks * n * BLOCK];
        for (i, row) in rows.iter().enumerate() {
            for (col, &x) in row.iter().enumerate() {
                packed[(col / BLOCK) * n * BLOCK + i * BLOCK + col % BLOCK] = x;
            }
        }
        Self { n, n_steps: steps.len(), packed }
    }

    /// τ₁ at every step for a resample in which direction i was drawn `weights[i]` times.
    ///
    /// Each stored entry of the orientation matrix is Σ cᵢ oᵢ over the drawn directions in index order (zz
    /// follows from the trace), so the
    /// result does not depend on how the sums are vectorised.
    pub(crate) fn tau1(&self, weights: &[u32]) -> Vec<f64> {
        let mut scratch = CurveScratch::default();
        self.tau1_into(weights, &mut scratch).to_vec()
    }

    /// [`UntiltCurves::tau1`] with reused buffers: the curve is left in (and returned from) `scratch`.
    pub(crate) fn tau1_into<'s>(&self, weights: &[u32], scratch: &'s mut CurveScratch) -> &'s [f64] {
        let CurveScratch { rows, sums, mats, out } = scratch;
        rows.clear();
        rows.extend(weights.iter().enumerate().filter(|w| *w.1 > 0).map(|(i, &c)| (i, c as f64)));
        sums.resize(self.packed.len() / self.n.max(1), 0.0);
        weighted_rows(&self.packed, self.n, rows, sums);
        let total: f64 = rows.iter().map(|r| r.1).sum();
        mats.clear();
        mats.extend(sums[..self.n_steps * COLS].chunks_exact(COLS).flat_map(|m| [m[0], m[1], total - m[0] - m[1], m[2], m[3], m[4]]));
        out.resize(self.n_steps, 0.0);
        largest_eigenvalues(mats, 1.0 / self.n as f64, out);
        out
    }
}

/// Buffers of [`UntiltCurves::tau1_into`], kept between resamples.
#[derive(Debug, Default)]
pub(crate) struct CurveScratch {
    rows: Vec<(usize, f64)>,
    sums: Vec<f64>,
    mats: Vec<f64>,
    out: Vec<f64>,
}

/// `out[block][k] = Σ c · packed[block][i][k]` over `rows` = (i, c): the 32 partial sums of a block stay
/// in registers while the rows stream past.
#[inline(always)]
fn weighted_rows_body(packed: &[f64], n: usize, rows: &[(usize, f64)], out: &mut [f64]) {
    for (blk, dst) in packed.chunks_exact(n * BLOCK).zip(out.chunks_exact_mut(BLOCK)) {
        let mut acc = [0.0f64; BLOCK];
        for &(i, c) in rows {
            let o = &blk[i * BLOCK..(i + 1) * BLOCK];
            for k in 0..BLOCK {
                acc[k] += c * o[k];
            }
        }
        dst.copy_from_slice(&acc);
    }
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn weighted_rows_avx2(packed: &[f64], n: usize, rows: &[(usize, f64)], out: &mut [f64]) {
    // Separate multiplies and adds (no fused multiply-add): the same numbers as the portable path.
    weighted_rows_body(packed, n, rows, out)
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx512f")]
fn weighted_rows_avx512(packed: &[f64], n: usize, rows: &[(usize, f64)], out: &mut [f64]) {
    // 512-bit vectors, still separate multiplies and adds: the same numbers as the portable path.
    weighted_rows_body(packed, n, rows, out)
}

/// [`weighted_rows_body`] with 512- or 256-bit vectors where the processor has them (checked at run
/// time).
fn weighted_rows(packed: &[f64], n: usize, rows: &[(usize, f64)], out: &mut [f64]) {
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx512f") {
        // SAFETY: the processor supports AVX-512F (checked just above).
        return unsafe { weighted_rows_avx512(packed, n, rows, out) };
    }
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the processor supports AVX2 (checked just above).
        return unsafe { weighted_rows_avx2(packed, n, rows, out) };
    }
    weighted_rows_body(packed, n, rows, out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::linalg::sym_eigen;

    #[test]
    fn closed_form_eigenvalue_matches_jacobi() {
        // Cases: general, scalar (p = 0), dominant axis, rank one, a girdle (double largest root), a
        // near-girdle, and a negative-definite matrix.
        let ms = [[0.5, 0.3, 0.2, 0.1, -0.05, 0.02], [1.0, 1.0, 1.0, 0.0, 0.0, 0.0], [0.9, 0.05, 0.05, 0.2, 0.1, 0.01], [0.0, 0.0, 1.0, 0.0, 0.0, 0.0], [0.5, 0.5, 0.0, 0.0, 0.0, 0.0], [0.5, 0.5 - 1e-9, 1e-9, 1e-7, 0.0, 0.0], [-1.0, -2.0, -3.0, 0.3, 0.2, 0.1]];
        for m in ms {
            let full = [[m[0], m[3], m[4]], [m[3], m[1], m[5]], [m[4], m[5], m[2]]];
            let jac = sym_eigen(full);
            let j = jac.values[0];
            // A near-double root is conditioned like √ε in any closed form (1e-9 here), as it was before.
            let tol = if m[1] == 0.5 - 1e-9 { 1e-9 } else { 1e-12 };
            assert!((largest_eigenvalue(m) - j).abs() < tol, "{m:?}: {} vs Jacobi {j}", largest_eigenvalue(m));
            // Smith (1961) trigonometric form, written out here as an independent check where the
            // largest root is well separated (near a double root acos loses half the digits).
            if jac.values[0] - jac.values[1] < 1e-3 {
                continue;
            }
            let q = (m[0] + m[1] + m[2]) / 3.0;
            let p2 = ((m[0] - q).powi(2) + (m[1] - q).powi(2) + (m[2] - q).powi(2) + 2.0 * (m[3] * m[3] + m[4] * m[4] + m[5] * m[5])) / 6.0;
            if p2 > 0.0 {
                let p = p2.sqrt();
                let b = full.map(|r| r.map(|x| x / p));
                let bd = [b[0][0] - q / p, b[1][1] - q / p, b[2][2] - q / p];
                let det = bd[0] * (bd[1] * bd[2] - b[1][2] * b[1][2]) - b[0][1] * (b[0][1] * bd[2] - b[1][2] * b[0][2]) + b[0][2] * (b[0][1] * b[1][2] - bd[1] * b[0][2]);
                let trig = q + 2.0 * p * ((det / 2.0).clamp(-1.0, 1.0).acos() / 3.0).cos();
                assert!((largest_eigenvalue(m) - trig).abs() < tol, "{m:?}: {} vs {trig}", largest_eigenvalue(m));
            }
        }
    }

    #[test]
    fn vector_and_portable_sums_are_identical() {
        // The run-time dispatched kernel (256-bit vectors on this machine if it has them) against the
        // portable body: bit for bit, on awkward magnitudes.
        let n = 7;
        let mut rng = crate::montecarlo::replicate_rng(9, 0, 0);
        use rand::RngExt;
        let packed: Vec<f64> = (0..3 * n * BLOCK).map(|_| (rng.random::<f64>() - 0.5) * 10f64.powi(rng.random_range(-8..8))).collect();
        let rows = [(0usize, 1.0), (2, 3.0), (3, 1.0), (6, 2.0)];
        let (mut fast, mut plain) = (vec![0.0; 3 * BLOCK], vec![0.0; 3 * BLOCK]);
        weighted_rows(&packed, n, &rows, &mut fast);
        weighted_rows_body(&packed, n, &rows, &mut plain);
        assert!(fast.iter().zip(&plain).all(|(a, b)| a.to_bits() == b.to_bits()));
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx2") {
            // SAFETY: AVX2 present (checked just above); the dispatch may have taken the 512-bit path.
            unsafe { weighted_rows_avx2(&packed, n, &rows, &mut fast) };
            assert!(fast.iter().zip(&plain).all(|(a, b)| a.to_bits() == b.to_bits()));
        }
        let (mut t4, h4) = ([1.9, 1.5, 1.2, 2.0], [1.7, 0.3, -1.5, 2.0]);
        let mut t1 = t4;
        let next4 = newton_x4(&mut t4, &h4);
        for _ in 0..FIXED_STEPS {
            for j in 0..4 {
                t1[j] -= Cubic::step(t1[j], h4[j]);
            }
        }
        assert_eq!(t4.map(f64::to_bits), t1.map(f64::to_bits));
        let next1: [f64; 4] = std::array::from_fn(|j| Cubic::step(t1[j], h4[j]));
        assert_eq!(next4.map(f64::to_bits), next1.map(f64::to_bits));
    }

    #[test]
    fn batch_equals_single_and_weighted_sums_equal_plain_sums() {
        // Eleven matrices (two groups of four and a remainder of three), including the degenerate ones.
        let ms: Vec<[f64; 6]> = (0..11)
            .map(|i| {
                let x = i as f64;
                match i {
                    3 => [0.5, 0.5, 0.0, 0.0, 0.0, 0.0],
                    7 => [1.0, 1.0, 1.0, 0.0, 0.0, 0.0],
                    _ => [0.6 + 0.01 * x, 0.3 - 0.01 * x, 0.1, 0.05 * (x - 5.0), -0.02 * x, 0.01],
                }
            })
            .collect();
        let flat: Vec<f64> = ms.iter().flatten().copied().collect();
        let mut out = vec![0.0; 11];
        largest_eigenvalues(&flat, 0.25, &mut out);
        for (m, o) in ms.iter().zip(&out) {
            assert_eq!(*o, 0.25 * largest_eigenvalue(*m));
        }
        // The packed weighted sums against a plain sum of weighted outer products, at every step.
        let v: Vec<Vec3> = [(10.0, 40.0), (200.0, -30.0), (95.0, 5.0)].iter().map(|&(d, i)| crate::sphere::Direction::new(d, i).unwrap().to_vector()).collect();
        let beds: Vec<Bedding> = [(90.0, 30.0), (270.0, 45.0), (10.0, 80.0)].iter().map(|&(a, d)| Bedding::from_dip_direction(a, d, false).unwrap()).collect();
        let steps: Vec<f64> = (0..9).map(|s| -10.0 + 20.0 * s as f64).collect();
        let curves = UntiltCurves::new(&v, &beds, &steps);
        let w = [2u32, 0, 1];
        let tau = curves.tau1(&w);
        for (s, pct) in steps.iter().enumerate() {
            let mut m = [0.0; 6];
            for (i, (u, b)) in v.iter().zip(&beds).enumerate() {
                let x = b.partial(pct / 100.0).apply(*u);
                let c = w[i] as f64;
                for (acc, o) in m.iter_mut().zip([x.x * x.x, x.y * x.y, x.z * x.z, x.x * x.y, x.x * x.z, x.y * x.z]) {
                    *acc += c * o;
                }
            }
            let full = [[m[0], m[3], m[4]], [m[3], m[1], m[5]], [m[4], m[5], m[2]]];
            assert!((tau[s] - sym_eigen(full).values[0] / 3.0).abs() < 1e-14, "step {pct}");
        }
    }
}
