"""psv: against the command line's JSON, and the latitude-model fit against scipy.optimize.nnls."""

import numpy as np
import pytest
from scipy import optimize

import lodestone
from conftest import read_table, record

COMP = "psv-compilation.csv"


@pytest.mark.parametrize("cutoff", ["none", "vandamme"])
def test_psv_matches_the_command_line(cli, cutoff):
    got = lodestone.psv(record(COMP), by="study", cutoff=cutoff, resamples=200)
    want = cli("psv", record(COMP), "--by", "study", "--cutoff", cutoff, "--resamples", 200)
    assert list(got.columns[:6]) == ["group", "paleolat", "s", "s_low", "s_high", "n_used"]
    assert list(got["group"]) == [g["group"] for g in want["groups"]]
    for key in ("paleolat", "s", "s_low", "s_high", "n_used"):
        np.testing.assert_allclose(got[key], [g[key] for g in want["groups"]], rtol=1e-12, err_msg=key)
    for key in ("a", "b", "a_low", "a_high", "b_low", "b_high", "rms", "n_groups"):
        assert got.attrs["model"][key] == pytest.approx(want["model"][key], rel=1e-12), key
    # One caution text (the library's), the last sentence the command line gives.
    assert got.attrs["caution"] == want["notes"][-1]


def test_latitude_model_is_the_nonnegative_least_squares_fit():
    # S² = A + B λ² with A, B ≥ 0 by least squares (McFadden, Merrill & McElhinny 1988): the same problem
    # scipy.optimize.nnls solves for the design [1, λ²].
    got = lodestone.psv(read_table(COMP), by="study", resamples=50)
    lam2 = got["paleolat"].to_numpy() ** 2
    (a2, b2), _ = optimize.nnls(np.column_stack([np.ones_like(lam2), lam2]), got["s"].to_numpy() ** 2)
    assert got.attrs["model"]["a"] == pytest.approx(np.sqrt(a2), rel=1e-9)
    assert got.attrs["model"]["b"] == pytest.approx(np.sqrt(b2), rel=1e-9)
    assert (got["s_low"] <= got["s"]).all() and (got["s"] <= got["s_high"]).all()
    assert "not the field itself" in got.attrs["caution"]


def test_psv_bad_input_raises():
    t = read_table(COMP)
    with pytest.raises(lodestone.LodestoneError) as e:
        lodestone.psv(t, by="formation")
    assert e.value.column == "formation"
    with pytest.raises(lodestone.LodestoneError, match="at least 2 groups"):
        lodestone.psv(t[t["study"] == t["study"].iloc[0]], by="study")
    bad = t.copy()
    bad.loc[5, "dec"] = np.nan
    with pytest.raises(lodestone.LodestoneError) as e:
        lodestone.psv(bad, by="study")
    assert e.value.line == 5 + 2 and e.value.column == "dec"
    with pytest.raises(lodestone.LodestoneError, match="cutoff"):
        lodestone.psv(t, by="study", cutoff="wide")
    # A group cut to 2 sites is left out and said so; the others still make the model.
    first = t["study"].iloc[0]
    rows = t.index[t["study"] == first]
    few = lodestone.psv(t.drop(index=rows[2:]), by="study", resamples=50)
    assert {"group": first, "remark": "too_few_sites", "sites": 2} in few.attrs["remarks"]
    assert first not in set(few["group"]) and len(few) == t["study"].nunique() - 1
