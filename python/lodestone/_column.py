"""Magnetostratigraphy: the polarity column, its correlation with a time scale, and the column figure."""

from __future__ import annotations

import json
from typing import Optional, Sequence, Tuple, Union

import pandas as pd

from . import _native
from ._results import Correlation, PolarityColumn
from ._tables import TableLike, _source

#: Defaults of the command line (``column`` and ``correlate``), as the library decides them.
THRESHOLD = _native.VGP_THRESHOLD
MIN_LEVELS = _native.MIN_LEVELS

Anchor = Union[Tuple[float, float], Tuple[float, float, float]]


def _zones_frame(zones) -> pd.DataFrame:
    """The zones table (the library's columns, as ``column --format csv`` prints it)."""
    df = pd.DataFrame(zones["columns"])
    df.attrs["section_ends"] = [tuple(e) for e in zones["section_ends"]]
    return df


def polarity_column(
    levels: TableLike, threshold: float = THRESHOLD, min_levels: int = MIN_LEVELS, in_situ: bool = False
) -> PolarityColumn:
    """Polarity of each level and the magnetozones of a section (as ``column``).

    ``levels`` is a directions table with ``height`` or ``depth`` and ``lat``/``lon`` (one or more
    directions per level; tilt-corrected where bedding is given unless ``in_situ``), or a table
    with a ``vgp_lat`` column. A level is normal when its VGP latitude is at least ``threshold``
    degrees, reversed at or below −``threshold``, intermediate between; zones resting on fewer than
    ``min_levels`` levels are reported as single-level (unconfirmed), not merged. Each internal
    boundary lies somewhere in the sampling gap between the levels on either side (``base_low`` …
    ``base_high``, ``top_low`` … ``top_high``, metres).

    Returns a :class:`PolarityColumn` with the ``levels`` and ``zones`` DataFrames (the zones with
    the columns of ``column --format csv``, readable by :func:`correlate`).

    The polarity rule on VGP latitude is common practice; see Opdyke & Channell (1996),
    *Magnetic Stratigraphy*, ch. 5.
    """
    d = _native.polarity_column(_source(levels), float(threshold), int(min_levels), bool(in_situ))
    lev = pd.DataFrame(d["levels"])
    for c in ("a95", "mad"):
        lev[c] = lev[c].astype(float)
    return PolarityColumn._from(
        dict(axis=d["axis"], levels=lev, zones=_zones_frame(d["zones"]), threshold=float(threshold),
             min_levels=int(min_levels), notes=list(d["notes"]))
    )


def _settings(anchors, miss_penalty, hiatus_penalty, skip_penalty, rate_spread, candidates, threshold, min_levels):
    parsed = []
    for a in anchors or ():
        if len(a) not in (2, 3):
            raise TypeError(f"an anchor is (position, age) or (position, age, uncertainty), not {a!r}")
        parsed.append((float(a[0]), float(a[1]), float(a[2]) if len(a) == 3 else 0.0))
    return dict(
        anchors=parsed, miss_penalty=float(miss_penalty), hiatus_penalty=float(hiatus_penalty),
        skip_penalty=float(skip_penalty), rate_spread=float(rate_spread), candidates=int(candidates),
        threshold=float(threshold), min_levels=int(min_levels),
    )


