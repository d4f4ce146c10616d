"""fit_renewal and hazard: against the command line's JSON and scipy.stats distributions."""

import math

import numpy as np
import pandas as pd
import pytest
from scipy import optimize, stats

import lodestone
from conftest import read_table, record

SCALE = "timescales/chrons-0-6ma.csv"
PARAMS = ["rate", "shape", "scale", "mu", "sigma", "mean"]


def scipy_model(row):
    """The fitted model as a scipy.stats distribution (parameter mapping from the SciPy documentation)."""
    m = row["model"]
    if m == "exponential":
        return stats.expon(scale=1 / row["rate"])
    if m == "gamma":
        return stats.gamma(a=row["shape"], scale=row["scale"])
    if m == "weibull":
        return stats.weibull_min(c=row["shape"], scale=row["scale"])
    if m == "lognormal":
        return stats.lognorm(s=row["sigma"], scale=math.exp(row["mu"]))
    if m == "inverse_gaussian":
        # IG(mean m, shape λ) is scipy's invgauss(mu = m/λ, scale = λ).
        return stats.invgauss(mu=row["mean"] / row["shape"], scale=row["shape"])
    raise AssertionError(m)


def censored_loglik(dist, complete, censored):
    """ℓ = Σ ln f(xᵢ) + Σ ln S(cⱼ): right censoring of the open chron and of the oldest interval
    (Lawless 2003, §2.2)."""
    return np.sum(dist.logpdf(complete)) + sum(dist.logsf(c) for c in censored)


def censored_lengths(df):
    return [c for c in (df.attrs["censored"], df.attrs["censored_old"]) if c is not None]


def test_fits_match_the_command_line(cli):
    got = lodestone.fit_renewal(record(SCALE))
    want = cli("intervals", record(SCALE), "--resamples", 100)
    assert got.attrs["n_intervals"] == want["n_intervals"]
    assert got.attrs["censored"] == pytest.approx(want["censored"])
    assert got.attrs["censored_old"] == pytest.approx(want["censored_old"])
    assert got.attrs["lr_p_value"] == pytest.approx(want["lr_test"]["p_value"], rel=1e-12)
    assert list(got["model"]) == [m["model"] for m in want["models"]]
    for (_, g), w in zip(got.iterrows(), want["models"]):
        for p in PARAMS:
            if p in w["params"]:
                assert g[p] == pytest.approx(w["params"][p], rel=1e-12), (w["model"], p)
            else:
                assert math.isnan(g[p])
        for key in ("loglik", "aic", "bic", "weight", "mean_interval"):
            assert g[key] == pytest.approx(w[key], rel=1e-12), (w["model"], key)


def test_censored_logliks_and_criteria_agree_with_scipy():
    got = lodestone.fit_renewal(read_table(SCALE))
    x, c = np.array(got.attrs["complete"]), censored_lengths(got)
    n_obs = len(x) + len(c)
    for _, row in got.iterrows():
        dist = scipy_model(row)
        assert row["loglik"] == pytest.approx(censored_loglik(dist, x, c), rel=1e-9, abs=1e-9), row["model"]
        k = 1 if row["model"] == "exponential" else 2
        # AIC = 2k − 2ℓ (Akaike 1974); BIC = k ln n − 2ℓ (Schwarz 1978).
        assert row["aic"] == pytest.approx(2 * k - 2 * row["loglik"], rel=1e-12)
        assert row["bic"] == pytest.approx(k * math.log(n_obs) - 2 * row["loglik"], rel=1e-12)
        assert row["mean_interval"] == pytest.approx(dist.mean(), rel=1e-9)
    # Akaike weights: exp(−Δ/2) normalised (Burnham & Anderson 2002, §2.9).
    w = np.exp(-(got["aic"] - got["aic"].min()) / 2)
    np.testing.assert_allclose(got["weight"], w / w.sum(), rtol=1e-12)


def test_censored_fits_are_maxima_of_the_scipy_likelihood():
    # Nelder–Mead on the scipy.stats censored log-likelihood, started at our estimate, finds nothing
    # better: the fits are maximum-likelihood estimates with the open chron censored.
    got = lodestone.fit_renewal(read_table(SCALE))
    x, c = np.array(got.attrs["complete"]), censored_lengths(got)
    assert len(c) == 2  # the open chron, and the oldest chron of a scale cut at an arbitrary age
    # Exponential with censoring: λ = n/(Σxᵢ + Σcⱼ) (Lawless 2003, §2.2; a closed form).
    assert got.loc[got["model"] == "exponential", "rate"].item() == pytest.approx(len(x) / (x.sum() + sum(c)),
                                                                                 rel=1e-12)
    for _, row in got[got["model"] != "exponential"].iterrows():
        names = [p for p in PARAMS if not math.isnan(row[p])]

        def nll(theta, row=row, names=names):
            trial = pd.Series(dict(row, **dict(zip(names, theta))))
            if any(trial[p] <= 0 for p in names if p != "mu"):
                return np.inf
            return -censored_loglik(scipy_model(trial), x, c)

        best = optimize.minimize(nll, [row[p] for p in names], method="Nelder-Mead",
                                 options={"xatol": 1e-10, "fatol": 1e-12, "maxiter": 4000})
        assert -best.fun <= row["loglik"] + 1e-7, row["model"]


