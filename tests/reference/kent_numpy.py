"""Independent Kent (1982) ellipse for the check in src/dirstats/tests.rs.

Written from Fisher, Lewis & Embleton (1987), Statistical Analysis of Spherical Data, §5.3.2: rotate the
moment matrix S = (1/N) Σ u uᵀ by the matrix H whose third column is the mean direction (H built from
the mean's colatitude θ and azimuth φ, their eq. 3.9), take the upper-left 2 × 2 block B, and
sin ζ = sqrt(χ²₂(0.95) · eig(B) / (N μ²)), μ = R/N. χ²₂ from scipy.stats.chi2.ppf.

Run: python3 tests/reference/kent_numpy.py   (NumPy 2.4.6, SciPy 1.17.1 when the values were made)
"""
import numpy as np
from scipy import stats

# Invented directions (dec, inc), degrees: an elongated set.
DATA = [(352, 41), (8, 47), (15, 38), (2, 60), (340, 52), (21, 55), (5, 30), (355, 66),
        (12, 44), (348, 35), (30, 49), (359, 57)]

def unit(dec, inc):
    d, i = np.radians(dec), np.radians(inc)
    return np.array([np.cos(i) * np.cos(d), np.cos(i) * np.sin(d), np.sin(i)])

X = np.array([unit(d, i) for d, i in DATA])
n = len(X)
r = X.sum(axis=0)
mu = np.linalg.norm(r) / n
m = r / np.linalg.norm(r)
theta = np.arccos(m[2])   # colatitude of the mean in the (x, y, z) frame with z as the pole
phi = np.arctan2(m[1], m[0])
H = np.array([[np.cos(theta) * np.cos(phi), -np.sin(phi), np.sin(theta) * np.cos(phi)],
              [np.cos(theta) * np.sin(phi), np.cos(phi), np.sin(theta) * np.sin(phi)],
              [-np.sin(theta), 0.0, np.cos(theta)]])
S = X.T @ X / n
B = (H.T @ S @ H)[:2, :2]
w, v = np.linalg.eigh(B)
q = stats.chi2.ppf(0.95, 2)
zeta = np.degrees(np.arcsin(np.sqrt(q * w / (n * mu ** 2))))
major = H[:, :2] @ v[:, 1]
if major[2] < 0:
    major = -major
print("numpy", np.__version__, "scipy", __import__("scipy").__version__)
print("mean dec/inc", np.degrees(np.arctan2(m[1], m[0])) % 360, np.degrees(np.arcsin(m[2])))
print("major, minor semi-axes", repr(zeta[1]), repr(zeta[0]))
print("major axis dec/inc", repr(np.degrees(np.arctan2(major[1], major[0])) % 360), repr(np.degrees(np.arcsin(major[2]))))
print("chi2_2(0.95)", repr(q))
