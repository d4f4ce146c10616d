use super::*;
use crate::model::{Anchor, FitKind, SpecimenSteps, StepRecord};
use crate::montecarlo::replicate_rng;
use crate::sphere::{Direction, Vec3};
use approx::assert_abs_diff_eq;
use rand::RngExt;

fn pts() -> Vec<Vec3> {
    [
        [4.1e-6, 1.2e-6, 5.3e-6],
        [3.2e-6, 0.8e-6, 4.4e-6],
        [2.5e-6, 0.9e-6, 3.2e-6],
        [1.6e-6, 0.4e-6, 2.3e-6],
        [0.9e-6, 0.35e-6, 1.1e-6],
        [0.3e-6, 0.05e-6, 0.5e-6],
    ]
    .iter()
    .map(|a| Vec3::from_array(*a))
    .collect()
}

#[test]
fn line_and_plane_match_numpy_svd() {
    // Reference: numpy.linalg.svd (NumPy 2.4.6) of the centred (free) or raw (origin) 6 × 3 data
    // matrix; singular values s₁ ≥ s₂ ≥ s₃, MAD_line = atan(√(s₂² + s₃²)/s₁),
    // MAD_plane = atan(√(s₃²/s₂² + s₃²/s₁²)), line = first right-singular vector, pole = third.
    let p = pts();
    let f = fit_line(&p, Anchor::Free).unwrap();
    assert_abs_diff_eq!(f.direction.dec, 15.746974819529623, epsilon = 1e-9);
    assert_abs_diff_eq!(f.direction.inc, 51.364385866615535, epsilon = 1e-9);
    assert_abs_diff_eq!(f.mad, 3.6190415949034773, epsilon = 1e-9);
    assert_abs_diff_eq!(f.dang, 0.7305689803944471, epsilon = 1e-8);
    let o = fit_line(&p, Anchor::Origin).unwrap();
    assert_abs_diff_eq!(o.direction.dec, 16.194306338214396, epsilon = 1e-9);
    assert_abs_diff_eq!(o.direction.inc, 51.81693672321719, epsilon = 1e-9);
    assert_abs_diff_eq!(o.mad, 1.9210568581575707, epsilon = 1e-9);
    let g = fit_plane(&p, Anchor::Free).unwrap();
    assert_abs_diff_eq!(g.pole.dec, 322.9750409187284, epsilon = 1e-8);
    assert_abs_diff_eq!(g.pole.inc, -25.807136050206548, epsilon = 1e-8);
    assert_abs_diff_eq!(g.mad, 10.855082106253198, epsilon = 1e-9);
    let h = fit_plane(&p, Anchor::Origin).unwrap();
    assert_abs_diff_eq!(h.pole.dec, 322.824531728833, epsilon = 1e-8);
    assert_abs_diff_eq!(h.pole.inc, -25.137397041684448, epsilon = 1e-8);
    assert_abs_diff_eq!(h.mad, 14.328090541278081, epsilon = 1e-9);
}

#[test]
fn degenerate_ranges_are_errors_not_panics() {
    let a = Vec3::new(1.0, 2.0, 3.0);
    assert!(fit_line(&[a], Anchor::Free).is_err());
    assert!(fit_line(&[a, a], Anchor::Free).is_err()); // coincident steps
    assert!(fit_plane(&[a, a * 0.5], Anchor::Free).is_err()); // fewer than 3
    assert!(fit_plane(&[a, a * 0.5, a * 0.2], Anchor::Free).is_err()); // collinear
                                                                       // Two distinct steps make an exact line: MAD 0.
    let f = fit_line(&[a, a * 0.5], Anchor::Free).unwrap();
    assert_abs_diff_eq!(f.mad, 0.0, epsilon = 1e-9);
    assert_abs_diff_eq!(f.direction.angle_to(Direction::from_vector(a).unwrap()), 0.0, epsilon = 1e-9);
}

