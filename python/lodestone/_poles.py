"""The paleopole and the VGP scatter of a sites table."""

from __future__ import annotations

from typing import Optional, Union

import pandas as pd

from . import _native
from ._native import ONE_VGP_CAUTION
from ._results import Paleopole
from ._tables import TableLike, _source


def paleopole(
    sites: TableLike,
    cutoff: Union[str, float] = "none",
    northern: bool = False,
    seed: int = 1,
    resamples: int = 1000,
    threads: Optional[int] = None,
) -> Paleopole:
    """VGP of each site, the paleopole (Fisher mean of the VGPs) and the VGP scatter S_B (as ``poles``).

    ``sites`` has ``site, lat, lon, dec, inc`` and optional ``n``, ``k``, ``a95`` (degrees). A site's
    α95 is taken as given, else from n and k through Fisher's cone; dp, dm and the paleolatitude
    range need it. The paleopole averages the VGPs as computed (a reversed site gives a southern
    VGP), or aligned to one polarity with ``northern=True``. The scatter always uses the VGPs
    aligned by their principal axis: ``cutoff`` is ``"none"``, ``"vandamme"`` or an angle about the
    mean pole (e.g. ``45``); S_B = √(S_T² − S_W²) with the within-site term where n and k (or n and
    a95) are known; ``s_low``/``s_high`` is a seeded bootstrap over the kept sites (``resamples``,
    95 % percentile; the same numbers for any ``threads``).

    Formula: S_T² = Σ Δᵢ²/(N − 1) (Δᵢ the angle of VGP i from the mean pole); S_B² = S_T² −
    (1/N) Σ S_wᵢ²/nᵢ with S_w = 81/√K_w, K_w = 8k/(5 + 18 sin²λ + 9 sin⁴λ) (Cox 1970); Vandamme's
    A = 1.8 S_T + 5°.

    References: Butler (1992), Paleomagnetism, §7.1 (VGP, dp, dm); Fisher (1953) for the mean;
    McElhinny & McFadden (1997), Geophys. J. Int. 131, 240–252 (S_B); Cox (1970), Geophys. J. R.
    astr. Soc. 20, 253–269; Vandamme (1994), Phys. Earth
    Planet. Inter. 85, 131–142 (the cutoff); Efron & Tibshirani (1993), ch. 13 (the bootstrap).

    Where the data give a paleopole but no scatter (a cutoff that keeps fewer than two sites) or no
    interval, those fields are None and ``scatter_note`` says why (as the verb's note).

    Returns a :class:`Paleopole` (``vgps`` DataFrame; pole and scatter fields None for one site).
    """
    d = _native.paleopole(_source(sites), str(cutoff), bool(northern), int(seed), int(resamples), threads)
    # The columns of ``poles --format csv`` (the library's presenter), then ``a95``, ``kept``, ``flipped``.
    vgps = pd.DataFrame(d["sites"])
    for c in ("dp", "dm", "paleolat_low", "paleolat_high"):
        vgps[c] = vgps[c].astype(float)
    pole = d.get("pole") or {}
    sc = d.get("scatter") or {}
    values = dict(
        vgps=vgps, northern=bool(northern), seed=int(seed), resamples=int(resamples),
        cutoff=sc.get("cutoff", str(cutoff)), scatter_note=d["scatter_note"],
    )
    values.update({k: pole.get(k) for k in ("n", "plat", "plon", "k", "a95")})
    values.update({k: sc.get(k) for k in ("s", "s_low", "s_high", "s_total", "within_term", "n_used", "n_removed",
                                           "threshold")})
    if not pole:
        values["caution"] = ONE_VGP_CAUTION
    return Paleopole._from(values)
