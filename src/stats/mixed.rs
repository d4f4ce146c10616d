//! Combined mean of directions (lines) and great circles (planes).

use super::fisher::{FisherStats, Precision};
use crate::error::{check_range, Error, Result};
use crate::sphere::{Direction, Vec3};
use crate::tolerance;

/// Result of the combined line-and-plane mean.
#[derive(Debug, Clone, PartialEq, serde::Serialize)]
pub struct MixedStats {
    /// Number of lines, M.
    pub n_lines: usize,
    /// Number of planes (great circles), N.
    pub n_planes: usize,
    /// Effective sample size N' = M + N/2 used in the confidence cone.
    pub n_eff: f64,
    /// Mean direction.
    pub mean: Direction,
    /// Length of the resultant of the lines and the points chosen on the circles.
    pub r: f64,
    /// Precision estimate k (infinite when all vectors coincide); `None` when it is undefined: two
    /// great circles and no line always meet, so their R = 2 says nothing about dispersion.
    pub k: Option<Precision>,
    /// Cone half-angle at the requested confidence, degrees (`None` when undefined).
    pub alpha: Option<f64>,
    /// The confidence level used for `alpha`.
    pub confidence: f64,
    /// For each plane, the point on its great circle nearest the mean (in input order).
    pub circle_points: Vec<Direction>,
    /// Iterations used.
    pub iterations: usize,
    /// How the sense of the mean was chosen when there are no lines (`None` when lines fix it).
    pub sense: Option<CircleSense>,
}

/// How the sense of a mean of great circles only was chosen: the circles fix an axis, not which end
/// of it the remanence points to.
#[derive(Debug, Clone, Copy, PartialEq, Eq, serde::Serialize)]
#[serde(rename_all = "snake_case", tag = "rule")]
pub enum CircleSense {
    /// From the demagnetization paths: `toward` circles move toward the chosen end, `away` toward the
    /// other (the majority decides).
    FromPaths {
        /// Circles whose path moves toward the chosen end.
        toward: usize,
        /// Circles whose path moves toward the opposite end.
        away: usize,
    },
    /// Nothing decides (no path directions, or a tie): the lower-hemisphere end is given, and the
    /// opposite sense is equally possible.
    Undetermined,
}

impl MixedStats {
    /// The same numbers in the shape of [`FisherStats`] (n = M + N; θ63 = 81/√k).
    pub fn as_fisher(&self) -> FisherStats {
        FisherStats {
            n: self.n_lines + self.n_planes,
            mean: Some(self.mean),
            r: self.r,
            k: self.k,
            alpha: self.alpha,
            confidence: self.confidence,
            theta63: self.k.map(|k| if k.is_infinite() { 0.0 } else { 81.0 / k.0.sqrt() }),
        }
    }
}

/// The point of the great circle with pole `pole` nearest `m` (both unit vectors); `None` when `m`
/// is the pole itself (every point of the circle is equally near).
fn nearest_on_circle(pole: Vec3, m: Vec3) -> Option<Vec3> {
    (m - pole * pole.dot(m)).normalized()
}

/// Cone half-angle of the combined mean.
///
/// # Formula
/// cos α = 1 − ((N' − 1)/(k R)) · ((1/p)^(1/(N'−1)) − 1), p = 1 − confidence, N' = M + N/2.
/// With N = 0 this is Fisher's cone exactly, since then (N' − 1)/k = M − R.
///
/// # References
/// McFadden, P. L. & McElhinny, M. W. (1988), The combined analysis of remagnetization circles and
/// direct observations in palaeomagnetism, *Earth Planet. Sci. Lett.* 87, 161–172 (from memory).
pub fn mixed_cone(n_eff: f64, r: f64, k: f64, confidence: f64) -> Option<f64> {
    if !(n_eff > 1.0 && r > 0.0 && confidence > 0.0 && confidence < 1.0) {
        return None;
    }
    if k.is_infinite() {
        return Some(0.0);
    }
    let p = 1.0 - confidence;
    let c = 1.0 - ((n_eff - 1.0) / (k * r)) * ((1.0 / p).powf(1.0 / (n_eff - 1.0)) - 1.0);
    if c < -1.0 {
        None
    } else {
        Some(c.min(1.0).acos().to_degrees())
    }
}

