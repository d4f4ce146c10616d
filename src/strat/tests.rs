//! Synthetic-section checks of the correlation search: sections generated here from a known time scale
//! and a known, varying accumulation rate (seeded), with hiatuses and noisy levels.

use super::*;
use crate::model::{StratAxis, TimeScale};
use crate::montecarlo::replicate_rng;
use crate::table::Table;
use crate::units::m_per_myr_to_cm_per_kyr;
use rand::RngExt;

const SCALE: &str = include_str!("../../records/timescales/chrons-0-6ma.csv");

fn scale() -> TimeScale {
    TimeScale::from_table(&Table::parse("chrons-0-6ma.csv", SCALE.as_bytes()).unwrap()).unwrap()
}

/// A synthetic section: the true age of each level, its height, its VGP latitude.
struct Synth {
    seed: u64,
    ages: Vec<f64>,
    heights: Vec<f64>,
    vgp: Vec<f64>,
}

/// Accumulation rate at age t (m/Myr): 20 m/Myr ± 30 %, varying with a 1.3 Myr period; zero inside the
/// removed intervals (hiatuses).
fn rate(t: f64, hiatus: &[(f64, f64)]) -> f64 {
    if hiatus.iter().any(|&(a, b)| t > a && t < b) {
        0.0
    } else {
        20.0 * (1.0 + 0.3 * (std::f64::consts::TAU * t / 1.3).sin())
    }
}

/// Generate a section spanning ages [young, old] Ma; levels spaced 0.5–1.3 m at random; 1 level in 20 is
/// noisy (VGP latitude near the equator), the rest scatter 55–85° about the pole of their chron.
fn synth(ts: &TimeScale, young: f64, old: f64, hiatus: &[(f64, f64)], seed: u64) -> Synth {
    let mut rng = replicate_rng(seed, 6, 0);
    // Height as a function of age on a fine grid (trapezoid rule), height 0 at the oldest age.
    let n = 40_000;
    let dt = (old - young) / n as f64;
    let mut grid = vec![(old, 0.0)];
    for i in 1..=n {
        let t1 = old - dt * i as f64;
        let h = grid[i - 1].1 + 0.5 * (rate(t1, hiatus) + rate(t1 + dt, hiatus)) * dt;
        grid.push((t1, h));
    }
    let top = grid[n].1;
    let mut s = Synth { seed, ages: vec![], heights: vec![], vgp: vec![] };
    let mut h = 0.2;
    let mut k = 0;
    while h < top {
        while grid[k + 1].1 < h {
            k += 1;
        }
        let (a, b) = (grid[k], grid[k + 1]);
        let age = a.0 + (h - a.1) / (b.1 - a.1) * (b.0 - a.0);
        let chron = ts.chrons.iter().find(|c| age >= c.young && age < c.old).unwrap();
        let sign = if chron.polarity == crate::model::Polarity::Normal { 1.0 } else { -1.0 };
        let lat = if rng.random::<f64>() < 0.05 {
            rng.random_range(-30.0..30.0)
        } else {
            sign * rng.random_range(55.0..85.0)
        };
        s.ages.push(age);
        s.heights.push((h * 1000.0f64).round() / 1000.0);
        s.vgp.push(lat);
        h += rng.random_range(0.5..1.3);
    }
    s
}

fn column_of(s: &Synth) -> ZoneColumn {
    let pol: Vec<ZonePolarity> = s.vgp.iter().map(|&v| classify(v, DEFAULT_THRESHOLD)).collect();
    build_zones(StratAxis::Height, &s.heights, &pol, DEFAULT_MIN_LEVELS).unwrap()
}

/// The true chron-boundary age inside each tie's gap (the boundary crossed between the two levels that
/// bracket the gap), from the known ages of the levels.
fn true_boundary_ages(ts: &TimeScale, s: &Synth, tie: &Tie) -> Vec<f64> {
    let i_lo = s.heights.iter().position(|&h| (h - tie.low).abs() < 1e-9).unwrap();
    let i_hi = s.heights.iter().position(|&h| (h - tie.high).abs() < 1e-9).unwrap();
    let (young, old) = (s.ages[i_hi], s.ages[i_lo]);
    ts.chrons.iter().map(|c| c.old).filter(|&a| a > young && a < old).collect()
}

