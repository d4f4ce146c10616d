#!/usr/bin/env python3
"""Run lodestone's renewal-model computations and the NumPy/SciPy baseline on the same intervals and
print the times, the ratios and the two sides' results.

Usage: python3 benches/compare_renewal.py [DIR]     (DIR defaults to target/compare)

Writes DIR/renewal300.csv (300 invented interval lengths drawn from a gamma distribution, shape 2,
scale 0.125 Myr, NumPy default_rng(20261203), plus one open chron of 0.78 Myr entered as right-censored,
as in benches/renewal.rs), runs benches/baseline_renewal.py and `cargo bench --bench compare_renewal`
on it, and prints:
  - a table of seconds and baseline/lodestone ratios (lodestone on 2 threads and on 1);
  - the fitted parameters and log-likelihoods of both sides, with the stated tolerances checked;
  - the goodness-of-fit statistics (the same data and fits: must agree) and their bootstrap
    p-values (different random streams: agree only within Monte Carlo error).
OPENBLAS_CORETYPE and OPENBLAS_L2_SIZE are removed from the environment of the NumPy run only.
Exit status 1 when a check fails.
"""
import math
import os
import sys

import numpy as np
import scipy

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)
sys.path.insert(0, HERE)
import baseline_renewal as br  # noqa: E402
from compare import print_ratios, run_both  # noqa: E402
MODELS = ("exponential", "gamma", "weibull", "lognormal", "inverse_gaussian")

# Tolerances of the agreement checks. lodestone maximises the censored likelihoods by Newton's method
# with analytic derivatives (stopping when the predicted gain is below 1e-13 of the log-likelihood;
# Nelder-Mead only as a fallback); the baseline by Newton with the censored term's derivatives by
# central differences, to 1e-10 in the parameters. Both find the same maximum when the parameters
# agree to REL_PARAM and the log-likelihoods to ABS_LOGLIK.
REL_PARAM = 1e-5
ABS_LOGLIK = 1e-8
REL_STAT = 1e-6  # D and A^2 of the data under the fitted model
PARAMS = ("rate", "shape", "scale", "mu", "sigma", "mean")


def write_input(path):
    rng = np.random.default_rng(20261203)
    x = rng.gamma(2.0, 0.125, 300)
    rows = np.column_stack([np.append(x, 0.78), np.append(np.zeros(300), 1.0)])
    np.savetxt(path, rows, delimiter=",", header="length,censored", comments="", fmt=["%.17g", "%d"])


def parse(text):
    times, checks = {}, {}
    for line in text.splitlines():
        parts = line.split()
        if not parts:
            continue
        if parts[0].startswith("check_"):
            kv = dict(p.split("=", 1) for p in parts[1:] if "=" in p)
            checks[parts[0]] = {k: float(v) for k, v in kv.items()}
        elif len(parts) == 2:
            try:
                times[parts[0]] = float(parts[1])
            except ValueError:
                pass
    return times, checks


def rel(a, b):
    return abs(a - b) / max(abs(a), abs(b), 1e-300)


