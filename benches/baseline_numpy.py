#!/usr/bin/env python3
"""Side-by-side baseline: the Monte Carlo computations of lodestone's benches written plainly in
idiomatic, vectorised NumPy (no Python loops over replicates or directions where NumPy does not need
them). Run on request only (by benches/compare.py); not part of the tests.

Each item is timed as the median of a few runs after a warm-up, on the inputs that compare.py writes.
Where two reasonable vectorised formulations exist, both are timed and the faster is reported, so the
baseline is given its best case. Prints one `name seconds` line per item (plus `check_*` lines with a
result, for a sanity check against the Rust side).

Formulas (the same as lodestone's):
  Fisher (1953) mean, R, k = (N-1)/(N-R), alpha95 from cos a = 1 - (N-R)/R ((1/p)^(1/(N-1)) - 1).
  Bootstrap of two means, component bounds: Tauxe, Kylstra & Constable (1991).
  Fold test, largest eigenvalue of the orientation matrix against percent untilting:
  Tauxe & Watson (1994).
  Watson's V_w with simulated Fisher sets: Watson (1983); Fisher draws by inverse CDF, Fisher, Lewis
  & Embleton (1987) section 3.6.2.
"""
import os
import sys
import time

import numpy as np

K_CAP = 1e10  # only guards k against N - R = 0


