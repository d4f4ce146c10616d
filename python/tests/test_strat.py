"""polarity_column, correlate and column_figure: against the command line (JSON, CSV and the figure
files it writes) and against the rules of the trade they implement."""

import io
import subprocess

import numpy as np
import pandas as pd
import pytest

import lodestone
from conftest import ROOT, read_table, record

LEVELS = "orrin-bluff-vgp.csv"
DIRS = "velmora-directions.csv"
SCALE = "timescales/chrons-0-6ma.csv"


def raw(cli, *args):
    """The command line's stdout as text (for --format csv), or its files (for --plot)."""
    done = subprocess.run([str(cli.binary), *map(str, args), "--quiet"], cwd=ROOT, capture_output=True, text=True)
    assert done.returncode == 0, done.stderr
    return done.stdout


@pytest.mark.parametrize("name", [LEVELS, DIRS])
def test_polarity_column_matches_the_command_line(cli, name):
    got = lodestone.polarity_column(record(name))
    want = cli("column", record(name))
    axis = want["axis"]
    assert got.axis == axis
    lv = got.levels
    np.testing.assert_allclose(lv[axis], [w[axis] for w in want["levels"]], rtol=1e-12)
    np.testing.assert_allclose(lv["vgp_lat"], [w["vgp_lat"] for w in want["levels"]], rtol=1e-12)
    assert list(lv["polarity"]) == [w["polarity"] for w in want["levels"]]
    z = got.zones
    assert len(z) == len(want["zones"])
    for (_, g), w in zip(z.iterrows(), want["zones"]):
        assert (g["zone"], g["polarity"], g["n_levels"], g["status"]) == (w["zone"], w["polarity"], w["n_levels"],
                                                                          w["status"])
        for key in ("base", "base_low", "base_high", "top", "top_low", "top_high"):
            assert g[key] == pytest.approx(w[key], rel=1e-12, abs=1e-12), key


def test_zones_have_the_columns_and_values_of_the_csv(cli):
    got = lodestone.polarity_column(record(LEVELS), threshold=40, min_levels=3).zones
    text = raw(cli, "column", record(LEVELS), "--threshold", 40, "--min-levels", 3, "--format", "csv")
    want = pd.read_csv(io.StringIO(text))
    assert list(got.columns) == list(want.columns)
    for c in got.columns:
        if not pd.api.types.is_numeric_dtype(got[c]):
            assert list(got[c]) == list(want[c]), c
        else:
            # The CSV carries three decimals.
            np.testing.assert_allclose(got[c], want[c], atol=5e-4, err_msg=c)


def test_polarity_rule_and_boundary_gaps():
    # Common practice: normal at VGP latitude ≥ threshold, reversed ≤ −threshold, intermediate between;
    # a boundary lies in the sampling gap between the last level of one zone and the first of the next.
    t = read_table(LEVELS).sort_values("height")
    col = lodestone.polarity_column(t, threshold=45)
    want = np.where(t["vgp_lat"] >= 45, "N", np.where(t["vgp_lat"] <= -45, "R", "I"))
    assert list(col.levels["polarity"]) == list(want)
    heights = list(col.levels["height"])
    ends = col.zones.attrs["section_ends"]
    assert sum(top for top, _ in ends) == 1 and sum(base for _, base in ends) == 1
    internal = col.zones[[not top for top, _ in ends]]
    assert len(internal) == len(col.zones) - 1
    for _, z in internal.iterrows():
        i = heights.index(z["top_low"])
        assert heights[i + 1] == pytest.approx(z["top_high"])
        assert z["top"] == pytest.approx((z["top_low"] + z["top_high"]) / 2)


def check_correlation(got, want):
    assert got.n_scored == want["n_scored"] and got.comparison == want["comparison"]
    assert list(got.candidates["rank"]) == [c["rank"] for c in want["candidates"]]
    for (_, g), w in zip(got.candidates.iterrows(), want["candidates"]):
        assert g["score"] == pytest.approx(w["score"], rel=1e-12)
        assert g["mean_rate_cm_kyr"] == pytest.approx(w["mean_rate"], rel=1e-12)
        assert (g["missing_chrons"], g["skipped_zones"], g["ties"]) == (w["missing_chrons"], w["skipped_zones"],
                                                                        len(w["ties"]))
    axis = got.axis
    wt = [(c["rank"], t) for c in want["candidates"] for t in c["ties"]]
    assert len(got.ties) == len(wt)
    for (_, g), (rank, t) in zip(got.ties.iterrows(), wt):
        assert g["rank"] == rank and (g["chron_above"], g["chron_below"]) == (t["chron_above"], t["chron_below"])
        for k in (axis, "low", "high", "age"):
            assert g[k] == pytest.approx(t[k], rel=1e-12), k
    runs = want["candidates"][0]["rates"]
    assert len(got.age_model) == len(runs)
    for (_, g), r in zip(got.age_model.iterrows(), runs):
        for k in ("top", "base", "age_young", "age_old"):
            assert g[k] == pytest.approx(r[k], rel=1e-12), k
        assert (np.isnan(g["rate"]) and r["rate"] is None) or g["rate"] == pytest.approx(r["rate"], rel=1e-12)
        assert g["reading"] == r["reading"] and g["missing"] == " ".join(r["missing"])
    # One caution text (the library's), the last sentence the command line prints with the ranking.
    assert got.caution == want["notes"][-1] and "not proof of the correlation" in got.caution


