"""VGP scatter per group against paleolatitude, with the latitude model S(λ)² = a² + (bλ)²."""

from __future__ import annotations

from typing import Optional, Union

import pandas as pd

from . import _native
from ._tables import TableLike, _source

#: What the latitude model is (and is not): the library's one wording (present::cautions).
from ._native import PSV_CAUTION


def psv(
    sites: TableLike,
    by: str,
    cutoff: Union[str, float] = "none",
    seed: int = 1,
    resamples: int = 1000,
    threads: Optional[int] = None,
) -> pd.DataFrame:
    """VGP scatter S_B per group of sites against the group's paleolatitude (as ``psv``).

    ``sites`` is a sites table (``site, lat, lon, dec, inc``, optional ``n``, ``k``, ``a95``) with a
    group column ``by`` (e.g. a study). Each group's VGPs are aligned to one polarity by their
    principal axis, ``cutoff`` (``"none"``, ``"vandamme"`` or an angle) applied, and S_B computed
    with the within-site correction where n and k are known; groups of fewer than 3 sites are left
    out (``attrs["remarks"]``). The model S(λ)² = a² + (bλ)² (λ in degrees, a, b ≥ 0) is fitted by
    least squares of S² on λ²; intervals from a seeded bootstrap of sites within each group (at least
    20 pseudo-samples; the same for any ``threads``).

    Returns a DataFrame with the columns of ``psv --format csv`` (``group, paleolat, s, s_low,
    s_high, n_used``; degrees) and ``within_site_corrected``; ``df.attrs["model"]`` holds ``a``,
    ``b``, ``a_low``, ``a_high``, ``b_low``, ``b_high``, ``rms``, ``n_groups``; also ``remarks``,
    ``flipped``, ``resamples``, ``caution``.

    References: McFadden, Merrill & McElhinny (1988), J. Geophys. Res. 93, 11583–11588 (the model);
    McElhinny & McFadden (1997), Geophys. J. Int. 131, 240–252 (S_B); Vandamme (1994).
    """
    d = _native.psv(_source(sites), str(by), str(cutoff), int(seed), int(resamples), threads)
    # The columns of the verb's sheet (the library's presenter), then within_site_corrected.
    df = pd.DataFrame(d["groups"])
    # The latitude model: one row of the verb's model sheet.
    df.attrs["model"] = {k: v[0] for k, v in d["model"].items()}
    df.attrs["remarks"] = [{"group": g, "remark": r, "sites": n} for g, r, n in d["remarks"]]
    df.attrs["flipped"] = d["flipped"]
    df.attrs["resamples"] = d["resamples"]
    df.attrs["caution"] = PSV_CAUTION
    return df
