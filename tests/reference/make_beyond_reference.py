"""Reference values for time scales and transit light curves, from general-purpose libraries.

- timescales: astropy.time (ERFA) converts UTC timestamps to TT and TDB Julian dates. astropy's
  TDB uses the full series (Fairhead & Bretagnon); Syzygy's two-term periodic approximation
  should agree to about 10 microseconds.
- light curves: numpy integrates the quadratically limb-darkened stellar disk on a fine polar
  grid, hiding the part under the planet's disk — a brute-force method independent of
  Syzygy's closed-form overlap plus quadrature. Grid error is about 1e-6 in relative flux.

Run: python3 make_beyond_reference.py > beyond.json
"""
import json
import sys

import astropy
import numpy as np
from astropy.time import Time

stamps = [
    "1980-06-01T00:00:00",
    "2000-01-01T11:58:55.816",
    "2016-12-31T23:59:30",
    "2017-01-01T00:00:30",
    "2024-03-14T05:12:00",
    "2026-11-20T18:00:00",
]
timescales = []
for s in stamps:
    t = Time(s, format="isot", scale="utc")
    timescales.append({
        "utc": s + "Z",
        "jd_utc": t.utc.jd1 + t.utc.jd2,
        "jd_tt": t.tt.jd1 + t.tt.jd2,
        "tdb_minus_tt_s": float(((t.tdb.jd1 - t.tt.jd1) + (t.tdb.jd2 - t.tt.jd2)) * 86400.0),
        "tt_minus_utc_s": float(((t.tt.jd1 - t.utc.jd1) + (t.tt.jd2 - t.utc.jd2)) * 86400.0),
    })


def blocked(p, z, u1, u2, n_r=4000, n_phi=4000):
    # Midpoint rule in r and phi over the unit disk.
    r = (np.arange(n_r) + 0.5) / n_r
    phi = (np.arange(n_phi) + 0.5) / n_phi * 2 * np.pi
    R, PHI = np.meshgrid(r, phi, indexing="ij")
    mu = np.sqrt(1 - R**2)
    inten = 1 - u1 * (1 - mu) - u2 * (1 - mu) ** 2
    x, y = R * np.cos(PHI), R * np.sin(PHI)
    under = (x - z) ** 2 + y**2 < p**2
    w = R  # polar area element r dr dphi
    return float((inten * w * under).sum() / (inten * w).sum())


cases = []
for p, z, u1, u2 in [
    (0.1, 0.0, 0.4, 0.25),
    (0.1, 0.5, 0.4, 0.25),
    (0.1, 0.95, 0.4, 0.25),
    (0.1, 1.05, 0.4, 0.25),
    (0.2, 0.3, 0.6, 0.1),
    (0.05, 0.8, 0.0, 0.0),
]:
    cases.append({"p": p, "z": z, "u1": u1, "u2": u2, "blocked": blocked(p, z, u1, u2)})

json.dump({
    "generator": {"python": sys.version.split()[0], "astropy": astropy.__version__,
                  "numpy": np.__version__},
    "timescales": timescales,
    "light_curve": cases,
}, sys.stdout, indent=1)
print()
