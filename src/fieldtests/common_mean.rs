//! Do two sets of directions share a mean? The McFadden & McElhinny (1990) critical angle, combined
//! with Watson's V_w and a bootstrap of the means into one comparison.

use super::bootstrap_means::{bootstrap_overlap, BootstrapOverlap};
use super::resultant;
use super::watson_v::{watson_v, WatsonV};
use crate::error::{Error, Result};
use crate::montecarlo::MonteCarlo;
use crate::sphere::{angle_between, Direction, Vec3};

/// Quality class of a positive test, after McFadden & McElhinny (1990), from the critical angle γc:
/// A (γc ≤ 5°), B (≤ 10°), C (≤ 20°), indeterminate (γc > 20°); `Negative` when γ > γc.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
pub enum Mm90Class {
    /// γc ≤ 5°.
    A,
    /// 5° < γc ≤ 10°.
    B,
    /// 10° < γc ≤ 20°.
    C,
    /// γc > 20°: the test passes but cannot discriminate.
    #[serde(rename = "indeterminate")]
    Indeterminate,
    /// γ > γc: the means differ.
    #[serde(rename = "negative")]
    Negative,
}

impl Mm90Class {
    /// The name used in output: `A`, `B`, `C`, `indeterminate` or `negative`.
    pub fn name(self) -> &'static str {
        match self {
            Mm90Class::A => "A",
            Mm90Class::B => "B",
            Mm90Class::C => "C",
            Mm90Class::Indeterminate => "indeterminate",
            Mm90Class::Negative => "negative",
        }
    }
    /// Classify an observed angle γ against its critical angle γc (degrees).
    pub fn classify(gamma: f64, gamma_c: f64) -> Self {
        if gamma > gamma_c {
            Mm90Class::Negative
        } else if gamma_c <= 5.0 {
            Mm90Class::A
        } else if gamma_c <= 10.0 {
            Mm90Class::B
        } else if gamma_c <= 20.0 {
            Mm90Class::C
        } else {
            Mm90Class::Indeterminate
        }
    }
}

/// The McFadden & McElhinny (1990) part of a comparison.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct Mm90 {
    /// Angle between the two means γ, degrees.
    pub gamma: f64,
    /// Critical angle γc at the chosen confidence, degrees (180 when any angle is acceptable): the
    /// angle at which Watson's V_w reaches its simulated critical value ([`watson_critical_angle`]).
    /// It holds whether or not the two sets share a precision.
    pub gamma_c: f64,
    /// The analytic critical angle that assumes one precision for both sets
    /// ([`mm90_critical_angle`]), reported for comparison; it is too small when the precisions differ.
    pub gamma_c_common_k: f64,
    /// Quality class.
    pub class: Mm90Class,
    /// γ ≤ γc.
    pub passed: bool,
}

/// Critical angle between two mean directions that share a precision parameter.
///
/// Valid only when both sets share one precision k; [`compare_means`] classifies with
/// [`watson_critical_angle`] instead and reports this angle beside it.
///
/// # Units
/// Degrees. `confidence` is a probability, e.g. 0.95.
///
/// # Formula
/// Under a common Fisher precision, (N − 2)(R₁ + R₂ − R)/(N − R₁ − R₂) follows F with 2 and 2(N − 2)
/// degrees of freedom (McFadden & Lowes 1981), N = N₁ + N₂. The upper-p point of F(2, 2m) is
/// m(p^(−1/m) − 1), so the largest acceptable resultant is R_c = R₁ + R₂ − (N − R₁ − R₂)(p^(−1/(N−2)) − 1),
/// p = 1 − confidence, and since R² = R₁² + R₂² + 2R₁R₂ cos γ:
/// cos γc = (R_c² − R₁² − R₂²)/(2 R₁ R₂). When R_c ≤ |R₁ − R₂| every angle is acceptable (γc = 180°).
///
/// This is the exact quantile of the F statistic. McFadden & McElhinny (1990) print an approximate
/// closed form for the same angle; the two differ by a few hundredths of a degree near the class
/// limits, so a value read from the paper's formula may fall on the other side of a limit.
///
/// # References
/// McFadden, P. L. & Lowes, F. J. (1981), The discrimination of mean directions drawn from Fisher
/// distributions, *Geophys. J. R. astr. Soc.* 67, 19–33.
/// McFadden, P. L. & McElhinny, M. W. (1990), Classification of the reversal test in palaeomagnetism,
/// *Geophys. J. Int.* 103, 725–729.
pub fn mm90_critical_angle(n1: usize, r1: f64, n2: usize, r2: f64, confidence: f64) -> Result<f64> {
    crate::error::check_range("confidence", confidence, 1e-12, 1.0 - 1e-12, "(0, 1)")?;
    if n1 < 2 || n2 < 2 {
        return Err(Error::TooFew {
            what: "the critical angle of two means",
            needed: 2,
            got: n1.min(n2),
            unit: "directions in each set",
        });
    }
    if !(r1 > 0.0 && r2 > 0.0) {
        return Err(Error::Undefined("a set has no mean direction (its resultant vanishes)".into()));
    }
    let n = (n1 + n2) as f64;
    let s = r1 + r2;
    let p = 1.0 - confidence;
    let d = (n - s).max(0.0) * (p.powf(-1.0 / (n - 2.0)) - 1.0);
    let rc = s - d;
    if rc <= (r1 - r2).abs() {
        return Ok(180.0);
    }
    let c = (rc * rc - r1 * r1 - r2 * r2) / (2.0 * r1 * r2);
    Ok(c.clamp(-1.0, 1.0).acos().to_degrees())
}

