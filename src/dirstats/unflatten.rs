//! Correction of inclination shallowing: the elongation/inclination method (Tauxe & Kent 2004) and
//! the correction by a given flattening factor (King 1955).

use super::elongation::{from_matrix, tk03_curve};
use crate::error::{check_range, Error, Result};
use crate::montecarlo::{quantiles_select, MonteCarlo, UniformIndex};
use crate::sphere::{Direction, Vec3};
use crate::stats::{fisher_mean, FisherStats};

/// Below this many directions `unflatten_search` refuses to run.
pub const MIN_DIRECTIONS: usize = 30;
/// Below this many directions the method's result is unreliable (a caution, not a refusal).
pub const RECOMMENDED_DIRECTIONS: usize = 100;

/// The largest inclination used, degrees (tan 90° is infinite; a vertical direction does not change).
const MAX_INC: f64 = 89.99;
/// The smallest flattening factor searched.
const F_MIN: f64 = 0.2;
/// Step of the coarse search from f = 1 down to `F_MIN`.
const F_STEP: f64 = 0.02;
/// Bisection steps refining a crossing (the bracket shrinks to 0.02/2¹⁴ ≈ 10⁻⁶).
const BISECT: usize = 14;
/// Random stream of the bootstrap.
const STREAM: u64 = 0xF1A7_7E11;

/// Inclination unflattened by the factor `f`: tan I₀ = tan I_f / f.
///
/// # Formula
/// tan I_f = f tan I₀ (King 1955), inverted.
///
/// # References
/// King, R. F. (1955), The remanent magnetism of artificially deposited sediments, *Mon. Not. R.
/// Astron. Soc. Geophys. Suppl.* 7, 115–134.
pub fn unflatten_inclination(inc_deg: f64, f: f64) -> f64 {
    (inc_deg.to_radians().tan() / f).atan().to_degrees()
}

/// Every direction unflattened by `f` in (0, 1] (declinations unchanged). A factor above 1 steepens.
pub fn apply_factor(directions: &[Direction], f: f64) -> Result<Vec<Direction>> {
    check_range("flattening factor", f, 0.01, 100.0, "[0.01, 100]")?;
    Ok(directions.iter().map(|d| Direction { dec: d.dec, inc: unflatten_inclination(d.inc, f) }).collect())
}

/// The Fisher means of a set before and after unflattening by a given factor.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct FactorResult {
    /// The factor applied.
    pub f: f64,
    /// Fisher statistics of the directions as observed.
    pub observed: FisherStats,
    /// Fisher statistics of the unflattened directions.
    pub corrected: FisherStats,
}

/// Unflatten by a given factor and compare the Fisher means (α95 changes because the scatter does).
pub fn unflatten_factor(directions: &[Direction], f: f64) -> Result<FactorResult> {
    let corrected = apply_factor(directions, f)?;
    Ok(FactorResult { f, observed: fisher_mean(directions, 0.95)?, corrected: fisher_mean(&corrected, 0.95)? })
}

/// A path of the elongation/inclination method: for each f tried, the inclination of V₁ and the
/// What one bootstrap replicate of the unflattening search gives back (see its use below).
type BootstrapDraw = (Option<(f64, f64)>, Option<EiCurve>);

/// meridional elongation.
#[derive(Debug, Clone, PartialEq, Default, serde::Serialize)]
pub struct EiCurve {
    /// Flattening factors, from 1 downward.
    pub f: Vec<f64>,
    /// Inclination of the principal axis after unflattening by f, degrees (sign of the data).
    pub inc: Vec<f64>,
    /// Meridional elongation (E, or 1/E for an east–west elongation).
    pub e: Vec<f64>,
}

/// The result of the elongation/inclination method with its bootstrap.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct UnflattenResult {
    /// Number of directions.
    pub n: usize,
    /// The flattening factor where the data's path meets the model curve (1 when the observed data lie
    /// on or above the curve); `None` when the path does not meet it for f ≥ 0.2.
    pub f: Option<f64>,
    /// Bootstrap 2.5 % and 97.5 % quantiles of f.
    pub f_low: Option<f64>,
    /// See `f_low`.
    pub f_high: Option<f64>,
    /// Inclination of V₁ of the observed directions, degrees.
    pub inc_observed: f64,
    /// Inclination of V₁ at the crossing, degrees.
    pub inc_corrected: Option<f64>,
    /// Bootstrap 2.5 % quantile of the corrected inclination.
    pub inc_low: Option<f64>,
    /// Bootstrap 97.5 % quantile of the corrected inclination.
    pub inc_high: Option<f64>,
    /// Elongation τ₂/τ₃ of the observed directions.
    pub elongation: f64,
    /// Declination of the observed axis of elongation V₂, degrees.
    pub elongation_dec: f64,
    /// Whether the observed elongation is north–south (meridional).
    pub meridional: bool,
    /// The data's path.
    pub path: EiCurve,
    /// Paths of the first bootstrap pseudo-samples (at most `paths_kept`).
    pub boot_paths: Vec<EiCurve>,
    /// Corrected inclinations of the pseudo-samples that met the curve.
    pub boot_inc: Vec<f64>,
    /// Flattening factors of the pseudo-samples that met the curve.
    pub boot_f: Vec<f64>,
    /// Pseudo-samples drawn.
    pub resamples: usize,
    /// Pseudo-samples whose path did not meet the curve for f ≥ 0.2 (left out of the intervals).
    pub no_crossing: usize,
}

