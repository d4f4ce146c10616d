use super::*;
use crate::sphere::{rotate_about, Direction, Vec3};
use approx::assert_abs_diff_eq;

fn dirs(v: &[(f64, f64)]) -> Vec<Direction> {
    v.iter().map(|&(d, i)| Direction::new(d, i).unwrap()).collect()
}

#[test]
fn four_symmetric_directions() {
    // Analytic: (10,0), (350,0), (0,10), (0,-10) average to (0,0) with R = 4 cos 10 exactly
    // (each unit vector has north component cos 10 and the other components cancel).
    let s = fisher_mean(&dirs(&[(10.0, 0.0), (350.0, 0.0), (0.0, 10.0), (0.0, -10.0)]), 0.95).unwrap();
    let m = s.mean.unwrap();
    assert!(m.dec < 1e-9 || m.dec > 360.0 - 1e-9);
    assert_abs_diff_eq!(m.inc, 0.0, epsilon = 1e-9);
    assert_abs_diff_eq!(s.r, 4.0 * 10f64.to_radians().cos(), epsilon = 1e-12);
    let k = s.k.unwrap().0;
    assert_abs_diff_eq!(k, 3.0 / (4.0 - s.r), epsilon = 1e-9);
    assert_abs_diff_eq!(s.theta63.unwrap(), 81.0 / k.sqrt(), epsilon = 1e-12);
}

#[test]
fn matches_scipy_directional_stats() {
    // scipy.stats.directional_stats (SciPy 1.17.1) on these six directions:
    // mean dec 10.22770404794826, inc 47.316300335867986, R = N * mean_resultant_length = 5.904008521394596.
    let s =
        fisher_mean(&dirs(&[(12.0, 45.0), (20.0, 51.0), (355.0, 38.0), (8.0, 60.0), (25.0, 40.0), (2.0, 47.0)]), 0.95)
            .unwrap();
    let m = s.mean.unwrap();
    assert_abs_diff_eq!(m.dec, 10.22770404794826, epsilon = 1e-9);
    assert_abs_diff_eq!(m.inc, 47.316300335867986, epsilon = 1e-9);
    assert_abs_diff_eq!(s.r, 5.904008521394596, epsilon = 1e-12);
}

#[test]
fn exact_cone_approaches_140_over_sqrt_kn() {
    // Fisher (1953) exact formula vs the common large-k approximation alpha95 ~ 140/sqrt(kN)
    // (Butler 1992, eq. 6.21), which drops terms of order 1/N: for N = 400, k = 500 they agree within
    // 1 %; for N = 20 the exact cone is about 4 % wider.
    let n = 400usize;
    let k: f64 = 500.0;
    let r = n as f64 - (n as f64 - 1.0) / k;
    let exact = confidence_cone(n, r, 0.95).unwrap();
    let approx = 140.0 / (k * n as f64).sqrt();
    assert!((exact - approx).abs() / approx < 0.01, "{exact} vs {approx}");
    // And the exact value by hand: cos a = 1 - ((N-R)/R)(20^(1/(N-1)) - 1).
    let by_hand = (1.0 - ((n as f64 - r) / r) * (20f64.powf(1.0 / 399.0) - 1.0)).acos().to_degrees();
    assert_abs_diff_eq!(exact, by_hand, epsilon = 1e-12);
}

#[test]
fn edge_cases_are_defined() {
    // N = 1: mean only.
    let one = fisher_mean(&dirs(&[(123.0, 45.0)]), 0.95).unwrap();
    assert_eq!(one.n, 1);
    assert!(one.k.is_none() && one.alpha.is_none() && one.theta63.is_none());
    assert_abs_diff_eq!(one.mean.unwrap().dec, 123.0, epsilon = 1e-9);
    // N = 2 works with the exact formula (N - 1 = 1 in the exponent).
    let two = fisher_mean(&dirs(&[(0.0, 40.0), (10.0, 40.0)]), 0.95).unwrap();
    assert!(two.alpha.is_some() && two.k.unwrap().0.is_finite());
    // Identical directions: k infinite, alpha 0, theta63 0, never NaN.
    let same = fisher_mean(&dirs(&[(200.0, -30.0); 5]), 0.95).unwrap();
    assert!(same.k.unwrap().is_infinite());
    assert_eq!(same.alpha, Some(0.0));
    assert_eq!(same.theta63, Some(0.0));
    assert_eq!(serde_json::to_string(&same.k).unwrap(), "\"inf\"");
    // Antipodal pair: R = 0, no mean, no cone.
    let anti = fisher_mean(&dirs(&[(0.0, 30.0), (180.0, -30.0)]), 0.95).unwrap();
    assert!(anti.mean.is_none());
    assert!(anti.alpha.is_none());
    assert!(anti.r < 1e-12);
    // Empty set is an error, not a panic.
    assert!(fisher_mean(&[], 0.95).is_err());
}

