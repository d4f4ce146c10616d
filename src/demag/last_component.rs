//! The automatic rule that isolates the last (characteristic) component of a specimen: the segment
//! that decays toward the origin at the highest steps, found by growing a line downward from the
//! last steps until a step departs from it by more than the noise allows.

use super::pca::{fit_line, fit_plane};
use super::ranges::{fit_indices, SpecimenFit};
use crate::error::{check_range, Error, Result};
use crate::model::{Anchor, FitKind, SpecimenSteps};
use crate::sphere::Vec3;
use statrs::distribution::{ContinuousCDF, FisherSnedecor};

/// Parameters of [`last_component`]; every one is printed with the results.
#[derive(Debug, Clone, Copy, PartialEq, serde::Serialize)]
pub struct LastComponentRule {
    /// Fewest steps of a line (≥ 3: two steps always lie on a line, so they test nothing).
    pub min_steps: usize,
    /// Significance level of the test that a step departs from the line of the steps above it.
    pub alpha: f64,
    /// Largest accepted MAD of the line (and of a fallback plane), degrees.
    pub max_mad: f64,
    /// Largest accepted DANG: the line must head for the origin, degrees.
    pub max_dang: f64,
    /// Free or origin-anchored line for the reported direction.
    pub anchor: Anchor,
    /// Fall back to a great circle when no line trends to the origin.
    pub planes: bool,
}

impl Default for LastComponentRule {
    fn default() -> Self {
        Self { min_steps: 3, alpha: 0.05, max_mad: 15.0, max_dang: 10.0, anchor: Anchor::Free, planes: true }
    }
}

impl LastComponentRule {
    /// Check the parameters (min_steps ≥ 3, 0 < alpha < 1, angles in [0, 90]).
    pub fn validate(&self) -> Result<()> {
        if self.min_steps < 3 {
            return Err(Error::TooFew {
                what: "the last-component rule",
                needed: 3,
                got: self.min_steps,
                unit: "steps",
            });
        }
        check_range("alpha", self.alpha, 1e-12, 0.5, "(0, 0.5]")?;
        check_range("max_mad", self.max_mad, 0.0, 90.0, "[0, 90]")?;
        check_range("max_dang", self.max_dang, 0.0, 90.0, "[0, 90]")?;
        Ok(())
    }
}

/// How far to trust an automatic fit.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord, serde::Serialize)]
pub enum Grade {
    /// A line of at least five steps with MAD and DANG both ≤ 5°.
    A,
    /// Any other accepted line.
    B,
    /// A great circle: the last component was not isolated, only the plane holding it.
    C,
}

impl Grade {
    /// The grade of an accepted line: A for five or more steps with MAD and DANG both ≤ 5°, else B
    /// (the one rule for every automatic line, whichever rule chose it).
    pub fn of_line(f: &SpecimenFit) -> Grade {
        if f.n_steps >= 5 && f.mad <= 5.0 && f.dang.is_some_and(|d| d <= 5.0) {
            Grade::A
        } else {
            Grade::B
        }
    }

    /// The letter used in tables.
    pub fn as_str(self) -> &'static str {
        match self {
            Grade::A => "A",
            Grade::B => "B",
            Grade::C => "C",
        }
    }
}

/// The fit the rule chose for one specimen, with its grade and the reason in words.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct AutoChoice {
    /// The fit.
    pub fit: SpecimenFit,
    /// Quality grade.
    pub grade: Grade,
    /// Why this segment: where the growth stopped and what the fit looks like.
    pub reason: String,
}

/// What the rule found for one specimen: a choice, or the reason there is none.
pub type LastOutcome = std::result::Result<AutoChoice, String>;

/// Where the downward growth of a fit stopped.
struct Growth {
    first: usize,
    /// The test that stopped it: (F, critical F, df₁, df₂).
    stop: Option<(f64, f64, f64, f64)>,
}