/// Which end of the axis `m` the demagnetization paths move toward. `paths[i]` is the last step used
/// on circle i, with its pole signed so that the path turns anticlockwise about it (as
/// [`crate::demag::PlaneFit`] gives it). On circle i the path moves along pᵢ × x; it moves toward m
/// when (pᵢ × xᵢ)·m > 0, i.e. m lies ahead of the last step within half a turn.
fn circle_sense(poles: &[Vec3], paths: &[Option<Vec3>], m: Vec3) -> (Vec3, CircleSense) {
    let (mut toward, mut away) = (0usize, 0usize);
    for (p, x) in poles.iter().zip(paths) {
        let Some(x) = x else { continue };
        let s = p.cross(*x).dot(m);
        if s > 1e-12 {
            toward += 1;
        } else if s < -1e-12 {
            away += 1;
        }
    }
    match toward.cmp(&away) {
        std::cmp::Ordering::Greater => (m, CircleSense::FromPaths { toward, away }),
        std::cmp::Ordering::Less => (-m, CircleSense::FromPaths { toward: away, away: toward }),
        std::cmp::Ordering::Equal => (m, CircleSense::Undetermined),
    }
}

/// Combined mean of M directions and N great circles (given by their poles).
///
/// See [`mixed_mean_with_paths`]; here no circle carries the direction of its demagnetization path,
/// so a mean of circles only has an undetermined sense.
pub fn mixed_mean(lines: &[Direction], planes: &[Direction], confidence: f64) -> Result<MixedStats> {
    mixed_mean_with_paths(lines, planes, &vec![None; planes.len()], confidence)
}

