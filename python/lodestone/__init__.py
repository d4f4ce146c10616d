"""lodestone: paleomagnetic reversal-record analysis, from Python.

The same library as the ``lodestone`` command line, at native speed: Fisher means, virtual
geomagnetic poles, the paleopole and the VGP scatter, principal-component fits, field tests, the
polarity column and its correlation with a time scale (with the column figure), renewal-model fits
to polarity intervals, the hazard and the reversal rate, synthetic time scales, the whole chain on
a project folder, and the present field from a spherical-harmonic model (the bundled IGRF-14 or a
model table).

Conventions (as on the command line): angles in degrees; declination clockwise from north in
[0, 360); inclination positive down in [-90, 90]; ages in Ma, durations in Myr. Arrays are NumPy
arrays (lists accepted); tables are pandas DataFrames or paths to CSV files with the command line's
column names. Undefined statistics are None (NaN inside arrays and DataFrames). Bad input raises
:class:`LodestoneError` (a ``ValueError``) with the library's message; for tables it names the file
(``DataFrame`` for a DataFrame, whose header is line 1 and row ``i`` line ``i + 2``), the line and
the column, also available as the attributes ``file``, ``line`` and ``column``.

Random results take ``seed`` (default 1) and give the same numbers for any ``threads``; the GIL is
released during the computations.
"""

from __future__ import annotations

import os
import pathlib
from typing import Optional, Sequence, Union

import numpy as np
import pandas as pd

from . import _native
from ._native import LodestoneError
from ._column import column_figure, correlate, polarity_column
from ._poles import paleopole
from ._psv import psv
from ._rates import reversal_rate, simulate_timescale
from ._shallowing import unflatten
from ._synthetic import simulate_section
from ._results import (
    FIELD_CAUTION,
    Correlation,
    FieldElements,
    FisherMean,
    FoldTest,
    Paleopole,
    PolarityColumn,
    ReversalTest,
    Unflattening,
    VGP,
)

# Errors that do not come from a table have no file, line or column.
LodestoneError.file = LodestoneError.line = LodestoneError.column = None

__all__ = [
    "LodestoneError",
    "FisherMean",
    "VGP",
    "ReversalTest",
    "FoldTest",
    "FieldElements",
    "Paleopole",
    "PolarityColumn",
    "Correlation",
    "Unflattening",
    "fisher_mean",
    "group_means",
    "vgp",
    "fit_components",
    "reversal_test",
    "fold_test",
    "fit_renewal",
    "hazard",
    "run_section",
    "field_at",
    "field_series",
    "paleopole",
    "polarity_column",
    "correlate",
    "column_figure",
    "reversal_rate",
    "simulate_timescale",
    "simulate_section",
    "unflatten",
    "psv",
]

from ._tables import ArrayLike, TableLike, _array, _source

#: Parameter columns of the renewal tables, as in ``intervals --format csv`` (each model fills its own).
PARAM_COLUMNS = ["rate", "shape", "scale", "mu", "sigma", "mean"]


def fisher_mean(dec: ArrayLike, inc: ArrayLike, confidence: float = 0.95) -> FisherMean:
    """Fisher (1953) mean direction, resultant length R, precision k, α95 and θ63.

    Units: degrees in and out. ``dec`` and ``inc`` must have the same length; a NaN or an
    inclination outside [-90, 90] raises :class:`LodestoneError` naming the index.

    Formula: R = |Σ uᵢ|, k = (N − 1)/(N − R), cos α = 1 − ((N − R)/R)((1/p)^(1/(N−1)) − 1) with
    p = 1 − confidence, θ63 = 81/√k.

    References: Fisher, R. A. (1953), Dispersion on a sphere, Proc. R. Soc. Lond. A 217, 295–305;
    Butler, R. F. (1992), Paleomagnetism, §6.2.
    """
    d = _native.fisher_mean(_array(dec, "dec"), _array(inc, "inc"), float(confidence))
    return FisherMean._from(d)


