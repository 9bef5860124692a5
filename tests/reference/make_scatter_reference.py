#!/usr/bin/env python3
"""Percentiles of a prediction widened by its relation's log-normal scatter, by numerical
integration with scipy (reference for ``lang/src/derive/scatter.rs``).

A value predicted from a mass-radius relation is ``y = A 10^(sigma z)``: ``A`` the
relation's mean at the inputs, normal with mean ``a0`` and standard deviation ``rho a0``
(first order), ``z`` a standard normal (the relation's scatter of ``sigma`` dex). With
``x = y / a0`` the distribution function is

    F(x) = P(A <= 0) + int_{1 + rho a > 0} phi(a) Phi(log10(x / (1 + rho a)) / sigma) da,

integrated here with ``scipy.integrate.quad`` (adaptive Gauss-Kronrod over the whole line,
not the fixed Gauss-Hermite rule the Rust code uses), and each percentile found with
``scipy.optimize.brentq``. A Monte Carlo check with numpy (10^7 draws) is printed to
standard error beside each case.

Run:  python3 tests/reference/make_scatter_reference.py > tests/reference/scatter.json
Needs: scipy (run with 1.17.1), numpy.
"""
import json
import sys

import numpy as np
import scipy
from scipy import integrate, optimize, stats

P_LOW = 0.158655253931457
P_HIGH = 0.841344746068543

CASES = [
    # rho (relative first-order spread of the mean), sigma (scatter, dex)
    (0.0, 0.146),   # the Neptunian branch's scatter alone (Chen & Kipping 2017)
    (0.05, 0.146),
    (0.25, 0.146),
    (0.10, 0.0403),  # the Terran branch's scatter
    (0.25, 0.0403),  # the mean's spread the larger: integrated over the scatter in Rust
    (0.20, 0.0738),  # the Jovian branch's scatter
    (0.15, 0.30),
]


def cdf(x, rho, sigma):
    if rho == 0.0:
        return stats.norm.cdf(np.log10(x) / sigma)
    below = stats.norm.cdf(-1.0 / rho)  # A <= 0: y <= 0 < x
    inner = lambda a: stats.norm.pdf(a) * stats.norm.cdf(np.log10(x / (1.0 + rho * a)) / sigma)
    return below + integrate.quad(inner, -1.0 / rho, np.inf, epsabs=1e-14, epsrel=1e-13, limit=400)[0]


def quantile(p, rho, sigma):
    return optimize.brentq(lambda x: cdf(x, rho, sigma) - p, 1e-9, 1e3, xtol=1e-14, rtol=1e-14)


rng = np.random.default_rng(20261204)
cases = []
for rho, sigma in CASES:
    q = [quantile(p, rho, sigma) for p in (P_LOW, 0.5, P_HIGH)]
    draws = (1.0 + rho * rng.standard_normal(10**7)) * 10.0 ** (sigma * rng.standard_normal(10**7))
    mc = np.percentile(draws, [100 * P_LOW, 50, 100 * P_HIGH])
    print(f"rho {rho} sigma {sigma}: quad {q}, Monte Carlo 1e7 {list(mc)}", file=sys.stderr)
    cases.append({"rho": rho, "sigma_dex": sigma, "quantiles": q})

out = {
    "source": "scipy %s: scipy.integrate.quad of the distribution function, scipy.optimize.brentq" % scipy.__version__,
    "percentiles": [P_LOW, 0.5, P_HIGH],
    "cases": cases,
}
print(json.dumps(out, indent=1))
