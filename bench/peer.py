#!/usr/bin/env python3
"""The hand-written route, for comparison: read a folder of `.syz` catalogue files with a
small regular-expression reader and derive planetary parameters with astropy units and
constants and the `uncertainties` package (linear, first-order propagation).

Usage: peer.py DIR [OUT.csv]      (OUT defaults to DIR/peer.csv)

What this reader understands is only what the benchmark catalogue uses: `star` and
`planet` blocks with `name = value ± err unit` or `name = value +up/-down unit`. An
asymmetric uncertainty is replaced by the mean of its two sides, as people usually do
when handing values to `uncertainties`.

Per planet it computes, as one would write it by hand:
  - semi-major axis from Kepler's third law with the stellar mass only (planet mass
    neglected);
  - minimum mass with the small-planet approximation
        Mp sin i = K (P / (2 pi G))^(1/3) M*^(2/3) sqrt(1 - e^2)
    (Mp << M*; common practice), not the exact solution of the mass function;
  - for a transiting planet: inclination from the impact parameter
        cos i = b (1 + e sin w) / ((a/R*) (1 - e^2)), w = 90 deg (Winn 2010 eq. 7),
    true mass Mp = Mp sin i / sin i, radius Rp = sqrt(depth) R* (no limb darkening)
    and bulk density;
  - equilibrium temperature with Bond albedo 0 and full redistribution,
        Teq = Teff sqrt(R* / (2a)),
    and insolation S = sigma Teff^4 (R*/a)^2 in units of Earth's.
"""
import csv
import glob
import math
import os
import re
import sys

import astropy.constants as const
import astropy.units as u
from uncertainties import ufloat, umath

BLOCK = re.compile(r"^\s*(star|planet)\s+(\w+)(?:\s+orbits\s+(\w+))?\s*\{")
SYSTEM = re.compile(r'^\s*system\s+"([^"]+)"')
SYM = re.compile(r"^\s*(\w+)\s*=\s*([-+0-9.eE]+)\s*(?:±|\+-)\s*([0-9.eE]+)\s*([^\s\[#]*)")
ASYM = re.compile(r"^\s*(\w+)\s*=\s*([-+0-9.eE]+)\s*\+([0-9.eE]+)/-([0-9.eE]+)\s*([^\s\[#]*)")
UNITS = {"Msun": u.M_sun, "Rsun": u.R_sun, "K": u.K, "pc": u.pc, "d": u.day,
         "m/s": u.m / u.s, "%": u.percent, "": u.dimensionless_unscaled}
SI = {"mass": u.kg, "radius": u.m, "teff": u.K, "distance": u.m, "period": u.s,
      "rv_amplitude": u.m / u.s, "transit_depth": u.dimensionless_unscaled,
      "impact": u.dimensionless_unscaled, "eccentricity": u.dimensionless_unscaled}


def measured(value, err, unit, name):
    """A ufloat in SI units, converted with astropy."""
    q = (value * UNITS[unit]).to(SI[name])
    e = (err * UNITS[unit]).to(SI[name])
    return ufloat(q.value, e.value, name)


def read(path, make=None):
    """The system's name, its stars by name and its planets, each a dict of the values
    `make(value, err, unit, name)` returns (a ufloat in SI by default)."""
    make = make or measured
    system, stars, planets, current = None, {}, [], None
    with open(path, encoding="utf-8") as f:
        for line in f:
            line = line.split("#", 1)[0]
            m = SYSTEM.match(line)
            if m:
                system = m.group(1)
                continue
            m = BLOCK.match(line)
            if m:
                current = {"_name": m.group(2), "_host": m.group(3)}
                if m.group(1) == "star":
                    stars[m.group(2)] = current
                else:
                    planets.append(current)
                continue
            if current is None:
                continue
            m = ASYM.match(line)
            if m:
                name, v, up, lo, unit = m.groups()
                current[name] = make(float(v), (float(up) + float(lo)) / 2, unit, name)
                continue
            m = SYM.match(line)
            if m:
                name, v, err, unit = m.groups()
                current[name] = make(float(v), float(err), unit, name)
    return system, stars, planets


G = const.G.value
SIGMA = const.sigma_sb.value
AU = const.au.value
MEARTH = const.M_earth.value
REARTH = const.R_earth.value
S_EARTH = (const.L_sun / (4 * math.pi * const.au ** 2)).to(u.W / u.m ** 2).value

COLUMNS = ["system", "planet", "a_au", "a_err", "min_mass_mearth", "min_mass_err",
           "mass_mearth", "mass_err", "radius_rearth", "radius_err", "density_g_cm3",
           "density_err", "teq_k", "teq_err", "insolation_searth", "insolation_err"]


def derive(system, stars, planet):
    star = stars[planet["_host"]]
    ms, rs, teff = star["mass"], star["radius"], star["teff"]
    p, k = planet["period"], planet["rv_amplitude"]
    e = planet.get("eccentricity", 0.0)
    a = (G * ms * p ** 2 / (4 * math.pi ** 2)) ** (1 / 3)
    msini = k * (p / (2 * math.pi * G)) ** (1 / 3) * ms ** (2 / 3) * umath.sqrt(1 - e ** 2)
    teq = teff * umath.sqrt(rs / (2 * a))
    s = SIGMA * teff ** 4 * (rs / a) ** 2 / S_EARTH
    row = {"system": system, "planet": planet["_name"],
           "a_au": a / AU, "min_mass_mearth": msini / MEARTH, "teq_k": teq,
           "insolation_searth": s}
    if "transit_depth" in planet:
        cos_i = planet["impact"] * (1 + e) / ((a / rs) * (1 - e ** 2))
        sin_i = umath.sqrt(1 - cos_i ** 2)
        mp = msini / sin_i
        rp = umath.sqrt(planet["transit_depth"]) * rs
        rho = mp / (4 / 3 * math.pi * rp ** 3)
        row.update(mass_mearth=mp / MEARTH, radius_rearth=rp / REARTH,
                   density_g_cm3=rho / 1000.0)
    out = {}
    for c in COLUMNS:
        if c.endswith("_err"):
            continue
        v = row.get(c)
        if c in ("system", "planet"):
            out[c] = v
        elif v is None:
            out[c] = ""
        else:
            out[c] = f"{v.nominal_value:.6g}"
            out[COLUMNS[COLUMNS.index(c) + 1]] = f"{v.std_dev:.3g}"
    return out


def main(argv):
    if len(argv) not in (2, 3):
        sys.exit("usage: peer.py DIR [OUT.csv]")
    folder = argv[1]
    out = argv[2] if len(argv) == 3 else os.path.join(folder, "peer.csv")
    files = sorted(glob.glob(os.path.join(folder, "*.syz")))
    if not files:
        sys.exit(f"no .syz files in {folder}")
    with open(out, "w", newline="", encoding="utf-8") as f:
        w = csv.DictWriter(f, fieldnames=COLUMNS, restval="")
        w.writeheader()
        for path in files:
            system, stars, planets = read(path)
            for planet in planets:
                w.writerow(derive(system, stars, planet))


if __name__ == "__main__":
    main(sys.argv)