fn check_truth_ranks_first(ts: &TimeScale, s: &Synth, hiatus: &[(f64, f64)]) -> Candidate {
    let col = column_of(s);
    let res = correlate(&col, ts, &CorrelateOptions::default()).unwrap();
    assert!(res.candidates.len() >= 5, "only {} candidates", res.candidates.len());
    let best = &res.candidates[0];
    for t in &best.ties {
        let truth = true_boundary_ages(ts, s, t);
        assert!(
            truth.iter().any(|&a| (a - t.age).abs() < 1e-9),
            "seed {}: tie at {} m → {} Ma; true boundaries in the gap: {truth:?}",
            s.seed,
            t.position,
            t.age
        );
    }
    // Rates of interior runs agree with the true mean rate within the sampling resolution: each end of a
    // run is placed within its gap, so the thickness is off by at most (g1 + g2) / 2.
    for (i, r) in best.runs.iter().enumerate().filter(|(_, r)| !r.end) {
        let (a, b) = (&best.ties[i - 1], &best.ties[i]);
        let dur_true: f64 = (r.age_old - r.age_young)
            - hiatus.iter().map(|&(x, y)| (y.min(r.age_old) - x.max(r.age_young)).max(0.0)).sum::<f64>();
        let steps = 4000;
        let h_true: f64 = (0..steps)
            .map(|k| rate(r.age_young + (k as f64 + 0.5) * (r.age_old - r.age_young) / steps as f64, hiatus))
            .sum::<f64>()
            * (r.age_old - r.age_young)
            / steps as f64;
        let true_rate = m_per_myr_to_cm_per_kyr(h_true / dur_true);
        let bound = m_per_myr_to_cm_per_kyr(((a.high - a.low) + (b.high - b.low)) / 2.0 / dur_true) + 0.02 * true_rate;
        assert!(
            (r.rate.unwrap() - true_rate).abs() <= bound,
            "run {}–{} m: rate {} vs true {true_rate} (bound {bound})",
            r.top,
            r.base,
            r.rate.unwrap()
        );
    }
    best.clone()
}

#[test]
fn true_correlation_ranks_first_on_synthetic_sections() {
    let ts = scale();
    for seed in 1..=20 {
        let s = synth(&ts, 0.25, 3.45, &[], seed);
        let best = check_truth_ranks_first(&ts, &s, &[]);
        assert!(best.ties.len() >= 8, "seed {seed}: {} ties", best.ties.len());
    }
}

/// Remove C2n (the whole normal chron) and a little of the reversed chrons on either side. Measured: in
/// 17 of these 20 sections the winner skips C2n and every tie is true. In seed 20 the sampled C2r.1n
/// subchron is taken for C2n (a steady-rate reading without a hiatus, which the score prefers when nothing
/// else tells them apart); in seeds 21 and 29 at least one tie of the winner is misplaced (in seed 29 the whole column is put
/// among the C3n chrons, 3.5 Myr too old). A
/// hiatus is exactly where independent age control (an anchor) is needed. The test requires 17 of 20.
#[test]
fn a_chron_removed_by_a_hiatus_is_skipped_by_the_winner() {
    let ts = scale();
    let hiatus = [(1.76, 1.96)];
    let mut good = 0;
    let mut failures = Vec::new();
    for seed in 11..=30 {
        let s = synth(&ts, 0.25, 3.45, &hiatus, seed);
        let r = std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| {
            let best = check_truth_ranks_first(&ts, &s, &hiatus);
            assert!(best.runs.iter().any(|r| r.missing.iter().any(|m| m == "C2n")), "seed {seed}: C2n not skipped");
            assert!(best.ties.iter().all(|t| t.chron_above != "C2n" && t.chron_below != "C2n"));
        }));
        match r {
            Ok(()) => good += 1,
            Err(_) => failures.push(seed),
        }
    }
    assert!(good >= 17, "only {good} of 20 sections correlated correctly; failed seeds {failures:?}");
}