def main():
    d = os.path.abspath(sys.argv[1] if len(sys.argv) > 1 else os.path.join(ROOT, "target", "compare"))
    os.makedirs(d, exist_ok=True)
    path = os.path.join(d, "renewal300.csv")
    if not os.path.exists(path):
        print(f"writing {path}", file=sys.stderr)
        write_input(path)
    py, rs = run_both(d, "baseline_renewal.py", "compare_renewal")
    (t_np, c_np), (t_rs, c_rs) = parse(py), parse(rs)
    print(f"NumPy {np.__version__}, SciPy {scipy.__version__}; input {path}")
    for line in py.splitlines():
        if line.startswith("note_"):
            print("  baseline", line)
    print()
    print_ratios(t_np, t_rs)

    failures = []

    def pair(kind, m):
        a, b = c_np.get(f"check_{kind}_{m}"), c_rs.get(f"check_{kind}_{m}")
        if a is None or b is None:
            failures.append(f"{m}: check_{kind} missing from one side")
            return None
        return a, b
    print(f"\nfitted parameters (tolerance: relative {REL_PARAM:g}; log-likelihood {ABS_LOGLIK:g} absolute)")
    print(f"{'model':18} {'param':6} {'NumPy/SciPy':>18} {'lodestone':>18} {'rel. diff':>10}")
    for m in MODELS:
        if (ab := pair("fit", m)) is None:
            continue
        a, b = ab
        for k in a:
            if k not in b or k == "loglik_scipy":
                continue
            if k == "loglik":
                diff, tol = abs(a[k] - b[k]), ABS_LOGLIK
            else:
                diff, tol = rel(a[k], b[k]), REL_PARAM
            checked = k == "loglik" or k in PARAMS
            bad = checked and not diff <= tol
            if bad:
                failures.append(f"{m} {k}: {a[k]!r} against {b[k]!r}")
            note = "  <-- differs" if bad else ("" if checked else "  (derived)")
            print(f"{m:18} {k:6} {a[k]:18.10g} {b[k]:18.10g} {diff:10.1e}{note}")
    lr_a, lr_b = c_np.get("check_lr", {}), c_rs.get("check_lr", {})
    if lr_a and lr_b:
        print(f"{'LR gamma/exp':18} {'stat':6} {lr_a['statistic']:18.10g} {lr_b['statistic']:18.10g} {abs(lr_a['statistic'] - lr_b['statistic']):10.1e}")
        print(f"{'':18} {'p':6} {lr_a['p_value']:18.10g} {lr_b['p_value']:18.10g}")

    print("\nlodestone's fits evaluated by scipy.stats (logpdf + logsf) against lodestone's own log-likelihood")
    x, c = br.load(path)
    for m in MODELS:
        b = c_rs.get(f"check_fit_{m}")
        if b is None:
            continue
        p = tuple(b[k] for k in br.PARAM_NAMES[m])
        ll = br.loglik(m, p, x, c)
        diff = abs(ll - b["loglik"])
        bad = diff > 1e-8 * max(1.0, abs(ll))
        if bad:
            failures.append(f"{m}: lodestone log-likelihood {b['loglik']!r}, scipy.stats {ll!r}")
        print(f"{m:18} scipy.stats {ll:18.10f}  lodestone {b['loglik']:18.10f}  diff {diff:.1e}{'  <-- differs' if bad else ''}")

    print(f"\ngoodness of fit (D, A^2: same data and fit, tolerance {REL_STAT:g} relative; p-values: different "
          f"random streams, 10 000 replicates each, agreement within 4 combined standard errors)")
    print(f"{'model':18} {'D np':>9} {'D lode':>9} {'A2 np':>9} {'A2 lode':>9} {'ks_p np':>8} {'ks_p lode':>9} {'ad_p np':>8} {'ad_p lode':>9}")
    for m in MODELS:
        if (ab := pair("gof", m)) is None:
            continue
        a, b = ab
        for k in ("ks_d", "ad"):
            if rel(a[k], b[k]) > REL_STAT:
                failures.append(f"{m} {k}: {a[k]!r} against {b[k]!r}")
        for k in ("ks_p", "ad_p"):
            p = 0.5 * (a[k] + b[k])
            se = math.sqrt(max(p * (1 - p), 1.0 / a["resamples"]) * (1 / a["resamples"] + 1 / b["resamples"]))
            if abs(a[k] - b[k]) > 4 * se:
                failures.append(f"{m} {k}: {a[k]} against {b[k]} (4 s.e. = {4 * se:.4f})")
        print(f"{m:18} {a['ks_d']:9.5f} {b['ks_d']:9.5f} {a['ad']:9.4f} {b['ad']:9.4f} {a['ks_p']:8.4f} {b['ks_p']:9.4f} {a['ad_p']:8.4f} {b['ad_p']:9.4f}")

    alt = [(k, v) for k, v in c_np.items() if k.startswith(("check_stats_", "check_optimize_"))]
    if alt:
        print("\nthe other SciPy formulations of the single fits (for information; scipy.stats `fit` stops at "
              "its optimiser's default tolerance)")
        for k, v in alt:
            print(f"  {k:34} " + " ".join(f"{kk}={vv:.8g}" for kk, vv in v.items()))

    if failures:
        print("\nCHECKS FAILED:")
        for f in failures:
            print("  " + f)
        sys.exit(1)
    print("\nall agreement checks passed")


if __name__ == "__main__":
    main()
