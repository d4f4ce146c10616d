//! Kent's (1982) elliptical confidence region for a mean direction.

use crate::error::{check_range, Error, Result};
use crate::sphere::{Direction, Vec3};

/// An elliptical confidence region about a mean direction.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct KentEllipse {
    /// Centre of the ellipse (the mean direction of the set it was fitted to).
    pub mean: Direction,
    /// Semi-axis along the direction of greatest spread, degrees (90 when the region covers a hemisphere).
    pub major: f64,
    /// Semi-axis along the direction of least spread, degrees.
    pub minor: f64,
    /// Direction of the major axis (a unit vector at 90° from the mean; the lower-hemisphere one of the two).
    pub major_axis: Direction,
    /// Direction of the minor axis (at 90° from the mean and from the major axis; lower hemisphere).
    pub minor_axis: Direction,
    /// Number of directions the ellipse was fitted to.
    pub n: usize,
    /// The mean resultant length R/N (μ̂ of the formula).
    pub mean_resultant: f64,
    /// Confidence level.
    pub confidence: f64,
}

/// The `p` quantile of the χ² distribution with two degrees of freedom.
///
/// # Formula
/// χ²₂ is the exponential distribution with mean 2, so its quantile is −2 ln(1 − p)
/// (−2 ln 0.05 = 5.9915 for p = 0.95; SciPy 1.17.1 `stats.chi2.ppf(0.95, 2)` = 5.991464547107979).
pub fn chi2_2_quantile(p: f64) -> f64 {
    -2.0 * (-p).ln_1p()
}

/// Two unit vectors that complete `m` to a right-handed orthonormal frame.
pub(crate) fn tangent_frame(m: Vec3) -> (Vec3, Vec3) {
    let helper = if m.z.abs() < 0.9 { Vec3::new(0.0, 0.0, 1.0) } else { Vec3::new(1.0, 0.0, 0.0) };
    let a = helper.cross(m).normalized().expect("helper not parallel to the mean");
    (a, m.cross(a))
}

/// A unit vector as a direction on the lower hemisphere (the axis ±v is reported by its downward end).
fn lower_axis(v: Vec3) -> Direction {
    let v = if v.z < 0.0 || (v.z == 0.0 && v.x < 0.0) { -v } else { v };
    Direction::from_vector(v).expect("unit axis")
}

/// Kent's elliptical confidence region for the mean of `vectors`.
///
/// `n_scale` divides the spread: give the number of directions N for the confidence region of a mean
/// estimated from the data, and 1 to describe the spread of a set of means themselves (the bootstrap
/// region, [`super::bootstrap_ellipse`]).
///
/// # Units
/// Semi-axes in degrees; `confidence` a probability in (0, 1).
///
/// # Formula
/// With x̄ the mean direction and (e₁, e₂) a frame of the plane tangent at x̄: zᵢ = uᵢ·x̄,
/// μ̂ = (1/N) Σ zᵢ, Γ = (1/N) Σ (uᵢ·e_a)(uᵢ·e_b) (a, b ∈ {1, 2}), γ₁ ≥ γ₂ its eigenvalues with
/// eigenvectors giving the axes; the region's semi-axes are
/// sin ζⱼ = √(χ²₂(p) γⱼ / (n μ̂²)), ζⱼ = 90° when the right-hand side reaches 1.
/// This is the large-sample normal approximation of the mean's distribution in the tangent plane.
///
/// # Errors
/// `TooFew` for fewer than 3 directions; `Undefined` when the resultant vanishes (R ≈ 0).
///
/// # References
/// Kent, J. T. (1982), The Fisher–Bingham distribution on the sphere, *J. R. Statist. Soc. B* 44,
/// 71–80; Fisher, N. I., Lewis, T. & Embleton, B. J. J. (1987), *Statistical Analysis of Spherical
/// Data*, §5.3.2 (elliptical confidence cone for the mean direction).
pub fn kent_ellipse(vectors: &[Vec3], n_scale: f64, confidence: f64) -> Result<KentEllipse> {
    check_range("confidence", confidence, 1e-9, 1.0 - 1e-9, "(0, 1)")?;
    check_range("n_scale", n_scale, 1e-9, f64::MAX, "(0, ∞)")?;
    let n = vectors.len();
    if n < 3 {
        return Err(Error::TooFew { what: "an elliptical confidence region", needed: 3, got: n, unit: "directions" });
    }
    let nf = n as f64;
    let sum = vectors.iter().fold(Vec3::ZERO, |s, v| s + *v);
    let mean_resultant = sum.norm() / nf;
    let m = match sum.normalized() {
        Some(m) if mean_resultant > crate::tolerance::RESULTANT_FRACTION => m,
        _ => return Err(Error::Undefined("the resultant vanishes (R ≈ 0): the directions have no mean".into())),
    };
    let (e1, e2) = tangent_frame(m);
    let (mut g11, mut g12, mut g22) = (0.0, 0.0, 0.0);
    for v in vectors {
        let (x, y) = (v.dot(e1), v.dot(e2));
        g11 += x * x;
        g12 += x * y;
        g22 += y * y;
    }
    let (g11, g12, g22) = (g11 / nf, g12 / nf, g22 / nf);
    // Eigen-decomposition of the symmetric 2 × 2 matrix Γ.
    let half_tr = 0.5 * (g11 + g22);
    let disc = (0.25 * (g11 - g22).powi(2) + g12 * g12).sqrt();
    let (gamma1, gamma2) = (half_tr + disc, (half_tr - disc).max(0.0));
    let psi = 0.5 * (2.0 * g12).atan2(g11 - g22);
    let major_v = e1 * psi.cos() + e2 * psi.sin();
    let minor_v = m.cross(major_v);
    let g = chi2_2_quantile(confidence) / (n_scale * mean_resultant * mean_resultant);
    let semi = |gamma: f64| {
        let s = (gamma * g).sqrt();
        if s >= 1.0 {
            90.0
        } else {
            s.asin().to_degrees()
        }
    };
    Ok(KentEllipse {
        mean: Direction::from_vector(m).expect("unit mean"),
        major: semi(gamma1),
        minor: semi(gamma2),
        major_axis: lower_axis(major_v),
        minor_axis: lower_axis(minor_v),
        n,
        mean_resultant,
        confidence,
    })
}

impl KentEllipse {
    /// `count + 1` points around the ellipse's boundary (closed: the last equals the first).
    ///
    /// # Formula
    /// The ellipse is drawn in the plane tangent at the mean: v(φ) = x̄ + tan ζ₁ cos φ e_major +
    /// tan ζ₂ sin φ e_minor, normalised (semi-axes of 90° are drawn at 89.9°).
    pub fn boundary(&self, count: usize) -> Vec<Direction> {
        let m = self.mean.to_vector();
        // The axes, made exactly perpendicular to the mean.
        let a = (self.major_axis.to_vector() - m * self.major_axis.to_vector().dot(m)).normalized();
        let a = a.unwrap_or_else(|| tangent_frame(m).0);
        let b = m.cross(a);
        let t1 = self.major.min(89.9).to_radians().tan();
        let t2 = self.minor.min(89.9).to_radians().tan();
        let count = count.max(4);
        (0..=count)
            .map(|k| {
                let phi = std::f64::consts::TAU * k as f64 / count as f64;
                Direction::from_vector(m + a * (t1 * phi.cos()) + b * (t2 * phi.sin())).expect("non-zero")
            })
            .collect()
    }
}