/// Squared distance of `q` from the fitted line or plane, and its leverage factor.
///
/// For a line through centre c along v, the distance is the component of q − c across v, and the
/// leverage 1 + 1/m + (t − t̄)²/Σ(tⱼ − t̄)² with t the positions along v (as for a prediction in
/// straight-line regression). For a plane the distance is along the pole and the leverage uses the
/// two in-plane coordinates through the same formula summed over both axes.
fn departure(pts: &[Vec3], q: Vec3, kind: FitKind) -> Option<(f64, f64, f64)> {
    let m = pts.len() as f64;
    let c = pts.iter().fold(Vec3::ZERO, |a, p| a + *p) * (1.0 / m);
    let lev_along = |axis: Vec3| {
        let tq = (q - c).dot(axis);
        let stt: f64 = pts.iter().map(|p| (*p - c).dot(axis).powi(2)).sum();
        if stt > 0.0 {
            tq * tq / stt
        } else {
            0.0
        }
    };
    match kind {
        FitKind::Line => {
            let f = fit_line(pts, Anchor::Free).ok()?;
            let v = f.direction.to_vector();
            let d = q - c;
            let across = d - v * d.dot(v);
            let rss = (f.eigenvalues[1] + f.eigenvalues[2]).max(0.0);
            Some((across.dot(across), 1.0 + 1.0 / m + lev_along(v), rss))
        }
        FitKind::Plane => {
            let f = fit_plane(pts, Anchor::Free).ok()?;
            let n = f.pole.to_vector();
            let d = (q - c).dot(n);
            // In-plane axes: any two orthonormal vectors across the pole.
            let a = if n.x.abs() < 0.9 { Vec3::new(1.0, 0.0, 0.0) } else { Vec3::new(0.0, 1.0, 0.0) };
            let u = (a - n * a.dot(n)).normalized()?;
            let w = n.cross(u);
            Some((d * d, 1.0 + 1.0 / m + lev_along(u) + lev_along(w), f.eigenvalues[2].max(0.0)))
        }
    }
}

/// Residual degrees of freedom per step and fitted parameters of a free line or plane in 3-D.
fn dof(kind: FitKind) -> (f64, f64) {
    match kind {
        // Each step has two coordinates across the line; the line has four parameters.
        FitKind::Line => (2.0, 4.0),
        // One coordinate across the plane; the plane has three parameters.
        FitKind::Plane => (1.0, 3.0),
    }
}

/// Grow a fit of `kind` downward from the steps `first..=last` while each next lower step lies on it
/// within the noise (F-test at level `alpha`).
///
/// # Formula
/// With m steps fitted, RSS the residual sum of squares (λ₂ + λ₃ for a line, λ₃ for a plane) on
/// ν = p·m − q degrees of freedom (p = 2, q = 4 for a line; p = 1, q = 3 for a plane), σ̂² = RSS/ν, and
/// d² the squared distance of the next step from the fit with leverage h:
/// F = d² / (p · σ̂² · h), compared with the (1 − α) quantile of F(p, ν).
/// σ̂² is floored at (10⁻⁶ · largest moment)² so that noise-free data still test sensibly.
///
/// # References
/// Draper, N. R. & Smith, H. (1998), *Applied Regression Analysis*, 3rd ed., Wiley, ch. 1 and 6
/// (prediction variance and the extra-sum-of-squares F-test, common practice); Kirschvink (1980) for
/// the principal-component fits.
fn grow(pts: &[Vec3], first: usize, last: usize, kind: FitKind, alpha: f64) -> Growth {
    let (p, q) = dof(kind);
    let scale = pts.iter().map(|v| v.norm()).fold(0.0f64, f64::max);
    let floor = (1e-6 * scale).powi(2);
    let mut first = first;
    while first > 0 {
        let seg = &pts[first..=last];
        let nu = p * seg.len() as f64 - q;
        let Some((d2, h, rss)) = departure(seg, pts[first - 1], kind) else {
            return Growth { first, stop: None };
        };
        if nu < 1.0 {
            first -= 1; // too few steps to estimate the noise yet: take the step
            continue;
        }
        let s2 = (rss / nu).max(floor);
        let f = d2 / (p * s2 * h);
        let crit = FisherSnedecor::new(p, nu).map(|d| d.inverse_cdf(1.0 - alpha)).unwrap_or(f64::INFINITY);
        if f > crit {
            return Growth { first, stop: Some((f, crit, p, nu)) };
        }
        first -= 1;
    }
    Growth { first, stop: None }
}

