#!/usr/bin/env python3
"""The hand-written Monte Carlo route, for comparison: the same reader and the same
quantities as `peer.py`, propagated by drawing samples with numpy instead of to first order.

Usage: peer_mc.py DIR [OUT.csv] [SAMPLES]   (OUT defaults to DIR/peer_mc.csv, SAMPLES to 10000)

Per planet, every measured input is drawn SAMPLES times from a normal distribution (an
asymmetric uncertainty replaced by the mean of its two sides, as in `peer.py`), the
formulas of `peer.py` are evaluated on the whole arrays, and each quantity is reported as
the median with the distances to the 16th and 84th percentiles (`numpy.percentile`). Draws
are not kept inside physical ranges (an eccentricity below zero is not redrawn), as a quick
script usually does not; impossible values (sin i of |cos i| > 1) give NaN and are left out
of the percentiles (`numpy.nanpercentile`).
"""
import csv
import glob
import math
import os
import sys

import numpy as np

import peer

COLUMNS = ["system", "planet"] + [
    f"{q}_{s}" for q in ("a_au", "min_mass_mearth", "mass_mearth", "radius_rearth",
                         "density_g_cm3", "teq_k", "insolation_searth")
    for s in ("median", "below", "above")]


def si(value, err, unit, name):
    """Value and standard uncertainty in SI, converted with astropy units (as peer.py)."""
    scale = (1.0 * peer.UNITS[unit]).to(peer.SI[name]).value
    return value * scale, err * scale


def derive(system, stars, planet, rng, n):
    star = stars[planet["_host"]]
    draw = lambda v: rng.normal(v[0], v[1], n)  # noqa: E731
    ms, rs, teff = draw(star["mass"]), draw(star["radius"]), draw(star["teff"])
    p, k = draw(planet["period"]), draw(planet["rv_amplitude"])
    e = draw(planet["eccentricity"]) if "eccentricity" in planet else np.zeros(n)
    G = peer.G
    a = (G * ms * p ** 2 / (4 * math.pi ** 2)) ** (1 / 3)
    msini = k * (p / (2 * math.pi * G)) ** (1 / 3) * ms ** (2 / 3) * np.sqrt(1 - e ** 2)
    teq = teff * np.sqrt(rs / (2 * a))
    s = peer.SIGMA * teff ** 4 * (rs / a) ** 2 / peer.S_EARTH
    values = {"a_au": a / peer.AU, "min_mass_mearth": msini / peer.MEARTH, "teq_k": teq,
              "insolation_searth": s}
    if "transit_depth" in planet:
        b, depth = draw(planet["impact"]), draw(planet["transit_depth"])
        cos_i = b * (1 + e) / ((a / rs) * (1 - e ** 2))
        with np.errstate(invalid="ignore"):
            sin_i = np.sqrt(1 - cos_i ** 2)
            rp = np.sqrt(depth) * rs
        mp = msini / sin_i
        rho = mp / (4 / 3 * math.pi * rp ** 3)
        values.update(mass_mearth=mp / peer.MEARTH, radius_rearth=rp / peer.REARTH,
                      density_g_cm3=rho / 1000.0)
    row = {"system": system, "planet": planet["_name"]}
    for q, v in values.items():
        lo, mid, hi = np.nanpercentile(v, [15.865525, 50.0, 84.134475])
        row[f"{q}_median"] = f"{mid:.6g}"
        row[f"{q}_below"] = f"{mid - lo:.3g}"
        row[f"{q}_above"] = f"{hi - mid:.3g}"
    return row


def main(argv):
    if len(argv) not in (2, 3, 4):
        sys.exit("usage: peer_mc.py DIR [OUT.csv] [SAMPLES]")
    folder = argv[1]
    out = argv[2] if len(argv) >= 3 else os.path.join(folder, "peer_mc.csv")
    n = int(argv[3]) if len(argv) == 4 else 10_000
    files = sorted(glob.glob(os.path.join(folder, "*.syz")))
    if not files:
        sys.exit(f"no .syz files in {folder}")
    rng = np.random.default_rng(20261202)
    with open(out, "w", newline="", encoding="utf-8") as f:
        w = csv.DictWriter(f, fieldnames=COLUMNS, restval="")
        w.writeheader()
        for path in files:
            system, stars, planets = peer.read(path, si)
            for planet in planets:
                w.writerow(derive(system, stars, planet, rng, n))


if __name__ == "__main__":
    main(sys.argv)
