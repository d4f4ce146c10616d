"""fit_components: against the command line's JSON and a principal-component fit done with NumPy."""

import math

import numpy as np
import pandas as pd
import pytest

import lodestone
from conftest import read_table, record

STEPS = "velmora-steps.csv"
NUMERIC = ["n_steps", "from", "to", "dec", "inc", "mad", "dang"]


def compare(got: pd.DataFrame, want: list):
    assert len(got) == len(want)
    for (_, g), w in zip(got.iterrows(), want):
        for key in ("specimen", "site", "kind", "anchor"):
            assert g[key] == w[key], key
        for key in NUMERIC:
            if w[key] is None:
                assert math.isnan(g[key]), key
            else:
                assert g[key] == pytest.approx(w[key], rel=1e-10, abs=1e-10), key


def test_automatic_fits_match_the_command_line(cli):
    got = lodestone.fit_components(record(STEPS))
    want = cli("components", record(STEPS), "--auto")
    assert list(got.columns) == ["specimen", "site", "kind", "anchor", "n_steps", "from", "to", "dec", "inc",
                                 "mad", "dang", "height", "grade"]
    compare(got, want["fits"])
    assert list(got["grade"]) == [w["grade"] for w in want["fits"]]
    assert got.attrs["reasons"] == {w["specimen"]: w["reason"] for w in want["fits"]}
    assert got.attrs["unfitted"] == want["unfitted"]
    np.testing.assert_allclose(got["height"], [w["height"] for w in want["fits"]])


def test_noisy_automatic_fits_use_the_command_lines_limits(cli, tmp_path):
    # The last-component rule accepts lines up to MAD 15° by default (the library's default, which
    # `components --auto` uses); with seeded noise on every step some lines fall between 5° and 15°.
    steps = read_table(STEPS)
    rng = np.random.default_rng(11)
    steps["dec"] = (steps["dec"] + rng.normal(0.0, 6.0, len(steps))) % 360.0
    steps["inc"] = np.clip(steps["inc"] + rng.normal(0.0, 6.0, len(steps)), -90.0, 90.0)
    path = tmp_path / "noisy-steps.csv"
    steps.to_csv(path, index=False)
    got = lodestone.fit_components(steps)
    want = cli("components", path, "--auto")
    compare(got, want["fits"])
    assert list(got["grade"]) == [w["grade"] for w in want["fits"]]
    assert got.attrs["unfitted"] == want["unfitted"]
    assert any(5.0 < w["mad"] <= 15.0 for w in want["fits"] if w["kind"] == "line")


def test_longest_run_fits_match_the_command_line(cli):
    got = lodestone.fit_components(record(STEPS), rule="longest")
    want = cli("components", record(STEPS), "--auto", "--rule", "longest")
    assert "grade" not in got.columns
    compare(got, want["fits"])
    assert got.attrs["unfitted"] == want["unfitted"]


def test_picked_fits_match_the_command_line(cli, tmp_path):
    auto = lodestone.fit_components(read_table(STEPS))
    picks = auto[["specimen", "from", "to"]].copy()
    picks["kind"] = ["plane" if i == 0 else "line" for i in range(len(picks))]
    picks["anchor"] = ["free" if i % 2 else "origin" for i in range(len(picks))]
    path = tmp_path / "picks.csv"
    picks.to_csv(path, index=False)
    got = lodestone.fit_components(read_table(STEPS), picks=picks)
    compare(got, cli("components", record(STEPS), "--picks", path)["fits"])
    assert got["kind"][0] == "plane" and math.isnan(got["dang"][0])


def test_free_line_follows_the_principal_component_formulas():
    # Kirschvink (1980): the free line is the principal eigenvector of the centred steps' scatter
    # matrix, MAD = atan(√((λ₂ + λ₃)/λ₁)) (eigenvalues λ₁ ≥ λ₂ ≥ λ₃; formula from memory); DANG is
    # the angle between the line and the centre of mass (common practice). The line points from the
    # last step used toward the first.
    steps = read_table(STEPS)
    fits = lodestone.fit_components(steps, rule="longest")
    assert len(fits) == steps["specimen"].nunique() and set(fits["kind"]) == {"line"} and set(fits["anchor"]) == {"free"}
    for _, f in fits.iterrows():
        s = steps[(steps["specimen"] == f["specimen"]) & steps["step"].between(f["from"], f["to"])]
        d, i = np.radians(s["dec"].to_numpy()), np.radians(s["inc"].to_numpy())
        x = s["moment"].to_numpy()[:, None] * np.column_stack([np.cos(i) * np.cos(d), np.cos(i) * np.sin(d), np.sin(i)])
        c = x.mean(axis=0)
        lam, vec = np.linalg.eigh((x - c).T @ (x - c))
        v = vec[:, 2] * np.sign(vec[:, 2] @ (x[0] - x[-1]))
        assert len(s) == f["n_steps"]
        assert f["dec"] == pytest.approx(math.degrees(math.atan2(v[1], v[0])) % 360, abs=1e-7)
        assert f["inc"] == pytest.approx(math.degrees(math.asin(v[2])), abs=1e-7)
        assert f["mad"] == pytest.approx(math.degrees(math.atan(math.sqrt((lam[0] + lam[1]) / lam[2]))), abs=1e-7)
        dang = math.degrees(math.acos(np.clip(v @ c / np.linalg.norm(c), -1, 1)))
        assert f["dang"] == pytest.approx(dang, abs=1e-6)


def test_bad_steps_and_picks_raise():
    steps = read_table(STEPS)
    with pytest.raises(lodestone.LodestoneError, match="moment") as e:
        lodestone.fit_components(steps.drop(columns="moment"))
    assert e.value.column == "moment"
    with pytest.raises(lodestone.LodestoneError, match="picks"):
        lodestone.fit_components(steps, auto=False)
    with pytest.raises(lodestone.LodestoneError, match="rule"):
        lodestone.fit_components(steps, rule="quickest")
    picks = pd.DataFrame({"specimen": ["no-such-specimen"], "from": [0.0], "to": [10.0]})
    with pytest.raises(lodestone.LodestoneError, match="no-such-specimen"):
        lodestone.fit_components(steps, picks=picks)
    with pytest.raises(TypeError):
        lodestone.fit_components(42)