def group_means(table: TableLike, by: Optional[str] = "site", frame: str = "geo") -> pd.DataFrame:
    """Fisher mean per group of a directions table: the columns of ``mean --format csv``.

    ``table`` has ``dec``, ``inc`` and optional ``site``, bedding and ``kind`` columns (see the
    contract's directions table). ``by="site"`` groups by the ``site`` column, or takes the whole
    table as one group ``(all)`` when there is none (as the command line does); another name
    groups by that column, which must exist; ``by=None`` takes the whole table. ``frame`` is
    ``"geo"`` (in situ) or ``"tilt"`` (bedding-corrected; every row needs bedding). A group with
    great circles (``kind = plane``) gets the combined mean of McFadden & McElhinny (1988).

    Returns a DataFrame with ``group, n, dec, inc, r, k, a95, theta63`` (degrees; NaN where a
    statistic is undefined, e.g. k, a95 and theta63 of a single direction).
    """
    rows = _native.group_means(_source(table), by, frame)
    cols = ["group", "n", "dec", "inc", "r", "k", "a95", "theta63"]
    df = pd.DataFrame([{c: r[c] for c in cols} for r in rows], columns=cols)
    for c in cols[2:]:
        df[c] = df[c].astype(float)
    return df


def vgp(lat: ArrayLike, lon: ArrayLike, dec: ArrayLike, inc: ArrayLike, a95: Optional[ArrayLike] = None) -> VGP:
    """Virtual geomagnetic pole of each site, with the confidence oval dp, dm when a95 is given.

    Units: degrees. The arguments broadcast against each other (NumPy rules); NaN in ``a95`` means
    no a95 for that site (dp and dm are NaN there); NaN elsewhere raises.

    Formula: magnetic colatitude p from tan I = 2 cot p; the pole lies p from the site along
    azimuth D. dp = a95 (1 + 3 cos²p)/2, dm = a95 sin p / cos I.

    References: Butler, R. F. (1992), Paleomagnetism, §7.1, eqs. 7.1–7.6.
    """
    args = [np.asarray(x, dtype=np.float64) for x in (lat, lon, dec, inc)]
    if a95 is not None:
        args.append(np.asarray(a95, dtype=np.float64))
    shapes = {a.shape for a in args}
    try:
        shape = shapes.pop() if len(shapes) == 1 else np.broadcast_shapes(*shapes)
    except ValueError as e:
        raise LodestoneError(f"the arrays do not broadcast together: {e}") from None
    flat = [np.ascontiguousarray(a if a.shape == shape else np.broadcast_to(a, shape)).reshape(-1) for a in args]
    d = _native.vgp(*flat[:4], flat[4] if a95 is not None else None)
    out = {k: (v.reshape(shape) if shape else float(v[0])) for k, v in d.items()}
    return VGP._from(out)


def fit_components(
    steps: TableLike, picks: Optional[TableLike] = None, auto: bool = True, rule: str = "last"
) -> pd.DataFrame:
    """Principal-component fits per specimen: the columns of ``components --format csv``.

    ``steps`` is a stepwise-demagnetization table (``specimen, step, dec, inc, moment``, optional
    ``treatment``, ``site``, ``height``/``depth``, bedding). With ``picks`` (``specimen, from, to``,
    optional ``kind``, ``anchor``) each specimen is fitted over its chosen range. Otherwise, with
    ``auto=True``, an automatic rule with the command line's defaults chooses each fit:
    ``rule="last"`` (as ``components --auto``) grows a line down from the last steps while each
    lower step lies on it within the noise (F-test at α = 0.05; MAD ≤ 15°, DANG ≤ 10°), else fits a
    great circle, and grades each fit A, B or C (column ``grade``; the reasons in
    ``df.attrs["reasons"]``); ``rule="longest"`` (as ``--rule longest``) takes the longest run of at
    least 3 steps with MAD ≤ 5° and DANG ≤ 10°. A free line points from the last step used toward
    the first (the component removed).

    Returns a DataFrame (degrees for dec, inc, mad, dang); specimens without a fit are listed in
    ``df.attrs["unfitted"]`` with the reason. Check automatic choices on the specimens' figures.

    References: Kirschvink, J. L. (1980), The least-squares line and plane and the analysis of
    palaeomagnetic data, Geophys. J. R. astr. Soc. 62, 699–718.
    """
    d = _native.fit_components(_source(steps), None if picks is None else _source(picks), bool(auto), rule)
    df = pd.DataFrame(d["fits"], columns=d["columns"])
    for c in ("dang",) + tuple(c for c in ("height", "depth", "bed_dip_dir", "bed_dip") if c in df.columns):
        df[c] = df[c].astype(float)
    df.attrs["unfitted"] = [{"specimen": s, "reason": r} for s, r in d["unfitted"]]
    if "grade" in df.columns:
        df.attrs["reasons"] = {f["specimen"]: f["reason"] for f in d["fits"]}
    return df


