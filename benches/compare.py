#!/usr/bin/env python3
"""Run lodestone and the NumPy/SciPy baseline on the same inputs and print the ratios.

Usage: python3 benches/compare.py [DIR]     (DIR defaults to target/compare)

Writes the inputs (invented Fisher-distributed sets, seed fixed) into DIR, runs
benches/baseline_numpy.py and `cargo bench --bench compare` on them, and prints a table of
times and baseline/lodestone ratios. OPENBLAS_CORETYPE and OPENBLAS_L2_SIZE are removed from the
environment of the NumPy run only. Takes a few minutes (the release build comes first).
"""
import os
import subprocess
import sys

import numpy as np

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.dirname(HERE)


def fisher_set(rng, n, dec, inc, kappa):
    """n unit vectors (x north, y east, z down) from a Fisher distribution about (dec, inc)."""
    u, phi = rng.random(n), rng.random(n) * 2 * np.pi
    ct = 1 + np.log1p(u * np.expm1(-2 * kappa)) / kappa
    st = np.sqrt(np.maximum(0, 1 - ct * ct))
    local = np.stack([st * np.cos(phi), st * np.sin(phi), ct], axis=1)  # about +z
    d, i = np.radians(dec), np.radians(inc)
    m = np.array([np.cos(i) * np.cos(d), np.cos(i) * np.sin(d), np.sin(i)])
    # orthonormal frame with m as third axis
    e1 = np.cross(m, [0.0, 0.0, 1.0]) if abs(m[2]) < 0.99 else np.cross(m, [1.0, 0.0, 0.0])
    e1 /= np.linalg.norm(e1)
    e2 = np.cross(m, e1)
    v = local[:, :1] * e1 + local[:, 1:2] * e2 + local[:, 2:] * m
    return v / np.linalg.norm(v, axis=1, keepdims=True)


def write_xyz(path, v, extra=None, header="x,y,z"):
    cols = v if extra is None else np.column_stack([v, extra])
    np.savetxt(path, cols, delimiter=",", header=header, comments="", fmt="%.17g")


def untilt_rot(dipdir, dip):
    az = np.radians(dipdir - 90.0)
    k = np.array([np.cos(az), np.sin(az), 0.0])
    a = -np.radians(dip)  # untilting: rotation by -dip about the strike line (right-hand rule)
    kx = np.array([[0, -k[2], k[1]], [k[2], 0, -k[0]], [-k[1], k[0], 0]])
    return np.cos(a) * np.eye(3) + np.sin(a) * kx + (1 - np.cos(a)) * np.outer(k, k)


