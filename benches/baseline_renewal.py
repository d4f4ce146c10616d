#!/usr/bin/env python3
"""Side-by-side baseline for the renewal-model benches: the computations that benches/renewal.rs
times, written plainly in idiomatic, vectorised NumPy/SciPy. Run on request only (by
benches/compare_renewal.py); not part of the tests.

Usage: python3 benches/baseline_renewal.py DIR     (reads DIR/renewal300.csv: columns length,censored)

Items (each timed as the median of a few runs after a warm-up):
  five_fits_300                    five censored maximum-likelihood fits, AIC, BIC, Akaike weights and the
                                   gamma-against-exponential likelihood-ratio test
  <model>_gof_10000                the parametric-bootstrap goodness of fit of one fitted model: 10 000
                                   replicate samples of 300 drawn from the fit, each refitted (censored
                                   length held at its observed value), Kolmogorov-Smirnov D and
                                   Anderson-Darling A^2 of every replicate, bootstrap p-values
  five_fits_plus_gamma_gof_10000   the first item plus the gamma model's bootstrap
  five_fits_plus_five_gof_10000    the first item plus the bootstrap of every model

No Python loop runs over replicates or intervals: every replicate is refitted at once over a
(10 000 x 300) array. Uncensored starting values are the closed-form or Newton (Minka 2002) estimates;
the censored likelihood is then maximised for all replicates together by Newton steps with the
analytic complete-data Hessian and the censored term's gradient by central differences (it is one
observation in 301, so the iteration contracts by about that factor per step). The Weibull fit is
Newton on the profile equation of the shape (Lawless 2003, section 5.2), the same equation lodestone
solves. For the five single fits three formulations are timed and the fastest is reported: scipy.stats
`fit` with `CensoredData`, scipy.optimize.minimize (Nelder-Mead) on the analytic censored
log-likelihood, and the vectorised Newton code on one sample.

Prints one `name seconds` line per item, `note_*` lines with the alternative timings, and `check_*`
lines (`key=value` pairs) with fitted parameters, log-likelihoods, statistics and p-values, for the
comparison with lodestone (benches/compare_renewal.py).

Formulas (the same as lodestone's, src/reversals/):
  censored log-likelihood l = sum ln f(x_i) + ln S(c); AIC = 2k - 2l; BIC = k ln(n + 1) - 2l;
  Akaike weights (Burnham & Anderson 2002, section 2.9); LR = 2(l_gamma - l_exp) ~ chi2_1 (Wilks 1938).
  D = max_i max(i/n - F_(i), F_(i) - (i-1)/n); A^2 = -n - (1/n) sum (2i-1)(ln F_(i) + ln S_(n+1-i))
  (Stephens 1974); p = (1 + #{T* >= T}) / (B + 1) (Davison & Hinkley 1997, eq. 4.11).
"""
import os
import sys

import numpy as np
from scipy import optimize, special, stats

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from baseline_numpy import timed  # noqa: E402  (median of a few runs after a warm-up)

LN_2PI = np.log(2.0 * np.pi)
MODELS = ("exponential", "gamma", "weibull", "lognormal", "inverse_gaussian")
N_PARAMS = {"exponential": 1, "gamma": 2, "weibull": 2, "lognormal": 2, "inverse_gaussian": 2}
PARAM_NAMES = {"exponential": ("rate",), "gamma": ("shape", "scale"), "weibull": ("shape", "scale"),
               "lognormal": ("mu", "sigma"), "inverse_gaussian": ("mean", "shape")}


def load(path):
    rows = np.loadtxt(path, delimiter=",", skiprows=1, ndmin=2)
    x = np.sort(rows[rows[:, 1] == 0, 0])
    c = rows[rows[:, 1] == 1, 0]
    return x, (float(c[0]) if len(c) else None)


class Batch:
    """B samples of n interval lengths (rows), with the sums the likelihoods need, computed once."""

    def __init__(self, x):
        self.x = np.atleast_2d(x)
        self.n = self.x.shape[1]
        self._log = None

    @property
    def log(self):
        if self._log is None:
            self._log = np.log(self.x)
        return self._log

    def sum_x(self):
        return self.x.sum(axis=1)

    def sum_ln(self):
        return self.log.sum(axis=1)