def reversal_test(
    dec: ArrayLike, inc: ArrayLike, seed: int = 1, resamples: int = 1000, threads: Optional[int] = None
) -> ReversalTest:
    """Reversal test: are the two polarity modes antipodal?

    The directions are split into two modes on their principal axis, the second mode is flipped to
    its antipode, and the means are compared three ways: the angle γ against γc with the
    classification of McFadden & McElhinny (1990), Watson's V_w with a simulated critical value
    (``resamples`` pairs), and the bootstrap of the mean components (``resamples`` resamples,
    at least 100). Degrees in and out.

    This is a statistical statement about a model of these directions, not proof of when the rocks
    were magnetized; local practice and the published literature decide (see ``result.caution``).

    References: McFadden, P. L. & McElhinny, M. W. (1990), Geophys. J. Int. 103, 725–729;
    Tauxe, L., Kylstra, N. & Constable, C. (1991), J. Geophys. Res. 96, 11723–11740.
    """
    d = _native.reversal_test(_array(dec, "dec"), _array(inc, "inc"), int(seed), int(resamples), threads)
    return ReversalTest._from(d)


def fold_test(table: TableLike, seed: int = 1, resamples: int = 1000, threads: Optional[int] = None) -> FoldTest:
    """Bootstrap fold test by incremental untilting, with the classic precision ratio beside it.

    ``table`` is a directions table with bedding on every row (``bed_dip_dir`` or ``bed_strike``,
    and ``bed_dip``). The untilting (−10 % … 150 % in 1 % steps) that maximises τ₁ is found for
    the data and for ``resamples`` bootstrap resamples; the 95 % interval of those maxima gives the
    verdict.

    This is a statistical statement about a model, not proof of when the rocks were magnetized;
    local practice and the published literature decide.

    References: Tauxe, L. & Watson, G. S. (1994), Earth Planet. Sci. Lett. 122, 331–341;
    McElhinny, M. W. (1964), Geophys. J. R. astr. Soc. 8, 338–340.
    """
    return FoldTest._from(_native.fold_test(_source(table), int(seed), int(resamples), threads))


def _model_rows(models: Sequence[dict], keys: Sequence[str]) -> pd.DataFrame:
    rows = []
    for m in models:
        row: dict = {"model": m["model"]}
        row.update({c: m["params"].get(c, np.nan) for c in PARAM_COLUMNS})
        row.update({k: (np.nan if m[k] is None else m[k]) for k in keys})
        rows.append(row)
    return pd.DataFrame(rows, columns=["model"] + PARAM_COLUMNS + list(keys))


def fit_renewal(
    timescale: TableLike,
    young: Optional[float] = None,
    old: Optional[float] = None,
    min_length: float = 0.0,
    censor: bool = True,
    old_edge: Optional[str] = None,
) -> pd.DataFrame:
    """Renewal-model fits to the polarity intervals of a time scale (maximum likelihood).

    ``timescale`` has ``young``, ``old`` (Ma) and ``polarity`` (``N``/``R``). The window
    [``young``, ``old``] Ma defaults to the whole scale; chrons shorter than ``min_length`` Myr are
    merged into their neighbours; the open chron at the present enters as a right-censored length
    unless ``censor=False``. ``old_edge`` says how to read the interval at the old end (``"complete"``,
    ``"censored"`` or ``"left-out"``; default as on the command line: complete when the table's
    ``old_edge`` column says the oldest row ends at a reversal, else censored).

    Returns a DataFrame, one row per model (``exponential``, ``gamma``, ``weibull``, ``lognormal``,
    ``inverse_gaussian``): the parameters (``rate`` per Myr; ``shape``, ``scale`` Myr; ``mu``,
    ``sigma`` of ln Myr; ``mean`` Myr; NaN where a model has no such parameter), ``loglik``,
    ``aic``, ``bic``, ``weight`` (Akaike weight) and ``mean_interval`` (Myr). ``df.attrs`` holds
    ``n_intervals``, ``censored`` and ``censored_old`` (Myr or None), ``lr_statistic`` and
    ``lr_p_value`` (gamma against exponential), ``failures`` and the complete lengths.

    References: Cox, A. (1968), J. Geophys. Res. 73, 3247–3260; Akaike, H. (1974), IEEE Trans.
    Autom. Control 19, 716–723; Burnham & Anderson (2002), Model Selection and Multimodel Inference.
    """
    d = _native.fit_renewal(_source(timescale), young, old, float(min_length), bool(censor), old_edge)
    df = _model_rows(d["models"], ["loglik", "aic", "bic", "weight", "mean_interval"])
    keys = ("n_intervals", "censored", "censored_old", "old_edge", "lr_statistic", "lr_p_value", "failures", "complete")
    for k in keys:
        df.attrs[k] = d[k]
    return df


