"""Correction of inclination shallowing in sediments."""

from __future__ import annotations

from typing import Optional

from . import _native
from ._results import Unflattening
from ._tables import TableLike, _source


def unflatten(
    table: TableLike,
    factor: Optional[float] = None,
    frame: str = "tilt",
    seed: int = 1,
    resamples: int = 1000,
    threads: Optional[int] = None,
) -> Unflattening:
    """Inclination-shallowing correction of a sedimentary directions table (as ``unflatten``).

    ``table`` is a directions table of lines (``dec``, ``inc``; bedding columns are applied when
    ``frame="tilt"`` and given on every row). Without ``factor``: the elongation/inclination method —
    the directions are unflattened by f from 1 down to 0.2 until their elongation and inclination
    meet the TK03 model curve; ``resamples`` bootstrap pseudo-samples (at least 100; seeded, the same
    for any ``threads``) give the 95 % intervals. It needs at least 30 directions (about 100 to be
    reliable). With ``factor`` in (0, 1]: every direction is unflattened by it (King 1955) and the
    Fisher means before and after are compared.

    Formula: tan I₀ = tan I_f / f; elongation τ₂/τ₃ of the orientation matrix; TK03 curve
    E = 2.895 − 0.01466 I − 3.525e-4 I² + 3.160e-6 I³.

    References: King (1955), Mon. Not. R. Astron. Soc. Geophys. Suppl. 7, 115–134; Tauxe & Kent
    (2004), AGU Geophys. Monogr. 145, 101–115; Tauxe et al. (2008), Phys. Earth Planet. Inter. 169,
    152–165.
    """
    d = _native.unflatten(
        _source(table), None if factor is None else float(factor), str(frame), int(seed), int(resamples), threads
    )
    if factor is None:
        d.update(seed=int(seed), resamples=int(resamples))
    return Unflattening._from(d)
