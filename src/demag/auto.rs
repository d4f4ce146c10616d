//! An automatic, reproducible choice of the line segment of each specimen.

use super::ranges::{fit_indices, SpecimenFit};
use crate::model::{Anchor, FitKind, SpecimenSteps};

/// The rule used by [`auto_line`]; every parameter is printed with the results.
///
/// Among all runs of consecutive steps with at least `min_steps` steps whose line fit (with the
/// chosen anchor) has MAD ≤ `max_mad` and DANG ≤ `max_dang`, take the longest; among runs of equal
/// length the one with the smaller MAD; then the earlier one.
///
/// The DANG condition keeps segments that head for the origin (a characteristic component) and
/// rejects a soft overprint segment that does not.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct AutoRule {
    /// Fewest consecutive steps in a segment (≥ 2).
    pub min_steps: usize,
    /// Largest accepted MAD, degrees.
    pub max_mad: f64,
    /// Largest accepted DANG, degrees.
    pub max_dang: f64,
    /// Free or origin-anchored lines.
    pub anchor: Anchor,
}

impl Default for AutoRule {
    fn default() -> Self {
        Self { min_steps: 3, max_mad: 5.0, max_dang: 10.0, anchor: Anchor::Free }
    }
}

/// What the rule found for one specimen.
#[derive(Debug, Clone, PartialEq)]
pub enum AutoOutcome {
    /// A segment satisfied the rule.
    Fitted(SpecimenFit),
    /// No segment did; the reason says why, in words.
    Unfitted(String),
}

/// Apply the rule to one specimen.
pub fn auto_line(sp: &SpecimenSteps, rule: &AutoRule) -> AutoOutcome {
    let n = sp.steps.len();
    let min = rule.min_steps.max(FitKind::Line.min_steps());
    if n < min {
        return AutoOutcome::Unfitted(format!("{n} step(s); the rule needs at least {min} consecutive steps"));
    }
    let mut best: Option<SpecimenFit> = None;
    let mut least_mad: Option<(f64, f64, f64)> = None; // (mad, from, to) of the tightest run seen, for the reason
    let mut least_dang: Option<(f64, f64, f64)> = None;
    for first in 0..n {
        for last in (first + min - 1)..n {
            let Ok(f) = fit_indices(sp, first, last, FitKind::Line, rule.anchor) else {
                continue;
            };
            let dang = f.dang.unwrap_or(f64::INFINITY);
            if least_mad.is_none_or(|m| f.mad < m.0) {
                least_mad = Some((f.mad, f.from, f.to));
            }
            if f.mad <= rule.max_mad && least_dang.is_none_or(|m| dang < m.0) {
                least_dang = Some((dang, f.from, f.to));
            }
            if f.mad > rule.max_mad || dang > rule.max_dang {
                continue;
            }
            let better = match &best {
                None => true,
                Some(b) => f.n_steps > b.n_steps || (f.n_steps == b.n_steps && f.mad < b.mad),
            };
            if better {
                best = Some(f);
            }
        }
    }
    match best {
        Some(f) => AutoOutcome::Fitted(f),
        None => AutoOutcome::Unfitted(match (least_mad, least_dang) {
            (_, Some((d, a, b))) => format!(
                "no run of {min}+ steps has MAD ≤ {}° and DANG ≤ {}°; runs with small MAD miss the origin (least DANG {d:.1}° over steps {a}–{b})",
                rule.max_mad, rule.max_dang),
            (Some((m, a, b)), None) => format!(
                "no run of {min}+ steps has MAD ≤ {}°; the straightest run (steps {a}–{b}) has MAD {m:.1}°",
                rule.max_mad),
            (None, None) => "no run of steps gives a defined line".into(),
        }),
    }
}
