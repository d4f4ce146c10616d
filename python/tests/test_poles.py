"""paleopole: against the command line's JSON and against the published formulas (Butler 1992;
Fisher 1953; McElhinny & McFadden 1997; Cox 1970), recomputed here with NumPy."""

import math

import numpy as np
import pandas as pd
import pytest

import lodestone
from conftest import read_table, record

SITES = "kestrel-ridge-sites.csv"


def unit_pole(lat, lon):
    la, lo = np.radians(lat), np.radians(lon)
    return np.column_stack([np.cos(la) * np.cos(lo), np.cos(la) * np.sin(lo), np.sin(la)])


def fisher_cone(n, r, p=0.05):
    """α at confidence 1 − p: cos α = 1 − ((N − R)/R)((1/p)^(1/(N−1)) − 1) (Fisher 1953; Butler 1992, eq. 6.21)."""
    return math.degrees(math.acos(1 - (n - r) / r * ((1 / p) ** (1 / (n - 1)) - 1)))


@pytest.mark.parametrize("args", [(), ("--cutoff", "vandamme"), ("--cutoff", "45", "--northern")])
def test_paleopole_matches_the_command_line(cli, args):
    kw = {"cutoff": "none", "northern": False}
    if "--cutoff" in args:
        kw["cutoff"] = args[args.index("--cutoff") + 1]
    kw["northern"] = "--northern" in args
    got = lodestone.paleopole(record(SITES), resamples=200, **kw)
    want = cli("poles", record(SITES), "--resamples", 200, *args)
    v = got.vgps
    assert list(v.columns[:12]) == ["site", "lat", "lon", "dec", "inc", "plat", "plon", "dp", "dm", "paleolat",
                                    "paleolat_low", "paleolat_high"]
    assert list(v["site"]) == [w["site"] for w in want["sites"]]
    for key in ("plat", "plon", "dp", "dm", "paleolat", "paleolat_low", "paleolat_high", "a95"):
        np.testing.assert_allclose(v[key], [w[key] for w in want["sites"]], rtol=1e-12, err_msg=key)
    assert list(v["kept"]) == [w["kept"] for w in want["sites"]]
    for key in ("n", "plat", "plon", "k", "a95"):
        assert getattr(got, key) == pytest.approx(want["pole"][key], rel=1e-12), key
    sc = want["scatter"]
    for key in ("s", "s_low", "s_high", "s_total", "within_term", "threshold"):
        if sc[key] is None:
            assert getattr(got, key) is None, key
        else:
            assert getattr(got, key) == pytest.approx(sc[key], rel=1e-12), key
    assert (got.n_used, got.n_removed, got.cutoff) == (sc["n_used"], sc["n_removed"], sc["cutoff"])
    # One caution text (the library's), the last sentence the command line gives.
    assert got.caution == want["notes"][-1] and "rest on a model" in got.caution


def test_paleopole_follows_the_published_formulas():
    t = read_table(SITES)
    got = lodestone.paleopole(t, resamples=100)
    v = got.vgps
    # dp = a95 (1 + 3 cos² p)/2, dm = a95 sin p / cos I with tan I = 2 cot p (Butler 1992, eqs. 7.5–7.6).
    p = np.arctan2(2 * np.cos(np.radians(t["inc"])), np.sin(np.radians(t["inc"])))
    np.testing.assert_allclose(v["dp"], t["a95"] * (1 + 3 * np.cos(p) ** 2) / 2, rtol=1e-12)
    np.testing.assert_allclose(v["dm"], t["a95"] * np.sin(p) / np.cos(np.radians(t["inc"])), rtol=1e-12)
    # Paleopole = Fisher mean of the VGPs; K = (N − 1)/(N − R); A95 from Fisher's cone (Fisher 1953).
    x = unit_pole(v["plat"], v["plon"])
    s = x.sum(axis=0)
    n, r = len(x), np.linalg.norm(s)
    m = s / r
    assert got.plat == pytest.approx(math.degrees(math.asin(m[2])), abs=1e-9)
    assert got.k == pytest.approx((n - 1) / (n - r), rel=1e-9)
    assert got.a95 == pytest.approx(fisher_cone(n, r), rel=1e-9)
    # S_T² = Σ Δ²/(N − 1) about the mean pole, S_B² = S_T² − (1/N) Σ S_w²/n with S_w = 81/√K_w,
    # K_w = 8k/(5 + 18 sin²λ + 9 sin⁴λ) (McElhinny & McFadden 1997; Cox 1970). No cutoff here.
    # The scatter uses VGPs aligned to one polarity: each VGP more than 90° from the principal axis of the
    # orientation matrix T = Σ xxᵀ is replaced by its antipode (Fisher, Lewis & Embleton 1987, §3.2.4).
    axis = np.linalg.eigh(x.T @ x)[1][:, 2]
    flip = x @ axis < 0
    assert list(v["flipped"]) == list(flip)
    xa = np.where(flip[:, None], -x, x)
    ma = xa.sum(axis=0) / np.linalg.norm(xa.sum(axis=0))
    delta = np.degrees(np.arccos(np.clip(xa @ ma, -1, 1)))
    st2 = np.sum(delta**2) / (n - 1)
    sl = np.sin(np.radians(v["paleolat"]))
    kw = 8 * t["k"] / (5 + 18 * sl**2 + 9 * sl**4)
    sw2 = np.mean((81 / np.sqrt(kw)) ** 2 / t["n"])
    assert got.s_total == pytest.approx(math.sqrt(st2), rel=1e-9)
    assert got.s == pytest.approx(math.sqrt(st2 - sw2), rel=1e-9)
    assert got.s_low <= got.s <= got.s_high


