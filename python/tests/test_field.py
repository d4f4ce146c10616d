"""The present field: field_at and field_series against the command line, IGRF evaluated by an
outside library (ppigrf), and check values that are facts of the trade."""

import io
import math
import subprocess

import numpy as np
import pandas as pd
import pytest

import lodestone
from conftest import ROOT, record

MODEL_TABLE = record("fieldmodels/igrf14.csv")

# Points of an invented survey: (year, lat, lon, altitude km, geocentric).
POINTS = [
    (2020.5, -25.0, 315.0, 0.0, False),
    (1965.25, 48.3, 12.7, 0.0, False),
    (2027.8, 71.0, 250.0, 3.5, False),
    (1903.0, -62.0, -140.0, 400.0, True),
    (1990.0, 0.0, 0.0, 0.0, True),
]
ELEMENTS = ["x", "y", "z", "h", "f", "dec", "inc"]


def _at_args(year, lat, lon, alt, gc):
    args = ["field", "at", "--year", year, "--lat", lat, "--lon", lon, "--altitude", alt]
    return args + (["--geocentric"] if gc else [])


@pytest.mark.parametrize("year,lat,lon,alt,gc", POINTS)
def test_field_at_matches_the_command_line(cli, year, lat, lon, alt, gc):
    want = cli(*_at_args(year, lat, lon, alt, gc))
    got = lodestone.field_at(year, lat, lon, altitude=alt, geocentric=gc)
    for k in ELEMENTS:
        assert getattr(got, k) == pytest.approx(want[k], rel=1e-12, abs=1e-9), k
    assert got.frame == want["frame"]
    assert got.model == want["model"]
    d = got.to_dict()
    assert isinstance(d["f"], float) and "not a forecast" in d["caution"]


def test_field_at_with_a_model_table_matches_the_command_line(cli):
    want = cli("field", "at", MODEL_TABLE, "--year", 2001.5, "--lat", 35.0, "--lon", 139.0)
    got = lodestone.field_at(2001.5, 35.0, 139.0, model=MODEL_TABLE)
    for k in ELEMENTS:
        assert getattr(got, k) == pytest.approx(want[k], rel=1e-12, abs=1e-9), k
    assert got.model["name"] == want["model"]["name"]


def test_field_at_broadcasts_and_agrees_point_by_point():
    lat = np.array([-40.0, 0.0, 40.0])
    lon = np.array([[10.0], [200.0]])
    got = lodestone.field_at(2012.0, lat, lon, altitude=1.0)
    assert got.f.shape == (2, 3)
    for i in range(2):
        for j in range(3):
            one = lodestone.field_at(2012.0, lat[j], lon[i, 0], altitude=1.0)
            assert got.z[i, j] == one.z and got.dec[i, j] == one.dec
    # The elements hang together: H = √(X² + Y²), F = √(H² + Z²), tan D = Y/X, tan I = Z/H.
    np.testing.assert_allclose(got.h, np.hypot(got.x, got.y), rtol=1e-12)
    np.testing.assert_allclose(got.f, np.hypot(got.h, got.z), rtol=1e-12)
    np.testing.assert_allclose(np.degrees(np.arctan2(got.z, got.h)), got.inc, atol=1e-9)
    assert isinstance(got.to_dict()["f"], list)


def test_field_series_matches_the_command_line(cli):
    want = cli("field", "series", "--from", 1960, "--to", 2025, "--every", 10, "--low-threshold", 30000)
    df = lodestone.field_series(start=1960, end=2025, every=10, low_threshold=30000)
    assert len(df) == len(want["epochs"]) == 7
    for i, row in enumerate(want["epochs"]):
        for k in lodestone.SERIES_COLUMNS:
            if row[k] is None:
                assert math.isnan(df[k].iloc[i]), (k, i)
            else:
                assert df[k].iloc[i] == pytest.approx(row[k], rel=1e-12, abs=1e-9), (k, i)
        np.testing.assert_allclose(df.attrs["spectrum"][row["year"]], row["spectrum"], rtol=1e-12)
    assert df.attrs["model"] == want["model"]
    assert "not a forecast" in df.attrs["caution"]


def test_field_series_has_the_columns_of_the_csv_output(cli):
    done = subprocess.run(
        [str(cli.binary), "field", "series", "--from", "2015", "--to", "2020", "--format", "csv", "--quiet"],
        cwd=ROOT, capture_output=True, text=True, check=True,
    )
    want = pd.read_csv(io.StringIO(done.stdout))
    got = lodestone.field_series(start=2015, end=2020, every=5, model=MODEL_TABLE)
    assert list(got.columns) == list(want.columns)
    assert got["low_cells"].tolist() == want["low_cells"].tolist()
    # The CSV rounds to its printed digits; the DataFrame has them in full.
    np.testing.assert_allclose(got["low_f"], want["low_f"], rtol=1e-9)
    np.testing.assert_allclose(got["moment"], want["moment"], rtol=1e-4)


