"""reversal_test and fold_test: against the command line's JSON, published formulas and SciPy."""

import math

import numpy as np
import pytest
from scipy import stats

import lodestone
from conftest import read_table, record

DIRS = "velmora-directions.csv"


def unit(dec, inc):
    d, i = np.radians(dec), np.radians(inc)
    return np.column_stack([np.cos(i) * np.cos(d), np.cos(i) * np.sin(d), np.sin(i)])


def modes(x):
    """Split on the principal axis of the orientation matrix (Fisher, Lewis & Embleton 1987, §3.2.4);
    the second mode is flipped to its antipode."""
    axis = np.linalg.eigh(x.T @ x)[1][:, 2]
    side = x @ axis >= 0
    return x[side], -x[~side]


def test_reversal_test_matches_the_command_line(cli):
    t = read_table(DIRS)
    got = lodestone.reversal_test(t["dec"], t["inc"], seed=1, resamples=1000)
    want = cli("test", "reversal", record(DIRS), "--seed", 1, "--resamples", 1000)
    for key in ("gamma", "gamma_c", "v_w", "v_crit"):
        assert getattr(got, key) == pytest.approx(want[key], rel=1e-12), key
    assert got.classification == want["class"]
    assert (got.passed, got.n1, got.n2) == (want["passed"], want["n1"], want["n2"])
    assert got.bootstrap_passed == want["bootstrap"]["passed"]
    assert "not proof" in got.caution


def test_reversal_statistics_follow_the_published_formulas():
    t = read_table(DIRS)
    got = lodestone.reversal_test(t["dec"], t["inc"], resamples=200)
    a, b = modes(unit(t["dec"].to_numpy(), t["inc"].to_numpy()))
    xa, xb = a.sum(axis=0), b.sum(axis=0)
    ra, rb = np.linalg.norm(xa), np.linalg.norm(xb)
    # γ: the angle between the two mode means (McFadden & McElhinny 1990).
    gamma = math.degrees(math.acos(xa @ xb / (ra * rb)))
    assert got.gamma == pytest.approx(gamma, rel=1e-10)
    # γc: (N − 2)(R₁ + R₂ − R)/(N − R₁ − R₂) ~ F(2, 2(N − 2)) under a common mean and precision
    # (McFadden & Lowes 1981); the F point from scipy.stats.f, then R² = R₁² + R₂² + 2R₁R₂ cos γc.
    n = len(a) + len(b)
    rc = ra + rb - stats.f.ppf(0.95, 2, 2 * (n - 2)) * (n - ra - rb) / (n - 2)
    gamma_c = math.degrees(math.acos((rc**2 - ra**2 - rb**2) / (2 * ra * rb)))
    assert got.gamma_c == pytest.approx(gamma_c, rel=1e-9)
    # Watson (1983) V_w = 2(S_w − R_w), S_w = k₁R₁ + k₂R₂, R_w = |k₁X₁ + k₂X₂|, k = (N − 1)/(N − R).
    ka, kb = (len(a) - 1) / (len(a) - ra), (len(b) - 1) / (len(b) - rb)
    v_w = 2 * (ka * ra + kb * rb - np.linalg.norm(ka * xa + kb * xb))
    assert got.v_w == pytest.approx(v_w, rel=1e-9)
    # The simulated critical value tends to the χ²₂ point for large N (Watson 1983); with 30
    # directions it lies above it, but not far.
    assert stats.chi2.ppf(0.95, 2) * 0.9 < got.v_crit < stats.chi2.ppf(0.95, 2) * 1.5


def test_reversal_test_is_seeded_and_independent_of_threads():
    t = read_table(DIRS)
    one = lodestone.reversal_test(t["dec"], t["inc"], seed=5, resamples=300, threads=1)
    two = lodestone.reversal_test(t["dec"], t["inc"], seed=5, resamples=300, threads=2)
    other = lodestone.reversal_test(t["dec"], t["inc"], seed=6, resamples=300)
    assert one.to_dict() == two.to_dict()
    assert other.v_crit != one.v_crit and other.gamma == one.gamma


def test_reversal_test_bad_input_raises():
    with pytest.raises(lodestone.LodestoneError, match="at least 100"):
        lodestone.reversal_test([1.0, 2.0], [3.0, 4.0], resamples=10)
    with pytest.raises(lodestone.LodestoneError, match="values"):
        lodestone.reversal_test([1.0, 2.0, 3.0], [3.0, 4.0])
    with pytest.raises(lodestone.LodestoneError, match="inclination"):
        lodestone.reversal_test([1.0, 2.0], [3.0, -91.0])
    with pytest.raises(lodestone.LodestoneError, match="threads"):
        lodestone.reversal_test([1.0, 181.0, 2.0, 182.0], [40.0, -40.0, 41.0, -41.0], threads=0)


def test_fold_test_matches_the_command_line(cli):
    got = lodestone.fold_test(read_table(DIRS), seed=3, resamples=300)
    want = cli("test", "fold", record(DIRS), "--seed", 3, "--resamples", 300)
    for key in ("best_untilt", "ci_low", "ci_high", "at_edge", "bedding_spread"):
        assert getattr(got, key) == pytest.approx(want[key], rel=1e-12), key
    assert got.verdict == want["verdict"]
    for key, wkey in (("k_geo", "k_geo"), ("k_tilt", "k_tilt"), ("k_ratio", "ratio"), ("f_crit", "f_crit")):
        assert getattr(got, key) == pytest.approx(want["classic"][wkey], rel=1e-12), key


def test_fold_test_classic_ratio_follows_the_published_test():
    # McElhinny (1964): k_tilt/k_geo against F with (2(N − 1), 2(N − 1)) degrees of freedom at 95 %,
    # from scipy.stats.f; k_geo = (N − 1)/(N − R) (Fisher 1953) with the second polarity mode flipped.
    t = read_table(DIRS)
    got = lodestone.fold_test(t, resamples=100)
    n = len(t)
    assert got.f_crit == pytest.approx(stats.f.ppf(0.95, 2 * (n - 1), 2 * (n - 1)), rel=1e-9)
    a, b = modes(unit(t["dec"].to_numpy(), t["inc"].to_numpy()))
    r = np.linalg.norm(a.sum(axis=0) + b.sum(axis=0))
    assert got.k_geo == pytest.approx((n - 1) / (n - r), rel=1e-10)
    assert got.k_ratio == pytest.approx(got.k_tilt / got.k_geo, rel=1e-12)


def test_fold_test_needs_bedding_on_every_row():
    t = read_table(DIRS)
    t.loc[4, "bed_dip"] = np.nan
    t.loc[4, "bed_dip_dir"] = np.nan
    with pytest.raises(lodestone.LodestoneError, match="bedding") as e:
        lodestone.fold_test(t, resamples=100)
    assert e.value.line == 4 + 2
    with pytest.raises(lodestone.LodestoneError):
        lodestone.fold_test(t.drop(columns=["bed_dip", "bed_dip_dir"]), resamples=100)