#[test]
fn an_anchor_excludes_candidates_that_contradict_it() {
    let ts = scale();
    let s = synth(&ts, 0.25, 3.45, &[], 3);
    let col = column_of(&s);
    // Anchor a level near the middle of the section at its true age.
    let i = s.heights.len() / 2;
    let opts = CorrelateOptions {
        anchors: vec![DatedLevel { position: s.heights[i], age: s.ages[i], uncertainty: 0.01 }],
        ..Default::default()
    };
    let res = correlate(&col, &ts, &opts).unwrap();
    for c in &res.candidates {
        let a = c.age_at(s.heights[i], StratAxis::Height).unwrap();
        let run = c.runs.iter().find(|r| s.heights[i] <= r.top && s.heights[i] >= r.base).unwrap();
        assert!(s.ages[i] >= run.age_young - 0.01 && s.ages[i] <= run.age_old + 0.01, "rank {}: {a}", c.rank);
    }
    // An anchor at an impossible age removes every candidate.
    let opts = CorrelateOptions {
        anchors: vec![DatedLevel { position: s.heights[i], age: 50.0, uncertainty: 0.0 }],
        ..Default::default()
    };
    assert!(correlate(&col, &ts, &opts).is_err());
}

#[test]
fn bundled_scale_is_valid_and_its_chrons_tile_its_span() {
    let ts = scale();
    assert_eq!(ts.chrons.first().unwrap().name.as_deref(), Some("C1n"));
    assert_eq!(ts.chrons.last().unwrap().name.as_deref(), Some("C3r"));
    let sum: f64 = ts.chrons.iter().map(|c| c.duration()).sum();
    assert!((sum - (ts.old() - ts.young())).abs() < 1e-9, "{sum}");
    assert!(ts.old() >= 5.3);
    // Brunhes–Matuyama boundary 0.781 Ma (commonly stated figure, "about 770 000 years ago" in newer work).
    assert!((ts.chrons[0].old - 0.781).abs() < 1e-12);
    for w in ts.chrons.windows(2) {
        assert_ne!(w[0].polarity, w[1].polarity, "{:?}", w[1].name);
    }
}

#[test]
fn a_column_without_a_polarity_change_cannot_be_correlated() {
    let col = build_zones(StratAxis::Height, &[1.0, 2.0], &[ZonePolarity::Normal; 2], 2).unwrap();
    assert!(correlate(&col, &scale(), &CorrelateOptions::default()).is_err());
}

#[test]
fn correlation_settings_are_checked_before_the_search() {
    assert!(DatedLevel::new(12.0, 1.5, 0.1).is_ok());
    for (p, a, e) in [(12.0, -0.1, 0.0), (12.0, 1.0, -0.2), (f64::NAN, 1.0, 0.0), (1.0, f64::INFINITY, 0.0)] {
        assert!(matches!(DatedLevel::new(p, a, e), Err(crate::Error::OutOfRange { .. })), "{p} {a} {e}");
    }
    let levels = Table::parse("l.csv", b"height,vgp_lat\n1,70\n2,75\n3,-70\n4,-80\n5,60\n6,65\n").unwrap();
    let (col, set) = read_column(&levels, DEFAULT_THRESHOLD, DEFAULT_MIN_LEVELS).unwrap();
    assert_eq!(col.zones.len(), 3);
    assert_eq!(set.map(|s| s.levels.len()), Some(6));
    let bad = [
        CorrelateOptions { candidates: 0, ..Default::default() },
        CorrelateOptions { rate_spread: 0.0, ..Default::default() },
        CorrelateOptions { miss_penalty: -1.0, ..Default::default() },
        CorrelateOptions {
            anchors: vec![DatedLevel { position: 1.0, age: -2.0, uncertainty: 0.0 }],
            ..Default::default()
        },
    ];
    for opts in &bad {
        assert!(correlate(&col, &scale(), opts).is_err(), "{opts:?}");
    }
    assert!(correlate(&col, &scale(), &CorrelateOptions::default()).is_ok());
}
