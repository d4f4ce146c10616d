//! Drawing directions from a Fisher distribution.

use crate::error::{Error, Result};
use crate::sphere::{Direction, Rotation, Vec3};
use rand::{Rng, RngExt};
use rand_distr::{Distribution, Exp1};

/// Below this κ the fast draw takes 1 − cos θ by the inverse CDF instead of rejecting exponential
/// variates beyond 2κ (at κ = 1.5 a rejection happens once in 20 draws).
const REJECTION_KAPPA: f64 = 1.5;

/// A Fisher (1953) distribution on the sphere, for Monte Carlo work.
///
/// # Formula
/// Inverse-CDF sampling of the angle θ from the mean:
/// cos θ = 1 + ln(1 − U (1 − e^(−2κ)))/κ, U ~ uniform(0, 1), computed with `ln_1p`/`exp_m1` so that
/// it stays exact for large κ; azimuth about the mean uniform on [0, 2π).
///
/// # References
/// Fisher, Lewis & Embleton (1987), *Statistical Analysis of Spherical Data*, §3.6.2 (simulation of
/// the Fisher distribution).
#[derive(Debug, Clone, Copy)]
pub struct FisherSampler {
    kappa: f64,
    inv_kappa: f64,
    em1: f64,
    rot: Rotation,
}

impl FisherSampler {
    /// A sampler around `mean` with concentration `kappa` (> 0; use a large value for near-identical
    /// directions).
    pub fn new(mean: Direction, kappa: f64) -> Result<Self> {
        if !(kappa > 0.0 && kappa.is_finite()) {
            return Err(Error::OutOfRange { name: "kappa", value: kappa, range: "(0, ∞)" });
        }
        // Work in a frame where the mean is the +x axis, then rotate onto the mean.
        Ok(Self { kappa, inv_kappa: 1.0 / kappa, em1: (-2.0 * kappa).exp_m1(), rot: Rotation::from_north_to(mean.to_vector()) })
    }

    /// Draw one unit vector.
    pub fn sample<R: Rng + ?Sized>(&self, rng: &mut R) -> Vec3 {
        let u: f64 = rng.random();
        let cos_t = (1.0 + (u * self.em1).ln_1p() / self.kappa).clamp(-1.0, 1.0);
        let sin_t = (1.0 - cos_t * cos_t).max(0.0).sqrt();
        let phi = rng.random::<f64>() * std::f64::consts::TAU;
        let (s, c) = phi.sin_cos();
        self.rot.apply(Vec3::new(cos_t, sin_t * c, sin_t * s))
    }

    /// One draw in the sampler's own frame, where the mean is the +x axis, by a method without
    /// trigonometry (see [`FisherSampler::local_resultant`]). Same distribution as [`FisherSampler::sample`]
    /// (rotated back onto +x), a different random stream.
    #[inline]
    pub fn sample_local_fast<R: Rng + ?Sized>(&self, rng: &mut R) -> Vec3 {
        let two_k = 2.0 * self.kappa;
        let e = if self.kappa >= REJECTION_KAPPA {
            loop {
                let e: f64 = Exp1.sample(rng);
                if e <= two_k {
                    break e;
                }
            }
        } else {
            -(rng.random::<f64>() * self.em1).ln_1p()
        };
        let x = (e * self.inv_kappa).min(2.0); // 1 − cos θ, in [0, 2]
        let sin2 = x * (2.0 - x);
        const SCALE: f64 = 1.0 / 2_147_483_648.0; // 2⁻³¹
        loop {
            let r = rng.next_u64();
            let a = (r as u32 as i32) as f64 * SCALE;
            let b = ((r >> 32) as u32 as i32) as f64 * SCALE;
            let s = a * a + b * b;
            if s < 1.0 && s > 0.0 {
                let f = (sin2 / s).sqrt();
                return Vec3::new(1.0 - x, a * f, b * f);
            }
        }
    }

    /// The resultant (vector sum) of `n` draws, in the sampler's own frame (mean along +x). This is
    /// what simulations of statistics that depend on resultants only (Watson's V_w) need: no draw is
    /// stored or rotated.
    ///
    /// # Formula
    /// 1 − cos θ = E/κ with E exponential (rate 1) truncated to [0, 2κ]: the Fisher density of cos θ,
    /// ∝ e^(κ cos θ) on [−1, 1], is that of an exponential variate on [0, 2κ]. E is drawn by the ziggurat
    /// method and rejected beyond 2κ (exact; for κ < 1.5 the inverse CDF is used instead); sin θ =
    /// √(x(2 − x)) with x = 1 − cos θ, free of the cancellation of √(1 − cos²θ). The azimuth comes from a
    /// point (a, b) uniform in the unit disc (rejection from the square, acceptance π/4):
    /// (cos φ, sin φ) = (a, b)/√(a² + b²), so no sine or cosine is evaluated.
    ///
    /// # References
    /// Marsaglia, G. & Tsang, W. W. (2000), The ziggurat method for generating random variables,
    /// *J. Stat. Softw.* 5(8); von Neumann, J. (1951), Various techniques used in connection with random
    /// digits, *NBS Appl. Math. Ser.* 12, 36–38 (sine and cosine of a random angle by rejection);
    /// Fisher, Lewis & Embleton (1987), §3.6.2 and §4.2 (the distribution of cos θ).
    pub fn local_resultant<R: Rng + ?Sized>(&self, rng: &mut R, n: usize) -> Vec3 {
        let mut s = Vec3::ZERO;
        for _ in 0..n {
            s += self.sample_local_fast(rng);
        }
        s
    }

    /// Draw one direction.
    pub fn sample_direction<R: Rng + ?Sized>(&self, rng: &mut R) -> Direction {
        Direction::from_vector(self.sample(rng)).expect("unit vector")
    }
}
