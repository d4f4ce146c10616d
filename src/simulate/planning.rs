//! Sampling plans: how likely a regular grid of levels is to catch a chron of a given thickness.

/// Probability that a stratigraphic interval of `thickness` metres holds at least `min_levels`
/// levels of a regular sampling grid with `spacing` metres, when the interval's position relative to
/// the grid is uniformly random.
///
/// # Formula
/// With x = thickness/spacing, the number of grid points inside is ⌊x⌋ or ⌊x⌋ + 1, the latter with
/// probability x − ⌊x⌋ (geometric probability, common practice). Hence
/// P(N ≥ m) = clamp(x − m + 1, 0, 1); for m = 0 it is 1.
///
/// # Units
/// Metres; returns a probability in [0, 1]. Non-positive or non-finite inputs give 0.
pub fn catch_probability(thickness: f64, spacing: f64, min_levels: usize) -> f64 {
    if min_levels == 0 {
        return 1.0;
    }
    if !(thickness > 0.0 && spacing > 0.0 && thickness.is_finite() && spacing.is_finite()) {
        return 0.0;
    }
    (thickness / spacing - min_levels as f64 + 1.0).clamp(0.0, 1.0)
}

/// Thickness (m) of a chron of `length` Myr laid down at `rate` cm/kyr: 10 · rate · length.
pub fn chron_thickness(length: f64, rate: f64) -> f64 {
    crate::units::cm_per_kyr_to_m_per_myr(rate) * length
}

/// Chron lengths of a sampling plan, Myr: from 5 kyr (shorter than most resolved subchrons) to
/// 0.2 Myr.
pub const PLAN_LENGTHS: [f64; 6] = [0.005, 0.01, 0.02, 0.05, 0.1, 0.2];

/// One row of a sampling plan: a chron length at a rate, its thickness and the chances that a grid
/// of levels catches it once and twice.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct PlanRow {
    /// Chron length, Myr.
    pub length: f64,
    /// Accumulation rate, cm/kyr.
    pub rate: f64,
    /// Thickness of the chron, m ([`chron_thickness`]).
    pub thickness: f64,
    /// Chance that it holds at least one level ([`catch_probability`]).
    pub p_one: f64,
    /// Chance that it holds at least two levels.
    pub p_two: f64,
}

/// The sampling plan of levels every `spacing` m at each of `rates` (cm/kyr): one row per rate and
/// each of [`PLAN_LENGTHS`], rate by rate.
pub fn sampling_plan(spacing: f64, rates: &[f64]) -> Vec<PlanRow> {
    let row = |rate: f64, length: f64| {
        let thickness = chron_thickness(length, rate);
        PlanRow {
            length,
            rate,
            thickness,
            p_one: catch_probability(thickness, spacing, 1),
            p_two: catch_probability(thickness, spacing, 2),
        }
    };
    rates.iter().flat_map(|&rate| PLAN_LENGTHS.iter().map(move |&length| row(rate, length))).collect()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::montecarlo::MonteCarlo;
    use rand::RngExt;

    #[test]
    fn closed_form_matches_hand_values_and_a_simulation() {
        // Hand values: 0.7 m at 1 m spacing holds a level 70 % of the time; 2.3 m holds two levels
        // always and three 30 % of the time.
        assert!((catch_probability(0.7, 1.0, 1) - 0.7).abs() < 1e-12);
        assert_eq!(catch_probability(2.3, 1.0, 2), 1.0);
        assert!((catch_probability(2.3, 1.0, 3) - 0.3).abs() < 1e-12);
        assert_eq!(catch_probability(0.0, 1.0, 1), 0.0);
        assert_eq!(catch_probability(1.0, 0.0, 1), 0.0);
        assert_eq!(catch_probability(0.5, 1.0, 0), 1.0);
        // 2 cm/kyr for 0.05 Myr = 1 m (unit conversion, 1 cm/kyr = 10 m/Myr).
        assert!((chron_thickness(0.05, 2.0) - 1.0).abs() < 1e-12);
        // The plan at 2 cm/kyr on a 1 m grid: 0.05 Myr is 1 m (caught once for sure, twice never);
        // 0.1 Myr is 2 m (caught twice for sure); rows rate by rate.
        let plan = sampling_plan(1.0, &[2.0, 4.0]);
        assert_eq!(plan.len(), 2 * PLAN_LENGTHS.len());
        let at = |rate: f64, length: f64| *plan.iter().find(|r| r.rate == rate && r.length == length).unwrap();
        assert_eq!((at(2.0, 0.05).p_one, at(2.0, 0.05).p_two), (1.0, 0.0));
        assert_eq!((at(2.0, 0.1).p_one, at(2.0, 0.1).p_two), (1.0, 1.0));
        assert!((at(4.0, 0.02).thickness - 0.8).abs() < 1e-12);
        assert!((plan[6].rate, plan[6].length) == (4.0, 0.005));
        // Simulation: drop an interval of 1.35 m at a uniform offset on a 0.5 m grid and count.
        let (d, s) = (1.35, 0.5);
        let counts = MonteCarlo::new(5, 4000).run("grid", 0, |rng, _| {
            let start = rng.random::<f64>() * s;
            ((start + d) / s).floor() as usize - (start / s).floor() as usize
        });
        for m in 1..=4 {
            let p = counts.iter().filter(|&&c| c >= m).count() as f64 / counts.len() as f64;
            let q = catch_probability(d, s, m);
            let se = (q * (1.0 - q) / 4000.0).sqrt().max(1e-9);
            assert!((p - q).abs() <= 4.0 * se, "m = {m}: simulated {p}, closed form {q}");
        }
    }
}
