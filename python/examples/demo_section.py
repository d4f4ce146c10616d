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

# 2. Site means of the fitted directions, with each site's bedding from the sampling table.
sampling = pd.read_csv(DEMO / "sampling.csv", comment="#")
dirs = fits[["specimen", "site", "dec", "inc"]].merge(sampling[["site", "bed_dip_dir", "bed_dip"]], on="site")
means = lodestone.group_means(dirs, by="site", frame="tilt")
print(means.head())

# 3. Field tests on the site means (seeded: the same numbers on any machine and thread count).
site_dirs = means.merge(sampling, left_on="group", right_on="site")
rev = lodestone.reversal_test(site_dirs["dec"], site_dirs["inc"], seed=1)
print(f"reversal test: class {rev.classification}, gamma {rev.gamma:.1f} vs gamma_c {rev.gamma_c:.1f}")

# 4. VGPs of the sites.
poles = lodestone.vgp(site_dirs["lat"], site_dirs["lon"], site_dirs["dec"], site_dirs["inc"], a95=site_dirs["a95"])
print(f"VGP latitudes from {poles.plat.min():.1f} to {poles.plat.max():.1f}")

# 5. Reversal statistics of the time scale: model fits and the hazard (a statement about models, not a forecast).
print(lodestone.fit_renewal(DEMO / "timescale.csv")[["model", "loglik", "aic", "weight"]])
h = lodestone.hazard(DEMO / "timescale.csv", horizon=0.1, resamples=200)
print(h[["model", "hazard", "p_within"]])
for caution in h.attrs["cautions"]:
    print("caution:", caution)

# 6. The whole chain with its figures and HTML report.
report = lodestone.run_section(DEMO, out, force=True)
print(f"report: {report / 'report.html'}")
