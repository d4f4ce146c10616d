//! τ₁ curves of incremental untilting: the numerical kernel of the bootstrap fold test.
//!
//! A resample of the fold test is a vector of counts (how often each direction was drawn). Its curve
//! is τ₁(f) = λ_max((1/N) Σ cᵢ Rᵢ(f) uᵢ (Rᵢ(f) uᵢ)ᵀ) at every untilting step f. The outer products
//! Rᵢ(f) uᵢ (Rᵢ(f) uᵢ)ᵀ do not depend on the resample, so they are computed once; a resample is then a
//! weighted sum of rows of numbers ([`UntiltCurves::tau1`]) and one largest eigenvalue per step.

use crate::sphere::{rotate_unit, Bedding, Untilting, Vec3};
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
/// multiple of 6), each multiplied by `scale`, into `out`. Four matrices at a time (eight with
/// 512-bit vectors) run the same steps side by side, which keeps the chain of divisions of the Newton
/// steps from setting the pace; the result is the same, bit for bit, as [`largest_eigenvalue`] of
/// each times `scale`.
pub fn largest_eigenvalues(m: &[f64], scale: f64, out: &mut [f64]) {
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx512f") {
        // SAFETY: the processor supports AVX-512F (checked just above).
        return unsafe { largest_eigenvalues_avx512(m, scale, out) };
    }
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the processor supports AVX2 (checked just above).
        return unsafe { largest_eigenvalues_avx2(m, scale, out) };
    }
    largest_eigenvalues_body::<4>(m, scale, out)
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn largest_eigenvalues_avx2(m: &[f64], scale: f64, out: &mut [f64]) {
    // No fused multiply-add: the same numbers as the portable path and as `largest_eigenvalue`.
    largest_eigenvalues_body::<4>(m, scale, out)
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx512f")]
fn largest_eigenvalues_avx512(m: &[f64], scale: f64, out: &mut [f64]) {
    // Eight lanes; still no fused multiply-add.
    largest_eigenvalues_body::<8>(m, scale, out)
}

#[inline(always)]
fn largest_eigenvalues_body<const L: usize>(m: &[f64], scale: f64, out: &mut [f64]) {
    let mut groups = m.chunks_exact(6 * L).zip(out.chunks_exact_mut(L));
    for (mg, og) in &mut groups {
        // Straight-line arithmetic on L lanes (the compiler turns it into vector instructions).
        let col = |k: usize| -> [f64; L] { std::array::from_fn(|j| mg[6 * j + k]) };
        let (a, b, c, d, e, f) = (col(0), col(1), col(2), col(3), col(4), col(5));
        // The same operations as `Cubic::of` and `Cubic::start`, written out lane by lane: calling
        // `Cubic::of` per lane gives the same numbers but a slower fold test (12.4 against 8.9 ms on one
        // thread, measured), because the compiler then keeps the lanes apart.
        let lanes = |g: &dyn Fn(usize) -> f64| -> [f64; L] { std::array::from_fn(g) };
        let off = lanes(&|j| d[j] * d[j] + e[j] * e[j] + f[j] * f[j]);
        let q = lanes(&|j| (a[j] + b[j] + c[j]) * THIRD);
        let (aa, bb, cc) = (lanes(&|j| a[j] - q[j]), lanes(&|j| b[j] - q[j]), lanes(&|j| c[j] - q[j]));
        let p2 = lanes(&|j| (aa[j] * aa[j] + bb[j] * bb[j] + cc[j] * cc[j] + 2.0 * off[j]) * SIXTH);
        let p = lanes(&|j| p2[j].sqrt());
        let det = lanes(&|j| {
            aa[j] * (bb[j] * cc[j] - f[j] * f[j]) - d[j] * (d[j] * cc[j] - f[j] * e[j])
                + e[j] * (d[j] * f[j] - bb[j] * e[j])
        });
        let h = lanes(&|j| (det[j] / (p2[j] * p[j])).clamp(-2.0, 2.0));
        let deg: [bool; L] = std::array::from_fn(|j| !(p2[j] > 1e-300));
        let mut t = lanes(&|j| 2.0 - (2.0 - h[j]) * NINTH);
        let step = newton_lanes(&mut t, &h);
        for j in 0..L {
            let cub = Cubic { q: q[j], p: p[j], h: h[j], degenerate: deg[j] };
            og[j] = scale * if deg[j] { q[j] } else { cub.finish(t[j], step[j]) };
        }
    }
    let done = out.len() / L * L;
    for (k, o) in out[done..].iter_mut().enumerate() {
        let j = done + k;
        *o = scale * largest_eigenvalue(std::array::from_fn(|i| m[6 * j + i]));
    }
}

/// [`FIXED_STEPS`] Newton steps of [`Cubic::step`] on `L` lanes; returns the next step of each. Eight
/// lanes go through [`newton_x8_avx512`], four through [`newton_x4_avx2`] where the processor has
/// the instructions.
#[inline(always)]
fn newton_lanes<const L: usize>(t: &mut [f64; L], h: &[f64; L]) -> [f64; L] {
    #[cfg(target_arch = "x86_64")]
    if L == 8 && std::arch::is_x86_feature_detected!("avx512f") {
        let mut next = [0.0; L];
        // SAFETY: the processor supports AVX-512F (checked just above); the three arrays hold eight f64.
        unsafe { newton_x8_avx512(t.as_mut_ptr(), h.as_ptr(), next.as_mut_ptr()) };
        return next;
    }
    #[cfg(target_arch = "x86_64")]
    if L == 4 && std::arch::is_x86_feature_detected!("avx2") {
        let mut next = [0.0; L];
        // SAFETY: the processor supports AVX2 (checked just above); the three arrays hold four f64.
        unsafe { newton_x4_avx2(t.as_mut_ptr(), h.as_ptr(), next.as_mut_ptr()) };
        return next;
    }
    for _ in 0..FIXED_STEPS {
        for j in 0..L {
            t[j] -= Cubic::step(t[j], h[j]);
        }
    }
    std::array::from_fn(|j| Cubic::step(t[j], h[j]))
}

/// Defines `unsafe fn $name(t: *mut f64, h: *const f64, next: *mut f64)`: [`FIXED_STEPS`] Newton
/// steps on the lanes of one vector (`t` and `h` read, `t` and `next` written, one vector of numbers
/// each, unaligned), with the same operations in the same order as [`Cubic::step`] (multiplies,
/// subtractions and one correctly rounded division per step; no fused multiply-add), hence the same
/// numbers. One body for the 256- and the 512-bit instructions.
macro_rules! newton_simd {
    ($name:ident, $feature:literal, $vec:ty, $load:path, $store:path, $set1:path, $mul:path, $sub:path, $div:path) => {
        #[cfg(target_arch = "x86_64")]
        #[target_feature(enable = $feature)]
        unsafe fn $name(t: *mut f64, h: *const f64, next: *mut f64) {
            // SAFETY: the caller passes pointers to one vector of f64 each; unaligned loads and stores.
            let (mut tv, hv) = unsafe { ($load(t), $load(h)) };
            let (one, three) = ($set1(1.0), $set1(3.0));
            let step = |tv: $vec| {
                let tt = $mul(tv, tv);
                let num = $sub($mul(tv, $sub(tt, three)), hv);
                let den = $mul(three, $sub(tt, one));
                $div(num, den)
            };
            for _ in 0..FIXED_STEPS {
                tv = $sub(tv, step(tv));
            }
            unsafe {
                $store(t, tv);
                $store(next, step(tv));
            }
        }
    };
}

#[cfg(target_arch = "x86_64")]
use std::arch::x86_64 as simd;

newton_simd!(
    newton_x4_avx2,
    "avx2",
    simd::__m256d,
    simd::_mm256_loadu_pd,
    simd::_mm256_storeu_pd,
    simd::_mm256_set1_pd,
    simd::_mm256_mul_pd,
    simd::_mm256_sub_pd,
    simd::_mm256_div_pd
);
newton_simd!(
    newton_x8_avx512,
    "avx512f",
    simd::__m512d,
    simd::_mm512_loadu_pd,
    simd::_mm512_storeu_pd,
    simd::_mm512_set1_pd,
    simd::_mm512_mul_pd,
    simd::_mm512_sub_pd,
    simd::_mm512_div_pd
);

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
        let (n, n_steps) = (v.len(), steps.len());
        let width = n_steps * COLS;
        let turns: Vec<Untilting> = beds.iter().map(Bedding::untilting).collect();
        // One sine and cosine per distinct angle of correction and step (beds of one attitude share
        // them): `kinds` holds one untilting per distinct angle, `kind[i]` the one of direction i.
        let mut slots = std::collections::HashMap::new();
        let mut kinds: Vec<Untilting> = Vec::new();
        let kind: Vec<usize> = turns
            .iter()
            .map(|t| {
                *slots.entry(t.full_angle.to_bits()).or_insert_with(|| {
                    kinds.push(*t);
                    kinds.len() - 1
                })
            })
            .collect();
        let sin_cos: Vec<(f64, f64)> = (0..kinds.len() * n_steps)
            .into_par_iter()
            .with_min_len(64)
            .map(|j| kinds[j / n_steps].angle_deg(steps[j % n_steps] / 100.0).to_radians().sin_cos())
            .collect();
        // Each block of columns is filled by its own task from the steps it covers (a step split
        // between two blocks is computed in both, with the same result).
        let mut packed = vec![0.0f64; width.div_ceil(BLOCK) * n * BLOCK];
        packed.par_chunks_mut((n * BLOCK).max(1)).enumerate().for_each(|(b, blk)| {
            let cols = b * BLOCK..((b + 1) * BLOCK).min(width);
            for s in cols.start / COLS..cols.end.div_ceil(COLS) {
                for (i, ((u, t), &k)) in v.iter().zip(&turns).zip(&kind).enumerate() {
                    let (sin, cos) = sin_cos[k * n_steps + s];
                    let w = rotate_unit(*u, t.axis, sin, cos);
                    for (e, x) in [w.x * w.x, w.y * w.y, w.x * w.y, w.x * w.z, w.y * w.z].into_iter().enumerate() {
                        let col = s * COLS + e;
                        if cols.contains(&col) {
                            blk[i * BLOCK + col - cols.start] = x;
                        }
                    }
                }
            }
        });
        Self { n, n_steps, packed }
    }

    /// τ₁ at every step for a resample in which direction i was drawn `weights[i]` times.
    ///
    /// Each stored entry of the orientation matrix is Σ cᵢ oᵢ over the directions in index order (zz
    /// follows from the trace), so the result does not depend on how the sums are vectorised or on
    /// which resamples share a pass (see [`UntiltCurves::tau1_tile`]).
    pub(crate) fn tau1(&self, weights: &[u32]) -> Vec<f64> {
        let mut scratch = CurveScratch::default();
        self.tau1_tile(weights, &mut scratch).to_vec()
    }

    /// τ₁ curves of up to [`TILE`] resamples at once: `weights` holds their counts one resample after
    /// the other (n each); the curves are left in (and returned from) `scratch`, `n_steps` numbers
    /// each, in the same order. Every curve is bit for bit what [`UntiltCurves::tau1`] gives alone.
    pub(crate) fn tau1_tile<'s>(&self, weights: &[u32], scratch: &'s mut CurveScratch) -> &'s [f64] {
        let n = self.n.max(1);
        let m = weights.len() / n;
        assert!(m <= TILE && m * n == weights.len(), "{} counts for tiles of {TILE} resamples of {n}", weights.len());
        let CurveScratch { wts, sums, mats, out } = scratch;
        wts.clear();
        wts.extend(weights.iter().map(|&c| c as f64));
        // Unused resamples of the tile weigh nothing (their sums are computed and ignored).
        wts.resize(TILE * n, 0.0);
        let stride = self.packed.len() / n;
        sums.resize(TILE * stride, 0.0);
        weighted_tiles(&self.packed, n, wts, sums);
        mats.clear();
        for (w, s) in wts.chunks_exact(n).zip(sums.chunks_exact(stride)).take(m) {
            let total: f64 = w.iter().sum();
            mats.extend(
                s[..self.n_steps * COLS]
                    .chunks_exact(COLS)
                    .flat_map(|m| [m[0], m[1], total - m[0] - m[1], m[2], m[3], m[4]]),
            );
        }
        out.resize(m * self.n_steps, 0.0);
        largest_eigenvalues(mats, 1.0 / self.n as f64, out);
        out
    }
}