/// Critical angle from a critical value of Watson's V_w: the angle γ between the two means at which
/// V_w, with the sets' resultants and precisions held fixed, equals `v_crit`.
///
/// # Units
/// Degrees. `k1`, `k2` are precisions, `r1`, `r2` resultant lengths, `v_crit` is dimensionless.
///
/// # Formula
/// V_w = 2(S_w − R_w), S_w = k₁R₁ + k₂R₂, R_w² = (k₁R₁)² + (k₂R₂)² + 2k₁R₁k₂R₂ cos γ. The critical
/// R_wc = S_w − V_crit/2 gives cos γc = (R_wc² − (k₁R₁)² − (k₂R₂)²)/(2 k₁R₁ k₂R₂); γc = 180° when
/// R_wc ≤ |k₁R₁ − k₂R₂| (every angle acceptable), 0° when V_crit ≤ 0. Since R_w falls as γ grows,
/// γ > γc exactly when V_w > V_crit.
///
/// # References
/// McFadden, P. L. & McElhinny, M. W. (1990), Classification of the reversal test in palaeomagnetism,
/// *Geophys. J. Int.* 103, 725–729 (the critical angle from the simulated critical value of V_w, for
/// sets of different precision); Watson (1983) for V_w.
pub fn watson_critical_angle(k1: f64, r1: f64, k2: f64, r2: f64, v_crit: f64) -> f64 {
    let (a, b) = (k1 * r1, k2 * r2);
    if v_crit <= 0.0 {
        return 0.0;
    }
    let rwc = a + b - v_crit / 2.0;
    if rwc <= (a - b).abs() {
        return 180.0;
    }
    let c = (rwc * rwc - a * a - b * b) / (2.0 * a * b);
    c.clamp(-1.0, 1.0).acos().to_degrees()
}

/// The angle test of two sets from their resultants and an already simulated V_w: γ, the critical
/// angle from V_crit ([`watson_critical_angle`]) and the class; the common-precision angle beside it.
pub fn mm90_test(a: &[Vec3], b: &[Vec3], watson: &WatsonV) -> Result<Mm90> {
    let (sa, sb) = (resultant(a), resultant(b));
    let (r1, r2) = (sa.norm(), sb.norm());
    let gamma = angle_between(sa, sb);
    let gamma_c_common_k = mm90_critical_angle(a.len(), r1, b.len(), r2, watson.confidence)?;
    let (k1, k2) = (super::capped_k(a.len(), r1), super::capped_k(b.len(), r2));
    let gamma_c = watson_critical_angle(k1, r1, k2, r2, watson.v_crit);
    let class = Mm90Class::classify(gamma, gamma_c);
    Ok(Mm90 { gamma, gamma_c, gamma_c_common_k, class, passed: class != Mm90Class::Negative })
}

/// The full comparison of two sets of directions.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct MeanComparison {
    /// Number of directions in the first set.
    pub n1: usize,
    /// Number of directions in the second set.
    pub n2: usize,
    /// Resultant length of the first set.
    pub r1: f64,
    /// Resultant length of the second set.
    pub r2: f64,
    /// Fisher precision estimate of the first set (capped at [`super::K_CAP`]).
    pub k1: f64,
    /// Fisher precision estimate of the second set.
    pub k2: f64,
    /// Mean of the first set.
    pub mean1: Direction,
    /// Mean of the second set.
    pub mean2: Direction,
    /// McFadden & McElhinny (1990) angle test.
    pub mm90: Mm90,
    /// Watson's V_w with a simulated critical value.
    pub watson: WatsonV,
    /// Bootstrap overlap of the mean components.
    pub bootstrap: BootstrapOverlap,
    /// Overall result: the angle test, γ ≤ γc with γc from the simulated V_w. The other two are
    /// reported beside it.
    pub passed: bool,
}