# ---------------------------------------------------------------- the censored term and Newton steps

def censored_newton(p, grad, hess, ln_sf_c, positive, tol=1e-10, max_iter=50):
    """Maximise complete(p) + ln_sf_c(p) for all replicates at once (p: 2 x B).

    Newton steps; the complete-data gradient and Hessian are analytic, the censored term's gradient
    and Hessian come from a nine-point central-difference stencil (steps 1e-5 of each parameter).
    `positive` marks parameters that must stay > 0 (a step that would cross 0 is halved)."""
    p = np.array(p, dtype=float)
    for _ in range(max_iter):
        h = 1e-5 * np.maximum(np.abs(p), 1e-3)
        f0 = ln_sf_c(p)
        fa = {}
        for s0, s1 in ((1, 0), (-1, 0), (0, 1), (0, -1), (1, 1), (1, -1), (-1, 1), (-1, -1)):
            fa[s0, s1] = ln_sf_c(p + np.array([s0 * h[0], s1 * h[1]]))
        g = grad(p)
        g[0] += (fa[1, 0] - fa[-1, 0]) / (2.0 * h[0])
        g[1] += (fa[0, 1] - fa[0, -1]) / (2.0 * h[1])
        h00, h01, h11 = hess(p)
        h00 = h00 + (fa[1, 0] - 2.0 * f0 + fa[-1, 0]) / h[0] ** 2
        h11 = h11 + (fa[0, 1] - 2.0 * f0 + fa[0, -1]) / h[1] ** 2
        h01 = h01 + (fa[1, 1] - fa[1, -1] - fa[-1, 1] + fa[-1, -1]) / (4.0 * h[0] * h[1])
        det = h00 * h11 - h01 * h01
        step = np.array([(h11 * g[0] - h01 * g[1]) / det, (h00 * g[1] - h01 * g[0]) / det])
        new = p - step
        for j in range(2):
            if positive[j]:
                new[j] = np.where(new[j] <= 0, 0.5 * p[j], new[j])
        done = np.all(np.abs(new - p) <= tol * np.maximum(np.abs(p), 1.0))
        p = new
        if done:
            break
    return p


# ---------------------------------------------------------------- the five models, vectorised over rows

def fit_exponential(b, c):
    return (b.n / (b.sum_x() + (c or 0.0)),)


def gamma_complete(b):
    """Uncensored gamma MLE for every row: Newton on 1/a (Minka 2002, eqs. 6 and 8)."""
    n = b.n
    sx, sl = b.sum_x(), b.sum_ln()
    mean = sx / n
    d = np.log(mean) - sl / n
    a = (3.0 - d + np.sqrt((d - 3.0) ** 2 + 24.0 * d)) / (12.0 * d)
    for _ in range(100):
        g = np.log(a) - special.digamma(a) - d
        dg = 1.0 / a - special.polygamma(1, a)
        new = 1.0 / (1.0 / a + g / (a * a * dg))
        done = np.all(np.abs(new - a) <= 1e-12 * a)
        a = new
        if done:
            break
    return a, mean / a, sx, sl


def fit_gamma(b, c):
    a, t, sx, sl = gamma_complete(b)
    if c is None:
        return a, t
    n = b.n

    def grad(p):
        a, t = p
        return np.array([sl - n * (np.log(t) + special.digamma(a)), sx / t ** 2 - n * a / t])

    def hess(p):
        a, t = p
        return -n * special.polygamma(1, a), -n / t, -2.0 * sx / t ** 3 + n * a / t ** 2

    return tuple(censored_newton([a, t], grad, hess, lambda p: np.log(special.gammaincc(p[0], c / p[1])),
                                 (True, True)))


