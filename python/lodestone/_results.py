"""Result objects of the lodestone package: named attributes and ``to_dict()``."""

from __future__ import annotations

import dataclasses
from typing import Any, Dict, Optional

import numpy as np
import pandas as pd

# The cautions: the library's one wording of each (present::cautions). FIELD_TEST_CAUTION goes with
# every field test, FIELD_CAUTION with every present-field result, POLE_CAUTION with the paleopole
# and the VGP scatter (ONE_VGP_CAUTION with the VGP of a single site), SHALLOWING_CAUTION with an
# inclination-shallowing correction.
from ._native import FIELD_CAUTION, FIELD_TEST_CAUTION, ONE_VGP_CAUTION, POLE_CAUTION, SHALLOWING_CAUTION


def _plain(value: Any) -> Any:
    """A value as plain Python: arrays become lists, NumPy scalars become Python numbers."""
    if isinstance(value, np.ndarray):
        return value.tolist()
    if isinstance(value, pd.DataFrame):
        # Records of plain values; NaN (an undefined statistic in a table) becomes None.
        return [
            {k: (None if isinstance(v, float) and v != v else _plain(v)) for k, v in row.items()}
            for row in value.to_dict("records")
        ]
    if isinstance(value, np.generic):
        return value.item()
    return value


class _Result:
    """Common behaviour: ``to_dict()`` and a short ``repr``."""

    @classmethod
    def _from(cls, values: Dict[str, Any]):
        """An instance from the extension's dict, without the frozen dataclass's slow ``__init__``
        (fields with defaults fall back to the class attribute)."""
        obj = object.__new__(cls)
        obj.__dict__.update(values)
        return obj

    def to_dict(self) -> Dict[str, Any]:
        """Every attribute as plain Python values (lists for arrays, None for undefined values)."""
        return {f.name: _plain(getattr(self, f.name)) for f in dataclasses.fields(self)}  # type: ignore[arg-type]


@dataclasses.dataclass(frozen=True)
class FisherMean(_Result):
    """Fisher (1953) mean of a set of directions.

    Units: degrees for ``dec``, ``inc``, ``a95``, ``alpha`` and ``theta63``; ``r`` in units of
    direction count; ``k`` dimensionless (``inf`` when all directions are identical).

    ``dec``/``inc`` are None when the resultant vanishes (R ≈ 0); ``k``, ``a95`` and ``theta63``
    are None for a single direction; ``a95`` is None when the cone is undefined (very scattered
    sets). ``a95`` is always at 95 %; ``alpha`` is the cone at ``confidence``.
    """

    dec: Optional[float]
    inc: Optional[float]
    n: int
    r: float
    k: Optional[float]
    a95: Optional[float]
    theta63: Optional[float]
    alpha: Optional[float]
    confidence: float


@dataclasses.dataclass(frozen=True)
class VGP(_Result):
    """Virtual geomagnetic poles (arrays in the broadcast shape of the inputs, floats for scalars).

    Units: degrees. ``plat``/``plon`` the pole (longitude in [0, 360)); ``dp``/``dm`` the semi-axes
    of the confidence oval (NaN where no a95 was given); ``paleolat`` the site's paleolatitude
    (negative for a reversed direction); ``colatitude`` the magnetic colatitude p.
    """

    plat: Any
    plon: Any
    dp: Any
    dm: Any
    paleolat: Any
    colatitude: Any


@dataclasses.dataclass(frozen=True)
class ReversalTest(_Result):
    """Reversal test: the two polarity modes compared after flipping the second.

    ``gamma``/``gamma_c`` in degrees (McFadden & McElhinny 1990; γc is the angle at which V_w reaches
    its simulated critical value, valid for unequal precisions; ``gamma_c_common_k`` is the analytic
    angle that assumes one precision, for comparison); ``classification`` one of
    ``A``, ``B``, ``C``, ``indeterminate`` or ``negative`` (γ > γc); ``v_w``/``v_crit`` Watson's
    V_w and its simulated critical value; ``passed`` follows the angle test. ``caution`` says what
    the result is and is not.
    """

    gamma: float
    gamma_c: float
    classification: str
    v_w: float
    v_crit: float
    passed: bool
    gamma_c_common_k: float
    n1: int
    n2: int
    v_w_passed: bool
    bootstrap_passed: bool
    mean1_dec: float
    mean1_inc: float
    mean2_dec: float
    mean2_inc: float
    k1: float
    k2: float
    seed: int
    resamples: int
    caution: str = FIELD_TEST_CAUTION


@dataclasses.dataclass(frozen=True)
class FoldTest(_Result):
    """Bootstrap fold test (percent untilting) with the classic precision ratio beside it.

    ``best_untilt``, ``ci_low``, ``ci_high`` in percent of the full bedding correction; ``verdict``
    one of ``pre-folding``, ``syn-folding``, ``post-folding``, ``inconclusive``. ``k_ratio`` is
    k_tilt/k_geo against ``f_crit`` (for comparison only: both k come from the same directions).
    """

    best_untilt: float
    ci_low: float
    ci_high: float
    verdict: str
    n: int
    k_geo: float
    k_tilt: float
    k_ratio: float
    f_crit: float
    at_edge: float
    bedding_spread: float
    seed: int
    resamples: int
    caution: str = FIELD_TEST_CAUTION