def test_paleopole_a95_from_n_and_k():
    # Without an a95 column the site's α95 comes from n and k through Fisher's cone, R = n − (n − 1)/k.
    t = read_table(SITES).drop(columns="a95")
    got = lodestone.paleopole(t, resamples=100).vgps
    want = [fisher_cone(n, n - (n - 1) / k) for n, k in zip(t["n"], t["k"])]
    np.testing.assert_allclose(got["a95"], want, rtol=1e-9)
    # Without n or k: no oval, no within-site term (S_B = S_T).
    bare = lodestone.paleopole(t.drop(columns=["n", "k"]), resamples=100)
    assert bare.vgps["dp"].isna().all() and bare.within_term is None
    assert bare.s == pytest.approx(bare.s_total, rel=1e-12)


def test_paleopole_is_seeded_and_thread_independent():
    a = lodestone.paleopole(record(SITES), cutoff="vandamme", seed=5, resamples=300, threads=1)
    b = lodestone.paleopole(record(SITES), cutoff="vandamme", seed=5, resamples=300, threads=2)
    c = lodestone.paleopole(record(SITES), cutoff="vandamme", seed=6, resamples=300)
    assert (a.s_low, a.s_high) == (b.s_low, b.s_high)
    assert (a.s_low, a.s_high) != (c.s_low, c.s_high)
    d = a.to_dict()
    assert isinstance(d["vgps"], list) and d["vgps"][0]["site"] == "KR01" and d["s"] == a.s


def test_paleopole_of_one_site_gives_its_vgp_only():
    one = lodestone.paleopole(read_table(SITES).head(1))
    assert len(one.vgps) == 1 and one.plat is None and one.s is None
    assert "one site records one moment" in one.caution and one.caution != lodestone.paleopole(record(SITES), resamples=50).caution


def test_paleopole_bad_input_raises():
    t = read_table(SITES)
    with pytest.raises(lodestone.LodestoneError) as e:
        lodestone.paleopole(t.drop(columns="inc"))
    assert e.value.column == "inc" and e.value.file == "DataFrame"
    bad = t.copy()
    bad.loc[2, "lat"] = np.nan
    with pytest.raises(lodestone.LodestoneError) as e:
        lodestone.paleopole(bad)
    assert e.value.line == 2 + 2 and e.value.column == "lat"
    bad = t.copy()
    bad.loc[0, "inc"] = 93.0
    with pytest.raises(lodestone.LodestoneError, match="inc"):
        lodestone.paleopole(bad)
    with pytest.raises(lodestone.LodestoneError, match="cutoff"):
        lodestone.paleopole(t, cutoff="tight")
    with pytest.raises(TypeError):
        lodestone.paleopole(pd.Series([1.0]))


def test_a_cutoff_that_keeps_too_few_sites_is_a_note_as_on_the_command_line(cli):
    # A 1° cutoff keeps no site: the paleopole stands, the scatter is None, and the note is the verb's.
    got = lodestone.paleopole(record(SITES), cutoff=1, northern=True, resamples=100)
    want = cli("poles", record(SITES), "--cutoff", "1", "--northern", "--resamples", 100)
    assert got.plat == pytest.approx(want["pole"]["plat"], abs=1e-12) and got.n == want["pole"]["n"]
    assert got.s is None and got.s_low is None and want["scatter"] is None
    assert got.scatter_note.startswith("VGP scatter skipped: ") and got.scatter_note in want["notes"]
    assert list(got.vgps["kept"]) == [True] * len(got.vgps)
