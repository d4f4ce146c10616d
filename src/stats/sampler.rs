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
        Ok(Self { kappa, em1: (-2.0 * kappa).exp_m1(), rot: Rotation::from_north_to(mean.to_vector()) })
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

    /// Draw one direction.
    pub fn sample_direction<R: Rng + ?Sized>(&self, rng: &mut R) -> Direction {
        Direction::from_vector(self.sample(rng)).expect("unit vector")
    }
}