/// Buffers of [`UntiltCurves::tau1_tile`], kept between tiles.
#[derive(Debug, Default)]
pub(crate) struct CurveScratch {
    wts: Vec<f64>,
    sums: Vec<f64>,
    mats: Vec<f64>,
    out: Vec<f64>,
}

/// Resamples summed together in one pass over the packed numbers: each number loaded serves
/// [`TILE`] resamples, which makes the sums bound by arithmetic rather than by loads from the cache.
/// Measured on the benchmark fold test (100 directions, 1 000 resamples, 161 steps, one thread): one
/// resample at a time, skipping the directions not drawn, 8.5 ms; tiles of four, 7.3 ms; lists of the
/// drawn directions of four, eight or sixteen resamples sharing one pass over a block, no faster
/// than the tiles (their loads miss the first-level cache).
pub(crate) const TILE: usize = 4;

/// `out[r][block][k] = Σᵢ w[r][i] · packed[block][i][k]` for the [`TILE`] resamples r (weights `w`
/// one resample after the other, n each; sums `out` one resample after the other), i in index
/// order. `W` columns of a block at a time stay in registers for all the resamples while the
/// directions stream past. Zero weights are included: their products are ±0, and adding ±0 to a
/// sum that started at +0 changes no bit of it, so the sums equal those over the drawn directions
/// only.
#[inline(always)]
fn weighted_tiles_body<const W: usize>(packed: &[f64], n: usize, w: &[f64], out: &mut [f64]) {
    let stride = out.len() / TILE;
    let wr: [&[f64]; TILE] = std::array::from_fn(|r| &w[r * n..(r + 1) * n]);
    for (b, blk) in packed.chunks_exact(n * BLOCK).enumerate() {
        for sub in (0..BLOCK).step_by(W) {
            let mut acc = [[0.0f64; W]; TILE];
            for (i, row) in blk.chunks_exact(BLOCK).enumerate() {
                let o: &[f64; W] = row[sub..sub + W].try_into().expect("W divides BLOCK");
                for r in 0..TILE {
                    let c = wr[r][i];
                    for k in 0..W {
                        acc[r][k] += c * o[k];
                    }
                }
            }
            for (r, a) in acc.iter().enumerate() {
                out[r * stride + b * BLOCK + sub..][..W].copy_from_slice(a);
            }
        }
    }
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
fn weighted_tiles_avx2(packed: &[f64], n: usize, w: &[f64], out: &mut [f64]) {
    // Eight columns (two 256-bit vectors) for four resamples: eight of the sixteen registers hold
    // sums. Separate multiplies and adds (no fused multiply-add): the same numbers as the portable path.
    weighted_tiles_body::<8>(packed, n, w, out)
}

#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx512f")]
fn weighted_tiles_avx512(packed: &[f64], n: usize, w: &[f64], out: &mut [f64]) {
    // A whole block (four 512-bit vectors) for four resamples: sixteen of the thirty-two registers
    // hold sums. Still separate multiplies and adds: the same numbers as the portable path.
    weighted_tiles_body::<BLOCK>(packed, n, w, out)
}

/// [`weighted_tiles_body`] with 512- or 256-bit vectors where the processor has them (checked at run
/// time).
fn weighted_tiles(packed: &[f64], n: usize, w: &[f64], out: &mut [f64]) {
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx512f") {
        // SAFETY: the processor supports AVX-512F (checked just above).
        return unsafe { weighted_tiles_avx512(packed, n, w, out) };
    }
    #[cfg(target_arch = "x86_64")]
    if std::arch::is_x86_feature_detected!("avx2") {
        // SAFETY: the processor supports AVX2 (checked just above).
        return unsafe { weighted_tiles_avx2(packed, n, w, out) };
    }
    weighted_tiles_body::<8>(packed, n, w, out)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::linalg::sym_eigen;

    #[test]
    fn closed_form_eigenvalue_matches_jacobi() {
        // Cases: general, scalar (p = 0), dominant axis, rank one, a girdle (double largest root), a
        // near-girdle, and a negative-definite matrix.
        let ms = [
            [0.5, 0.3, 0.2, 0.1, -0.05, 0.02],
            [1.0, 1.0, 1.0, 0.0, 0.0, 0.0],
            [0.9, 0.05, 0.05, 0.2, 0.1, 0.01],
            [0.0, 0.0, 1.0, 0.0, 0.0, 0.0],
            [0.5, 0.5, 0.0, 0.0, 0.0, 0.0],
            [0.5, 0.5 - 1e-9, 1e-9, 1e-7, 0.0, 0.0],
            [-1.0, -2.0, -3.0, 0.3, 0.2, 0.1],
        ];
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
            let p2 = ((m[0] - q).powi(2)
                + (m[1] - q).powi(2)
                + (m[2] - q).powi(2)
                + 2.0 * (m[3] * m[3] + m[4] * m[4] + m[5] * m[5]))
                / 6.0;
            if p2 > 0.0 {
                let p = p2.sqrt();
                let b = full.map(|r| r.map(|x| x / p));
                let bd = [b[0][0] - q / p, b[1][1] - q / p, b[2][2] - q / p];
                let det = bd[0] * (bd[1] * bd[2] - b[1][2] * b[1][2]) - b[0][1] * (b[0][1] * bd[2] - b[1][2] * b[0][2])
                    + b[0][2] * (b[0][1] * b[1][2] - bd[1] * b[0][2]);
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
        let packed: Vec<f64> =
            (0..3 * n * BLOCK).map(|_| (rng.random::<f64>() - 0.5) * 10f64.powi(rng.random_range(-8..8))).collect();
        // Four resamples of seven directions; zero weights included (the last resample draws nothing
        // but the direction 6).
        let w: Vec<f64> = [
            [1.0, 0.0, 3.0, 1.0, 0.0, 0.0, 2.0],
            [0.0, 2.0, 0.0, 0.0, 4.0, 1.0, 0.0],
            [1.0; 7],
            [0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 7.0],
        ]
        .concat();
        let (mut fast, mut plain) = (vec![0.0; TILE * 3 * BLOCK], vec![0.0; TILE * 3 * BLOCK]);
        weighted_tiles(&packed, n, &w, &mut fast);
        weighted_tiles_body::<8>(&packed, n, &w, &mut plain);
        let same = |a: &[f64], b: &[f64]| a.iter().zip(b).all(|(x, y)| x.to_bits() == y.to_bits());
        assert!(same(&fast, &plain));
        // The sums over the drawn directions only, one resample at a time, in index order.
        for r in 0..TILE {
            for col in 0..3 * BLOCK {
                let mut acc = 0.0;
                for i in (0..n).filter(|&i| w[r * n + i] > 0.0) {
                    acc += w[r * n + i] * packed[(col / BLOCK) * n * BLOCK + i * BLOCK + col % BLOCK];
                }
                assert_eq!(acc.to_bits(), plain[r * 3 * BLOCK + col].to_bits(), "resample {r} column {col}");
            }
        }
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx2") {
            // SAFETY: AVX2 present (checked just above); the dispatch may have taken the 512-bit path.
            unsafe { weighted_tiles_avx2(&packed, n, &w, &mut fast) };
            assert!(same(&fast, &plain));
        }
        // The Newton steps on four and on eight lanes (256- and 512-bit vectors where the processor
        // has them) against the scalar steps.
        newton_lanes_match_scalar([1.9, 1.5, 1.2, 2.0], [1.7, 0.3, -1.5, 2.0]);
        let h8 = [1.7, 0.3, -1.5, 2.0, -2.0, 1.999, 0.0, -0.7];
        newton_lanes_match_scalar(h8.map(|h| 2.0 - (2.0 - h) * NINTH), h8);
    }

    fn newton_lanes_match_scalar<const L: usize>(mut t: [f64; L], h: [f64; L]) {
        let mut s = t;
        let next = newton_lanes(&mut t, &h);
        for _ in 0..FIXED_STEPS {
            for j in 0..L {
                s[j] -= Cubic::step(s[j], h[j]);
            }
        }
        assert_eq!(t.map(f64::to_bits), s.map(f64::to_bits));
        assert_eq!(next.map(f64::to_bits), std::array::from_fn(|j| Cubic::step(s[j], h[j]).to_bits()));
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
        let v: Vec<Vec3> = [(10.0, 40.0), (200.0, -30.0), (95.0, 5.0)]
            .iter()
            .map(|&(d, i)| crate::sphere::Direction::new(d, i).unwrap().to_vector())
            .collect();
        let beds: Vec<Bedding> = [(90.0, 30.0), (270.0, 45.0), (10.0, 80.0)]
            .iter()
            .map(|&(a, d)| Bedding::from_dip_direction(a, d, false).unwrap())
            .collect();
        let steps: Vec<f64> = (0..9).map(|s| -10.0 + 20.0 * s as f64).collect();
        let curves = UntiltCurves::new(&v, &beds, &steps);
        let w = [2u32, 0, 1];
        let tau = curves.tau1(&w);
        // A tile of three resamples gives each the curve it gets alone, bit for bit.
        let tile_w = [[2u32, 0, 1], [0, 0, 3], [1, 1, 1]];
        let mut scratch = CurveScratch::default();
        let tile = curves.tau1_tile(&tile_w.concat(), &mut scratch).to_vec();
        for (r, one) in tile_w.iter().enumerate() {
            let alone = curves.tau1(one);
            assert!(
                alone.iter().zip(&tile[r * steps.len()..]).all(|(a, b)| a.to_bits() == b.to_bits()),
                "resample {r}"
            );
        }
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
