"""fisher_mean, group_means and vgp: against the command line's JSON, published formulas and SciPy."""

import math

import numpy as np
import pandas as pd
import pytest
from scipy import stats

import lodestone
from conftest import read_table, record

DIRS = "velmora-directions.csv"
SITES = "kestrel-ridge-sites.csv"


def unit(dec, inc):
    d, i = np.radians(dec), np.radians(inc)
    return np.column_stack([np.cos(i) * np.cos(d), np.cos(i) * np.sin(d), np.sin(i)])


def test_fisher_mean_matches_the_command_line_on_the_whole_file(cli):
    t = read_table(DIRS)
    got = lodestone.fisher_mean(t["dec"], t["inc"])
    want = cli("mean", record(DIRS), "--whole")["groups"][0]
    for key in ("n", "dec", "inc", "r", "k", "a95", "theta63"):
        assert getattr(got, key) == pytest.approx(want[key], rel=1e-12, abs=1e-12), key


def test_fisher_mean_follows_fishers_formulas():
    # Fisher (1953): R = |Σu|, k = (N − 1)/(N − R), cos α = 1 − ((N − R)/R)((1/p)^(1/(N−1)) − 1);
    # θ63 = 81/√k (Butler 1992, eq. 6.16). Evaluated here directly with NumPy.
    t = read_table(DIRS).iloc[:6]
    u = unit(t["dec"].to_numpy(), t["inc"].to_numpy())
    n, s = len(u), u.sum(axis=0)
    r = np.linalg.norm(s)
    k = (n - 1) / (n - r)
    for conf in (0.95, 0.63, 0.99):
        p = 1 - conf
        alpha = math.degrees(math.acos(1 - (n - r) / r * ((1 / p) ** (1 / (n - 1)) - 1)))
        got = lodestone.fisher_mean(t["dec"], t["inc"], confidence=conf)
        assert got.alpha == pytest.approx(alpha, rel=1e-12)
    got = lodestone.fisher_mean(t["dec"], t["inc"])
    assert got.r == pytest.approx(r, rel=1e-13)
    assert got.k == pytest.approx(k, rel=1e-11)
    assert got.theta63 == pytest.approx(81 / math.sqrt(k), rel=1e-11)
    assert got.dec == pytest.approx(math.degrees(math.atan2(s[1], s[0])) % 360, abs=1e-10)
    assert got.inc == pytest.approx(math.degrees(math.asin(s[2] / r)), abs=1e-10)


def test_fisher_mean_of_scipy_von_mises_fisher_draws():
    # SciPy ≥ 1.11: scipy.stats.vonmises_fisher draws Fisher-distributed unit vectors, and its fit()
    # returns the maximum-likelihood mean direction (the normalised resultant) and κ, which solves
    # coth κ − 1/κ = R/N (Fisher, Lewis & Embleton 1987, §5.3.2(iv)). Our k is (N − 1)/(N − R).
    mu = unit(np.array([30.0]), np.array([-40.0]))[0]
    x = stats.vonmises_fisher(mu, 25.0).rvs(500, random_state=np.random.default_rng(7))
    dec = np.degrees(np.arctan2(x[:, 1], x[:, 0]))
    inc = np.degrees(np.arcsin(np.clip(x[:, 2], -1, 1)))
    got = lodestone.fisher_mean(dec, inc)
    mu_hat, kappa_hat = stats.vonmises_fisher.fit(x)
    np.testing.assert_allclose(unit([got.dec], [got.inc])[0], mu_hat, atol=1e-12)
    assert 1 / np.tanh(kappa_hat) - 1 / kappa_hat == pytest.approx(got.r / got.n, rel=1e-6)
    assert got.k == pytest.approx((got.n - 1) / (got.n - got.r), rel=1e-12)
    # And the sample is what it should be: within a few α95 of the true mean (a loose sanity bound).
    assert np.degrees(np.arccos(unit([got.dec], [got.inc])[0] @ mu)) < 3 * got.a95


def test_fisher_mean_edges():
    one = lodestone.fisher_mean([12.0], [34.0])
    assert (one.n, one.k, one.a95, one.theta63) == (1, None, None, None)
    same = lodestone.fisher_mean([5.0, 5.0, 5.0], [60.0, 60.0, 60.0])
    assert same.k == math.inf and same.a95 == 0.0
    apart = lodestone.fisher_mean([10.0, 190.0], [30.0, -30.0])
    assert apart.dec is None and apart.inc is None and apart.r == pytest.approx(0.0, abs=1e-12)
    # Declinations either side of north average to north, not to 180.
    north = lodestone.fisher_mean([359.0, 1.0], [45.0, 45.0])
    assert min(north.dec, 360 - north.dec) < 1e-9
    assert set(one.to_dict()) == {"dec", "inc", "n", "r", "k", "a95", "theta63", "alpha", "confidence"}


@pytest.mark.parametrize(
    "dec, inc, words",
    [
        ([1.0, 2.0], [10.0], "dec has 2 values but inc has 1"),
        ([1.0, float("nan")], [10.0, 20.0], "index 1"),
        ([1.0, 2.0], [10.0, 95.0], "inclination = 95"),
        ([], [], "at least 1"),
        (["a"], [1.0], "dec: expected numbers"),
    ],
)
def test_fisher_mean_bad_input_raises(dec, inc, words):
    with pytest.raises(lodestone.LodestoneError, match=words):
        lodestone.fisher_mean(dec, inc)


