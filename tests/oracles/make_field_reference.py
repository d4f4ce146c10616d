#!/usr/bin/env python3
"""Reference values of the IGRF-14 field for lodestone's Rust tests (tests/field_model.rs), computed by
an outside implementation: ppigrf 2.1.0 (PyPI; pure-Python IGRF, its own bundled IGRF14.shc).

Made once with:
    python3 -m venv /tmp/v && /tmp/v/bin/pip install ppigrf==2.1.0 numpy pandas scipy
    /tmp/v/bin/python tests/oracles/make_field_reference.py tests/oracles
(numpy 2.4.6, pandas 3.1.1, scipy 1.17.1 at the time). The random points come from a fixed seed, so a
rerun gives the same files.

Writes:
  field_ppigrf_points.csv  year, frame, lat, lon, alt_km, x, y, z (nT): 1000 geodetic points (ppigrf.igrf,
                           X = Bn, Y = Be, Z = -Bu) and 200 geocentric ones (ppigrf.igrf_gc at r = 6371.2 km
                           + alt, X = -Btheta, Y = Bphi, Z = -Br).
  field_ppigrf_dip_poles.csv  year, pole (down|up), lat, lon: where ppigrf's horizontal field vanishes on
                           the WGS84 surface (scipy.optimize.root on (Bn, Be) over geodetic lat, lon).
"""
import os
import sys

import numpy as np
import ppigrf
from ppigrf.ppigrf import yearfrac_to_datetime
from scipy.optimize import root

RE = 6371.2


def when(year):
    return yearfrac_to_datetime(np.array([year]))[0]


def geodetic(lon, lat, alt, year):
    be, bn, bu = ppigrf.igrf(lon, lat, alt, when(year))
    return float(bn.ravel()[0]), float(be.ravel()[0]), float(-bu.ravel()[0])


def geocentric(lon, lat, alt, year):
    br, bt, bp = ppigrf.igrf_gc(RE + alt, 90.0 - lat, lon, when(year))
    return float(-bt.ravel()[0]), float(bp.ravel()[0]), float(-br.ravel()[0])


def dip_pole(year, down):
    """Start at the best point of a 1-degree grid (H/F smallest, Z of the right sign), then root-find."""
    lat, lon = np.meshgrid(np.arange(-89.5, 90.0, 1.0), np.arange(0.0, 360.0, 1.0), indexing="ij")
    be, bn, bu = ppigrf.igrf(lon, lat, 0.0, when(year))
    be, bn, bu = be[0], bn[0], bu[0]
    ratio = np.hypot(be, bn) / np.sqrt(be**2 + bn**2 + bu**2)
    ratio[(-bu > 0) != down] = np.inf
    i = np.unravel_index(np.argmin(ratio), ratio.shape)
    start = [lat[i], lon[i]]

    def horizontal(v):
        x, y, _ = geodetic(v[1], v[0], 0.0, year)
        return [x, y]

    sol = root(horizontal, start, method="hybr", options={"xtol": 1e-12})
    if np.hypot(*sol.fun) > 1e-6:
        raise SystemExit(f"dip pole {year} {start}: {sol.message} {sol.fun}")
    return sol.x


def main():
    out = sys.argv[1] if len(sys.argv) > 1 else "."  # --poles-only: leave the points file as it is
    if "--poles-only" not in sys.argv:
        points(out)
    poles(out)


def points(out):
    rng = np.random.default_rng(20261202)
    rows = []
    for k in range(1200):
        year = float(np.round(rng.uniform(1900.0, 2030.0), 4))
        lat = float(np.round(np.degrees(np.arcsin(rng.uniform(-1.0, 1.0))), 6))
        lon = float(np.round(rng.uniform(-180.0, 360.0), 6))
        alt = float(np.round(rng.uniform(0.0, 1000.0) if k % 3 else 0.0, 3))
        frame = "geodetic" if k < 1000 else "geocentric"
        f = geodetic if frame == "geodetic" else geocentric
        x, y, z = f(lon, lat, alt, year)
        rows.append(f"{year},{frame},{lat},{lon},{alt},{x:.6f},{y:.6f},{z:.6f}")
    with open(os.path.join(out, "field_ppigrf_points.csv"), "w") as fh:
        fh.write("# IGRF-14 by ppigrf 2.1.0 (see make_field_reference.py for the command)\n")
        fh.write("year,frame,lat,lon,alt_km,x,y,z\n")
        fh.write("\n".join(rows) + "\n")


def poles(out):
    poles = []
    for year in (1900.0, 1925.0, 1950.0, 1975.0, 1990.0, 2000.0, 2010.0, 2015.5, 2020.0, 2025.0, 2028.5):
        for name in ("down", "up"):
            lat, lon = dip_pole(year, name == "down")
            poles.append(f"{year},{name},{lat:.8f},{lon % 360.0:.8f}")
    with open(os.path.join(out, "field_ppigrf_dip_poles.csv"), "w") as fh:
        fh.write("# IGRF-14 dip poles from ppigrf 2.1.0 + scipy.optimize.root (see make_field_reference.py)\n")
        fh.write("year,pole,lat,lon\n")
        fh.write("\n".join(poles) + "\n")


if __name__ == "__main__":
    main()