@dataclasses.dataclass(frozen=True)
class FieldElements(_Result):
    """The main field's elements at one or more points (arrays in the broadcast shape of ``lat``,
    ``lon`` and ``altitude``; floats when all three are scalars).

    Units: nT for ``x`` (north), ``y`` (east), ``z`` (down), ``h`` (horizontal) and ``f`` (total);
    degrees for ``dec`` (clockwise from north, [0, 360)) and ``inc`` (positive down). ``year`` is the
    decimal year; ``frame`` is ``"geodetic"`` (WGS84; X, Z along the ellipsoid's north and normal) or
    ``"geocentric"`` (the sphere of radius 6371.2 km); ``model`` names the model and its span.
    ``caution``: a model of the observed field, not a forecast.
    """

    x: Any
    y: Any
    z: Any
    h: Any
    f: Any
    dec: Any
    inc: Any
    year: float
    frame: str
    model: Dict[str, Any]
    caution: str = FIELD_CAUTION


@dataclasses.dataclass(frozen=True)
class Paleopole(_Result):
    """VGPs of the sites, the paleopole and the VGP scatter S_B (as ``poles`` gives them).

    ``vgps``: DataFrame with ``site, lat, lon, dec, inc, plat, plon, dp, dm, paleolat, paleolat_low,
    paleolat_high`` (the columns of ``poles --format csv``) and ``a95``, ``kept`` (by the cutoff),
    ``flipped`` (more than 90° from the northern end of the VGPs' principal axis). Degrees throughout.
    ``n``, ``plat``, ``plon``, ``k``, ``a95``: the Fisher mean of the VGPs (None for a single site).
    ``s`` (S_B, None when the within-site term exceeds the total), ``s_low``/``s_high`` (bootstrap
    95 % interval), ``s_total``, ``within_term``, ``n_used``, ``n_removed``, ``threshold`` (the
    cutoff angle used, None without a cutoff) and ``cutoff``: the scatter of the polarity-aligned
    VGPs. ``caution`` says what these numbers are (for a single site, what its VGP is);
    ``scatter_note`` why the scatter or its interval is missing although there is a paleopole.
    """

    vgps: Any
    n: Optional[int]
    plat: Optional[float]
    plon: Optional[float]
    k: Optional[float]
    a95: Optional[float]
    s: Optional[float]
    s_low: Optional[float]
    s_high: Optional[float]
    s_total: Optional[float]
    within_term: Optional[float]
    n_used: Optional[int]
    n_removed: Optional[int]
    threshold: Optional[float]
    cutoff: str
    northern: bool
    seed: int
    resamples: int
    caution: str = POLE_CAUTION
    scatter_note: Optional[str] = None


@dataclasses.dataclass(frozen=True)
class PolarityColumn(_Result):
    """Polarity per level and the magnetozones of a section (as ``column`` gives them).

    ``levels``: DataFrame with ``height`` (or ``depth``), ``vgp_lat``, ``polarity`` (``N``, ``R``,
    ``I``), ``n``, ``a95``, ``mad``, by increasing position. ``zones``: DataFrame with the columns of
    ``column --format csv`` (``zone, polarity, n_levels, status, base, base_low, base_high, top,
    top_low, top_high, axis``; metres), which :func:`lodestone.correlate` reads back. ``axis`` is
    ``"height"`` or ``"depth"``; ``threshold`` the VGP latitude (degrees) of the polarity rule.
    """

    axis: str
    levels: Any
    zones: Any
    threshold: float
    min_levels: int
    notes: Any


@dataclasses.dataclass(frozen=True)
class Correlation(_Result):
    """Ranked correlations of a polarity column with a time scale (as ``correlate`` gives them).

    ``candidates``: DataFrame, one row per candidate (``rank, score, mean_rate_cm_kyr, ties,
    missing_chrons, skipped_zones, top_age, base_age``; lower score is better). ``ties``: DataFrame
    of every candidate's tie points (the columns of ``correlate --format csv``: ``rank``, the
    position, ``low``, ``high``, ``age``, ``chron_above``, ``chron_below``). ``age_model``: the best
    candidate's runs (``top, base, age_young, age_old, rate`` in cm/kyr, ``reading``, ``missing``).
    ``details``: every candidate as the library gives it (runs, chrons, age-model points).
    ``comparison``: best against runner-up in words. ``caution`` says what the ranking is.
    """

    axis: str
    candidates: Any
    ties: Any
    age_model: Any
    comparison: str
    n_scored: int
    details: Any
    zones: Any
    caution: str


@dataclasses.dataclass(frozen=True)
class Unflattening(_Result):
    """Inclination-shallowing correction (as ``unflatten`` gives it).

    ``method``: ``"elongation_inclination"`` (the search, with bootstrap intervals ``f_low``,
    ``f_high``, ``inc_low``, ``inc_high``) or ``"factor"`` (a given ``f``; ``inc_low``/``inc_high``
    are the corrected mean inclination ∓ the corrected α95). ``f`` is the flattening factor
    (tan I_f = f tan I₀; 1 = no shallowing; None when the data's path never meets the model curve);
    inclinations in degrees; ``elongation`` τ₂/τ₃ of the observed directions. ``no_bedding`` is True
    when the tilt-corrected frame was asked for but the table has no bedding (directions as given).
    """

    method: str
    n: int
    f: Optional[float]
    inc_observed: Optional[float]
    inc_corrected: Optional[float]
    inc_low: Optional[float]
    inc_high: Optional[float]
    elongation: Optional[float]
    no_bedding: bool
    f_low: Optional[float] = None
    f_high: Optional[float] = None
    elongation_dec: Optional[float] = None
    meridional: Optional[bool] = None
    no_crossing: Optional[int] = None
    dec_observed: Optional[float] = None
    dec_corrected: Optional[float] = None
    a95_observed: Optional[float] = None
    a95_corrected: Optional[float] = None
    seed: Optional[int] = None
    resamples: Optional[int] = None
    caution: str = SHALLOWING_CAUTION
