"""Synthetic sections written as project folders (the ``simulate section`` verb)."""

from __future__ import annotations

import os
import pathlib
from typing import Optional, Sequence, Tuple, Union

import pandas as pd

from . import _native

# What a synthetic section is: the library's one wording (present::cautions).
from ._native import SYNTHETIC_SECTION_CAUTION

PathLike = Union[str, "os.PathLike[str]"]


def _pair(value: Optional[Sequence[float]]) -> Optional[Tuple[float, float]]:
    if value is None:
        return None
    low, high = value
    return float(low), float(high)


def simulate_section(
    out: PathLike,
    base_age: float,
    lat: float,
    lon: float,
    timescale: Optional[PathLike] = None,
    top_age: float = 0.0,
    rates: Union[str, float] = "2",
    spacing: float = 1.0,
    specimens: int = 3,
    kappa: float = 40.0,
    level_kappa: Optional[float] = None,
    bedding: Sequence[Tuple[float, float]] = (),
    treatment: str = "thermal",
    steps: Optional[Sequence[float]] = None,
    characteristic: Optional[Tuple[float, float]] = None,
    overprint: Optional[Tuple[float, float]] = None,
    overprint_ratio: float = 0.5,
    overprint_range: Optional[Tuple[float, float]] = None,
    moment: float = 1e-8,
    moment_spread: float = 0.25,
    noise: float = 0.005,
    site_prefix: str = "L",
    core: bool = False,
    model: str = "gamma",
    shape: Optional[float] = None,
    mean_interval: float = 0.25,
    first_polarity: str = "N",
    name_prefix: Optional[str] = None,
    seed: int = 1,
    force: bool = False,
) -> pd.DataFrame:
    """Draw a synthetic section and write it as a project folder ``out`` (as ``simulate section``).

    The section runs from ``base_age`` to ``top_age`` Ma at the locality ``lat``, ``lon`` (degrees),
    accumulating at ``rates`` (cm/kyr, ``"RATE@AGE,…,RATE"`` from the base upward, 0 a hiatus; a
    number is a constant rate), sampled every ``spacing`` m with ``specimens`` per level. It samples
    the time scale ``timescale`` (a path to a timescale table) or, without one, a time scale drawn
    from the renewal ``model`` (``shape``, ``mean_interval`` Myr, ``first_polarity``,
    ``name_prefix``, as :func:`lodestone.simulate_timescale`) covering the section and one mean
    interval more. Specimens scatter about their level's field with Fisher precision ``kappa``,
    levels about the axial dipole with ``level_kappa`` (None: exactly on it); ``bedding`` is a list
    of (dip direction, dip) given to levels in turn (empty: flat-lying). Demagnetization:
    ``treatment`` (``"thermal"`` or ``"af"``), ``steps`` (°C or mT, starting with 0; default the
    treatment's schedule), the characteristic unblocking range ``characteristic`` (low, high), an
    optional ``overprint`` (dec, inc, geographic) of moment ``overprint_ratio`` over
    ``overprint_range``; moments ``moment`` A·m² with log-spread ``moment_spread``, noise ``noise``
    (fraction of the moment per component). Levels are named ``site_prefix`` and a number from the
    base; ``core=True`` writes depths below the top instead of heights.

    The folder gets ``steps.csv``, ``sampling.csv``, ``timescale.csv``, ``settings.toml`` and
    ``truth.json``, byte for byte what the command line writes with the same options and seed. It
    must be new or empty unless ``force`` (files of the same names are replaced). Files are written
    through a temporary name and a rename.

    Returns a DataFrame of the chrons in the section (the columns of ``simulate section --format
    csv``: ``chron, polarity, young, old, base, top, thickness, n_levels, status``); ``df.attrs``:
    ``folder`` (a path), ``files``, ``plan`` (DataFrame: the chance that a chron of a given length
    holds at least one / two levels, ``length, rate, thickness, p_one, p_two``), ``notes`` and
    ``caution`` (synthetic data say nothing about any real section).
    """
    d = _native.simulate_section(
        os.fspath(out), float(base_age), float(lat), float(lon),
        None if timescale is None else os.fspath(timescale), float(top_age), str(rates), float(spacing),
        int(specimens), float(kappa), None if level_kappa is None else float(level_kappa),
        [(float(a), float(b)) for a, b in bedding], str(treatment),
        None if steps is None else [float(s) for s in steps], _pair(characteristic),
        _pair(overprint), float(overprint_ratio), _pair(overprint_range),
        float(moment), float(moment_spread), float(noise), str(site_prefix), bool(core), str(model),
        None if shape is None else float(shape), float(mean_interval), str(first_polarity), name_prefix,
        int(seed), bool(force),
    )
    df = pd.DataFrame(d["chrons"])
    df.attrs["folder"] = pathlib.Path(out)
    df.attrs["files"] = list(d["files"])
    df.attrs["plan"] = pd.DataFrame(d["plan"])
    df.attrs["notes"] = list(d["notes"])
    df.attrs["caution"] = SYNTHETIC_SECTION_CAUTION
    return df
