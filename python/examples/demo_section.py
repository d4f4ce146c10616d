"""Notebook-style walk through the invented demo section (records/demo, the fictional Sallowmere Gulch
section; synthetic data, not measurements) with the Python package.

Run from the repository root:  python python/examples/demo_section.py [OUT]
"""

import pathlib
import sys

import pandas as pd

import lodestone

DEMO = pathlib.Path("records/demo")
out = pathlib.Path(sys.argv[1] if len(sys.argv) > 1 else "lodestone-demo-python")

# 1. Components of every specimen by the automatic rule (columns of `components --format csv`).
fits = lodestone.fit_components(DEMO / "steps.csv")
print(f"{len(fits)} specimens fitted, {len(fits.attrs['unfitted'])} left unfitted")

# 2. Site means of the fitted directions (great circles, kind = plane, combined with the lines), with
#    each site's bedding from the sampling table.
sampling = pd.read_csv(DEMO / "sampling.csv", comment="#")
dirs = fits[["specimen", "site", "dec", "inc", "kind"]].merge(sampling[["site", "bed_dip_dir", "bed_dip"]], on="site")
means = lodestone.group_means(dirs, by="site", frame="tilt")
print(means.head())

# 3. Field tests on the site means (seeded: the same numbers on any machine and thread count).
site_dirs = means.merge(sampling, left_on="group", right_on="site")
rev = lodestone.reversal_test(site_dirs["dec"], site_dirs["inc"], seed=1)
print(f"reversal test: class {rev.classification}, gamma {rev.gamma:.1f} vs gamma_c {rev.gamma_c:.1f}")

# 4. VGPs of the sites.
poles = lodestone.vgp(site_dirs["lat"], site_dirs["lon"], site_dirs["dec"], site_dirs["inc"], a95=site_dirs["a95"])
print(f"VGP latitudes from {poles.plat.min():.1f} to {poles.plat.max():.1f}")

# 5. The paleopole and the VGP scatter S_B of the site means (Vandamme cutoff; a seeded bootstrap interval).
sites = site_dirs[["site", "lat", "lon", "dec", "inc", "n", "k", "a95"]]
pole = lodestone.paleopole(sites, cutoff="vandamme", northern=True, resamples=500)
sb = (f"S_B {pole.s:.1f}° ({pole.s_low:.1f}–{pole.s_high:.1f})" if pole.s is not None
      else f"S_B undefined (the within-site term exceeds the total scatter S_T = {pole.s_total:.1f}°)")
print(f"paleopole {pole.plat:.1f}°N {pole.plon:.1f}°E, A95 {pole.a95:.1f}°; {sb}; {pole.n_used} sites in the scatter")

# 6. The polarity column of the section (one level per site, at its height) and its correlation with the
#    time scale; then the package's own column figure of the best correlation.
levels = site_dirs[["site", "height", "lat", "lon", "dec", "inc"]]
column = lodestone.polarity_column(levels)
print(column.zones[["zone", "polarity", "n_levels", "base", "top"]])
corr = lodestone.correlate(column.zones, DEMO / "timescale.csv")
print(corr.candidates.head(3))
print(corr.comparison)
print("caution:", corr.caution)
figure = out.parent / f"{out.name}-column.svg"
figure.write_text(lodestone.column_figure(levels, DEMO / "timescale.csv", title="Sallowmere Gulch against the time scale"))
print(f"figure: {figure}")

# 7. Reversal statistics of the time scale: model fits and the hazard (a statement about models, not a forecast).
print(lodestone.fit_renewal(DEMO / "timescale.csv")[["model", "loglik", "aic", "weight"]])
h = lodestone.hazard(DEMO / "timescale.csv", horizon=0.1, resamples=200)
print(h[["model", "hazard", "p_within"]])
for caution in h.attrs["cautions"]:
    print("caution:", caution)
rate = lodestone.reversal_rate(DEMO / "timescale.csv", window=1.0)
print(f"Laplace U = {rate.attrs['laplace']['u']:.2f}; highest windowed rate {rate['rate'].max():.1f} per Myr")

# 8. A synthetic time scale from a stated model (not a record of the field), fitted like the real one.
synthetic = lodestone.simulate_timescale("gamma", span=6.0, mean_interval=0.25, shape=1.5, seed=11)
print(f"{len(synthetic)} synthetic chrons; fitted gamma shape "
      f"{lodestone.fit_renewal(synthetic).set_index('model').loc['gamma', 'shape']:.2f}")

# 9. The whole chain with its figures and HTML report.
report = lodestone.run_section(DEMO, out, force=True)
print(f"report: {report / 'report.html'}")