def test_uncensored_fits_agree_with_scipy_fit():
    # scipy.stats.<dist>.fit(x, floc=0) gives the maximum-likelihood estimates of complete samples.
    got = lodestone.fit_renewal(record(SCALE), censor=False, old_edge="left-out").set_index("model")
    x = np.array(got.attrs["complete"])
    assert got.attrs["censored"] is None and got.attrs["censored_old"] is None
    a, _, scale = stats.gamma.fit(x, floc=0)
    assert (got.loc["gamma", "shape"], got.loc["gamma", "scale"]) == pytest.approx((a, scale), rel=1e-4)
    c, _, scale = stats.weibull_min.fit(x, floc=0)
    assert (got.loc["weibull", "shape"], got.loc["weibull", "scale"]) == pytest.approx((c, scale), rel=1e-4)
    s, _, scale = stats.lognorm.fit(x, floc=0)
    assert (got.loc["lognormal", "sigma"], math.exp(got.loc["lognormal", "mu"])) == pytest.approx((s, scale), rel=1e-4)
    assert got.loc["exponential", "rate"] == pytest.approx(1 / stats.expon.fit(x, floc=0)[1], rel=1e-9)
    # Inverse Gaussian: mean = x̄, 1/λ = mean(1/xᵢ − 1/x̄) (Tweedie 1957; closed form).
    assert got.loc["inverse_gaussian", "mean"] == pytest.approx(x.mean(), rel=1e-9)
    assert got.loc["inverse_gaussian", "shape"] == pytest.approx(1 / np.mean(1 / x - 1 / x.mean()), rel=1e-7)


def test_hazard_matches_the_command_line(cli):
    got = lodestone.hazard(record(SCALE), horizon=0.2, seed=2, resamples=200)
    want = cli("hazard", record(SCALE), "--horizon", 0.2, "--seed", 2, "--resamples", 200)
    assert got.attrs["elapsed"] == pytest.approx(want["elapsed"])
    for (_, g), w in zip(got.iterrows(), want["models"]):
        assert g["model"] == w["model"]
        for key in ("weight", "hazard", "survival", "p_within", "cdf"):
            assert g[key] == pytest.approx(w[key], rel=1e-12), (w["model"], key)
    for key in ("low", "high"):
        assert got.attrs["averaged"][key] == pytest.approx(want["averaged"][key], rel=1e-12)
    assert got.attrs["averaged"]["averaged"] == pytest.approx(want["averaged"]["p_within"], rel=1e-12)
    assert got.attrs["cautions"] == want["cautions"]


def test_hazard_quantities_agree_with_scipy():
    # h(T) = f(T)/S(T); P(reversal within Δ | none for T) = 1 − S(T + Δ)/S(T) (Cox 1962, ch. 1).
    elapsed, horizon = 0.4, 0.1
    got = lodestone.hazard(read_table(SCALE), elapsed=elapsed, horizon=horizon, resamples=0)
    fits = lodestone.fit_renewal(read_table(SCALE)).set_index("model")
    for _, row in got.iterrows():
        dist = scipy_model(fits.loc[row["model"]].rename(None).to_dict() | {"model": row["model"]})
        assert row["survival"] == pytest.approx(dist.sf(elapsed), rel=1e-9)
        assert row["hazard"] == pytest.approx(dist.pdf(elapsed) / dist.sf(elapsed), rel=1e-8)
        assert row["p_within"] == pytest.approx(1 - dist.sf(elapsed + horizon) / dist.sf(elapsed), rel=1e-8)
        assert row["cdf"] == pytest.approx(dist.cdf(elapsed), rel=1e-9)
    assert got.attrs["averaged"]["low"] is None
    assert got.attrs["notes"] == []  # skipped on request: not a failed bootstrap
    assert np.sum(got["weight"] * got["p_within"]) == pytest.approx(got.attrs["averaged"]["averaged"], rel=1e-12)


def test_renewal_bad_input_raises():
    t = read_table(SCALE)
    with pytest.raises(lodestone.LodestoneError, match="polarity") as e:
        lodestone.fit_renewal(t.drop(columns="polarity"))
    assert e.value.column == "polarity"
    gap = t.copy()
    gap.loc[5, "old"] = gap.loc[5, "old"] - 0.01
    with pytest.raises(lodestone.LodestoneError):
        lodestone.fit_renewal(gap)
    with pytest.raises(lodestone.LodestoneError, match="old_edge"):
        lodestone.fit_renewal(t, old_edge="sideways")
    with pytest.raises(lodestone.LodestoneError, match="horizon"):
        lodestone.hazard(t, horizon=-1.0, resamples=0)
    with pytest.raises(lodestone.LodestoneError, match="elapsed"):
        lodestone.hazard(t, young=1.0, resamples=0)
    # The level is checked whether or not the bootstrap runs (the rule the command line shares).
    with pytest.raises(lodestone.LodestoneError, match="level"):
        lodestone.hazard(t, level=1.5, resamples=0)
