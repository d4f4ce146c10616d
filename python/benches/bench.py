"""Timings of the Python package (a benchmark, not a test): call overhead, fisher_mean on 10⁶
directions against the same computation in vectorised NumPy, and a 10 000-resample reversal test
against the release binary doing the same work.

Run from the repository root with the package installed (release wheel) and a release binary:

    cargo build --release --bin lodestone
    python python/benches/bench.py [--bin target/release/lodestone]

Each figure is the median of several repeats (best-of inside timeit for the short calls).
"""

import argparse
import json
import pathlib
import statistics
import subprocess
import tempfile
import time
import timeit

import numpy as np

import lodestone

ROOT = pathlib.Path(__file__).resolve().parents[2]


def numpy_fisher(dec, inc):
    """Fisher mean, R, k and α95 in vectorised NumPy (Fisher 1953), the baseline."""
    d, i = np.radians(dec), np.radians(inc)
    ci = np.cos(i)
    s = np.array([np.sum(ci * np.cos(d)), np.sum(ci * np.sin(d)), np.sum(np.sin(i))])
    n, r = len(dec), np.linalg.norm(s)
    k = (n - 1) / (n - r)
    a95 = np.degrees(np.arccos(1 - (n - r) / r * (20 ** (1 / (n - 1)) - 1)))
    return np.degrees(np.arctan2(s[1], s[0])) % 360, np.degrees(np.arcsin(s[2] / r)), r, k, a95


def median_time(f, repeats):
    times = []
    for _ in range(repeats):
        t0 = time.perf_counter()
        f()
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def per_call(stmt, number=20000, repeat=7):
    return min(timeit.repeat(stmt, number=number, repeat=repeat)) / number


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--bin", default=str(ROOT / "target" / "release" / "lodestone"))
    ap.add_argument("--repeats", type=int, default=9)
    args = ap.parse_args()

    dec, inc = np.array([10.0, 20.0, 15.0]), np.array([40.0, 45.0, 50.0])
    print(f"call overhead fisher_mean, 3 directions: {per_call(lambda: lodestone.fisher_mean(dec, inc)) * 1e6:.2f} µs")
    print(f"call overhead vgp, one site: {per_call(lambda: lodestone.vgp(40.0, 250.0, 10.0, 55.0, 3.0)) * 1e6:.2f} µs")
    print(f"native fisher_mean alone, 3 directions: "
          f"{per_call(lambda: lodestone._native.fisher_mean(dec, inc, 0.95)) * 1e6:.2f} µs")

    rng = np.random.default_rng(1)
    n = 1_000_000
    big_dec, big_inc = rng.uniform(0, 360, n), rng.uniform(-90, 90, n)
    ours = lodestone.fisher_mean(big_dec, big_inc)
    ref = numpy_fisher(big_dec, big_inc)
    assert abs(ours.r - ref[2]) < 1e-6 * n
    t_ours = median_time(lambda: lodestone.fisher_mean(big_dec, big_inc), args.repeats)
    t_np = median_time(lambda: numpy_fisher(big_dec, big_inc), args.repeats)
    print(f"fisher_mean 1e6: lodestone {t_ours * 1e3:.1f} ms, NumPy {t_np * 1e3:.1f} ms, ratio {t_np / t_ours:.2f}x")

    t = np.genfromtxt(ROOT / "records" / "velmora-directions.csv", delimiter=",", names=True, comments="#",
                      dtype=None, encoding="utf-8")
    t_py = median_time(lambda: lodestone.reversal_test(t["dec"], t["inc"], resamples=10000), args.repeats)
    with tempfile.TemporaryDirectory() as tmp:
        path = pathlib.Path(tmp) / "d.csv"
        path.write_text("dec,inc\n" + "".join(f"{d},{i}\n" for d, i in zip(t["dec"], t["inc"])))
        cmd = [args.bin, "test", "reversal", str(path), "--resamples", "10000", "--format", "json", "--quiet"]
        out = json.loads(subprocess.run(cmd, capture_output=True, check=True, text=True).stdout)
        py = lodestone.reversal_test(t["dec"], t["inc"], resamples=10000)
        assert out["v_crit"] == py.v_crit
        t_cli = median_time(lambda: subprocess.run(cmd, capture_output=True, check=True), args.repeats)
        t_start = median_time(lambda: subprocess.run([args.bin, "--version"], capture_output=True, check=True),
                              args.repeats)
    print(f"reversal test, 10 000 resamples: Python {t_py * 1e3:.1f} ms, binary {t_cli * 1e3:.1f} ms "
          f"(process start {t_start * 1e3:.1f} ms), Python/binary {t_py / t_cli:.3f}")


if __name__ == "__main__":
    main()