def fit_weibull(b, c):
    """Newton on the profile equation of the shape k, with the censored length in the power sums:
    1/k + mean(ln x_complete) - sum_all x^k ln x / sum_all x^k = 0; lambda^k = sum_all x^k / r."""
    lg = b.log
    r = b.n
    mean_lc = lg.mean(axis=1)
    spread = lg.std(axis=1)
    if c is not None:
        lg = np.concatenate([lg, np.full((lg.shape[0], 1), np.log(c))], axis=1)
    top = lg.max(axis=1)
    ls = lg - top[:, None]  # shifted so that no power overflows
    lc = mean_lc - top
    k = np.pi / (spread * np.sqrt(6.0))  # Gumbel-moment start, as lodestone
    for _ in range(60):
        w = np.exp(k[:, None] * ls)
        s0 = w.sum(axis=1)
        s1 = np.einsum("ij,ij->i", w, ls)
        s2 = np.einsum("ij,ij,ij->i", w, ls, ls)
        m1 = s1 / s0
        g = 1.0 / k + lc - m1
        dg = -1.0 / k ** 2 - (s2 / s0 - m1 * m1)
        new = k - g / dg
        new = np.where(new > 0, new, 0.5 * k)
        done = np.all(np.abs(new - k) <= 1e-12 * k)
        k = new
        if done:
            break
    s0 = np.exp(k[:, None] * ls).sum(axis=1)
    return k, np.exp((np.log(s0) + k * top - np.log(r)) / k)


def fit_lognormal(b, c):
    n = b.n
    sl = b.sum_ln()
    sl2 = np.einsum("ij,ij->i", b.log, b.log)
    mu = sl / n
    sg = np.sqrt(np.maximum(sl2 / n - mu * mu, 0.0))
    if c is None:
        return mu, sg
    lc = np.log(c)

    def grad(p):
        m, s = p
        ss = sl2 - 2.0 * m * sl + n * m * m
        return np.array([(sl - n * m) / s ** 2, ss / s ** 3 - n / s])

    def hess(p):
        m, s = p
        ss = sl2 - 2.0 * m * sl + n * m * m
        return -n / s ** 2, -2.0 * (sl - n * m) / s ** 3, -3.0 * ss / s ** 4 + n / s ** 2

    return tuple(censored_newton([mu, sg], grad, hess, lambda p: special.log_ndtr(-(lc - p[0]) / p[1]),
                                 (False, True)))


def ig_ln_sf(m, lam, x):
    """ln S of the inverse Gaussian, as lodestone computes it (both terms of F in log space)."""
    r = np.sqrt(lam / x)
    a = r * (x / m - 1.0)
    t2 = 2.0 * lam / m + special.log_ndtr(-r * (x / m + 1.0))
    u = special.log_ndtr(-a)
    d = t2 - u
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(d >= 0, -np.inf, u + np.log1p(-np.exp(np.minimum(d, 0.0))))


def fit_inverse_gaussian(b, c):
    n = b.n
    sx = b.sum_x()
    si = (1.0 / b.x).sum(axis=1)
    mu = sx / n
    lam = 1.0 / (si / n - 1.0 / mu)
    if c is None:
        return mu, lam

    def grad(p):
        m, l = p
        return np.array([l * (sx / m ** 3 - n / m ** 2), n / (2.0 * l) - 0.5 * (sx / m ** 2 - 2.0 * n / m + si)])

    def hess(p):
        m, l = p
        return l * (-3.0 * sx / m ** 4 + 2.0 * n / m ** 3), sx / m ** 3 - n / m ** 2, -n / (2.0 * l ** 2)

    return tuple(censored_newton([mu, lam], grad, hess, lambda p: ig_ln_sf(p[0], p[1], c), (True, True)))


FIT = {"exponential": fit_exponential, "gamma": fit_gamma, "weibull": fit_weibull,
       "lognormal": fit_lognormal, "inverse_gaussian": fit_inverse_gaussian}