/// Combined mean of M directions and N great circles (given by their poles), each circle optionally
/// with the last demagnetization step used in its fit (`paths`, one entry per plane).
///
/// # Units
/// Directions and poles in degrees; `confidence` a probability (0.95 for α95).
///
/// # Formula
/// Start from the mean of the lines (or, with lines absent, the axis most nearly perpendicular to
/// every pole: the least eigenvector of the poles' orientation matrix, taken on the lower
/// hemisphere). Repeat until the mean moves less than 1e-12 rad: for each circle take the point xᵢ
/// nearest the current mean, then mean = (Σ lines + Σ xᵢ)/R.
/// k = (2M + N − 2)/(2(M + N − R)); the cone from [`mixed_cone`]. With N = 0 this is the Fisher
/// mean, k = (M − 1)/(M − R) and α95 of Fisher (1953) exactly (tested). With M = 0 and N = 2, k, the
/// cone and θ63 are undefined (`None`): two circles always meet, so R = 2 whatever the scatter.
///
/// # Sense of a mean of circles only
/// Circles fix an axis, not its sense. The sense is taken from the paths: each circle whose last step
/// is given votes for the end of the axis its path moves toward (see `circle_sense`); the majority
/// decides and the count is reported. With no votes or a tie the lower-hemisphere end is given and
/// [`CircleSense::Undetermined`] says so. The path rule is the common practice of following the
/// demagnetization trend toward the stable endpoint (Halls 1976; McFadden & McElhinny 1988).
///
/// # References
/// McFadden & McElhinny (1988), eqs. for k and α95 (from memory, checked in the tests against the
/// Fisher limit and against a brute-force minimisation).
pub fn mixed_mean_with_paths(
    lines: &[Direction],
    planes: &[Direction],
    paths: &[Option<Direction>],
    confidence: f64,
) -> Result<MixedStats> {
    check_range("confidence", confidence, 1e-12, 1.0 - 1e-12, "(0, 1)")?;
    if paths.len() != planes.len() {
        return Err(Error::LengthMismatch {
            left_what: "path ends",
            left: paths.len(),
            right_what: "great circles",
            right: planes.len(),
        });
    }
    let (m, n) = (lines.len(), planes.len());
    if m + n < 2 || (m == 0 && n < 2) {
        return Err(Error::TooFew {
            what: "a combined mean of lines and great circles",
            needed: 2,
            got: m + n,
            unit: "directions or circles (two circles at least when there are no lines)",
        });
    }
    let lv: Vec<Vec3> = lines.iter().map(|d| d.to_vector()).collect();
    let pv: Vec<Vec3> = planes.iter().map(|d| d.to_vector()).collect();
    let n_eff = m as f64 + n as f64 / 2.0;
    let line_sum = lv.iter().fold(Vec3::ZERO, |a, b| a + *b);
    if n == 0 && m < 2 {
        return Err(Error::TooFew { what: "a combined mean", needed: 2, got: m, unit: "directions" });
    }
    let mut mean = if m > 0 {
        line_sum
            .normalized()
            .ok_or_else(|| Error::Undefined("the lines cancel out (R ≈ 0): no starting mean".into()))?
    } else {
        let e = super::principal_axes(&pv);
        if e.values[1] - e.values[2] <= 1e-12 * e.values[0].max(1e-300) {
            return Err(Error::Undefined(
                "the great circles do not intersect in one direction (their poles are identical or spread evenly)"
                    .into(),
            ));
        }
        e.vectors[2]
    };
    let mut sense = None;
    if m == 0 {
        let down = if mean.z < 0.0 { -mean } else { mean };
        let ends: Vec<Option<Vec3>> = paths.iter().map(|d| d.map(|d| d.to_vector())).collect();
        let (chosen, rule) = circle_sense(&pv, &ends, down);
        mean = chosen;
        sense = Some(rule);
    }
    let mut points = vec![Vec3::ZERO; n];
    let mut iterations = 0;
    let mut sum = line_sum;
    for it in 1..=10_000 {
        iterations = it;
        sum = line_sum;
        for (i, p) in pv.iter().enumerate() {
            let x = nearest_on_circle(*p, mean).ok_or_else(|| {
                Error::Undefined(format!(
                    "the mean coincides with the pole of great circle {}: its nearest point is undefined",
                    i + 1
                ))
            })?;
            points[i] = x;
            sum += x;
        }
        let next = sum
            .normalized()
            .ok_or_else(|| Error::Undefined("the lines and circle points cancel out (R ≈ 0)".into()))?;
        let moved = crate::sphere::angle_between(next, mean).to_radians();
        mean = next;
        if moved < 1e-12 {
            break;
        }
    }
    let r = sum.norm().min((m + n) as f64);
    let total = (m + n) as f64;
    let nr = total - r;
    let k = if m == 0 && n == 2 {
        None
    } else if nr <= tolerance::IDENTICAL * total {
        Some(f64::INFINITY)
    } else {
        Some((2.0 * m as f64 + n as f64 - 2.0) / (2.0 * nr))
    };
    let alpha = k.and_then(|k| mixed_cone(n_eff, r, k, confidence));
    Ok(MixedStats {
        n_lines: m,
        n_planes: n,
        n_eff,
        mean: Direction::from_vector(mean).expect("unit"),
        r,
        k: k.map(Precision),
        alpha,
        confidence,
        circle_points: points.into_iter().map(|x| Direction::from_vector(x).expect("unit")).collect(),
        iterations,
        sense,
    })
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::stats::fisher_mean;
    use approx::assert_abs_diff_eq;

    fn dirs(v: &[(f64, f64)]) -> Vec<Direction> {
        v.iter().map(|&(d, i)| Direction::new(d, i).unwrap()).collect()
    }

    #[test]
    fn without_planes_it_is_fisher_exactly() {
        // The same six directions as the SciPy-checked Fisher test (scipy.stats.directional_stats,
        // SciPy 1.17.1): the combined mean with N = 0 must give Fisher's mean, R, k and α95.
        let d = dirs(&[(12.0, 45.0), (20.0, 51.0), (355.0, 38.0), (8.0, 60.0), (25.0, 40.0), (2.0, 47.0)]);
        let f = fisher_mean(&d, 0.95).unwrap();
        let m = mixed_mean(&d, &[], 0.95).unwrap();
        assert_abs_diff_eq!(m.mean.dec, 10.22770404794826, epsilon = 1e-9);
        assert_abs_diff_eq!(m.mean.inc, 47.316300335867986, epsilon = 1e-9);
        assert_abs_diff_eq!(m.r, f.r, epsilon = 1e-12);
        assert_abs_diff_eq!(m.k.unwrap().0, f.k.unwrap().0, epsilon = 1e-9);
        assert_abs_diff_eq!(m.alpha.unwrap(), f.alpha.unwrap(), epsilon = 1e-9);
        assert_abs_diff_eq!(m.as_fisher().theta63.unwrap(), f.theta63.unwrap(), epsilon = 1e-9);
        // The cone formula alone, at another level, also reduces to Fisher's (N' = M).
        assert_abs_diff_eq!(
            mixed_cone(6.0, f.r, f.k.unwrap().0, 0.99).unwrap(),
            crate::stats::confidence_cone(6, f.r, 0.99).unwrap(),
            epsilon = 1e-9
        );
    }

    #[test]
    fn mean_maximises_the_resultant_as_scipy_finds() {
        // The combined mean maximises m·Σlines + Σ sqrt(1 − (m·pᵢ)²) over unit m (each circle point
        // is the nearest to m). scipy.optimize.minimize (Nelder-Mead, SciPy 1.17.1) on these data
        // finds the maximum at dec 3.88943373, inc 50.26533193 with value R = 6.913500479025619.
        let lines = dirs(&[(12.0, 45.0), (20.0, 51.0), (355.0, 38.0), (8.0, 60.0)]);
        let poles = dirs(&[(100.0, 10.0), (290.0, -20.0), (200.0, 30.0)]);
        let m = mixed_mean(&lines, &poles, 0.95).unwrap();
        assert_abs_diff_eq!(m.mean.dec, 3.88943373, epsilon = 1e-6);
        assert_abs_diff_eq!(m.mean.inc, 50.26533193, epsilon = 1e-6);
        assert_abs_diff_eq!(m.r, 6.913500479025619, epsilon = 1e-9);
        // k and α95 by the McFadden & McElhinny (1988) expressions, evaluated by hand here.
        let k = (2.0 * 4.0 + 3.0 - 2.0) / (2.0 * (7.0 - m.r));
        assert_abs_diff_eq!(m.k.unwrap().0, k, epsilon = 1e-9);
        let ne = 5.5;
        let ca = 1.0 - ((ne - 1.0) / (k * m.r)) * (20f64.powf(1.0 / (ne - 1.0)) - 1.0);
        assert_abs_diff_eq!(m.alpha.unwrap(), ca.acos().to_degrees(), epsilon = 1e-9);
        // Each circle point lies on its circle (90° from the pole).
        for (x, p) in m.circle_points.iter().zip(&poles) {
            assert_abs_diff_eq!(x.angle_to(*p), 90.0, epsilon = 1e-9);
        }
    }

    #[test]
    fn two_circles_meet_at_their_intersection() {
        // Analytic: the circle with pole east holds north and down; the circle with pole north holds
        // east and down; they meet at the vertical (down).
        let m = mixed_mean(&[], &dirs(&[(90.0, 0.0), (0.0, 0.0)]), 0.95).unwrap();
        assert_abs_diff_eq!(m.mean.inc, 90.0, epsilon = 1e-9);
        assert_abs_diff_eq!(m.r, 2.0, epsilon = 1e-12);
        // Two circles always meet (R = 2 exactly), so their dispersion is undefined, not zero: k, the
        // cone and θ63 are empty (McFadden & McElhinny 1988 need N' > 1 independent constraints; two
        // circles give exactly one point).
        assert_eq!((m.k, m.alpha, m.as_fisher().theta63), (None, None, None));
        // No path direction was given: the sense is reported as undetermined.
        assert_eq!(m.sense, Some(CircleSense::Undetermined));
        // Too few, identical poles, one plane only: errors, not panics.
        assert!(mixed_mean(&[], &dirs(&[(90.0, 0.0)]), 0.95).is_err());
        assert!(mixed_mean(&[], &dirs(&[(90.0, 0.0), (90.0, 0.0)]), 0.95).is_err());
        assert!(mixed_mean(&dirs(&[(10.0, 10.0)]), &[], 0.95).is_err());
        // A line on the circle: the mean is the line, R = 2, k infinite, cone zero.
        let m = mixed_mean(&dirs(&[(0.0, 30.0)]), &dirs(&[(90.0, 0.0)]), 0.95).unwrap();
        assert_abs_diff_eq!(m.mean.inc, 30.0, epsilon = 1e-9);
        assert!(m.k.unwrap().is_infinite());
        assert_eq!(m.alpha, Some(0.0));
    }

    #[test]
    fn a_mean_of_circles_only_takes_its_sense_from_the_paths() {
        // Three circles through the axis 'up' (inc −90°, a reversed site) with poles east, north and
        // north-east. Each path ends 30° short of the upward end of its circle and moves toward it:
        // circle pole p, last step x; the path moves along p × x (anticlockwise about p).
        let poles =
            [Vec3::new(0.0, 1.0, 0.0), Vec3::new(1.0, 0.0, 0.0), Vec3::new(1.0, 1.0, 0.0).normalized().unwrap()];
        let up = Vec3::new(0.0, 0.0, -1.0);
        let paths: Vec<Option<Direction>> = poles
            .iter()
            .map(|p| {
                // A point 30° from 'up' on the circle, on the side from which p × x turns toward 'up'.
                let t = p.cross(up); // horizontal, on the circle
                let (c, s) = (30f64.to_radians().cos(), 30f64.to_radians().sin());
                let a = up * c + t * s;
                let b = up * c - t * s;
                let x = if p.cross(a).dot(up) > 0.0 { a } else { b };
                Some(Direction::from_vector(x).unwrap())
            })
            .collect();
        let pd: Vec<Direction> = poles.iter().map(|p| Direction::from_vector(*p).unwrap()).collect();
        let m = mixed_mean_with_paths(&[], &pd, &paths, 0.95).unwrap();
        assert_abs_diff_eq!(m.mean.inc, -90.0, epsilon = 1e-9);
        assert_eq!(m.sense, Some(CircleSense::FromPaths { toward: 3, away: 0 }));
        // Without the paths the same circles give the lower-hemisphere end and say it is undetermined.
        let m = mixed_mean(&[], &pd, 0.95).unwrap();
        assert_abs_diff_eq!(m.mean.inc, 90.0, epsilon = 1e-9);
        assert_eq!(m.sense, Some(CircleSense::Undetermined));
        // With one line the line fixes the sense and no rule is reported.
        let m = mixed_mean(&[Direction::new(0.0, -85.0).unwrap()], &pd, 0.95).unwrap();
        assert!(m.mean.inc < -80.0 && m.sense.is_none());
    }
}
