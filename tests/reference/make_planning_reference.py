#!/usr/bin/env python3
"""Reference values for the planning quantities (distance, bolometric luminosity, spectroscopy
metrics, scale height, habitable zone, predicted masses), computed with astropy's units,
constants and blackbody model, independently of Syzygy.

    python3 tests/reference/make_planning_reference.py > tests/reference/planning.json

`lang/tests/planning.rs` declares the same invented star and planet and compares the
engine's values with these. What each number rests on:

* distance: astropy.coordinates.Distance from a parallax (d = 1 au / tan p would be exact;
  astropy uses 1/p in arcsec -> pc, the small-angle form; they agree to 1e-16 at 8 mas);
* luminosities: astropy's IAU 2015 Resolution B2 bolometric magnitude units (`u.M_bol`,
  `u.m_bol`, whose zero points are L0 = 3.0128e28 W and f0 = 2.518021002e-8 W/m^2), and
  L = 4 pi d^2 f;
* the 7.5 um Planck ratio: astropy.modeling.physical_models.BlackBody;
* the metrics: the equations of Kempton et al. (2018, PASP 130, 114001), eqs. 1 and 4, with
  the scale factors of its Table 1 (equations and numbers from memory, as in the engine),
  evaluated with astropy's nominal Earth, Jupiter and Sun values (IAU 2015 B3);
* the scale height: astropy's k_B and atomic mass constant u (CODATA 2018);
* the habitable zone: the fits of Kopparapu et al. (2014), Table 1 (coefficients from memory),
  with astropy's nominal solar luminosity;
* the mean mass-radius relation of Chen & Kipping (2017): its exponents and normalisation
  (from memory), inverted here with numpy.
"""
import json
import math
import sys

import astropy
import astropy.constants as c
import astropy.units as u
import numpy as np
from astropy.coordinates import Distance
from astropy.modeling.physical_models import BlackBody

# The invented star and planet of lang/tests/planning.rs (all names and numbers made up).
STAR = dict(mass=0.92, radius=0.88, teff=5310.0, parallax_mas=8.12, mj=9.87, mks=9.41,
            m_bol_abs=4.74, m_bol_app=10.2)
PLANET = dict(period_d=12.43, depth=0.0061, mass_mjup=0.153, a_over_rs=24.98, teq=751.0,
              g=8.48)

out = {"generator": {"astropy": astropy.__version__, "numpy": np.__version__,
                     "python": sys.version.split()[0]}}

# Distance from the parallax.
d = Distance(parallax=STAR["parallax_mas"] * u.mas)
out["distance_m"] = d.to_value(u.m)

# Luminosity from an absolute bolometric magnitude (IAU 2015 B2: M_bol = 4.74 is the nominal Sun).
out["luminosity_from_m_bol_abs_w"] = u.Magnitude(STAR["m_bol_abs"], u.M_bol).physical.to_value(u.W)
# Bolometric flux from an apparent bolometric magnitude, and the luminosity at the distance.
f = u.Magnitude(STAR["m_bol_app"], u.m_bol).physical.to(u.W / u.m**2)
out["bolometric_flux_w_m2"] = f.value
out["luminosity_from_flux_w"] = (4 * math.pi * d**2 * f).to_value(u.W)

# The Planck ratio of the emission metric, B_7.5um(1.10 Teq) / B_7.5um(Teff).
teq0 = STAR["teff"] * math.sqrt(1 / PLANET["a_over_rs"]) * 0.25**0.25
wav = 7.5 * u.um
ratio = (BlackBody(temperature=1.10 * teq0 * u.K)(wav) / BlackBody(temperature=STAR["teff"] * u.K)(wav))
out["planck_ratio"] = float(ratio.decompose().value)

# Kempton et al. (2018) metrics.
k = math.sqrt(PLANET["depth"])
rp = (k * STAR["radius"] * u.R_sun).to_value(u.R_earth)
mp = (PLANET["mass_mjup"] * u.M_jup).to_value(u.M_earth)
scale = 0.190 if rp < 1.5 else 1.26 if rp < 2.75 else 1.28 if rp < 4.0 else 1.15
out["tsm"] = scale * rp**3 * teq0 / (mp * STAR["radius"]**2) * 10 ** (-STAR["mj"] / 5)
out["esm"] = 4.29e6 * out["planck_ratio"] * k**2 * 10 ** (-STAR["mks"] / 5)
out["tsm_inputs"] = {"radius_earth": rp, "mass_earth": mp, "teq": teq0, "scale": scale}

# Scale height at Teq for mu = 2.3.
h = c.k_B * PLANET["teq"] * u.K / (2.3 * c.u * PLANET["g"] * u.m / u.s**2)
out["scale_height_m"] = h.to_value(u.m)

# Habitable zone (Kopparapu et al. 2014, Table 1, 1 Earth mass).
COEF = {
    "recent_venus": (1.776, 2.136e-4, 2.533e-8, -1.332e-11, -3.097e-15),
    "runaway_greenhouse": (1.107, 1.332e-4, 1.580e-8, -8.308e-12, -1.931e-15),
    "maximum_greenhouse": (0.356, 6.171e-5, 1.698e-9, -3.198e-12, -5.575e-16),
    "early_mars": (0.320, 5.547e-5, 1.526e-9, -2.874e-12, -5.011e-16),
}
t = STAR["teff"] - 5780.0
lum = (4 * math.pi * (STAR["radius"] * c.R_sun) ** 2 * c.sigma_sb * (STAR["teff"] * u.K) ** 4)
out["habitable"] = {}
for name, (s0, a, b, cc, dd) in COEF.items():
    seff = s0 + a * t + b * t**2 + cc * t**3 + dd * t**4
    dist = np.sqrt((lum / c.L_sun).decompose().value / seff) * u.au
    out["habitable"][name] = {"seff": seff, "distance_m": dist.to_value(u.m)}

# Chen & Kipping (2017) mean relation, inverted for an Earth-size and a Neptune-size planet.
t1, t2 = 2.04, (0.414 * u.M_jup).to_value(u.M_earth)
c1, s1, s2 = 1.008, 0.279, 0.589
c2 = c1 * t1 ** (s1 - s2)
def mass_from_radius(r):
    return (r / c1) ** (1 / s1) if r < c1 * t1**s1 else (r / c2) ** (1 / s2)
out["predicted_mass_earth"] = {str(r): mass_from_radius(r) for r in (1.0, 3.86)}
out["largest_invertible_radius_earth"] = c2 * t2**s2 * ((0.080 * u.M_sun).to_value(u.M_earth) / t2) ** -0.044

json.dump(out, sys.stdout, indent=1, sort_keys=True)
print()
