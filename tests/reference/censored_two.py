# Reference values for src/reversals/models/tests.rs (two_censored_lengths_match_scipy).
# Run: python3 tests/reference/censored_two.py   (SciPy 1.17.1, NumPy 2.4.6 in a venv)
# Maximises Σ logpdf(Y) + Σ logsf(C) with scipy.optimize (Nelder–Mead, tight tolerances).
import numpy as np, scipy
from scipy import stats, optimize
Y=np.array([0.12, 0.31, 0.05, 0.77, 0.22, 0.41, 0.09, 0.18, 0.56, 0.27]); C=np.array([0.78, 0.95])
def ll(dist, args): return dist.logpdf(Y, *args).sum()+dist.logsf(C, *args).sum()
models={
 'gamma': (lambda p: (np.exp(p[0]), 0, np.exp(p[1])), stats.gamma, [0.4, -1.4]),
 'weibull': (lambda p: (np.exp(p[0]), 0, np.exp(p[1])), stats.weibull_min, [0.2, -1.0]),
 'lognormal': (lambda p: (np.exp(p[1]), 0, np.exp(p[0])), stats.lognorm, [-1.3, -0.1]),
 'invgauss': (lambda p: (np.exp(p[0])/np.exp(p[1]), 0, np.exp(p[1])), stats.invgauss, [-0.9, -1.1]),
}
print("scipy", scipy.__version__)
for name,(tr,d,x0) in models.items():
    r=optimize.minimize(lambda p: -ll(d, tr(p)), x0, method='Nelder-Mead', options=dict(xatol=1e-12, fatol=1e-14, maxiter=20000))
    print(name, repr(np.exp(r.x[0])), repr(np.exp(r.x[1])) if name!='lognormal' else repr(np.exp(r.x[1])), repr(-r.fun))
# exponential closed form
lam=len(Y)/(Y.sum()+C.sum()); print('exp', repr(lam), repr(ll(stats.expon,(0,1/lam))))