def cdf_lnsf(model, b, p):
    """F and ln S of every interval under each row's fitted parameters (B x n)."""
    x = b.x
    col = [np.asarray(q)[:, None] if np.ndim(q) else q for q in p]
    if model == "exponential":
        z = col[0] * x
        return -np.expm1(-z), -z
    if model == "weibull":
        z = (x / col[1]) ** col[0]
        return -np.expm1(-z), -z
    if model == "lognormal":
        z = (b.log - col[0]) / col[1]
        return special.ndtr(z), special.log_ndtr(-z)
    if model == "gamma":
        y = x / col[1]
        f = special.gammainc(col[0], y)
        lns = np.log1p(-f)
        tail = f >= 1.0 - 1e-8  # far upper tail: ln S directly, as lodestone
        if tail.any():
            lns[tail] = np.log(special.gammaincc(np.broadcast_to(col[0], x.shape)[tail], y[tail]))
        return f, lns
    if model == "inverse_gaussian":
        m, l = col
        r = np.sqrt(l / x)
        f = np.minimum(np.exp(special.log_ndtr(r * (x / m - 1.0))) + np.exp(2.0 * l / m + special.log_ndtr(-r * (x / m + 1.0))), 1.0)
        lns = np.log1p(-np.minimum(f, 1.0 - 1e-8))
        tail = f >= 1.0 - 1e-8
        if tail.any():
            lns[tail] = ig_ln_sf(np.broadcast_to(m, x.shape)[tail], np.broadcast_to(l, x.shape)[tail], x[tail])
        return f, lns
    raise ValueError(model)


def ks_ad(f, lns):
    """D and A^2 of every row of sorted data (Stephens 1974)."""
    n = f.shape[1]
    i = np.arange(1, n + 1, dtype=float)
    d = np.maximum((i / n - f).max(axis=1), (f - (i - 1) / n).max(axis=1))
    t = np.log(np.maximum(f, 1e-300)) + np.maximum(lns, -690.0)[:, ::-1]
    a = -n - (t @ (2.0 * i - 1.0)) / n
    return d, a


def draw(model, rng, p, shape):
    if model == "exponential":
        return rng.exponential(1.0 / p[0], shape)
    if model == "gamma":
        return rng.gamma(p[0], p[1], shape)
    if model == "weibull":
        return p[1] * rng.weibull(p[0], shape)
    if model == "lognormal":
        return rng.lognormal(p[0], p[1], shape)
    if model == "inverse_gaussian":
        return rng.wald(p[0], p[1], shape)
    raise ValueError(model)


def goodness_of_fit(model, p, x, c, nboot, seed=1):
    p = tuple(float(np.ravel(q)[0]) for q in p)
    d0, a0 = ks_ad(*cdf_lnsf(model, Batch(x), p))
    rng = np.random.default_rng(seed)
    xs = draw(model, rng, p, (nboot, len(x)))
    xs.sort(axis=1)
    b = Batch(xs)
    d, a = ks_ad(*cdf_lnsf(model, b, FIT[model](b, c)))
    ok = np.isfinite(d) & np.isfinite(a)
    m = ok.sum()
    return {"ks_d": d0[0], "ks_p": (1 + (d[ok] >= d0[0]).sum()) / (m + 1),
            "ad": a0[0], "ad_p": (1 + (a[ok] >= a0[0]).sum()) / (m + 1), "resamples": int(m)}


# ---------------------------------------------------------------- the five single fits

def loglik(model, p, x, c):
    """Censored log-likelihood, evaluated with scipy.stats (independent of the fitting code)."""
    d = scipy_dist(model, p)
    return float(d.logpdf(x).sum() + (d.logsf(c) if c is not None else 0.0))


def scipy_dist(model, p):
    if model == "exponential":
        return stats.expon(scale=1.0 / p[0])
    if model == "gamma":
        return stats.gamma(p[0], scale=p[1])
    if model == "weibull":
        return stats.weibull_min(p[0], scale=p[1])
    if model == "lognormal":
        return stats.lognorm(p[1], scale=np.exp(p[0]))
    return stats.invgauss(p[0] / p[1], scale=p[1])  # mean mu, shape lambda: invgauss(mu/lambda, scale=lambda)


def from_scipy(model, fitted):
    if model == "exponential":
        return (1.0 / fitted[1],)
    if model == "lognormal":
        return (np.log(fitted[2]), fitted[0])
    if model == "inverse_gaussian":
        return (fitted[0] * fitted[2], fitted[2])
    return (fitted[0], fitted[2])


SCIPY = {"exponential": stats.expon, "gamma": stats.gamma, "weibull": stats.weibull_min,
         "lognormal": stats.lognorm, "inverse_gaussian": stats.invgauss}


