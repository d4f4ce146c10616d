//! Derivative-free minimisation (Nelder–Mead) and a safeguarded one-dimensional root finder, used
//! by the maximum-likelihood fits. Parameters are optimised on a log scale by the callers, so the
//! search space is unbounded.

/// The result of a minimisation.
#[derive(Debug, Clone, PartialEq)]
pub struct Minimum {
    /// The minimising point.
    pub x: Vec<f64>,
    /// The function value there.
    pub value: f64,
    /// Function evaluations used.
    pub evaluations: usize,
    /// Whether the tolerance was met before the evaluation budget ran out.
    pub converged: bool,
}

/// Minimise `f` from `start` by the Nelder–Mead simplex method.
///
/// `step` is the initial size of the simplex along each axis. Stops when the spread of the function
/// values over the simplex falls below `ftol` (absolute) and the simplex has shrunk below `xtol`,
/// or after `max_eval` evaluations. Non-finite function values are treated as +∞.
///
/// # Formula
/// Standard coefficients: reflection 1, expansion 2, contraction ½, shrink ½.
///
/// # References
/// Nelder, J. A. & Mead, R. (1965), A simplex method for function minimization. *Computer Journal*
/// 7, 308–313. Lagarias, J. C. et al. (1998), *SIAM J. Optim.* 9, 112–147 (convergence in low
/// dimensions).
pub fn nelder_mead<F: FnMut(&[f64]) -> f64>(
    mut f: F,
    start: &[f64],
    step: f64,
    ftol: f64,
    xtol: f64,
    max_eval: usize,
) -> Minimum {
    let n = start.len();
    let mut eval = 0usize;
    let mut g = |x: &[f64], eval: &mut usize| {
        *eval += 1;
        let v = f(x);
        if v.is_finite() {
            v
        } else {
            f64::INFINITY
        }
    };
    let mut simplex: Vec<Vec<f64>> = vec![start.to_vec()];
    for i in 0..n {
        let mut p = start.to_vec();
        p[i] += step;
        simplex.push(p);
    }
    let mut vals: Vec<f64> = simplex.iter().map(|p| g(p, &mut eval)).collect();
    let mut converged = false;
    while eval < max_eval {
        let mut order: Vec<usize> = (0..=n).collect();
        order.sort_by(|&a, &b| vals[a].total_cmp(&vals[b]));
        simplex = order.iter().map(|&i| simplex[i].clone()).collect();
        vals = order.iter().map(|&i| vals[i]).collect();
        let spread = (vals[n] - vals[0]).abs();
        let size =
            simplex[1..].iter().flat_map(|p| p.iter().zip(&simplex[0]).map(|(a, b)| (a - b).abs())).fold(0.0, f64::max);
        if spread <= ftol && size <= xtol {
            converged = true;
            break;
        }
        let centroid: Vec<f64> = (0..n).map(|j| simplex[..n].iter().map(|p| p[j]).sum::<f64>() / n as f64).collect();
        let along = |t: f64| -> Vec<f64> { (0..n).map(|j| centroid[j] + t * (simplex[n][j] - centroid[j])).collect() };
        let xr = along(-1.0);
        let fr = g(&xr, &mut eval);
        if fr < vals[0] {
            let xe = along(-2.0);
            let fe = g(&xe, &mut eval);
            if fe < fr {
                simplex[n] = xe;
                vals[n] = fe;
            } else {
                simplex[n] = xr;
                vals[n] = fr;
            }
        } else if fr < vals[n - 1] {
            simplex[n] = xr;
            vals[n] = fr;
        } else {
            let (xc, fc) = if fr < vals[n] {
                let xc = along(-0.5);
                let fc = g(&xc, &mut eval);
                (xc, fc)
            } else {
                let xc = along(0.5);
                let fc = g(&xc, &mut eval);
                (xc, fc)
            };
            if fc < vals[n].min(fr) {
                simplex[n] = xc;
                vals[n] = fc;
            } else {
                for i in 1..=n {
                    simplex[i] = (0..n).map(|j| simplex[0][j] + 0.5 * (simplex[i][j] - simplex[0][j])).collect();
                    vals[i] = g(&simplex[i], &mut eval);
                }
            }
        }
    }
    let best = (0..=n).min_by(|&a, &b| vals[a].total_cmp(&vals[b])).unwrap_or(0);
    Minimum { x: simplex[best].clone(), value: vals[best], evaluations: eval, converged }
}

/// Root of a decreasing function `g` on (lo, hi) by Newton steps safeguarded with bisection.
///
/// `g` returns the value and derivative. Requires g(lo) > 0 > g(hi); returns `None` otherwise.
///
/// # References
/// Press, W. H. et al. (2007), *Numerical Recipes*, 3rd ed., §9.4 (`rtsafe`).
pub fn newton_bisect<G: FnMut(f64) -> (f64, f64)>(
    mut g: G,
    mut lo: f64,
    mut hi: f64,
    start: f64,
    tol: f64,
) -> Option<f64> {
    let (glo, _) = g(lo);
    let (ghi, _) = g(hi);
    if !(glo > 0.0 && ghi < 0.0) {
        return None;
    }
    let mut x = if start > lo && start < hi { start } else { 0.5 * (lo + hi) };
    for _ in 0..200 {
        let (v, d) = g(x);
        if v == 0.0 {
            return Some(x);
        }
        if v > 0.0 {
            lo = x
        } else {
            hi = x
        }
        let newton = x - v / d;
        let next = if d.is_finite() && d != 0.0 && newton > lo && newton < hi { newton } else { 0.5 * (lo + hi) };
        if (next - x).abs() <= tol * (1.0 + x.abs()) {
            return Some(next);
        }
        x = next;
    }
    Some(x)
}