def timed(runs, f):
    f()
    t = []
    for _ in range(runs):
        s = time.perf_counter()
        f()
        t.append(time.perf_counter() - s)
    t.sort()
    return t[len(t) // 2]


def load(path):
    return np.loadtxt(path, delimiter=",", skiprows=1, ndmin=2)


def fisher_mean(dec, inc):
    d, i = np.radians(dec), np.radians(inc)
    ci = np.cos(i)
    x = np.stack([ci * np.cos(d), ci * np.sin(d), np.sin(i)], axis=1)
    s = x.sum(axis=0)
    n = len(dec)
    r = np.linalg.norm(s)
    k = (n - 1) / (n - r)
    a95 = np.degrees(np.arccos(1 - (n - r) / r * ((1 / 0.05) ** (1 / (n - 1)) - 1)))
    return s / r, r, k, a95


def chunked_means(v, b, rng, resample_sums, chunk_elems=4_000_000):
    """Mean unit vectors of b resamples, in chunks that keep temporaries bounded."""
    n = len(v)
    step = max(1, chunk_elems // n)
    out = []
    for start in range(0, b, step):
        s = resample_sums(v, rng.integers(0, n, size=(min(step, b - start), n)))
        out.append(s / np.linalg.norm(s, axis=1, keepdims=True))
    return np.concatenate(out)


def sums_gather(v, idx):
    """Resample sums by fancy indexing."""
    return v[idx].sum(axis=1)


def sums_counts(v, idx):
    """Resample sums from the counts of each index and one matrix product (BLAS)."""
    m, n = idx.shape
    w = np.bincount((idx + (np.arange(m) * n)[:, None]).ravel(), minlength=m * n).reshape(m, n)
    return w.astype(float) @ v


def boot_means_gather(v, b, rng):
    return chunked_means(v, b, rng, sums_gather)


def boot_means_counts(v, b, rng):
    return chunked_means(v, b, rng, sums_counts)


def bootstrap(a, b, nboot, means_fn, seed=1):
    rng = np.random.default_rng(seed)
    ma, mb = means_fn(a, nboot, rng), means_fn(b, nboot, rng)
    lo = np.quantile(ma, [0.025, 0.975], axis=0)
    hi = np.quantile(mb, [0.025, 0.975], axis=0)
    return bool(np.all((lo[0] <= hi[1]) & (hi[0] <= lo[1])))


def untilt_matrices(dipdir, dip, frac):
    """Rotation matrices (len(frac), n, 3, 3) untilting by frac * dip about each strike line."""
    az = np.radians(dipdir - 90.0)
    axis = np.stack([np.cos(az), np.sin(az), np.zeros_like(az)], axis=1)  # x north, y east, z down
    ang = -np.radians(dip)[None, :] * frac[:, None]
    c, s = np.cos(ang)[..., None, None], np.sin(ang)[..., None, None]
    kx = np.zeros((len(dip), 3, 3))
    kx[:, 0, 1], kx[:, 0, 2] = -axis[:, 2], axis[:, 1]
    kx[:, 1, 0], kx[:, 1, 2] = axis[:, 2], -axis[:, 0]
    kx[:, 2, 0], kx[:, 2, 1] = -axis[:, 1], axis[:, 0]
    outer = axis[:, :, None] * axis[:, None, :]
    return c * np.eye(3) + s * kx + (1 - c) * outer


def fold_test(v, dipdir, dip, nboot, seed=1):
    n = len(v)
    steps = np.arange(-10.0, 150.0 + 1e-9, 1.0)  # 161 steps, percent untilting
    rot = untilt_matrices(dipdir, dip, steps / 100.0)
    w = np.einsum("snij,nj->sni", rot, v)  # (S, n, 3)
    o = np.stack([w[..., 0] ** 2, w[..., 1] ** 2, w[..., 2] ** 2,
                  w[..., 0] * w[..., 1], w[..., 0] * w[..., 2], w[..., 1] * w[..., 2]], axis=-1)
    flat = o.transpose(1, 0, 2).reshape(n, -1)  # (n, S*6)

    def tau1(weights):
        t = (weights @ flat).reshape(len(weights), len(steps), 6) / n
        m = np.empty(t.shape[:2] + (3, 3))
        m[..., 0, 0], m[..., 1, 1], m[..., 2, 2] = t[..., 0], t[..., 1], t[..., 2]
        m[..., 0, 1] = m[..., 1, 0] = t[..., 3]
        m[..., 0, 2] = m[..., 2, 0] = t[..., 4]
        m[..., 1, 2] = m[..., 2, 1] = t[..., 5]
        return np.linalg.eigvalsh(m)[..., -1]

    data_best = steps[np.argmax(tau1(np.ones((1, n)))[0])]
    rng = np.random.default_rng(seed)
    idx = rng.integers(0, n, size=(nboot, n)) + (np.arange(nboot) * n)[:, None]
    wts = np.bincount(idx.ravel(), minlength=nboot * n).reshape(nboot, n).astype(float)
    best = steps[np.argmax(tau1(wts), axis=1)]
    return data_best, np.quantile(best, [0.025, 0.975])


def fisher_draws(rng, kappa, shape):
    """Unit vectors from a Fisher distribution about +x (north), by inverse CDF."""
    u = rng.random(shape)
    cos_t = np.clip(1.0 + np.log1p(u * np.expm1(-2.0 * kappa)) / kappa, -1.0, 1.0)
    sin_t = np.sqrt(np.maximum(0.0, 1.0 - cos_t * cos_t))
    phi = rng.random(shape) * 2.0 * np.pi
    return cos_t, sin_t * np.cos(phi), sin_t * np.sin(phi)


def capped_k(n, r):
    nr = np.maximum(n - r, 0.0)
    return np.where(nr <= 0, K_CAP, np.minimum((n - 1) / np.where(nr <= 0, 1.0, nr), K_CAP))


def v_w(xa, na, xb, nb):
    ra, rb = np.linalg.norm(xa, axis=-1), np.linalg.norm(xb, axis=-1)
    ka, kb = capped_k(na, ra), capped_k(nb, rb)
    rw = np.linalg.norm(xa * np.asarray(ka)[..., None] + xb * np.asarray(kb)[..., None], axis=-1)
    return np.maximum(2.0 * (ka * ra + kb * rb - rw), 0.0)


def watson_v(a, b, nsim, seed=1, chunk_elems=4_000_000):
    na, nb = len(a), len(b)
    ka, kb = capped_k(na, np.linalg.norm(a.sum(0))), capped_k(nb, np.linalg.norm(b.sum(0)))
    rng = np.random.default_rng(seed)
    step = max(1, chunk_elems // max(na, nb))
    sims = []
    for start in range(0, nsim, step):
        m = min(step, nsim - start)
        xa = np.stack([c.sum(axis=1) for c in fisher_draws(rng, ka, (m, na))], axis=1)
        xb = np.stack([c.sum(axis=1) for c in fisher_draws(rng, kb, (m, nb))], axis=1)
        sims.append(v_w(xa, na, xb, nb))
    sims = np.concatenate(sims)
    return float(v_w(a.sum(0), na, b.sum(0), nb)), float(np.quantile(sims, 0.95))


def main(d):
    rev200 = load(os.path.join(d, "rev200_a.csv")), load(os.path.join(d, "rev200_b.csv"))
    rev1000 = load(os.path.join(d, "rev1000_a.csv")), load(os.path.join(d, "rev1000_b.csv"))
    fold = load(os.path.join(d, "fold100.csv"))
    fis = load(os.path.join(d, "fisher1e6.csv"))
    dec, inc = fis[:, 0].copy(), fis[:, 1].copy()
    print(f"fisher_mean_1e6 {timed(5, lambda: fisher_mean(dec, inc)):.6f}")
    for name, (a, b), nboot, runs in [("bootstrap_n200_10000", rev200, 10_000, 21),
                                      ("bootstrap_n1000_50000", rev1000, 50_000, 3)]:
        tg = timed(runs, lambda: bootstrap(a, b, nboot, boot_means_gather))
        tc = timed(runs, lambda: bootstrap(a, b, nboot, boot_means_counts))
        print(f"{name} {min(tg, tc):.6f}")
        print(f"note_{name} gather={tg:.4f} counts={tc:.4f}")
    v, dd, dp = fold[:, :3].copy(), fold[:, 3].copy(), fold[:, 4].copy()
    print(f"fold_n100_1000x161 {timed(21, lambda: fold_test(v, dd, dp, 1000)):.6f}")
    best, ci = fold_test(v, dd, dp, 1000)
    print(f"check_fold best_untilt={best:.0f} ci=({ci[0]:.0f}, {ci[1]:.0f})")
    a, b = rev200
    print(f"watson_v_n200_10000 {timed(21, lambda: watson_v(a, b, 10_000)):.6f}")
    vw, vc = watson_v(a, b, 10_000)
    print(f"check_watson_v v_w={vw:.3f} v_crit={vc:.3f}")
    m, r, k, a95 = fisher_mean(dec, inc)
    print(f"check_fisher r={r:.3f} k={k:.3f} a95={a95:.5f}")


if __name__ == "__main__":
    main(sys.argv[1] if len(sys.argv) > 1 else "target/compare")
