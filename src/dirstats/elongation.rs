//! Elongation and inclination of a set of directions, and the elongation–inclination curve of TK03.

use crate::error::{Error, Result};
use crate::linalg::sym_eigen;
use crate::sphere::{Direction, Vec3};
use crate::stats::orientation_matrix;

/// The shape of a set of directions as the elongation/inclination method sees it.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Elongation {
    /// Elongation E = τ₂/τ₃ (≥ 1), from the eigenvalues of the orientation matrix.
    pub e: f64,
    /// The principal axis V₁, oriented toward the majority of the directions.
    pub principal: Direction,
    /// Declination of V₂, the axis of elongation (lower-hemisphere end), degrees.
    pub elongation_dec: f64,
    /// True when V₂ lies closer to the meridian of V₁ than across it (north–south elongation).
    pub meridional: bool,
    /// E measured along the meridian: E when `meridional`, 1/E otherwise; continuous through 1 when the
    /// elongation turns from east–west to north–south.
    pub e_meridian: f64,
}

/// Elongation, inclination and the direction of elongation of a set of unit vectors.
///
/// # Formula
/// T = (1/N) Σ uᵢuᵢᵀ with eigenvalues τ₁ ≥ τ₂ ≥ τ₃ and eigenvectors V₁, V₂, V₃; E = τ₂/τ₃.
/// V₁ is oriented so that most uᵢ have uᵢ·V₁ > 0. V₂ is meridional when |V₂·n̂| ≥ |V₂·ê| with
/// n̂ = (−sin I cos D, −sin I sin D, cos I) and ê = (−sin D, cos D, 0) the meridional and azimuthal
/// tangents at V₁ = (D, I).
///
/// # Errors
/// `TooFew` below 3 directions; `Undefined` when τ₃ = 0 (all directions on one great circle, or
/// identical).
///
/// # References
/// Tauxe, L. & Kent, D. V. (2004) (E = τ₂/τ₃ and the north–south test); Scheidegger (1965) and Fisher,
/// Lewis & Embleton (1987), §3.2.4 (orientation matrix).
pub fn elongation_of(vectors: &[Vec3]) -> Result<Elongation> {
    if vectors.len() < 3 {
        return Err(Error::TooFew { what: "an elongation", needed: 3, got: vectors.len(), unit: "directions" });
    }
    let v1 = sym_eigen(orientation_matrix(vectors)).vectors[0];
    let up = vectors.iter().filter(|u| u.dot(v1) > 0.0).count();
    let flip = 2 * up < vectors.len();
    from_matrix(orientation_matrix(vectors), if flip { -v1 } else { v1 })
}

/// [`elongation_of`] from an orientation matrix and a vector that picks the end of V₁ (V₁ is oriented
/// to have a non-negative product with it).
pub(crate) fn from_matrix(t: [[f64; 3]; 3], orient: Vec3) -> Result<Elongation> {
    let e = sym_eigen(t);
    let [_, tau2, tau3] = e.values;
    if tau3 <= 1e-14 * e.values[0].abs().max(1e-300) {
        return Err(Error::Undefined(
            "the directions are identical or lie on one great circle: the elongation is undefined".into(),
        ));
    }
    let v1 = if e.vectors[0].dot(orient) < 0.0 { -e.vectors[0] } else { e.vectors[0] };
    let principal = Direction::from_vector(v1).expect("unit eigenvector");
    let (d, i) = (principal.dec.to_radians(), principal.inc.to_radians());
    let north = Vec3::new(-i.sin() * d.cos(), -i.sin() * d.sin(), i.cos());
    let east = Vec3::new(-d.sin(), d.cos(), 0.0);
    let v2 = e.vectors[1];
    let meridional = v2.dot(north).abs() >= v2.dot(east).abs();
    let big_e = tau2 / tau3;
    let v2_down = if v2.z < 0.0 { -v2 } else { v2 };
    Ok(Elongation {
        e: big_e,
        principal,
        elongation_dec: Direction::from_vector(v2_down).expect("unit eigenvector").dec,
        meridional,
        e_meridian: if meridional { big_e } else { 1.0 / big_e },
    })
}

/// The elongation that the TK03 field model gives at inclination `inc_deg` (either sign).
///
/// # Formula
/// E = 2.895 − 0.01466 |I| − 3.525 × 10⁻⁴ I² + 3.160 × 10⁻⁶ |I|³ (I in degrees), the cubic fitted to
/// the model's simulated elongations.
///
/// # References
/// Tauxe, L., Kodama, K. P. & Kent, D. V. (2008), Testing corrections for paleomagnetic inclination
/// error in sedimentary rocks: a comparative approach, *Phys. Earth Planet. Inter.* 169, 152–165
/// (the polynomial; coefficients as recalled from that paper, checked in this crate's tests against a
/// simulation of [`super::Tk03`]).
pub fn tk03_curve(inc_deg: f64) -> f64 {
    let i = inc_deg.abs();
    2.895 - 0.01466 * i - 3.525e-4 * i * i + 3.160e-6 * i * i * i
}