/// One direction prepared for fast unflattening: cos D, sin D and tan I.
#[derive(Debug, Clone, Copy)]
struct Prepared {
    cd: f64,
    sd: f64,
    t: f64,
}

fn prepare(d: &Direction) -> Prepared {
    let (sd, cd) = d.dec.to_radians().sin_cos();
    Prepared { cd, sd, t: d.inc.clamp(-MAX_INC, MAX_INC).to_radians().tan() }
}

/// The orientation matrix of the set unflattened by f, without trigonometry.
///
/// # Formula
/// With u = tan I / f and w = cos² I₀ = 1/(1 + u²): xx = cos²D w, xy = cos D sin D w, yy = sin²D w,
/// xz = cos D u w, yz = sin D u w, zz = u² w.
fn matrix_at(set: &[Prepared], f: f64) -> [[f64; 3]; 3] {
    let inv = 1.0 / f;
    let (mut xx, mut xy, mut yy, mut xz, mut yz, mut zz) = (0.0, 0.0, 0.0, 0.0, 0.0, 0.0);
    for p in set {
        let u = p.t * inv;
        let w = 1.0 / (1.0 + u * u);
        let (cw, sw) = (p.cd * w, p.sd * w);
        xx += p.cd * cw;
        xy += p.cd * sw;
        yy += p.sd * sw;
        xz += u * cw;
        yz += u * sw;
        zz += u * u * w;
    }
    let n = set.len() as f64;
    [[xx / n, xy / n, xz / n], [xy / n, yy / n, yz / n], [xz / n, yz / n, zz / n]]
}

/// (inclination of V₁, meridional E) of the set unflattened by f; V₁ oriented by `orient`.
fn point_at(set: &[Prepared], f: f64, orient: Vec3) -> Option<(f64, f64)> {
    let e = from_matrix(matrix_at(set, f), orient).ok()?;
    Some((e.principal.inc, e.e_meridian))
}

/// The distance of a path point above the model curve.
fn gap(p: (f64, f64)) -> f64 {
    p.1 - tk03_curve(p.0)
}

/// Where the set's path meets the TK03 curve: (f, inclination there), and the coarse path.
fn search(set: &[Prepared], orient: Vec3, keep_path: bool) -> (Option<(f64, f64)>, EiCurve) {
    let mut path = EiCurve::default();
    let steps = ((1.0 - F_MIN) / F_STEP).round() as usize;
    let mut prev: Option<(f64, (f64, f64))> = None;
    let mut found = None;
    for k in 0..=steps {
        let f = 1.0 - k as f64 * F_STEP;
        let Some(p) = point_at(set, f, orient) else { break };
        if keep_path {
            path.f.push(f);
            path.inc.push(p.0);
            path.e.push(p.1);
        }
        if found.is_none() {
            match prev {
                None if gap(p) >= 0.0 => found = Some((f, p.0)),
                Some((fp, pp)) if gap(pp) < 0.0 && gap(p) >= 0.0 => found = Some(refine(set, orient, f, fp)),
                _ => {}
            }
        }
        if found.is_some() && !keep_path {
            break;
        }
        prev = Some((f, p));
    }
    (found, path)
}

/// Bisection between `lo` (gap ≥ 0) and `hi` (gap < 0).
fn refine(set: &[Prepared], orient: Vec3, mut lo: f64, mut hi: f64) -> (f64, f64) {
    let mut best = point_at(set, lo, orient).map_or((lo, f64::NAN), |p| (lo, p.0));
    for _ in 0..BISECT {
        let mid = 0.5 * (lo + hi);
        match point_at(set, mid, orient) {
            Some(p) if gap(p) >= 0.0 => {
                lo = mid;
                best = (mid, p.0);
            }
            Some(_) => hi = mid,
            None => break,
        }
    }
    best
}