/// A synthetic specimen: a soft overprint (dec 5, inc 62) removed linearly by step 20, and a
/// characteristic component (dec 192, inc −38) decaying linearly to zero at step 100, plus isotropic
/// Gaussian noise of standard deviation `sigma` per axis (unit: the NRM of the characteristic
/// component, 1). Steps 0, 5, 10, 15, 20, 30, …, 90.
pub(crate) fn synthetic(sigma: f64, replicate: u64) -> (SpecimenSteps, Vec3) {
    let chrm = Direction::new(192.0, -38.0).unwrap().to_vector();
    let over = Direction::new(5.0, 62.0).unwrap().to_vector() * 0.8;
    let mut rng = replicate_rng(7, 3, replicate);
    let mut gauss = move || {
        // Box–Muller from two uniforms of the shared engine's stream.
        let (u, v): (f64, f64) = (rng.random::<f64>().max(1e-300), rng.random());
        (-2.0 * u.ln()).sqrt() * (std::f64::consts::TAU * v).cos()
    };
    let levels = [0.0, 5.0, 10.0, 15.0, 20.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 90.0];
    let steps = levels
        .iter()
        .enumerate()
        .map(|(i, &s)| {
            let v = chrm * (1.0 - s / 100.0)
                + over * (1.0 - s / 20.0).max(0.0)
                + Vec3::new(gauss(), gauss(), gauss()) * sigma;
            StepRecord {
                line: i + 2,
                step: s,
                direction: Direction::from_vector(v).unwrap(),
                moment: v.norm(),
                treatment: None,
            }
        })
        .collect();
    (SpecimenSteps { specimen: format!("S{replicate}"), site: None, position: None, bedding: None, steps }, chrm)
}

#[test]
fn noiseless_history_is_recovered_exactly() {
    let (sp, chrm) = synthetic(0.0, 0);
    let truth = Direction::from_vector(chrm).unwrap();
    for anchor in [Anchor::Free, Anchor::Origin] {
        let f = fit_range(&sp, 20.0, 90.0, FitKind::Line, anchor).unwrap();
        assert_eq!(f.n_steps, 8);
        assert_abs_diff_eq!(f.direction.angle_to(truth), 0.0, epsilon = 1e-6);
        assert!(f.mad < 1e-6 && f.dang.unwrap() < 1e-6, "{f:?}");
    }
    // The overprint segment (0–20) is a straight line that misses the origin: small MAD, large DANG,
    // and its direction is the overprint's (the component removed, pointing from step 20 to step 0).
    let o = fit_range(&sp, 0.0, 20.0, FitKind::Line, Anchor::Free).unwrap();
    assert!(o.mad < 1e-6);
    assert!(o.dang.unwrap() > 30.0);
    let over = Direction::new(5.0, 62.0).unwrap().to_vector() * 0.8 + chrm * 0.2;
    assert_abs_diff_eq!(o.direction.angle_to(Direction::from_vector(over).unwrap()), 0.0, epsilon = 1e-6);
    // Over the overlap the path is a plane containing both components: its pole is ⟂ to both.
    let p = fit_range(&sp, 0.0, 90.0, FitKind::Plane, Anchor::Origin).unwrap();
    let pole = p.direction.to_vector();
    assert!(pole.dot(chrm).abs() < 1e-9 && pole.dot(Direction::new(5.0, 62.0).unwrap().to_vector()).abs() < 1e-9);
}