#[test]
fn declinations_across_north_average_correctly() {
    let s = fisher_mean(&dirs(&[(355.0, 50.0), (5.0, 50.0)]), 0.95).unwrap();
    let d = s.mean.unwrap().dec;
    assert!(!(1e-9..=360.0 - 1e-9).contains(&d), "{d}");
}

#[test]
fn sampler_recovers_kappa() {
    use rand::SeedableRng;
    // For a Fisher sample, (N-1)/(N-R) estimates kappa with relative sd about 1/sqrt(N) for large N
    // (Fisher, Lewis & Embleton 1987, §5.3.2(iv)); with N = 20000 the estimate lies within 5 %.
    for &kappa in &[5.0, 50.0, 1e4] {
        let mut rng = rand::rngs::Xoshiro256PlusPlus::seed_from_u64(7);
        let mean = Direction::new(30.0, 50.0).unwrap();
        let s = FisherSampler::new(mean, kappa).unwrap();
        let v: Vec<Vec3> = (0..20_000).map(|_| s.sample(&mut rng)).collect();
        let st = fisher_from_vectors(v, 0.95).unwrap();
        let k = st.k.unwrap().0;
        assert!((k / kappa - 1.0).abs() < 0.05, "kappa {kappa}: got {k}");
        assert!(st.mean.unwrap().angle_to(mean) < 3.0 * st.alpha.unwrap());
    }
}

#[test]
fn principal_axis_of_a_girdle_free_cluster() {
    let v: Vec<Vec3> = dirs(&[(0.0, 10.0), (180.0, -10.0), (2.0, 12.0)]).iter().map(|d| d.to_vector()).collect();
    let e = principal_axes(&v);
    assert_abs_diff_eq!(e.values.iter().sum::<f64>(), 1.0, epsilon = 1e-12);
    let ax = Direction::from_vector(e.vectors[0]).unwrap();
    assert!(
        ax.angle_to(Direction::new(1.0, 11.0).unwrap()) < 2.0
            || ax.antipode().angle_to(Direction::new(1.0, 11.0).unwrap()) < 2.0
    );
}

mod props {
    use super::*;
    use proptest::prelude::*;
    proptest! {
        #[test]
        fn rotation_moves_mean_and_keeps_statistics(
            pts in proptest::collection::vec((0.0f64..360.0, 10.0f64..80.0), 3..12),
            ax in (0.0f64..360.0, -90.0f64..90.0), ang in -180.0f64..180.0) {
            let d = dirs(&pts);
            let axis = Direction::new(ax.0, ax.1).unwrap().to_vector();
            let rotated: Vec<Direction> = d.iter()
                .map(|x| Direction::from_vector(rotate_about(x.to_vector(), axis, ang)).unwrap()).collect();
            let a = fisher_mean(&d, 0.95).unwrap();
            let b = fisher_mean(&rotated, 0.95).unwrap();
            prop_assert!((a.r - b.r).abs() < 1e-9);
            let ma = Direction::from_vector(rotate_about(a.mean.unwrap().to_vector(), axis, ang)).unwrap();
            prop_assert!(ma.angle_to(b.mean.unwrap()) < 1e-6);
            if let (Some(x), Some(y)) = (a.alpha, b.alpha) { prop_assert!((x - y).abs() < 1e-6); }
        }
        #[test]
        fn row_order_does_not_matter(pts in proptest::collection::vec((0.0f64..360.0, -90.0f64..90.0), 2..10)) {
            let d = dirs(&pts);
            let mut rev = d.clone();
            rev.reverse();
            let (a, b) = (fisher_mean(&d, 0.95).unwrap(), fisher_mean(&rev, 0.95).unwrap());
            prop_assert!((a.r - b.r).abs() < 1e-9);
        }
    }
}
