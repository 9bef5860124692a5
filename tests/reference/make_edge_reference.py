#!/usr/bin/env python3
"""Percentiles of an impact parameter derived from two transit durations, and of the
inclination that follows, with the draws that no impact parameter gives (b^2 < 0) taken at b = 0 (reference for the draws taken at
a formula's edge in ``lang/src/derive/rules.rs``, ``draws_at_edge``).

For a circular orbit (Seager & Mallen-Ornelas 2003, ApJ 585, 1038, eq. 7):

    b^2 = [(1 - k)^2 - r (1 + k)^2] / (1 - r),   r = sin^2(pi T23 / P) / sin^2(pi T14 / P),

with the radius ratio k = sqrt(depth) (limb darkening neglected). The measurements are
drawn as independent normals with numpy (4e6 draws, fixed seed); b = sqrt(max(b^2, 0)).
Also given: the share of draws with b^2 < 0, and the percentiles with those draws left out
instead (what taking them at the edge corrects).

Run:  python3 tests/reference/make_edge_reference.py > tests/reference/edge.json
Needs: numpy (run with 2.x).
"""
import json

import numpy as np

P_LOW = 0.158655253931457
P_HIGH = 0.841344746068543
N = 4_000_000

# An invented planet: period (d), depth (fraction), T14 and T23 (h), each value and sigma.
CASE = {
    "period": (5.0, 0.0001),
    "depth": (0.005, 0.0002),
    "t14": (2.4, 0.05),
    "t23": (2.0, 0.05),
}


def main():
    rng = np.random.default_rng(20261204)
    d = {k: rng.normal(v, s, N) for k, (v, s) in CASE.items()}
    k = np.sqrt(d["depth"])
    s14 = np.sin(np.pi * d["t14"] / 24.0 / d["period"]) ** 2
    s23 = np.sin(np.pi * d["t23"] / 24.0 / d["period"]) ** 2
    r = s23 / s14
    b2 = ((1 - k) ** 2 - r * (1 + k) ** 2) / (1 - r)
    clamped = np.sqrt(np.maximum(b2, 0.0))
    kept = np.sqrt(b2[b2 >= 0])
    # The inclination from that b and a/R* from T14 (eq. 8), cos i = b / (a/R*) (eq. 4 with
    # a circular orbit).
    ars = np.sqrt(((1 + k) ** 2 - clamped ** 2 * (1 - s14)) / s14)
    inclination = np.degrees(np.arccos(clamped / ars))
    q = lambda x: [float(v) for v in np.quantile(x, [P_LOW, 0.5, P_HIGH])]
    print(json.dumps({
        "source": "numpy Monte Carlo, 4e6 draws; Seager & Mallen-Ornelas 2003 eq. 7",
        "numpy": np.__version__,
        "inputs": {k: {"value": v, "sigma": s} for k, (v, s) in CASE.items()},
        "share_past_edge": float(np.mean(b2 < 0)),
        "at_edge": q(clamped),
        "left_out": q(kept),
        "inclination_deg": q(inclination),
    }, indent=2))


if __name__ == "__main__":
    main()