@pytest.mark.parametrize("frame", ["geo", "tilt"])
def test_group_means_match_the_command_line(cli, frame):
    got = lodestone.group_means(record(DIRS), frame=frame)
    want = cli("mean", record(DIRS), "--frame", frame)["groups"]
    assert list(got.columns) == ["group", "n", "dec", "inc", "r", "k", "a95", "theta63"]
    assert len(got) == len(want)
    for (_, g), w in zip(got.iterrows(), want):
        assert g["group"] == w["group"] and g["n"] == w["n"]
        for key in ("dec", "inc", "r", "k", "a95", "theta63"):
            assert g[key] == pytest.approx(w[key], rel=1e-9), key


def test_group_means_from_a_dataframe_equal_those_from_the_file():
    by_path = lodestone.group_means(record(DIRS), by="site")
    by_frame = lodestone.group_means(read_table(DIRS), by="site")
    pd.testing.assert_frame_equal(by_path, by_frame)
    whole = lodestone.group_means(read_table(DIRS), by=None)
    assert list(whole["group"]) == ["(all)"] and whole["n"][0] == 30
    # Without a site column, "site" means the whole table, as on the command line.
    assert len(lodestone.group_means(read_table(DIRS).drop(columns="site"))) == 1


def test_group_means_bad_tables_name_the_row_and_column():
    t = read_table(DIRS)
    with pytest.raises(lodestone.LodestoneError, match="inc") as e:
        lodestone.group_means(t.drop(columns="inc"))
    assert e.value.file == "DataFrame" and e.value.column == "inc"
    bad = t.copy()
    bad.loc[3, "inc"] = 91.0
    with pytest.raises(lodestone.LodestoneError) as e:
        lodestone.group_means(bad)
    assert e.value.line == 3 + 2 and e.value.column == "inc"
    with pytest.raises(lodestone.LodestoneError, match="frame"):
        lodestone.group_means(t, frame="sideways")
    with pytest.raises(lodestone.LodestoneError, match="lith"):
        lodestone.group_means(t, by="lith")


def test_vgp_matches_the_command_line(cli):
    t = read_table(SITES)
    want = cli("poles", record(SITES))["sites"]
    a95 = np.array([w["a95"] for w in want], dtype=float)
    got = lodestone.vgp(t["lat"], t["lon"], t["dec"], t["inc"], a95)
    for key in ("plat", "plon", "dp", "dm", "paleolat"):
        np.testing.assert_allclose(getattr(got, key), [w[key] for w in want], rtol=1e-12, atol=1e-9, err_msg=key)


def test_vgp_follows_the_closed_form():
    # Butler (1992), eqs. 7.1–7.4: p from tan I = 2 cot p; sin λp = sin λs cos p + cos λs sin p cos D;
    # β = asin(sin p sin D / cos λp); φp = φs + β if cos p ≥ sin λs sin λp, else φs + 180° − β.
    rng = np.random.default_rng(3)
    lat, lon = rng.uniform(-80, 80, 200), rng.uniform(-180, 360, 200)
    dec, inc = rng.uniform(0, 360, 200), rng.uniform(-85, 85, 200)
    p = np.arctan2(2 * np.cos(np.radians(inc)), np.sin(np.radians(inc)))
    ls, d = np.radians(lat), np.radians(dec)
    lp = np.arcsin(np.sin(ls) * np.cos(p) + np.cos(ls) * np.sin(p) * np.cos(d))
    beta = np.arcsin(np.clip(np.sin(p) * np.sin(d) / np.cos(lp), -1, 1))
    plon = np.where(np.cos(p) >= np.sin(ls) * np.sin(lp), lon + np.degrees(beta), lon + 180 - np.degrees(beta)) % 360
    got = lodestone.vgp(lat, lon, dec, inc)
    np.testing.assert_allclose(got.plat, np.degrees(lp), atol=1e-9)
    diff = (got.plon - plon + 180) % 360 - 180
    assert np.max(np.abs(diff * np.cos(lp))) < 1e-8
    assert np.all(np.isnan(got.dp)) and np.all(np.isnan(got.dm))


def test_vgp_broadcasts_and_checks_its_input():
    # A geocentric axial dipole direction (D = 0, tan I = 2 tan λ; common practice) gives the north pole.
    lat = np.array([-60.0, 0.0, 35.0, 89.0])
    inc = np.degrees(np.arctan(2 * np.tan(np.radians(lat))))
    got = lodestone.vgp(lat, 20.0, 0.0, inc, a95=[[4.0], [np.nan]])
    assert got.plat.shape == (2, 4)
    np.testing.assert_allclose(got.plat, 90.0, atol=1e-9)
    assert np.all(np.isfinite(got.dp[0])) and np.all(np.isnan(got.dp[1]))
    scalar = lodestone.vgp(10.0, 20.0, 180.0, -30.0)
    assert isinstance(scalar.plat, float) and scalar.paleolat < 0
    assert isinstance(lodestone.vgp(lat, 20.0, 0.0, inc).to_dict()["plat"], list)
    with pytest.raises(lodestone.LodestoneError, match="broadcast"):
        lodestone.vgp([1.0, 2.0], [3.0, 4.0, 5.0], 0.0, 0.0)
    with pytest.raises(lodestone.LodestoneError, match="latitude"):
        lodestone.vgp(95.0, 0.0, 0.0, 10.0)
    with pytest.raises(lodestone.LodestoneError, match="inclination"):
        lodestone.vgp(10.0, 0.0, 0.0, -90.5)
