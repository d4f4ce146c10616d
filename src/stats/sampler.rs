//! Drawing directions from a Fisher distribution.

use crate::error::{Error, Result};
use crate::sphere::{Direction, Rotation, Vec3};
use rand::{Rng, RngExt};

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
        Ok(Self {
            kappa,
            inv_kappa: 1.0 / kappa,
            em1: (-2.0 * kappa).exp_m1(),
            rot: Rotation::from_north_to(mean.to_vector()),
        })
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

    /// The resultant (vector sum) of `n` draws, in the sampler's own frame (mean along +x), drawn eight
    /// at a time from eight generators seeded from `rng` (32 outputs of it). This is what simulations of
    /// statistics that depend on resultants only (Watson's V_w) need: no draw is stored or rotated.
    ///
    /// # Formula
    /// 1 − cos θ = −ln(1 − U (1 − e^(−2κ)))/κ (inverse CDF), the azimuth's cosine and sine from a point
    /// drawn uniformly in the unit disc by rejection, (a, b)/√(a² + b²); the logarithm is computed by
    /// basic operations only, so the 256-bit vector path and the portable one agree bit for bit.
    ///
    /// # References
    /// Fisher, Lewis & Embleton (1987), §3.6.2 and §4.2; von Neumann, J. (1951), Various techniques used
    /// in connection with random digits, *NBS Appl. Math. Ser.* 12, 36–38 (sine and cosine of a random
    /// angle by rejection); Blackman, D. & Vigna, S. (2021), Scrambled linear pseudorandom number
    /// generators, *ACM Trans. Math. Softw.* 47(4), 36 (xoshiro256++).
    pub fn resultant<R: Rng + ?Sized>(&self, rng: &mut R, n: usize) -> Vec3 {
        super::fisher_lanes::FisherLanes::new(self, rng).resultant(n)
    }

    /// (1 − e^(−2κ), 1/κ) for the eight-lane sampler.
    pub(crate) fn lane_constants(&self) -> (f64, f64) {
        (-self.em1, self.inv_kappa)
    }

    /// Draw one direction.
    pub fn sample_direction<R: Rng + ?Sized>(&self, rng: &mut R) -> Direction {
        Direction::from_vector(self.sample(rng)).expect("unit vector")
    }
}