/// Maximise a smooth function of two parameters by Newton's method from `start`.
///
/// `f` is the function, `derivs` its gradient and Hessian `[∂₀₀, ∂₀₁, ∂₁₁]`, `inside` the domain.
/// A step that leaves the domain or does not increase `f` is halved (up to 40 times). Stops when the
/// increase that the quadratic model predicts, ½ gᵀ(−H)⁻¹g, is below `tol` · (1 + |f|). Returns `None`
/// when the Hessian is not negative definite, a step cannot be made, or `max_iter` steps do not
/// converge: the caller then falls back to [`nelder_mead`].
///
/// # References
/// Nocedal, J. & Wright, S. J. (2006), *Numerical Optimization*, 2nd ed., §3.1 (backtracking) and
/// §3.3 (Newton's method); Boyd, S. & Vandenberghe, L. (2004), *Convex Optimization*, §9.5.1 (the
/// Newton decrement as a stopping rule).
pub fn newton_max2<F, D, I>(f: F, derivs: D, inside: I, start: [f64; 2], tol: f64, max_iter: usize) -> Option<[f64; 2]>
where
    F: Fn([f64; 2]) -> f64,
    D: Fn([f64; 2]) -> ([f64; 2], [f64; 3]),
    I: Fn([f64; 2]) -> bool,
{
    let mut p = start;
    let mut fp = f(p);
    if !(inside(p) && fp.is_finite()) {
        return None;
    }
    for _ in 0..max_iter {
        let (g, h) = derivs(p);
        let det = h[0] * h[2] - h[1] * h[1];
        if !(h[0] < 0.0 && det > 0.0 && det.is_finite() && g[0].is_finite() && g[1].is_finite()) {
            return None;
        }
        // s = −H⁻¹ g.
        let s = [(h[1] * g[1] - h[2] * g[0]) / det, (h[1] * g[0] - h[0] * g[1]) / det];
        let gain = 0.5 * (g[0] * s[0] + g[1] * s[1]);
        if gain <= tol * (1.0 + fp.abs()) {
            return Some(p);
        }
        let mut t = 1.0;
        let mut moved = false;
        for _ in 0..40 {
            let q = [p[0] + t * s[0], p[1] + t * s[1]];
            if inside(q) {
                let fq = f(q);
                if fq.is_finite() && fq >= fp {
                    (p, fp, moved) = (q, fq, true);
                    break;
                }
            }
            t *= 0.5;
        }
        if !moved {
            return None;
        }
    }
    None
}

#[cfg(test)]
mod tests {
    use super::*;

    #[test]
    fn rosenbrock_minimum() {
        // The Rosenbrock (1960) function has its minimum 0 at (1, 1): a standard optimiser check.
        let m = nelder_mead(
            |p| 100.0 * (p[1] - p[0] * p[0]).powi(2) + (1.0 - p[0]).powi(2),
            &[-1.2, 1.0],
            0.5,
            1e-14,
            1e-9,
            5000,
        );
        assert!(m.converged);
        assert!((m.x[0] - 1.0).abs() < 1e-5 && (m.x[1] - 1.0).abs() < 1e-5, "{m:?}");
    }

    #[test]
    fn newton_max2_finds_a_quadratic_maximum() {
        // −(x − 1)² − 2(y + 3)² + xy/2 has its maximum where the gradient vanishes (solved by hand
        // with Cramer's rule):
        let f = |p: [f64; 2]| -(p[0] - 1.0).powi(2) - 2.0 * (p[1] + 3.0).powi(2) + 0.5 * p[0] * p[1];
        let d = |p: [f64; 2]| ([-2.0 * (p[0] - 1.0) + 0.5 * p[1], -4.0 * (p[1] + 3.0) + 0.5 * p[0]], [-2.0, 0.5, -4.0]);
        // −2x + y/2 = −2, x/2 − 4y = 12 → det = 8 − 1/4 = 31/4; x = (8 − 6)/(31/4) = 8/31, y = (−24 + 1)/(31/4) = −92/31.
        let m = newton_max2(f, d, |_| true, [10.0, 10.0], 1e-15, 20).unwrap();
        assert!((m[0] - 8.0 / 31.0).abs() < 1e-12 && (m[1] + 92.0 / 31.0).abs() < 1e-12, "{m:?}");
        // A convex function has no maximum: the Hessian test refuses it.
        assert!(newton_max2(
            |p| p[0] * p[0] + p[1] * p[1],
            |p| ([2.0 * p[0], 2.0 * p[1]], [2.0, 0.0, 2.0]),
            |_| true,
            [1.0, 1.0],
            1e-12,
            20
        )
        .is_none());
    }

    #[test]
    fn newton_finds_sqrt2() {
        let r = newton_bisect(|x| (2.0 - x * x, -2.0 * x), 0.0, 2.0, 1.0, 1e-14).unwrap();
        assert!((r - 2f64.sqrt()).abs() < 1e-12);
        assert!(newton_bisect(|x| (x, 1.0), 0.0, 1.0, 0.5, 1e-12).is_none());
    }
}
