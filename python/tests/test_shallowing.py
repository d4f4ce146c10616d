"""unflatten: against the command line's JSON, and against King's (1955) formula, Fisher (1953) and the
TK03 elongation/inclination curve (Tauxe & Kent 2004; Tauxe et al. 2008), recomputed with NumPy."""

import math

import numpy as np
import pytest

import lodestone
from conftest import read_table, record

BEDS = "tarrow-redbeds.csv"


def unit(dec, inc):
    d, i = np.radians(dec), np.radians(inc)
    return np.column_stack([np.cos(i) * np.cos(d), np.cos(i) * np.sin(d), np.sin(i)])


def fisher(x):
    """Mean inclination and α95 (Fisher 1953; Butler 1992, eq. 6.21)."""
    s = x.sum(axis=0)
    n, r = len(x), np.linalg.norm(s)
    a95 = math.degrees(math.acos(1 - (n - r) / r * (20 ** (1 / (n - 1)) - 1)))
    return math.degrees(math.asin(s[2] / r)), a95


def test_unflatten_matches_the_command_line(cli):
    got = lodestone.unflatten(record(BEDS), resamples=200)
    want = cli("unflatten", record(BEDS), "--resamples", 200)
    assert got.method == want["method"] == "elongation_inclination"
    for key in ("n", "f", "f_low", "f_high", "inc_observed", "inc_corrected", "inc_low", "inc_high", "elongation",
                "no_crossing"):
        assert getattr(got, key) == pytest.approx(want[key], rel=1e-12), key
    given = lodestone.unflatten(record(BEDS), factor=0.6)
    want = cli("unflatten", record(BEDS), "--factor", 0.6)
    for key in ("n", "f", "inc_observed", "inc_corrected", "inc_low", "inc_high", "elongation", "a95_corrected"):
        assert getattr(given, key) == pytest.approx(want[key], rel=1e-12), key
    # One caution text (the library's), the last sentence the command line gives with either method.
    assert got.caution == given.caution == want["notes"][-1] and "not measurements" in got.caution


def test_given_factor_follows_king_and_fisher():
    t = read_table(BEDS)
    got = lodestone.unflatten(t, factor=0.6)
    # King (1955): tan I₀ = tan I_f / f, declinations unchanged.
    inc0 = np.degrees(np.arctan(np.tan(np.radians(t["inc"])) / 0.6))
    inc_obs, _ = fisher(unit(t["dec"], t["inc"]))
    inc_cor, a95 = fisher(unit(t["dec"], inc0))
    assert got.inc_observed == pytest.approx(inc_obs, abs=1e-9)
    assert got.inc_corrected == pytest.approx(inc_cor, abs=1e-9)
    assert got.a95_corrected == pytest.approx(a95, rel=1e-9)
    assert (got.inc_low, got.inc_high) == pytest.approx((inc_cor - a95, inc_cor + a95), abs=1e-9)


def test_the_found_factor_meets_the_tk03_curve():
    t = read_table(BEDS)
    got = lodestone.unflatten(t, resamples=100)
    x = unit(t["dec"], t["inc"])
    # Elongation τ₂/τ₃ of the orientation matrix (Tauxe & Kent 2004) of the observed directions.
    tau = np.sort(np.linalg.eigvalsh(x.T @ x / len(x)))[::-1]
    assert got.elongation == pytest.approx(tau[1] / tau[2], rel=1e-9)
    # Unflattened by the found f, the principal axis's inclination and the elongation lie on the TK03
    # curve E = 2.895 − 0.01466 I − 3.525e-4 I² + 3.160e-6 I³ (Tauxe et al. 2008).
    inc0 = np.degrees(np.arctan(np.tan(np.radians(t["inc"])) / got.f))
    y = unit(t["dec"], inc0)
    w, v = np.linalg.eigh(y.T @ y / len(y))
    inc_v1 = abs(math.degrees(math.asin(v[2, 2])))
    e = w[1] / w[0]
    curve = 2.895 - 0.01466 * inc_v1 - 3.525e-4 * inc_v1**2 + 3.160e-6 * inc_v1**3
    assert got.inc_corrected == pytest.approx(inc_v1, abs=0.2)
    assert e == pytest.approx(curve, rel=0.01)
    assert got.f_low < got.f < got.f_high and got.inc_low < got.inc_corrected < got.inc_high


def test_unflatten_bad_input_raises():
    t = read_table(BEDS)
    with pytest.raises(lodestone.LodestoneError, match=r"\(0, 1\]"):
        lodestone.unflatten(t, factor=1.4)
    with pytest.raises(lodestone.LodestoneError, match="resamples"):
        lodestone.unflatten(t, resamples=50)
    with pytest.raises(lodestone.LodestoneError, match="at least 30"):
        lodestone.unflatten(t.head(20))
    planes = t.assign(kind=["plane"] + ["line"] * (len(t) - 1))
    with pytest.raises(lodestone.LodestoneError, match="plane"):
        lodestone.unflatten(planes)
    some_bedding = t.assign(bed_dip_dir=[90.0] + [np.nan] * (len(t) - 1), bed_dip=[10.0] + [np.nan] * (len(t) - 1))
    with pytest.raises(lodestone.LodestoneError, match="carry bedding"):
        lodestone.unflatten(some_bedding)
    assert lodestone.unflatten(some_bedding, frame="geo", factor=0.8).n == len(t)
    bad = t.copy()
    bad.loc[7, "inc"] = np.nan
    with pytest.raises(lodestone.LodestoneError) as e:
        lodestone.unflatten(bad)
    assert e.value.line == 7 + 2 and e.value.column == "inc"
    with pytest.raises(lodestone.LodestoneError, match="frame"):
        lodestone.unflatten(t, frame="strat")