#[test]
fn noisy_fits_recover_the_direction_and_mad_grows_with_noise() {
    // For small isotropic noise σ the scatter matrix gains ≈ σ² per axis per degree of freedom, so
    // E(λ₂ + λ₃) ≈ 2σ²(n − 1) (free line, centred) while λ₁ ≈ Σ (tᵢ − t̄)² (the spread along the
    // line); hence MAD ≈ atan(√(2σ²(n − 1)/Σ (tᵢ − t̄)²)), proportional to σ. The noise-free spread of
    // the steps 20–90 along the line: tᵢ = 1 − sᵢ/100.
    let s: Vec<f64> = [20.0, 30.0, 40.0, 50.0, 60.0, 70.0, 80.0, 90.0].iter().map(|x| 1.0 - x / 100.0).collect();
    let tbar = s.iter().sum::<f64>() / 8.0;
    let spread: f64 = s.iter().map(|t| (t - tbar).powi(2)).sum();
    let mut mean_mads = Vec::new();
    for sigma in [0.002, 0.004, 0.008, 0.016] {
        let reps = 200u64;
        let (mut mad_sum, mut worst) = (0.0, 0.0f64);
        for r in 0..reps {
            let (sp, chrm) = synthetic(sigma, r + (sigma * 1e6) as u64 * 1000);
            let f = fit_range(&sp, 20.0, 90.0, FitKind::Line, Anchor::Free).unwrap();
            worst = worst.max(f.direction.angle_to(Direction::from_vector(chrm).unwrap()));
            mad_sum += f.mad;
        }
        let mean_mad = mad_sum / reps as f64;
        // E(√X) for X with E(X) = a is a little below √a; allow 12 %.
        let predicted = (2.0 * sigma * sigma * 7.0 / spread).sqrt().atan().to_degrees();
        assert!(
            (mean_mad - predicted).abs() < 0.12 * predicted,
            "σ {sigma}: mean MAD {mean_mad} vs predicted {predicted}"
        );
        // Direction error: of order σ/√spread radians; no replicate beyond 5× that.
        let bound = 5.0 * (sigma / spread.sqrt()).to_degrees();
        assert!(worst < bound, "σ {sigma}: worst angle {worst} vs bound {bound}");
        mean_mads.push(mean_mad);
    }
    for w in mean_mads.windows(2) {
        let ratio = w[1] / w[0];
        assert!((1.7..2.3).contains(&ratio), "doubling σ should double MAD: ratio {ratio}");
    }
}

#[test]
fn auto_rule_finds_the_characteristic_segment() {
    let rule = AutoRule::default();
    for r in 0..20 {
        let (sp, chrm) = synthetic(0.004, 500 + r);
        match auto_line(&sp, &rule) {
            AutoOutcome::Fitted(f) => {
                // The overprint is gone by step 20: the chosen run starts at 15 or 20 at the earliest
                // (step 15 still carries a quarter of the overprint) and runs to the last step.
                assert!(f.from >= 20.0 && f.to == 90.0, "{f:?}");
                assert!(f.direction.angle_to(Direction::from_vector(chrm).unwrap()) < 2.0);
            }
            AutoOutcome::Unfitted(why) => panic!("replicate {r}: {why}"),
        }
    }
    // Pure noise: no run is straight; the reason says so.
    let (mut sp, _) = synthetic(0.0, 0);
    let mut rng = replicate_rng(9, 0, 0);
    for s in &mut sp.steps {
        s.direction = Direction::new(rng.random_range(0.0..360.0), rng.random_range(-80.0..80.0)).unwrap();
    }
    match auto_line(&sp, &rule) {
        AutoOutcome::Unfitted(why) => assert!(why.contains("MAD"), "{why}"),
        AutoOutcome::Fitted(f) => panic!("random directions fitted: {f:?}"),
    }
    // Too few steps.
    sp.steps.truncate(2);
    assert!(matches!(auto_line(&sp, &rule), AutoOutcome::Unfitted(w) if w.contains("at least 3")));
}

#[test]
fn a_line_is_graded_a_on_five_steps_within_five_degrees() {
    // One grade rule for the last-component rule's lines and the section's longest-run lines; its
    // thresholds (5 steps, MAD and DANG ≤ 5°) are the ones the reports print.
    let (sp, _) = synthetic(0.0, 0);
    let base = fit_range(&sp, 20.0, 90.0, FitKind::Line, Anchor::Free).unwrap();
    let at = |n_steps, mad, dang| SpecimenFit { n_steps, mad, dang, ..base.clone() };
    assert_eq!(Grade::of_line(&at(5, 5.0, Some(5.0))), Grade::A);
    assert_eq!(Grade::of_line(&at(4, 1.0, Some(1.0))), Grade::B);
    assert_eq!(Grade::of_line(&at(8, 5.0 + 1e-9, Some(1.0))), Grade::B);
    assert_eq!(Grade::of_line(&at(8, 1.0, Some(5.0 + 1e-9))), Grade::B);
    assert_eq!(Grade::of_line(&at(8, 1.0, None)), Grade::B);
    assert_eq!(Grade::of_line(&at(8, f64::NAN, Some(1.0))), Grade::B);
}