def hazard(
    timescale: TableLike,
    elapsed: Optional[float] = None,
    horizon: float = 0.1,
    young: Optional[float] = None,
    old: Optional[float] = None,
    min_length: float = 0.0,
    censor: bool = True,
    old_edge: Optional[str] = None,
    seed: int = 1,
    resamples: int = 1000,
    level: float = 0.95,
    threads: Optional[int] = None,
) -> pd.DataFrame:
    """Hazard and P(reversal within ``horizon`` | none for ``elapsed``) under each fitted model.

    Units: Myr for ``elapsed`` (default: the length so far of the open chron) and ``horizon``;
    ``hazard`` in reversals per Myr. ``survival`` is S(elapsed); ``p_within`` is
    1 − S(elapsed + horizon)/S(elapsed) (NaN where S underflows); ``cdf`` is F(elapsed).
    ``df.attrs["averaged"]`` holds the Akaike-weighted probability with its bootstrap interval
    (``resamples`` refits of resampled intervals; ``resamples=0`` skips it). Where the bootstrap gives
    no interval, ``low`` and ``high`` are None and ``df.attrs["notes"]`` says why.

    This is a statistical statement about renewal models fitted to a time scale, not a forecast:
    the record cannot tell when the next reversal comes, and local practice and the published
    literature decide how to read it. The sentences in ``df.attrs["cautions"]`` go with every use.

    References: Cox, D. R. (1962), Renewal Theory, ch. 1; Burnham & Anderson (2002), §4.3.
    """
    d = _native.hazard(
        _source(timescale), elapsed, float(horizon), young, old, float(min_length), bool(censor), old_edge,
        int(seed), int(resamples), float(level), threads,
    )
    df = _model_rows(d["models"], ["weight", "hazard", "survival", "p_within", "cdf"])
    df.attrs["averaged"] = {k: d[k] for k in ("averaged", "low", "high", "level")}
    for k in ("elapsed", "horizon", "percentile", "n_intervals", "censored", "censored_old", "notes", "cautions"):
        df.attrs[k] = d[k]
    return df


def run_section(
    folder: Union[str, "os.PathLike[str]"],
    out: Optional[Union[str, "os.PathLike[str]"]] = None,
    force: bool = False,
    threads: Optional[int] = None,
) -> pathlib.Path:
    """The whole chain on a project folder: tables, figures and an HTML report.

    ``folder`` holds ``steps.csv`` and ``sampling.csv`` (optional ``picks.csv``,
    ``timescale.csv``, ``settings.toml``). ``out`` defaults to the folder's name with ``-report``
    appended, beside it; an output folder that is not empty is refused unless ``force=True`` (then
    files of the same names are replaced and nothing else is touched). Returns the output folder.
    """
    return pathlib.Path(_native.run_section(os.fspath(folder), None if out is None else os.fspath(out), force, threads))



#: Columns of ``field_series``, as in ``field series --format csv``.
SERIES_COLUMNS = [
    "year", "moment", "moment_change", "tilt", "pole_lat", "pole_lon",
    "dip_north_lat", "dip_north_lon", "dip_north_speed", "dip_south_lat", "dip_south_lon", "dip_south_speed",
    "low_f", "low_lat", "low_lon", "low_area", "low_cells", "low_speed", "low_west_speed",
]


def _model_path(model: Optional[Union[str, "os.PathLike[str]"]]) -> Optional[str]:
    """A field-model table's path as text (None: the bundled IGRF-14)."""
    if model is None:
        return None
    if isinstance(model, (str, os.PathLike)):
        return os.fspath(model)
    raise TypeError(f"a field model is a path to its table or None, not {type(model).__name__}")


