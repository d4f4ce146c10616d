"""The reversal rate through time, and synthetic time scales from a renewal model."""

from __future__ import annotations

from typing import Optional

import pandas as pd

from . import _native
from ._tables import TableLike, _source

# What a rate and its tests are (and are not), and what a synthetic time scale is: the library's one
# wording of each (present::cautions).
from ._native import RATE_CAUTION, SYNTHETIC_CAUTION


def reversal_rate(
    timescale: TableLike,
    window: float = 1.0,
    step: Optional[float] = None,
    level: float = 0.95,
    young: Optional[float] = None,
    old: Optional[float] = None,
    min_length: float = 0.0,
    censor: bool = True,
    old_edge: Optional[str] = None,
) -> pd.DataFrame:
    """Reversal rate through time (as ``rate``): the columns of ``rate --format csv``.

    Reversals of ``timescale`` between ``young`` and ``old`` Ma (chrons shorter than ``min_length``
    Myr merged, as in :func:`lodestone.fit_renewal`), counted in windows of ``window`` Myr centred
    every ``step`` Myr (default a tenth of the window); only whole windows are used. Returns a
    DataFrame ``age`` (Ma, window centre), ``rate``, ``low``, ``high`` (per Myr; exact Poisson
    limits at ``level``) and ``count``. ``df.attrs`` holds ``laplace`` (``n``, ``u``, ``p_value``:
    U > 0 when reversals crowd toward the present) and ``clustering`` (``mean_h`` — 0.5 for a locally
    Poisson process — ``z``, ``p_value``, ``ks_d``, ``ks_p``, ``h``), each a dict or, when it cannot
    be computed, the reason as text; and ``reversals`` (ages), ``n_intervals``, ``from``, ``to``,
    ``window``, ``step``, ``level`` and ``caution``.

    Formula: rate = k/w; low = χ²(α/2; 2k)/(2w), high = χ²(1 − α/2; 2k + 2)/(2w), 1 − α = level;
    Laplace U = (Σ tᵢ/n − T/2)/(T √(1/(12 n))) with t measured from the old edge.

    References: Garwood (1936), Biometrika 28, 437–442; Cox & Lewis (1966), The Statistical
    Analysis of Series of Events, §3.
    """
    d = _native.reversal_rate(
        _source(timescale), young, old, float(min_length), bool(censor), old_edge, float(window),
        None if step is None else float(step), float(level),
    )
    df = pd.DataFrame(d["rate"])
    for k in ("laplace", "clustering", "reversals", "n_intervals", "from", "to", "window", "step", "level"):
        df.attrs[k] = d[k]
    df.attrs["n_reversals"] = len(d["reversals"])
    df.attrs["caution"] = RATE_CAUTION
    return df


def simulate_timescale(
    model: str = "gamma",
    span: float = 10.0,
    mean_interval: float = 0.25,
    shape: Optional[float] = None,
    young: float = 0.0,
    first_polarity: str = "N",
    name_prefix: Optional[str] = None,
    seed: int = 1,
) -> pd.DataFrame:
    """A synthetic polarity time scale from a renewal model (as ``simulate timescale``).

    Interval lengths are independent draws from ``model`` (``exponential``, ``gamma``, ``weibull``,
    ``lognormal``, ``inverse_gaussian``) with mean ``mean_interval`` Myr and ``shape`` (gamma and
    Weibull shape, lognormal σ, inverse-Gaussian shape in Myr; default 1.5, an illustrative choice;
    refused for the exponential). Chrons alternate in polarity from ``first_polarity`` (``"N"``,
    ``"R"`` or ``"random"``) at ``young`` Ma over ``span`` Myr; the youngest and oldest are cut by the
    ends (censored, as in a real record). Seeded: the same ``seed`` gives the same scale.

    Returns a DataFrame with the columns of ``simulate timescale --format csv`` (``name`` first when
    ``name_prefix`` names the chrons, then ``young``, ``old``, ``polarity``), which every function
    taking a time scale accepts. ``df.attrs``: ``model`` (name and parameters), ``mean``, ``seed``,
    ``caution``.

    References: Cox (1962), Renewal Theory, ch. 5 (the straddling interval); Johnson, Kotz &
    Balakrishnan (1994), Continuous Univariate Distributions, vol. 1.
    """
    d = _native.simulate_timescale(
        str(model), float(span), float(mean_interval), None if shape is None else float(shape), float(young),
        str(first_polarity), name_prefix, int(seed),
    )
    cols = (["name"] if name_prefix is not None else []) + ["young", "old", "polarity"]
    df = pd.DataFrame({c: d[c] for c in cols}, columns=cols)
    for k in ("model", "mean", "seed"):
        df.attrs[k] = d[k]
    df.attrs["caution"] = SYNTHETIC_CAUTION
    return df