impl MeanComparison {
    /// Whether all three approaches agree on the outcome.
    pub fn agree(&self) -> bool {
        self.mm90.passed == self.watson.passed && self.watson.passed == self.bootstrap.passed
    }
}

/// Compare the means of two sets of unit vectors with all three approaches.
///
/// `mc.resamples` sets both the bootstrap size and the number of simulated pairs for V_w.
///
/// # Formula
/// γ = angle between the two resultant vectors; V_w and its simulated critical value from
/// [`super::watson_v`] (the simulation uses each set's own N and k); γc from that critical value
/// ([`watson_critical_angle`]), so the class holds for unequal precisions; bootstrap from
/// [`super::bootstrap_overlap`].
///
/// # References
/// McFadden & McElhinny (1990); Watson (1983); Tauxe, Kylstra & Constable (1991).
pub fn compare_means(a: &[Vec3], b: &[Vec3], mc: &MonteCarlo, confidence: f64) -> Result<MeanComparison> {
    if a.len() < 2 || b.len() < 2 {
        return Err(Error::TooFew {
            what: "a comparison of two means",
            needed: 2,
            got: a.len().min(b.len()),
            unit: "directions in each set",
        });
    }
    let (sa, sb) = (resultant(a), resultant(b));
    let (r1, r2) = (sa.norm(), sb.norm());
    let nf = |n: usize| n as f64;
    let (mean1, mean2) = match (Direction::from_vector(sa), Direction::from_vector(sb)) {
        (Some(m1), Some(m2)) if r1 > 1e-9 * nf(a.len()) && r2 > 1e-9 * nf(b.len()) => (m1, m2),
        _ => return Err(Error::Undefined("a set has no mean direction: its directions cancel out (R ≈ 0)".into())),
    };
    let watson = watson_v(a, b, mc, confidence)?;
    let mm90 = mm90_test(a, b, &watson)?;
    let bootstrap = bootstrap_overlap(a, b, mc, confidence)?;
    Ok(MeanComparison {
        n1: a.len(),
        n2: b.len(),
        r1,
        r2,
        k1: super::capped_k(a.len(), r1),
        k2: super::capped_k(b.len(), r2),
        mean1,
        mean2,
        passed: mm90.passed,
        mm90,
        watson,
        bootstrap,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::FisherSampler;

    /// Share of simulated pairs with identical true means that the angle test rejects at 95 %:
    /// (with γc from the simulated V_w, with the common-precision γc).
    fn false_rejections(n1: usize, k1: f64, n2: usize, k2: f64, trials: usize, seed: u64) -> (f64, f64) {
        let mean = Direction { dec: 30.0, inc: 55.0 };
        let (s1, s2) = (FisherSampler::new(mean, k1).unwrap(), FisherSampler::new(mean, k2).unwrap());
        let outcomes = MonteCarlo::new(seed, trials).run("size study", 0x5157, |rng, t| {
            let a: Vec<Vec3> = (0..n1).map(|_| s1.sample(rng)).collect();
            let b: Vec<Vec3> = (0..n2).map(|_| s2.sample(rng)).collect();
            let w = watson_v(&a, &b, &MonteCarlo::new(seed ^ (t as u64 + 1) << 20, 400), 0.95).unwrap();
            let m = mm90_test(&a, &b, &w).unwrap();
            (!m.passed, m.gamma > m.gamma_c_common_k)
        });
        let share = |f: fn(&(bool, bool)) -> bool| outcomes.iter().filter(|o| f(o)).count() as f64 / trials as f64;
        (share(|o| o.0), share(|o| o.1))
    }

    #[test]
    fn false_rejection_rate_is_five_percent_for_equal_and_unequal_precisions() {
        // Seeded simulation study of the test's size: pairs of Fisher sets with one true mean, 1500
        // pairs each, V_crit from 400 simulations. A 95 % test should reject 5 % of them; the binomial
        // standard error at 1500 pairs is 0.56 %, so the band 5 ± 2 % is about ±3.5σ. The first two
        // pairs share a precision; the last two are the very unequal cases where the common-precision
        // angle rejects far too often (it is printed for the record, not asserted).
        let pairs = [(15, 30.0, 15, 30.0), (8, 10.0, 12, 10.0), (20, 100.0, 5, 5.0), (30, 60.0, 10, 20.0)];
        for (i, &(n1, k1, n2, k2)) in pairs.iter().enumerate() {
            let (rate, common_k) = false_rejections(n1, k1, n2, k2, 1500, 40 + i as u64);
            println!("{n1}@{k1} vs {n2}@{k2}: rejects {rate:.3} (common-k angle {common_k:.3})");
            assert!((0.03..=0.07).contains(&rate), "{n1}@{k1} vs {n2}@{k2}: rejects {rate}");
        }
    }

    #[test]
    fn critical_angle_matches_the_f_quantile_route() {
        // Reference: SciPy 1.17.1, R_c = S − (N − S)·f.ppf(0.95, 2, 2(N − 2))/(N − 2),
        // γc = degrees(arccos((R_c² − R1² − R2²)/(2 R1 R2))) — the same F statistic, evaluated through
        // SciPy's F quantile instead of the closed form used here.
        let cases = [
            ((10, 9.5, 12, 11.2), 16.3947208451984),
            ((20, 19.6, 20, 19.7), 6.195124032647273),
            ((5, 4.6, 4, 3.5), 40.06396415793824),
        ];
        for ((n1, r1, n2, r2), want) in cases {
            let got = mm90_critical_angle(n1, r1, n2, r2, 0.95).unwrap();
            assert!((got - want).abs() < 1e-9, "{n1} {r1} {n2} {r2}: {got} vs {want}");
        }
    }

    #[test]
    fn watson_angle_puts_v_w_at_its_critical_value() {
        // Two pairs of directions ±θ about two means γc apart: at that angle the V_w of the sets,
        // computed from the vectors by watson_v_statistic, must equal the V_crit that gave γc (the
        // defining property, from V_w = 2(S_w − R_w), Watson 1983).
        let pair = |dec: f64, th: f64| -> Vec<Vec3> {
            vec![Direction::new(dec + th, 0.0).unwrap().to_vector(), Direction::new(dec - th, 0.0).unwrap().to_vector()]
        };
        let (ra, rb) = (2.0 * 4f64.to_radians().cos(), 2.0 * 9f64.to_radians().cos());
        let (ka, kb) = (1.0 / (2.0 - ra), 1.0 / (2.0 - rb));
        for v_crit in [0.5, 3.0, 7.5] {
            let gc = watson_critical_angle(ka, ra, kb, rb, v_crit);
            let v = super::super::watson_v_statistic(&pair(0.0, 4.0), &pair(gc, 9.0));
            assert!((v - v_crit).abs() < 1e-7 * v_crit, "V_crit {v_crit}: γc {gc}, V_w {v}");
        }
        assert_eq!(watson_critical_angle(ka, ra, kb, rb, 0.0), 0.0);
        assert_eq!(watson_critical_angle(ka, ra, kb, rb, 1e9), 180.0);
    }

    #[test]
    fn critical_angle_edges() {
        // Perfectly concentrated sets: no room for any angle.
        assert_eq!(mm90_critical_angle(3, 3.0, 3, 3.0, 0.95).unwrap(), 0.0);
        // Very scattered small sets: every angle is acceptable.
        assert_eq!(mm90_critical_angle(2, 0.2, 2, 0.3, 0.95).unwrap(), 180.0);
        assert!(mm90_critical_angle(1, 1.0, 5, 4.0, 0.95).is_err());
        assert!(mm90_critical_angle(2, 0.0, 5, 4.0, 0.95).is_err());
    }

    #[test]
    fn classes_follow_the_published_limits() {
        // Class limits 5°, 10°, 20° (McFadden & McElhinny 1990).
        assert_eq!(Mm90Class::classify(1.0, 4.9), Mm90Class::A);
        assert_eq!(Mm90Class::classify(1.0, 5.0), Mm90Class::A);
        assert_eq!(Mm90Class::classify(1.0, 9.0), Mm90Class::B);
        assert_eq!(Mm90Class::classify(1.0, 19.0), Mm90Class::C);
        assert_eq!(Mm90Class::classify(1.0, 25.0), Mm90Class::Indeterminate);
        assert_eq!(Mm90Class::classify(12.0, 11.0), Mm90Class::Negative);
    }
}
