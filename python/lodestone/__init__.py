"""lodestone: paleomagnetic reversal-record analysis, from Python.

The same library as the ``lodestone`` command line, at native speed: Fisher means, virtual
geomagnetic poles, principal-component fits, field tests, renewal-model fits to polarity intervals
and the hazard, and the whole chain on a project folder.

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
from typing import Optional, Sequence, Tuple, Union

import numpy as np
import pandas as pd

from . import _native
from ._native import LodestoneError
from ._results import FisherMean, FoldTest, ReversalTest, VGP

__all__ = [
    "LodestoneError",
    "FisherMean",
    "VGP",
    "ReversalTest",
    "FoldTest",
    "fisher_mean",
    "group_means",
    "vgp",
    "fit_components",
    "reversal_test",
    "fold_test",
    "fit_renewal",
    "hazard",
    "run_section",
]

#: A table: a path to a CSV file, or a DataFrame with the same columns.
TableLike = Union[str, "os.PathLike[str]", pd.DataFrame]
ArrayLike = Union[Sequence[float], np.ndarray, float]

#: Parameter columns of the renewal tables, as in ``intervals --format csv`` (each model fills its own).
PARAM_COLUMNS = ["rate", "shape", "scale", "mu", "sigma", "mean"]


def _source(table: TableLike) -> Union[str, Tuple[str, bytes]]:
    """A table for the extension: a path as text, or a DataFrame as CSV bytes with a name."""
    if isinstance(table, pd.DataFrame):
        return ("DataFrame", table.to_csv(index=False).encode("utf-8"))
    if isinstance(table, (str, os.PathLike)):
        return os.fspath(table)
    raise TypeError(f"a table is a path or a pandas DataFrame, not {type(table).__name__}")


def _array(x: ArrayLike, name: str) -> np.ndarray:
    """A contiguous 1-D float64 copy of ``x`` (a scalar becomes one value)."""
    try:
        a = np.asarray(x, dtype=np.float64)
    except (TypeError, ValueError) as e:
        raise LodestoneError(f"{name}: expected numbers ({e})") from None
    return np.ascontiguousarray(a.reshape(-1))


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
    return FisherMean(**d)


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
    try:
        shaped = np.broadcast_arrays(*args)
    except ValueError as e:
        raise LodestoneError(f"the arrays do not broadcast together: {e}") from None
    shape = shaped[0].shape
    flat = [np.ascontiguousarray(a.reshape(-1)) for a in shaped]
    d = _native.vgp(*flat[:4], flat[4] if a95 is not None else None)
    out = {k: (v.reshape(shape) if shape else float(v[0])) for k, v in d.items()}
    return VGP(**out)


def fit_components(steps: TableLike, picks: Optional[TableLike] = None, auto: bool = True) -> pd.DataFrame:
    """Principal-component fits per specimen: the columns of ``components --format csv``.

    ``steps`` is a stepwise-demagnetization table (``specimen, step, dec, inc, moment``, optional
    ``treatment``, ``site``, ``height``/``depth``, bedding). With ``picks`` (``specimen, from, to``,
    optional ``kind``, ``anchor``) each specimen is fitted over its chosen range; otherwise, with
    ``auto=True``, the automatic rule of the command line chooses each specimen's line segment
    (longest run of at least 3 steps with MAD ≤ 5° and DANG ≤ 10°). A free line points from the
    last step used toward the first (the component removed).

    Returns a DataFrame (degrees for dec, inc, mad, dang); specimens without a fit are listed in
    ``df.attrs["unfitted"]`` with the reason.

    References: Kirschvink, J. L. (1980), The least-squares line and plane and the analysis of
    palaeomagnetic data, Geophys. J. R. astr. Soc. 62, 699–718.
    """
    d = _native.fit_components(_source(steps), None if picks is None else _source(picks), bool(auto))
    df = pd.DataFrame(d["fits"], columns=d["columns"])
    for c in ("dang",) + tuple(c for c in ("height", "depth", "bed_dip_dir", "bed_dip") if c in df.columns):
        df[c] = df[c].astype(float)
    df.attrs["unfitted"] = [{"specimen": s, "reason": r} for s, r in d["unfitted"]]
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
    return ReversalTest(**d)


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
    return FoldTest(**_native.fold_test(_source(table), int(seed), int(resamples), threads))


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
) -> pd.DataFrame:
    """Renewal-model fits to the polarity intervals of a time scale (maximum likelihood).

    ``timescale`` has ``young``, ``old`` (Ma) and ``polarity`` (``N``/``R``). The window
    [``young``, ``old``] Ma defaults to the whole scale; chrons shorter than ``min_length`` Myr are
    merged into their neighbours; the open chron at the present enters as a right-censored length
    unless ``censor=False``.

    Returns a DataFrame, one row per model (``exponential``, ``gamma``, ``weibull``, ``lognormal``,
    ``inverse_gaussian``): the parameters (``rate`` per Myr; ``shape``, ``scale`` Myr; ``mu``,
    ``sigma`` of ln Myr; ``mean`` Myr; NaN where a model has no such parameter), ``loglik``,
    ``aic``, ``bic``, ``weight`` (Akaike weight) and ``mean_interval`` (Myr). ``df.attrs`` holds
    ``n_intervals``, ``censored`` (Myr or None), ``lr_statistic`` and ``lr_p_value`` (gamma against
    exponential) and ``failures``.

    References: Cox, A. (1968), J. Geophys. Res. 73, 3247–3260; Akaike, H. (1974), IEEE Trans.
    Autom. Control 19, 716–723; Burnham & Anderson (2002), Model Selection and Multimodel Inference.
    """
    d = _native.fit_renewal(_source(timescale), young, old, float(min_length), bool(censor))
    df = _model_rows(d["models"], ["loglik", "aic", "bic", "weight", "mean_interval"])
    for k in ("n_intervals", "censored", "lr_statistic", "lr_p_value", "failures", "complete"):
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
    (``resamples`` refits of resampled intervals; ``resamples=0`` skips it).

    This is a statistical statement about renewal models fitted to a time scale, not a forecast:
    the record cannot tell when the next reversal comes, and local practice and the published
    literature decide how to read it. The sentences in ``df.attrs["cautions"]`` go with every use.

    References: Cox, D. R. (1962), Renewal Theory, ch. 1; Burnham & Anderson (2002), §4.3.
    """
    d = _native.hazard(
        _source(timescale), elapsed, float(horizon), young, old, float(min_length), bool(censor),
        int(seed), int(resamples), float(level), threads,
    )
    df = _model_rows(d["models"], ["weight", "hazard", "survival", "p_within", "cdf"])
    df.attrs["averaged"] = {k: d[k] for k in ("averaged", "low", "high", "level")}
    for k in ("elapsed", "horizon", "percentile", "n_intervals", "censored", "cautions"):
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