def field_at(
    year: float,
    lat: ArrayLike,
    lon: ArrayLike,
    altitude: ArrayLike = 0.0,
    model: Optional[Union[str, "os.PathLike[str]"]] = None,
    geocentric: bool = False,
) -> FieldElements:
    """The main field's elements X, Y, Z, H, F, D, I at points for one decimal year (as ``field at``).

    ``lat``, ``lon`` (degrees, longitude east) and ``altitude`` (km) broadcast against each other
    (NumPy rules); the result has their shape, or floats when all are scalars. By default the
    latitude is geodetic and the altitude above the WGS84 ellipsoid; with ``geocentric=True`` the
    latitude is geocentric and the altitude above the sphere of radius 6371.2 km. ``model`` is a
    field-model table (``epoch, degree, order, g, h``) or None for the bundled IGRF-14. The model is
    linear in time between its epochs and carried forward with its secular variation after the last
    one (a short extrapolation, not a forecast); years outside it raise :class:`LodestoneError`.

    Formula: B = −∇V with V = a Σ (a/r)^(n+1) Σ (g cos mφ + h sin mφ) P_n^m(cos θ), Schmidt
    quasi-normalised, a = 6371.2 km; geodetic to geocentric on the WGS84 ellipsoid.

    References: Langel (1987), §4.2; Alken et al. (2021), IGRF-13, Earth Planets Space 73:49, eq. 1;
    NIMA TR8350.2 (2000), §4 (WGS84).
    """
    args = [np.asarray(x, dtype=np.float64) for x in (lat, lon, altitude)]
    try:
        shape = np.broadcast_shapes(*(a.shape for a in args))
    except ValueError as e:
        raise LodestoneError(f"the arrays do not broadcast together: {e}") from None
    flat = [np.ascontiguousarray(np.broadcast_to(a, shape)).reshape(-1) for a in args]
    d = _native.field_at(float(year), *flat, _model_path(model), bool(geocentric))
    out = {k: (d[k].reshape(shape) if shape else float(d[k][0])) for k in ("x", "y", "z", "h", "f", "dec", "inc")}
    out.update(year=float(year), frame=d["frame"], model=d["model"])
    return FieldElements._from(out)


def field_series(
    start: Optional[float] = None,
    end: Optional[float] = None,
    every: float = 5.0,
    low_threshold: float = _native.LOW_THRESHOLD,
    model: Optional[Union[str, "os.PathLike[str]"]] = None,
) -> pd.DataFrame:
    """The present field through time, one row per year: the columns of ``field series --format csv``.

    Years from ``start`` to ``end`` (default the model's first and last epoch) every ``every`` years.
    Per year: the dipole ``moment`` (A·m², from g10, g11, h11 at 6371.2 km), ``moment_change`` (% per
    century, from the coefficient rates), ``tilt`` and the geomagnetic pole ``pole_lat``/``pole_lon``;
    the dip poles (geodetic, where the horizontal field vanishes) and their speeds since the previous
    year (km/yr; NaN for the first); the surface-intensity low on the sphere of radius 6371.2 km: its
    lowest ``low_f`` (nT) and position, ``low_area`` (km² below ``low_threshold`` nT), ``low_cells``
    (separate minima below it), and the drift of the lowest point (``low_speed``, and
    ``low_west_speed`` positive to the west; km/yr). ``df.attrs["spectrum"]`` holds the
    Lowes–Mauersberger power per degree (nT², degree 1 first) for each year; ``df.attrs["model"]``
    the model's name and span; ``df.attrs["caution"]`` the caution below.

    These numbers describe a model of the observed field, not a forecast of a reversal; local
    practice and the published literature decide what they mean.

    References: Lowes (1966), J. Geophys. Res. 71:2179 (the spectrum); Alken et al. (2021), IGRF-13.
    """
    d = _native.field_series(
        None if start is None else float(start), None if end is None else float(end), float(every),
        float(low_threshold), _model_path(model),
    )
    rows = d["epochs"]
    df = pd.DataFrame([{k: r[k] for k in SERIES_COLUMNS} for r in rows], columns=SERIES_COLUMNS)
    for k in ("dip_north_speed", "dip_south_speed", "low_speed", "low_west_speed"):
        df[k] = df[k].astype(np.float64)
    df["low_cells"] = df["low_cells"].astype(np.int64)
    df.attrs["spectrum"] = {r["year"]: r["spectrum"] for r in rows}
    df.attrs["model"] = d["model"]
    df.attrs["low_threshold"] = float(low_threshold)
    df.attrs["caution"] = FIELD_CAUTION
    return df