def correlate(
    zones: TableLike,
    timescale: TableLike,
    anchors: Optional[Sequence[Anchor]] = None,
    miss_penalty: float = _native.MISS_PENALTY,
    hiatus_penalty: float = _native.HIATUS_PENALTY,
    skip_penalty: float = _native.SKIP_PENALTY,
    rate_spread: float = _native.RATE_SPREAD,
    candidates: int = _native.CANDIDATES,
    threshold: float = THRESHOLD,
    min_levels: int = MIN_LEVELS,
) -> Correlation:
    """Ranked correlations of a polarity column with a time scale, and the best one's age model.

    ``zones`` is a zones table (``polarity_column(...).zones``, or what ``column --format csv``
    prints) or a levels table, zoned with ``threshold`` and ``min_levels``. ``timescale`` has
    ``young``, ``old`` (Ma), ``polarity`` and optional ``name``. ``anchors`` are dated beds
    ``(position m, age Ma)`` or ``(position, age, uncertainty Myr)``: each must fall in the chrons
    a candidate assigns there. Scores (lower is better) are −2 ln L of a log-normal model of the
    accumulation rates (spread ``rate_spread`` in ln rate) plus ``miss_penalty`` per chron missing
    from the column, ``hiatus_penalty`` per run read as holding a hiatus, ``skip_penalty`` per
    single-level zone left out.

    Returns a :class:`Correlation`: the ``candidates``, every candidate's ``ties`` (the columns of
    ``correlate --format csv``), the best one's ``age_model`` runs (rates in cm/kyr; the end runs
    are extrapolated at the mean rate and have no rate of their own), and ``comparison``.

    The ranking is a statistical statement about a steady-rate model, not proof of the correlation;
    independent age control, local practice and the published literature decide (``caution``).
    The verbal scale of ``comparison`` follows Kass & Raftery (1995), J. Am. Stat. Assoc. 90, 773–795.
    """
    st = _settings(anchors, miss_penalty, hiatus_penalty, skip_penalty, rate_spread, candidates, threshold, min_levels)
    d = _native.correlate(_source(zones), _source(timescale), st)
    cands = json.loads(d["candidates"])
    axis = d["axis"]
    sheets = d["sheets"]
    summary = pd.DataFrame(sheets["candidates"])
    ties = pd.DataFrame(sheets["ties"])
    runs = pd.DataFrame(sheets["runs"])
    runs["rate"] = runs["rate"].astype(float)
    ties.attrs["axis"] = axis
    return Correlation._from(
        dict(axis=axis, candidates=summary, ties=ties, age_model=runs, comparison=d["comparison"],
             n_scored=d["n_scored"], details=cands, zones=_zones_frame(d["zones"]), caution=d["caution"])
    )


def column_figure(
    levels: TableLike,
    timescale: Optional[TableLike] = None,
    format: str = "svg",
    title: Optional[str] = None,
    threshold: float = THRESHOLD,
    min_levels: int = MIN_LEVELS,
    anchors: Optional[Sequence[Anchor]] = None,
    **correlate_settings: float,
) -> Union[str, bytes]:
    """The library's polarity-column figure: SVG text (``format="svg"``) or PNG bytes (``"png"``).

    Without ``timescale``: the levels' VGP latitudes with the ±``threshold`` guides and the
    magnetozones beside them, as ``column --plot`` draws it (``levels`` is a levels table). With
    ``timescale``: the column beside the chrons its best correlation spans, with that candidate's
    tie lines, as ``correlate --plot`` draws it (``levels`` may then also be a zones table;
    ``anchors`` and the keywords of :func:`correlate` set the correlation). Fill convention of the
    trade: black normal, white reversed, grey intermediate or single-level.

    Write the result with ``open(path, "w").write(svg)`` or ``open(path, "wb").write(png)``; in a
    notebook, ``IPython.display.SVG(svg)`` shows it.
    """
    st = _settings(
        anchors, correlate_settings.pop("miss_penalty", _native.MISS_PENALTY),
        correlate_settings.pop("hiatus_penalty", _native.HIATUS_PENALTY),
        correlate_settings.pop("skip_penalty", _native.SKIP_PENALTY), correlate_settings.pop("rate_spread", _native.RATE_SPREAD),
        correlate_settings.pop("candidates", _native.CANDIDATES), threshold, min_levels,
    )
    if correlate_settings:
        raise TypeError(f"unknown keyword(s): {', '.join(sorted(correlate_settings))}")
    ts = None if timescale is None else _source(timescale)
    return _native.column_figure(_source(levels), ts, st, format, title)
