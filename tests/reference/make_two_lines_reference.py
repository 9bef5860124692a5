#!/usr/bin/env python3
"""Percentiles of a first-order value resting on one asymmetric uncertainty, by numerical
integration with scipy (reference for ``lang/src/derive/asymmetric.rs``).

A published ``v +a/-b`` is read as two half-normal lines, ``v + a u`` for ``u > 0`` and
``v + b u`` for ``u < 0`` with ``u`` standard normal (R. Barlow 2003, arXiv:physics/0306138,
sect. 2). A value ``y = g (x - v) + s w`` (``w`` standard normal: the rest of its inputs)
has the distribution function

    F(t) = int phi(u) Phi((t - g D(u)) / s) du,   D(u) = a u (u > 0), b u (u < 0),

integrated here with ``scipy.integrate.quad`` over each half-line, and each percentile
found with ``scipy.optimize.brentq``. This does not use the closed form the Rust code uses
(Owen's T function), so the two are independent.

Run:  python3 tests/reference/make_two_lines_reference.py > tests/reference/two_lines.json
Needs: scipy (run with 1.17.1).
"""
import json

import numpy as np
import scipy
from scipy import integrate, optimize, stats

P_LOW = 0.158655253931457
P_HIGH = 0.841344746068543

CASES = [
    # g, above, below, s
    (1.0, 3.0, 2.0, 0.0),
    (1.0, 3.0, 2.0, 0.5),
    (1.0, 3.0, 2.0, 2.5),
    (1.0, 3.0, 2.0, 10.0),
    (-2.0, 3.0, 1.0, 1.0),
    (0.7, 0.03, 0.02, 0.011),
    (1.0, 1.0, 4.0, 0.3),
    (5.0, 1.0, 1.0, 2.0),
]


def cdf(t, g, a, b, s):
    # g D(u): rising side r_up for u > 0 when g > 0.
    up, down = (g * a, g * b) if g >= 0 else (-g * b, -g * a)
    if s == 0.0:
        return stats.norm.cdf(t / (up if t >= 0 else down))
    pos = integrate.quad(lambda u: stats.norm.pdf(u) * stats.norm.cdf((t - up * u) / s), 0, np.inf,
                         epsabs=1e-14, epsrel=1e-13, limit=200)[0]
    neg = integrate.quad(lambda u: stats.norm.pdf(u) * stats.norm.cdf((t - down * u) / s), -np.inf, 0,
                         epsabs=1e-14, epsrel=1e-13, limit=200)[0]
    return pos + neg


def quantile(p, g, a, b, s):
    wide = 12 * max(abs(g) * max(a, b), s)
    return optimize.brentq(lambda t: cdf(t, g, a, b, s) - p, -wide, wide, xtol=1e-14, rtol=1e-14)


out = {
    "source": "scipy %s: scipy.integrate.quad of the distribution function, scipy.optimize.brentq" % scipy.__version__,
    "percentiles": [P_LOW, 0.5, P_HIGH],
    "cases": [
        {"g": g, "above": a, "below": b, "s": s,
         "quantiles": [quantile(p, g, a, b, s) for p in (P_LOW, 0.5, P_HIGH)]}
        for (g, a, b, s) in CASES
    ],
}
print(json.dumps(out, indent=1))