def fits_stats(x, c):
    """Formulation 1: scipy.stats `fit` with CensoredData (location fixed at 0)."""
    data = stats.CensoredData(uncensored=x, right=[c] if c is not None else [])
    return {m: from_scipy(m, SCIPY[m].fit(data, floc=0)) for m in MODELS}


def fits_optimize(x, c):
    """Formulation 2: scipy.optimize.minimize (Nelder-Mead) on the analytic censored log-likelihood,
    on log parameters, from the uncensored closed-form or Newton start."""
    b = Batch(x)
    n, sx, sl = len(x), x.sum(), np.log(x).sum()
    sl2, si = (np.log(x) ** 2).sum(), (1.0 / x).sum()
    out = {"exponential": (n / (sx + (c or 0.0)),)}

    def lnsf(model, p):
        if c is None:
            return 0.0
        if model == "gamma":
            return np.log(special.gammaincc(p[0], c / p[1]))
        if model == "weibull":
            return -(c / p[1]) ** p[0]
        if model == "lognormal":
            return special.log_ndtr(-(np.log(c) - p[0]) / p[1])
        return float(ig_ln_sf(p[0], p[1], c))

    lx = np.log(x)
    complete = {
        "gamma": lambda a, t: (a - 1) * sl - sx / t - n * (a * np.log(t) + special.gammaln(a)),
        "weibull": lambda k, l: n * (np.log(k) - k * np.log(l)) + (k - 1) * sl - np.sum(np.exp(k * (lx - np.log(l)))),
        "lognormal": lambda m, s: -(sl2 - 2 * m * sl + n * m * m) / (2 * s * s) - sl - n * (np.log(s) + 0.5 * LN_2PI),
        "inverse_gaussian": lambda m, l: 0.5 * (n * (np.log(l) - LN_2PI) - 3 * sl) - l * (sx - 2 * n * m + m * m * si) / (2 * m * m),
    }
    starts = {"gamma": gamma_complete(b)[:2], "weibull": (np.pi / (lx.std() * np.sqrt(6.0)), np.exp(lx.mean())),
              "lognormal": (sl / n, np.sqrt(sl2 / n - (sl / n) ** 2)),
              "inverse_gaussian": (sx / n, 1.0 / (si / n - n / sx))}
    for m in MODELS[1:]:
        log_first = m != "lognormal"  # lognormal mu is unbounded

        def to_p(q, log_first=log_first):
            return (np.exp(q[0]) if log_first else q[0], np.exp(q[1]))

        def nll(q, m=m, to_p=to_p):
            p = to_p(q)
            v = complete[m](*p) + lnsf(m, p)
            return -v if np.isfinite(v) else np.inf

        s0 = [float(np.ravel(v)[0]) for v in starts[m]]
        q0 = [np.log(s0[0]) if log_first else s0[0], np.log(s0[1])]
        r = optimize.minimize(nll, q0, method="Nelder-Mead", options={"xatol": 1e-9, "fatol": 1e-12, "maxiter": 4000})
        out[m] = to_p(r.x)
    return out


def fits_newton(x, c):
    """Formulation 3: the vectorised bootstrap code on one sample."""
    b = Batch(x)
    return {m: tuple(float(np.ravel(q)[0]) for q in FIT[m](b, c)) for m in MODELS}


def compare_models(params, x, c):
    """AIC, BIC, Akaike weights and the LR test, from the fitted parameters."""
    n_obs = len(x) + (c is not None)
    ll = {}
    for m, p in params.items():
        ll[m] = loglik_fast(m, p, x, c)
    aic = {m: 2 * N_PARAMS[m] - 2 * ll[m] for m in ll}
    bic = {m: N_PARAMS[m] * np.log(n_obs) - 2 * ll[m] for m in ll}
    best = min(aic.values())
    w = {m: np.exp(-(aic[m] - best) / 2) for m in ll}
    tot = sum(w.values())
    lr = max(2 * (ll["gamma"] - ll["exponential"]), 0.0)
    return {"loglik": ll, "aic": aic, "bic": bic, "weight": {m: w[m] / tot for m in w},
            "lr": lr, "lr_p": stats.chi2.sf(lr, 1)}