/// The elongation/inclination correction with a bootstrap interval.
///
/// # Units
/// Inclinations in degrees; f dimensionless.
///
/// # Formula
/// For f from 1 down to 0.2 every inclination is unflattened (tan I₀ = tan I_f / f) and the
/// orientation matrix gives the inclination I of V₁ and the elongation E = τ₂/τ₃, taken as 1/E when the
/// elongation is east–west. The estimate is the largest f at which E reaches the TK03 curve
/// E(I) ([`tk03_curve`]), found on a grid of step 0.02 and refined by bisection. Pseudo-samples drawn
/// with replacement from the directions give the 2.5 % and 97.5 % quantiles of f and of the corrected
/// inclination; pseudo-samples that never reach the curve are left out and counted.
///
/// # Errors
/// `TooFew` below [`MIN_DIRECTIONS`] directions; `Undefined` when the elongation of the data is undefined
/// (identical directions, or all on one great circle).
///
/// # References
/// Tauxe, L. & Kent, D. V. (2004), in *Timescales of the Paleomagnetic Field*, AGU Geophys. Monogr. 145,
/// 101–115; Tauxe, L. et al. (2008), *Phys. Earth Planet. Inter.* 169, 152–165; King (1955).
pub fn unflatten_search(directions: &[Direction], mc: &MonteCarlo<'_>, paths_kept: usize) -> Result<UnflattenResult> {
    let n = directions.len();
    if n < MIN_DIRECTIONS {
        return Err(Error::TooFew {
            what: "the elongation/inclination method",
            needed: MIN_DIRECTIONS,
            got: n,
            unit: "directions",
        });
    }
    let vectors: Vec<Vec3> = directions.iter().map(|d| d.to_vector()).collect();
    let observed = super::elongation_of(&vectors)?;
    let orient = observed.principal.to_vector();
    let set: Vec<Prepared> = directions.iter().map(prepare).collect();
    let (found, path) = search(&set, orient, true);
    let pick = UniformIndex::new(n).ok_or(Error::TooMany {
        what: "directions",
        count: n as u64,
        limit: u64::from(u32::MAX),
    })?;
    let draws: Vec<BootstrapDraw> = mc.run_with(
        "unflatten bootstrap",
        STREAM,
        || (vec![0u32; n], Vec::with_capacity(n)),
        |(idx, sample): &mut (Vec<u32>, Vec<Prepared>), rng, i| {
            pick.fill(rng, idx);
            sample.clear();
            sample.extend(idx.iter().map(|&j| set[j as usize]));
            let keep = i < paths_kept;
            let (hit, p) = search(sample, orient, keep);
            (hit, keep.then_some(p))
        },
    );
    let hits: Vec<(f64, f64)> = draws.iter().filter_map(|d| d.0).filter(|h| h.1.is_finite()).collect();
    let boot_f: Vec<f64> = hits.iter().map(|h| h.0).collect();
    let boot_inc: Vec<f64> = hits.iter().map(|h| h.1).collect();
    let enough = hits.len() >= 20;
    let q = |v: &[f64]| enough.then(|| quantiles_select(v, &[0.025, 0.975]));
    let (fq, iq) = (q(&boot_f), q(&boot_inc));
    let inc_observed = observed.principal.inc;
    Ok(UnflattenResult {
        n,
        f: found.map(|h| h.0),
        f_low: fq.as_ref().map(|v| v[0]),
        f_high: fq.as_ref().map(|v| v[1]),
        inc_observed,
        inc_corrected: found.map(|h| h.1),
        inc_low: iq.as_ref().map(|v| v[0].min(v[1])),
        inc_high: iq.as_ref().map(|v| v[0].max(v[1])),
        elongation: observed.e,
        elongation_dec: observed.elongation_dec,
        meridional: observed.meridional,
        path,
        boot_paths: draws.iter().filter_map(|d| d.1.clone()).collect(),
        no_crossing: mc.resamples - hits.len(),
        boot_f,
        boot_inc,
        resamples: mc.resamples,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use approx::assert_abs_diff_eq;

    #[test]
    fn king_formula_round_trips() {
        // tan I_f = f tan I₀ (King 1955): I₀ = 60°, f = 0.4 → I_f = atan(0.4 √3) = 34.715° (hand
        // computation), and unflattening gives 60° back.
        let i_f = (0.4 * 60f64.to_radians().tan()).atan().to_degrees();
        assert_abs_diff_eq!(i_f, 34.7150, epsilon = 1e-4);
        assert_abs_diff_eq!(unflatten_inclination(i_f, 0.4), 60.0, epsilon = 1e-10);
        assert_abs_diff_eq!(unflatten_inclination(-i_f, 0.4), -60.0, epsilon = 1e-10);
        assert_eq!(unflatten_inclination(25.0, 1.0), 25.0);
        assert!(apply_factor(&[Direction { dec: 0.0, inc: 10.0 }], 0.0).is_err());
    }

    #[test]
    fn fast_matrix_equals_the_orientation_matrix() {
        let dirs: Vec<Direction> =
            (0..40).map(|k| Direction::new(k as f64 * 37.0, -80.0 + 4.1 * k as f64).unwrap()).collect();
        let set: Vec<Prepared> = dirs.iter().map(prepare).collect();
        for f in [1.0, 0.63] {
            let v: Vec<Vec3> = apply_factor(&dirs, f).unwrap().iter().map(|d| d.to_vector()).collect();
            let want = crate::stats::orientation_matrix(&v);
            let got = matrix_at(&set, f);
            for i in 0..3 {
                for j in 0..3 {
                    assert_abs_diff_eq!(got[i][j], want[i][j], epsilon = 1e-12);
                }
            }
        }
    }
}
