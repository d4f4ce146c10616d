"""simulate_section: the folder it writes against the command line's on the same seed (same files, same
bytes), and its sampling plan against the geometric chance of catching a chron on a grid."""

import json
import subprocess

import numpy as np
import pytest

import lodestone
from conftest import ROOT, _binary

# Two invented set-ups: a renewal time scale with tilted, overprinted levels; a core on a time scale table.
CASES = [
    (
        ["--base-age", "2.5", "--lat", "41.2", "--lon", "-7.5", "--rates", "3@1.2,1.5", "--spacing", "0.8",
         "--specimens", "2", "--bedding", "120/25,300/20", "--overprint", "10/60", "--level-kappa", "80",
         "--name-prefix", "Q", "--site-prefix", "WB", "--seed", "11"],
        dict(base_age=2.5, lat=41.2, lon=-7.5, rates="3@1.2,1.5", spacing=0.8, specimens=2,
             bedding=[(120, 25), (300, 20)], overprint=(10, 60), level_kappa=80, name_prefix="Q", site_prefix="WB",
             seed=11),
    ),
    (
        ["--timescale", "records/timescales/chrons-0-6ma.csv", "--base-age", "1.8", "--top-age", "0.2", "--lat", "-33",
         "--lon", "151", "--rates", "2.2", "--treatment", "af", "--characteristic", "15:140", "--core", "--seed", "4"],
        dict(timescale="records/timescales/chrons-0-6ma.csv", base_age=1.8, top_age=0.2, lat=-33, lon=151,
             rates="2.2", treatment="af", characteristic=(15, 140), core=True, seed=4),
    ),
]


def _files(folder):
    return {p.name: p.read_bytes() for p in sorted(folder.iterdir())}


@pytest.mark.parametrize("args,kw", CASES)
def test_folder_is_the_command_lines_byte_for_byte(tmp_path, monkeypatch, args, kw):
    # Both run from the repository root, so a time scale given by a relative path is named alike in
    # the files' comments.
    monkeypatch.chdir(ROOT)
    done = subprocess.run([str(_binary()), "simulate", "section", str(tmp_path / "cli"), *args, "--format", "json",
                           "--quiet"], capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    want = json.loads(done.stdout)
    got = lodestone.simulate_section(tmp_path / "py", **kw)
    cli_files, py_files = _files(tmp_path / "cli"), _files(tmp_path / "py")
    assert list(py_files) == sorted(["steps.csv", "sampling.csv", "timescale.csv", "settings.toml", "truth.json"])
    assert list(py_files) == list(cli_files)
    for name in cli_files:
        assert py_files[name] == cli_files[name], name
    assert got.attrs["files"] == want["files"]
    assert list(got.columns) == ["chron", "polarity", "young", "old", "base", "top", "thickness", "n_levels", "status"]
    assert list(got["n_levels"]) == [c["n_levels"] for c in want["chrons"]]
    np.testing.assert_allclose(got["young"], [c["young"] for c in want["chrons"]], rtol=1e-12)
    assert got.attrs["notes"][-1] == got.attrs["caution"] == want["notes"][-1]
    # The same seed again writes the same bytes; another seed does not.
    again = lodestone.simulate_section(tmp_path / "again", **kw)
    assert _files(tmp_path / "again") == py_files and again.equals(got)
    other = lodestone.simulate_section(tmp_path / "other", **dict(kw, seed=kw["seed"] + 1))
    assert _files(tmp_path / "other")["steps.csv"] != py_files["steps.csv"] and len(other) > 0


def test_plan_is_the_geometric_chance_of_catching_a_chron(tmp_path):
    # A chron x spacings thick, placed at random against a regular grid, holds ⌊x⌋ or ⌊x⌋ + 1 levels, the
    # latter with probability x − ⌊x⌋ (geometric probability, common practice): P(≥ 1) = min(x, 1),
    # P(≥ 2) = clamp(x − 1, 0, 1). Thickness = rate (cm/kyr) × length (Myr) × 10 m (unit conversion).
    got = lodestone.simulate_section(tmp_path / "f", base_age=1.0, lat=10, lon=20, rates="4@0.5,1", spacing=0.5)
    plan = got.attrs["plan"]
    assert sorted(set(plan["rate"])) == [1.0, 4.0]
    x = plan["rate"] * plan["length"] * 10 / 0.5
    np.testing.assert_allclose(plan["thickness"], plan["rate"] * plan["length"] * 10, rtol=1e-12)
    np.testing.assert_allclose(plan["p_one"], np.clip(x, 0, 1), rtol=1e-12)
    np.testing.assert_allclose(plan["p_two"], np.clip(x - 1, 0, 1), rtol=1e-12)


def test_folder_rules(tmp_path):
    (tmp_path / "full").mkdir()
    (tmp_path / "full" / "keep.txt").write_text("x")
    with pytest.raises(lodestone.LodestoneError, match="not empty"):
        lodestone.simulate_section(tmp_path / "full", base_age=1.0, lat=10, lon=20)
    assert [p.name for p in (tmp_path / "full").iterdir()] == ["keep.txt"]
    lodestone.simulate_section(tmp_path / "full", base_age=1.0, lat=10, lon=20, force=True)
    assert (tmp_path / "full" / "keep.txt").read_text() == "x" and (tmp_path / "full" / "steps.csv").exists()
    with pytest.raises(lodestone.LodestoneError, match="treatment"):
        lodestone.simulate_section(tmp_path / "bad", base_age=1.0, lat=10, lon=20, treatment="microwave")
    with pytest.raises(lodestone.LodestoneError):
        lodestone.simulate_section(tmp_path / "bad", base_age=1.0, lat=95, lon=20)
    assert not (tmp_path / "bad").exists()