def loglik_fast(model, p, x, c):
    """Censored log-likelihood from vectorised formulas (the timed path)."""
    lx = np.log(x)
    if model == "exponential":
        v = len(x) * np.log(p[0]) - p[0] * x.sum()
        return v - (p[0] * c if c is not None else 0.0)
    if model == "gamma":
        a, t = p
        v = ((a - 1) * lx - x / t).sum() - len(x) * (a * np.log(t) + special.gammaln(a))
        return v + (np.log(special.gammaincc(a, c / t)) if c is not None else 0.0)
    if model == "weibull":
        k, l = p
        z = x / l
        v = (np.log(k / l) + (k - 1) * np.log(z) - z ** k).sum()
        return v - ((c / l) ** k if c is not None else 0.0)
    if model == "lognormal":
        m, s = p
        z = (lx - m) / s
        v = (-0.5 * z * z - lx).sum() - len(x) * (np.log(s) + 0.5 * LN_2PI)
        return v + (special.log_ndtr(-(np.log(c) - m) / s) if c is not None else 0.0)
    m, l = p
    v = (0.5 * (np.log(l) - LN_2PI - 3 * lx) - l * (x - m) ** 2 / (2 * m * m * x)).sum()
    return v + (float(ig_ln_sf(m, l, c)) if c is not None else 0.0)


def five_fits(fit_fn, x, c):
    params = fit_fn(x, c)
    return params, compare_models(params, x, c)


def fmt(v):
    return f"{v:.12g}"


def main(d):
    x, c = load(os.path.join(d, "renewal300.csv"))
    nboot = 10_000
    t_fits = {}
    for name, fn, runs in [("stats", fits_stats, 5), ("optimize", fits_optimize, 5), ("newton", fits_newton, 21)]:
        t_fits[name] = timed(runs, lambda fn=fn: five_fits(fn, x, c))
    best = min(t_fits, key=t_fits.get)
    print(f"five_fits_300 {t_fits[best]:.6f}")
    print("note_five_fits_300 " + " ".join(f"{k}={v:.5f}" for k, v in t_fits.items()) + f" reported={best}")

    params, cmp = five_fits(fits_newton, x, c)
    fits = {}
    for m in MODELS:
        p = params[m]
        fits[m] = p
        print(f"check_fit_{m} " + " ".join(f"{k}={fmt(v)}" for k, v in zip(PARAM_NAMES[m], p))
              + f" loglik={fmt(cmp['loglik'][m])} loglik_scipy={fmt(loglik(m, p, x, c))}"
              + f" aic={fmt(cmp['aic'][m])} bic={fmt(cmp['bic'][m])} weight={fmt(cmp['weight'][m])}")
    print(f"check_lr statistic={fmt(cmp['lr'])} p_value={fmt(cmp['lr_p'])}")
    for label, fn in [("stats", fits_stats), ("optimize", fits_optimize)]:
        alt = fn(x, c)
        for m in MODELS:
            print(f"check_{label}_{m} " + " ".join(f"{k}={fmt(v)}" for k, v in zip(PARAM_NAMES[m], alt[m]))
                  + f" loglik_scipy={fmt(loglik(m, alt[m], x, c))}")

    gof = {}
    t_gof = {}
    for m in MODELS:
        t_gof[m] = timed(3, lambda m=m: goodness_of_fit(m, fits[m], x, c, nboot))
        print(f"{m}_gof_10000 {t_gof[m]:.6f}")
        gof[m] = goodness_of_fit(m, fits[m], x, c, nboot)
        print(f"check_gof_{m} " + " ".join(f"{k}={fmt(v)}" for k, v in gof[m].items()))

    fastest = {"stats": fits_stats, "optimize": fits_optimize, "newton": fits_newton}[best]

    def fits_plus(models):
        p, _ = five_fits(fastest, x, c)
        return [goodness_of_fit(m, p[m], x, c, nboot) for m in models]

    print(f"five_fits_plus_gamma_gof_10000 {timed(3, lambda: fits_plus(['gamma'])):.6f}")
    print(f"five_fits_plus_five_gof_10000 {timed(3, lambda: fits_plus(MODELS)):.6f}")


if __name__ == "__main__":
    main(sys.argv[1] if len(sys.argv) > 1 else "target/compare")
