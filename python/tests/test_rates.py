"""reversal_rate and simulate_timescale: against the command line's JSON and scipy.stats."""

import numpy as np
import pytest
from scipy import stats

import lodestone
from conftest import read_table, record

SCALE = "timescales/chrons-0-6ma.csv"


@pytest.mark.parametrize("args", [(), ("--window", 0.5, "--step", 0.25, "--level", 0.9)])
def test_rate_matches_the_command_line(cli, args):
    kw = {k.lstrip("-"): float(v) for k, v in zip(args[::2], args[1::2])}
    got = lodestone.reversal_rate(record(SCALE), **kw)
    want = cli("rate", record(SCALE), *args)
    assert list(got.columns) == ["age", "rate", "low", "high", "count"]
    assert len(got) == len(want["rate"])
    for key in ("age", "rate", "low", "high", "count"):
        np.testing.assert_allclose(got[key], [w[key] for w in want["rate"]], rtol=1e-12, err_msg=key)
    assert got.attrs["n_reversals"] == want["n_reversals"] and got.attrs["step"] == pytest.approx(want["step"])
    for key in ("n", "u", "p_value"):
        assert got.attrs["laplace"][key] == pytest.approx(want["laplace"][key], rel=1e-12), key
    for key in ("n", "mean_h", "z", "p_value", "ks_d", "ks_p"):
        assert got.attrs["clustering"][key] == pytest.approx(want["clustering"][key], rel=1e-12), key
    # One caution text (the library's), the last sentence the command line gives.
    assert got.attrs["caution"] == want["notes"][-1]


def test_rate_follows_garwood_and_the_laplace_formula():
    got = lodestone.reversal_rate(record(SCALE), window=1.0, level=0.95)
    ages = np.array(got.attrs["reversals"])
    w, step, start = 1.0, got.attrs["step"], got.attrs["from"]
    for i, p in got.iterrows():
        lo = start + i * step
        k = int(np.sum((ages >= lo) & (ages < lo + w)))
        assert p["age"] == pytest.approx(lo + w / 2)
        assert p["count"] == k and p["rate"] == pytest.approx(k / w)
        # Exact Poisson limits (Garwood 1936) with scipy.stats.chi2 quantiles.
        low = 0.0 if k == 0 else stats.chi2.ppf(0.025, 2 * k) / (2 * w)
        assert p["low"] == pytest.approx(low, rel=1e-9, abs=1e-12)
        assert p["high"] == pytest.approx(stats.chi2.ppf(0.975, 2 * k + 2) / (2 * w), rel=1e-9)
    # Laplace trend test (Cox & Lewis 1966, §3.3): U = (Σtᵢ/n − T/2)/(T √(1/(12n))), t from the old edge;
    # two-sided p from scipy.stats.norm.
    lo, hi = got.attrs["from"], got.attrs["to"]
    t = hi - ages[(ages > lo) & (ages < hi)]
    n, span = len(t), hi - lo
    u = (t.mean() - span / 2) / (span * np.sqrt(1 / (12 * n)))
    lap = got.attrs["laplace"]
    assert lap["u"] == pytest.approx(u, rel=1e-9)
    assert lap["p_value"] == pytest.approx(2 * stats.norm.sf(abs(u)), rel=1e-9)
    # The clustering test's KS distance from the uniform law, checked with scipy.stats.kstest.
    cl = got.attrs["clustering"]
    assert cl["ks_d"] == pytest.approx(stats.kstest(cl["h"], "uniform").statistic, rel=1e-9)
    assert cl["mean_h"] == pytest.approx(np.mean(cl["h"]), rel=1e-12)
    assert "not a forecast" in got.attrs["caution"]


def test_rate_bad_input_raises():
    with pytest.raises(lodestone.LodestoneError, match="window"):
        lodestone.reversal_rate(record(SCALE), window=50.0)
    with pytest.raises(lodestone.LodestoneError, match="level"):
        lodestone.reversal_rate(record(SCALE), level=1.5)
    with pytest.raises(lodestone.LodestoneError, match="polarity"):
        lodestone.reversal_rate(read_table(SCALE).drop(columns="polarity"))
    with pytest.raises(lodestone.LodestoneError, match="old_edge"):
        lodestone.reversal_rate(record(SCALE), old_edge="sideways")


@pytest.mark.parametrize("model, extra", [("gamma", ()), ("exponential", ()), ("lognormal", ("--shape", 0.8))])
def test_simulated_timescale_matches_the_command_line(cli, model, extra):
    kw = {"shape": float(extra[1])} if extra else {}
    got = lodestone.simulate_timescale(model, span=12.0, mean_interval=0.3, seed=7, name_prefix="S", **kw)
    want = cli("simulate", "timescale", "--model", model, "--span", 12, "--mean-interval", 0.3, "--name-prefix", "S",
               "--seed", 7, *extra)
    assert list(got.columns) == ["name", "young", "old", "polarity"]
    assert len(got) == want["n_chrons"]
    for key in ("name", "polarity"):
        assert list(got[key]) == [c[key] for c in want["chrons"]], key
    for key in ("young", "old"):
        np.testing.assert_allclose(got[key], [c[key] for c in want["chrons"]], rtol=1e-12, err_msg=key)
    assert got.attrs["model"]["model"] == model and got.attrs["mean"] == pytest.approx(0.3)


def test_simulated_lengths_follow_the_model():
    # Gamma(shape 1.5, scale mean/1.5) lengths: the complete intervals (all but the cut end chrons) pass a
    # scipy.stats.kstest against that law; the scale tiles [young, young + span] without gaps.
    ts = lodestone.simulate_timescale("gamma", span=400.0, mean_interval=0.25, seed=3)
    assert ts["young"].iloc[0] == 0.0 and ts["old"].iloc[-1] == pytest.approx(400.0)
    np.testing.assert_allclose(ts["young"].iloc[1:].to_numpy(), ts["old"].iloc[:-1].to_numpy())
    assert all(a != b for a, b in zip(ts["polarity"].iloc[1:], ts["polarity"].iloc[:-1]))
    lengths = (ts["old"] - ts["young"]).iloc[1:-1]
    assert stats.kstest(lengths, stats.gamma(a=1.5, scale=0.25 / 1.5).cdf).pvalue > 0.01
    assert lengths.mean() == pytest.approx(0.25, rel=0.05)
    # A simulated scale is a time scale the fits accept, and the gamma fit finds a shape near 1.5.
    fit = lodestone.fit_renewal(ts)
    assert fit.set_index("model").loc["gamma", "shape"] == pytest.approx(1.5, rel=0.15)
    again = lodestone.simulate_timescale("gamma", span=400.0, mean_interval=0.25, seed=3)
    assert ts.equals(again) and "Synthetic" in ts.attrs["caution"]


def test_simulate_bad_input_raises():
    with pytest.raises(lodestone.LodestoneError, match="shape"):
        lodestone.simulate_timescale("exponential", span=5.0, shape=2.0)
    with pytest.raises(lodestone.LodestoneError, match="not a renewal model"):
        lodestone.simulate_timescale("poisson", span=5.0)
    with pytest.raises(lodestone.LodestoneError, match="first_polarity"):
        lodestone.simulate_timescale("gamma", span=5.0, first_polarity="X")
    with pytest.raises(lodestone.LodestoneError):
        lodestone.simulate_timescale("gamma", span=float("nan"))
    with pytest.raises(lodestone.LodestoneError, match="mean"):
        lodestone.simulate_timescale("gamma", span=5.0, mean_interval=-1.0)