def write_inputs(d):
    os.makedirs(d, exist_ok=True)
    rng = np.random.default_rng(20261202)
    for n in (200, 1000):
        a = fisher_set(rng, n // 2, 12.0, 48.0, 30.0)
        b = fisher_set(rng, n // 2, 12.0, 48.0, 30.0)  # the second mode, already flipped to the first
        write_xyz(os.path.join(d, f"rev{n}_a.csv"), a)
        write_xyz(os.path.join(d, f"rev{n}_b.csv"), b)
    # Fold: 100 sites, tilt-corrected mean (12, 48), limbs dipping 30 degrees east and west; the
    # directions are re-tilted (the inverse of untilting) into geographic coordinates.
    tilt = fisher_set(rng, 100, 12.0, 48.0, 30.0)
    dd = np.where(np.arange(100) % 2 == 0, 90.0, 270.0)
    dip = np.full(100, 30.0)
    geo = np.array([untilt_rot(dd[i], dip[i]).T @ tilt[i] for i in range(100)])
    write_xyz(os.path.join(d, "fold100.csv"), geo, np.column_stack([dd, dip]), header="x,y,z,dip_dir,dip")
    v = fisher_set(rng, 1_000_000, 12.0, 48.0, 30.0)
    dec = np.degrees(np.arctan2(v[:, 1], v[:, 0])) % 360.0
    inc = np.degrees(np.arcsin(np.clip(v[:, 2], -1, 1)))
    np.savetxt(os.path.join(d, "fisher1e6.csv"), np.column_stack([dec, inc]), delimiter=",",
               header="dec,inc", comments="", fmt="%.6f")


def parse(text):
    out = {}
    for line in text.splitlines():
        parts = line.split()
        if len(parts) == 2:
            try:
                out[parts[0]] = float(parts[1])
            except ValueError:
                pass
    return out


def run_both(d, script, bench):
    """Run the NumPy script of benches/ (without OPENBLAS_CORETYPE and OPENBLAS_L2_SIZE) and the Rust
    bench on the inputs in d; return both outputs."""
    env = {k: v for k, v in os.environ.items() if k not in ("OPENBLAS_CORETYPE", "OPENBLAS_L2_SIZE")}
    py = subprocess.run([sys.executable, os.path.join(HERE, script), d], env=env,
                        capture_output=True, text=True, check=True)
    rs = subprocess.run(["cargo", "bench", "--bench", bench], cwd=ROOT,
                        env={**os.environ, "LODESTONE_COMPARE_DIR": d}, capture_output=True, text=True, check=True)
    return py.stdout, rs.stdout


def print_ratios(base, ours):
    """Times of both sides (`name` against lodestone's `name_t2`/`name_t1` or `name`) and the ratios."""
    names = [n for n in base if not n.startswith(("note_", "check_"))]
    w = max([32] + [len(n) for n in names])
    print(f"{'item':{w}} {'NumPy s':>10} {'lodestone s':>12} {'1 thread s':>11} {'ratio':>7} {'1->2 thr':>9}")
    for name in names:
        t_np = base[name]
        t2 = ours.get(f"{name}_t2", ours.get(name))
        t1 = ours.get(f"{name}_t1")
        if t2 is None:
            continue
        scale = f"{t1 / t2:9.2f}" if t1 else f"{'':>9}"
        one = f"{t1:11.4f}" if t1 else f"{'':>11}"
        print(f"{name:{w}} {t_np:10.4f} {t2:12.4f} {one} {t_np / t2:7.1f} {scale}")


def main():
    d = os.path.abspath(sys.argv[1] if len(sys.argv) > 1 else os.path.join(ROOT, "target", "compare"))
    if not os.path.exists(os.path.join(d, "fisher1e6.csv")):
        print(f"writing inputs to {d}", file=sys.stderr)
        write_inputs(d)
    py, rs = run_both(d, "baseline_numpy.py", "compare")
    base, ours = parse(py), parse(rs)
    print(f"NumPy {np.__version__}; inputs in {d}")
    for line in py.splitlines():
        if line.startswith(("note_", "check_")):
            print("  baseline", line)
    print_ratios(base, ours)
    if "parallel_ceiling_t1" in ours and "parallel_ceiling_t2" in ours:
        print(f"{'parallel_ceiling (no baseline)':32} {'':>10} {ours['parallel_ceiling_t2']:12.4f} "
              f"{ours['parallel_ceiling_t1']:11.4f} {'':>7} {ours['parallel_ceiling_t1'] / ours['parallel_ceiling_t2']:9.2f}")
    for k in ("start_two_threads_after_0ms_idle_us", "start_two_threads_after_5ms_idle_us"):
        if k in ours:
            print(f"{k:36} {ours[k]:10.0f}")
    for k in ("fisher_draws_per_s", "fisher_fast_draws_per_s", "bare_uniform_pairs_per_s"):
        if k in ours:
            print(f"{k:32} {ours[k]:14.3e}")
    if "fisher_draws_per_s" in ours and "bare_uniform_pairs_per_s" in ours:
        print(f"Fisher draws at {100 * ours['fisher_draws_per_s'] / ours['bare_uniform_pairs_per_s']:.0f}% of the bare generator's rate (two uniforms per draw)")
    if "fisher_fast_draws_per_s" in ours and "bare_uniform_pairs_per_s" in ours:
        print(f"fast Fisher draws at {100 * ours['fisher_fast_draws_per_s'] / ours['bare_uniform_pairs_per_s']:.0f}% of it")


if __name__ == "__main__":
    main()