/// The last step worth fitting: the highest index whose window of `min` steps ending there has a
/// free-line MAD within `max_mad` (steps above it scatter about the origin at the noise floor).
fn last_usable(pts: &[Vec3], min: usize, max_mad: f64) -> usize {
    let n = pts.len();
    (min - 1..n)
        .rev()
        .find(|&e| fit_line(&pts[e + 1 - min..=e], Anchor::Free).is_ok_and(|f| f.mad <= max_mad))
        .unwrap_or(n - 1)
}

fn stop_words(sp: &SpecimenSteps, g: &Growth, what: &str) -> String {
    match g.stop {
        Some((f, crit, p, nu)) => format!(
            "the step below ({}) departs from the {what} (F = {f:.1} > F₁₋α({p}, {nu}) = {crit:.1})",
            sp.steps[g.first - 1].step
        ),
        None if g.first == 0 => format!("every step down to the first lies on the {what}"),
        None => "the growth stopped where the fit became undefined".into(),
    }
}

/// Choose the characteristic (last) component of one specimen.
///
/// 1. Drop trailing steps that scatter about the origin: the segment ends at the highest step
///    whose last `min_steps` steps make a line with MAD ≤ `max_mad`.
/// 2. Grow a line downward from those `min_steps` steps while each next lower step lies on it
///    within the noise (the F-test of `grow`); a step that departs marks where the direction of
///    decay changes, i.e. where a lower-stability component begins.
/// 3. Accept the line if it heads for the origin (DANG ≤ `max_dang`) with MAD ≤ `max_mad`; grade A
///    or B.
/// 4. Otherwise, if `planes`, grow a great circle the same way from the last four steps and accept
///    it with MAD ≤ `max_mad` (grade C): the steps then define only the plane that holds the last
///    component (McFadden & McElhinny 1988 combine such planes with lines).
///
/// # References
/// Kirschvink (1980) for the fits, MAD and planes; Tauxe & Staudigel (2004) for DANG; Draper &
/// Smith (1998) for the F-test; the principle that the characteristic component is the one that
/// decays to the origin at the highest steps is common practice (Butler 1992, ch. 5).
pub fn last_component(sp: &SpecimenSteps, rule: &LastComponentRule) -> LastOutcome {
    let n = sp.steps.len();
    let min = rule.min_steps.max(3);
    if n < min {
        return Err(format!("{n} step(s); the rule needs at least {min}"));
    }
    let pts: Vec<Vec3> = sp.steps.iter().map(|s| s.vector()).collect();
    let last = last_usable(&pts, min, rule.max_mad);
    let g = grow(&pts, last + 1 - min, last, FitKind::Line, rule.alpha);
    let line = fit_indices(sp, g.first, last, FitKind::Line, rule.anchor);
    let mut refusal = String::new();
    if let Ok(f) = line {
        let dang = f.dang.unwrap_or(f64::INFINITY);
        if f.mad <= rule.max_mad && dang <= rule.max_dang {
            let reason = format!(
                "line over steps {}–{}: {}; it heads for the origin (DANG {dang:.1}°, MAD {:.1}°)",
                f.from,
                f.to,
                stop_words(sp, &g, "line"),
                f.mad
            );
            return Ok(AutoChoice { grade: Grade::of_line(&f), fit: f, reason });
        }
        refusal = format!(
            "the last line (steps {}–{}) has MAD {:.1}° and DANG {:.1}° (limits {}° and {}°)",
            f.from, f.to, f.mad, dang, rule.max_mad, rule.max_dang
        );
    }
    if rule.planes && last + 1 >= 4 {
        let gp = grow(&pts, last + 1 - 4, last, FitKind::Plane, rule.alpha);
        if let Ok(f) = fit_indices(sp, gp.first, last, FitKind::Plane, Anchor::Origin) {
            if f.mad <= rule.max_mad {
                let reason = format!(
                    "{refusal}; great circle over steps {}–{} instead: {} (MAD {:.1}°)",
                    f.from,
                    f.to,
                    stop_words(sp, &gp, "plane"),
                    f.mad
                );
                return Ok(AutoChoice { fit: f, grade: Grade::C, reason });
            }
            refusal = format!("{refusal}; the great circle over steps {}–{} has MAD {:.1}°", f.from, f.to, f.mad);
        }
    }
    if refusal.is_empty() {
        refusal = "no line through the last steps is defined".into();
    }
    Err(refusal)
}