def test_field_series_defaults_span_the_model():
    df = lodestone.field_series(every=25)
    assert df["year"].tolist() == [1900.0, 1925.0, 1950.0, 1975.0, 2000.0, 2025.0]
    assert math.isnan(df["dip_north_speed"].iloc[0])


def test_facts_of_the_trade():
    """Check values that are common practice (widely published facts of the trade, not a test of
    one source): the surface-intensity low's minimum about 24 000 nT in 1970 and about 22 000 nT in
    2020, drifting west by 15–25 km/yr; the dipole moment falling 6–9 % from 1900 to 2025."""
    df = lodestone.field_series(start=1970, end=2020, every=50)
    assert df["low_f"].iloc[0] == pytest.approx(24000, abs=500)
    assert df["low_f"].iloc[1] == pytest.approx(22000, abs=500)
    assert 15 <= df["low_west_speed"].iloc[1] <= 25
    m = lodestone.field_series(start=1900, end=2025, every=125)["moment"]
    assert 6 <= 100 * (1 - m.iloc[1] / m.iloc[0]) <= 9


def test_bad_input_raises():
    with pytest.raises(lodestone.LodestoneError, match="outside the model"):
        lodestone.field_at(1850.0, 10.0, 10.0)
    with pytest.raises(lodestone.LodestoneError, match="latitude"):
        lodestone.field_at(2000.0, [10.0, 95.0], 10.0)
    with pytest.raises(lodestone.LodestoneError, match="every"):
        lodestone.field_series(every=0)
    with pytest.raises(lodestone.LodestoneError, match="do not broadcast"):
        lodestone.field_at(2000.0, [1.0, 2.0], [1.0, 2.0, 3.0])


def test_a_model_with_a_missing_degree_names_file_and_line(tmp_path):
    # An invented two-epoch model that lacks degree 2 in its second epoch.
    path = tmp_path / "gapped.csv"
    path.write_text(
        "epoch,degree,order,g,h\n"
        "2000,1,0,-29000,0\n2000,1,1,-1700,5000\n2000,2,0,-2300,0\n2000,2,1,3000,-2500\n2000,2,2,1600,-500\n"
        "2005,1,0,-28990,0\n2005,1,1,-1690,4990\n"
    )
    with pytest.raises(lodestone.LodestoneError) as e:
        lodestone.field_at(2001.0, 0.0, 0.0, model=path)
    assert e.value.file is not None and "gapped.csv" in e.value.file
    assert e.value.line is not None


def _ppigrf_equivalent_year(y):
    """The decimal year at which lodestone's interpolation (linear in decimal years) takes the same
    fraction of a five-year IGRF interval as ppigrf, which turns a decimal year into a date (day of
    year = fraction × 365 or 366, its ``yearfrac_to_datetime``) and interpolates in days between
    epochs (as tests/field_model.rs does for the same reference)."""
    def days(year):
        return 366.0 if (year % 4 == 0 and year % 100 != 0) or year % 400 == 0 else 365.0

    year = math.floor(y)
    epoch = (min(year, 2029) // 5) * 5
    since = sum(days(k) for k in range(epoch, year)) + (y - year) * days(year)
    span = sum(days(k) for k in range(epoch, epoch + 5))
    return epoch + 5.0 * since / span


# ppigrf 2.1.0 (Python registry; IGRF-14 coefficients from its own IGRF14.shc) as the outside reference.
@pytest.mark.parametrize("year,lat,lon,alt,gc", POINTS)
def test_field_at_agrees_with_ppigrf(year, lat, lon, alt, gc):
    ppigrf = pytest.importorskip("ppigrf")
    from ppigrf.ppigrf import yearfrac_to_datetime

    when = yearfrac_to_datetime(np.array([year]))[0]
    got = lodestone.field_at(_ppigrf_equivalent_year(year), lat, lon, altitude=alt, geocentric=gc)
    if gc:
        br, bt, bp = ppigrf.igrf_gc(6371.2 + alt, 90.0 - lat, lon, when)
        x, y, z = -float(np.ravel(bt)[0]), float(np.ravel(bp)[0]), -float(np.ravel(br)[0])
    else:
        be, bn, bu = ppigrf.igrf(lon, lat, alt, when)
        x, y, z = float(np.ravel(bn)[0]), float(np.ravel(be)[0]), -float(np.ravel(bu)[0])
    # ppigrf 2.1.0: X, Y, Z within 0.1 nT (the check of issue 20).
    assert got.x == pytest.approx(x, abs=0.1)
    assert got.y == pytest.approx(y, abs=0.1)
    assert got.z == pytest.approx(z, abs=0.1)
