#!/usr/bin/env python3
"""Convert a spherical-harmonic coefficient file (.shc, the layout in which IAGA distributes IGRF) into
lodestone's field-model table: columns epoch, degree, order, g, h (nT), plus `sv` rows (nT/yr).

The .shc file lists, per (degree, order) line, one coefficient per epoch; a negative order carries the
h (sine) coefficient of |order|. IGRF's last column is the final epoch extrapolated five years with the
secular variation; this script turns that column back into the yearly secular variation
(last column - last main-field epoch) / (its year - the epoch's year), rounded to 0.01 nT/yr.

Usage: python3 shc_to_table.py IGRF14.shc > igrf14.csv
Only the Python standard library is used.
"""
import sys


def read_shc(path):
    """Return (years, {(n, m): [values]}) with m < 0 meaning h of order |m|."""
    years = None
    coeffs = {}
    header_seen = False
    with open(path) as f:
        for raw in f:
            line = raw.strip()
            if not line or line.startswith("#"):
                continue
            fields = line.split()
            if not header_seen:
                header_seen = True  # N_MIN N_MAX N_TIMES SPLINE_ORDER N_STEP [first last]
                continue
            if years is None:
                years = [float(x) for x in fields]
                continue
            n, m = int(fields[0]), int(fields[1])
            values = [float(x) for x in fields[2:]]
            if len(values) != len(years):
                sys.exit(f"{path}: degree {n} order {m}: {len(values)} values for {len(years)} epochs")
            coeffs[(n, m)] = values
    return years, coeffs


def fmt(x):
    s = f"{x:.2f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def main():
    if len(sys.argv) != 2:
        sys.exit(__doc__)
    path = sys.argv[1]
    years, coeffs = read_shc(path)
    nmax = max(n for n, _ in coeffs)
    main_epochs = years[:-1]  # the last column is the secular-variation extrapolation
    span = years[-1] - years[-2]
    out = sys.stdout
    out.write(f"# Converted by shc_to_table.py from {path.split('/')[-1]} (see README.md beside this file).\n")
    out.write(f"# Main-field epochs {main_epochs[0]:g}-{main_epochs[-1]:g}; sv = yearly secular variation after "
              f"{main_epochs[-1]:g}, from the {years[-1]:g} column over {span:g} years.\n")
    out.write("epoch,degree,order,g,h\n")
    for k, year in enumerate(years):
        is_sv = k == len(years) - 1
        label = "sv" if is_sv else f"{year:g}"
        for n in range(1, nmax + 1):
            for m in range(0, n + 1):
                g = coeffs[(n, m)]
                h = coeffs[(n, -m)] if m > 0 else [0.0] * len(years)
                if is_sv:
                    gv = (g[k] - g[k - 1]) / span
                    hv = (h[k] - h[k - 1]) / span
                else:
                    gv, hv = g[k], h[k]
                out.write(f"{label},{n},{m},{fmt(gv)},{fmt(hv)}\n")


if __name__ == "__main__":
    main()