def test_correlate_matches_the_command_line(cli):
    check_correlation(lodestone.correlate(record(LEVELS), record(SCALE)), cli("correlate", record(LEVELS), record(SCALE)))


def test_correlate_with_an_anchor_and_settings_matches_the_command_line(cli):
    got = lodestone.correlate(record(LEVELS), record(SCALE), anchors=[(20.0, 1.5, 0.2)], rate_spread=0.3,
                              candidates=3)
    want = cli("correlate", record(LEVELS), record(SCALE), "--anchor", "20:1.5:0.2", "--rate-spread", 0.3,
               "--candidates", 3)
    check_correlation(got, want)


def test_correlate_reads_the_zones_of_polarity_column(cli, tmp_path):
    zones = lodestone.polarity_column(record(LEVELS)).zones
    path = tmp_path / "zones.csv"
    path.write_text(raw(cli, "column", record(LEVELS), "--format", "csv"))
    check_correlation(lodestone.correlate(zones, record(SCALE)), cli("correlate", path, record(SCALE)))
    # The scale as a DataFrame gives the same ranking as the file.
    a = lodestone.correlate(zones, read_table(SCALE))
    assert list(a.candidates["score"]) == list(lodestone.correlate(zones, record(SCALE)).candidates["score"])


def test_correlate_bad_input_raises():
    with pytest.raises(lodestone.LodestoneError, match="anchor age"):
        lodestone.correlate(record(LEVELS), record(SCALE), anchors=[(10.0, -1.0)])
    with pytest.raises(lodestone.LodestoneError, match="candidates"):
        lodestone.correlate(record(LEVELS), record(SCALE), candidates=0)
    with pytest.raises(lodestone.LodestoneError, match="rate spread"):
        lodestone.correlate(record(LEVELS), record(SCALE), rate_spread=float("nan"))
    gap = read_table(SCALE).drop(index=3)
    with pytest.raises(lodestone.LodestoneError, match="gap"):
        lodestone.correlate(record(LEVELS), gap)
    no_vgp = read_table(LEVELS).drop(columns="vgp_lat")
    with pytest.raises(lodestone.LodestoneError):
        lodestone.correlate(no_vgp, record(SCALE))
    with pytest.raises(TypeError):
        lodestone.correlate(record(LEVELS), record(SCALE), anchors=[(1.0,)])


def test_polarity_column_bad_input_raises():
    t = read_table(LEVELS)
    with pytest.raises(lodestone.LodestoneError) as e:
        lodestone.polarity_column(t.drop(columns="height"))
    assert e.value.file == "DataFrame"
    bad = t.copy()
    bad.loc[4, "vgp_lat"] = np.nan
    with pytest.raises(lodestone.LodestoneError) as e:
        lodestone.polarity_column(bad)
    assert e.value.line == 4 + 2 and e.value.column == "vgp_lat"
    with pytest.raises(lodestone.LodestoneError, match="threshold"):
        lodestone.polarity_column(t, threshold=95)


@pytest.mark.parametrize("fmt", ["svg", "png"])
def test_column_figure_is_the_command_lines_figure(cli, tmp_path, fmt):
    # The same bytes as `column --plot`: the figure is drawn by the same library code.
    path = tmp_path / f"col.{fmt}"
    raw(cli, "column", record(LEVELS), "--plot", path)
    got = lodestone.column_figure(record(LEVELS), format=fmt)
    if fmt == "svg":
        assert isinstance(got, str) and got.lstrip().startswith("<svg") and got == path.read_text()
    else:
        assert isinstance(got, bytes) and got[:8] == b"\x89PNG\r\n\x1a\n" and got == path.read_bytes()


def test_correlation_figure_is_the_command_lines_figure(cli, tmp_path):
    path = tmp_path / "corr.svg"
    raw(cli, "correlate", record(LEVELS), record(SCALE), "--plot", path)
    got = lodestone.column_figure(record(LEVELS), record(SCALE))
    assert got == path.read_text()
    assert "candidate 1" in got and "against" in got
    titled = lodestone.column_figure(read_table(LEVELS), title="Orrin Bluff")
    assert "Orrin Bluff" in titled
    with pytest.raises(lodestone.LodestoneError, match="format"):
        lodestone.column_figure(record(LEVELS), format="gif")
    with pytest.raises(TypeError, match="unknown"):
        lodestone.column_figure(record(LEVELS), colour="red")


def test_the_defaults_are_the_command_lines(cli):
    # The Python signatures take the library's defaults, as the verbs do: read the defaults that
    # `correlate --help` and `field series --help` print and compare them with the signatures.
    import inspect
    import re

    def defaults(*verb):
        text = subprocess.run([str(cli.binary), *verb, "--help"], capture_output=True, text=True, check=True).stdout
        found, option = {}, None
        for line in text.splitlines():
            start = re.match(r"\s+(?:-\w, )?--([a-z-]+)", line)
            if start:
                option = start.group(1).replace("-", "_")
            default = re.search(r"\[default: ([^\]]+)\]", line)
            if default and option:
                found.setdefault(option, default.group(1))
        return found

    c = defaults("correlate")
    sig = inspect.signature(lodestone.correlate).parameters
    for name in ("miss_penalty", "hiatus_penalty", "skip_penalty", "rate_spread", "candidates", "threshold",
                 "min_levels"):
        assert float(c[name]) == float(sig[name].default), name
    assert float(defaults("field", "series")["low_threshold"]) == float(
        inspect.signature(lodestone.field_series).parameters["low_threshold"].default
    )
