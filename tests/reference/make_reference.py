#!/usr/bin/env python3
"""Reference values for the Syzygy test suite, computed with general-purpose libraries.

What it computes
----------------
* ``units.json``       -- SI values of quantities written the way a ``.syz`` file writes them
                          (``1 Msun``, ``42 km s^-1``, ``250 ppm`` ...), converted with
                          ``astropy.units`` / ``astropy.constants``.
* ``derivations.json`` -- a handful of invented star + planet cases: symmetric inputs
                          (value +- sigma) and the derived quantities with first-order (linear)
                          uncertainties, propagated with ``uncertainties`` (independent inputs,
                          correlations between intermediate results tracked by the library).

Constants (from astropy, CODATA 2018 selected explicitly; IAU 2015 Resolution B3 nominal values):
    G        CODATA 2018 (6.67430e-11 m^3 kg^-1 s^-2)
    sigma    Stefan-Boltzmann constant, CODATA 2018 (exact in the 2019 SI)
    M_sun    = GM_sun / G      (IAU 2015 B3 nominal GM_sun; astropy's definition)
    M_jup    = GM_jup / G, M_earth = GM_earth / G   (same construction)
    R_sun, R_jup (equatorial), R_earth (equatorial), L_sun: IAU 2015 B3 nominal values
    au (IAU 2012 B2), pc, light year, Julian year (365.25 d), day = 86400 s: astropy.units
Constants are treated as exact (no uncertainty is propagated from G or from the nominal values).

Formulas used for ``derivations.json`` (all in SI internally):
    minimum mass m (= Mp sin i): solve   K = (2 pi G / P)^(1/3) m / (M* + m)^(2/3) / sqrt(1 - e^2)
        exactly, i.e. the cubic  m^3 = C (M* + m)^2  with  C = K^3 (1 - e^2)^(3/2) P / (2 pi G),
        by Newton iteration; derivatives for the propagation come from implicit differentiation.
    semi-major axis:   a = (G (M* + m) P^2 / (4 pi^2))^(1/3)   with m the minimum mass
    radius ratio:      k = sqrt(depth)          (no limb darkening)
    planet radius:     Rp = k R*
    inclination:       cos i = b R* / a         (circular orbits in the transiting cases)
    true mass Mp:      solve  K = (2 pi G / P)^(1/3) Mp sin i / (M* + Mp)^(2/3) / sqrt(1 - e^2),
                       i.e.   Mp^3 sin^3 i = C (M* + Mp)^2
    planet density:    Mp / (4/3 pi Rp^3)
    surface gravity:   G Mp / Rp^2
    star luminosity:   L* = 4 pi R*^2 sigma Teff^4
    star log g:        log10(G M* / R*^2 expressed in cm s^-2)   (dex, dimensionless)
    star density:      M* / (4/3 pi R*^3)
    without the star's mass or radius (``DENSITY_CASES``): rho* = 3 pi (a/R*)^3 / (G P^2)
                       (Seager & Mallen-Ornelas 2003 eq. 9, the planet's mass neglected), then
                       M* = 4/3 pi rho* R*^3 or R* = (3 M* / (4 pi rho*))^(1/3), a = (a/R*) R*
    insolation:        S = L* / (4 pi a^2)      (at distance a, not orbit-averaged)
    equilibrium temp.: Teq = Teff sqrt(R* / (2 a)) (f (1 - A))^(1/4)
                       f = redistribution factor (f = 1: heat spread over the whole planet),
                       A = Bond albedo
Every input is independent and symmetric; sigma = 0 marks an exact (assumed) value.

How to rerun
------------
    python3 -m pip install astropy uncertainties
    python3 tests/reference/make_reference.py

The script overwrites ``units.json`` and ``derivations.json`` in its own directory and records the
library versions used under the ``"generator"`` key of each file.
"""

import json
import math
import os
import platform

import astropy

# Select CODATA 2018 / IAU 2015 before astropy.constants or astropy.units is imported.
astropy.physical_constants.set("codata2018")
astropy.astronomical_constants.set("iau2015")

import astropy.constants as const  # noqa: E402
import astropy.units as u  # noqa: E402
import uncertainties  # noqa: E402
from uncertainties import ufloat, umath  # noqa: E402

HERE = os.path.dirname(os.path.abspath(__file__))

GENERATOR = {
    "astropy": astropy.__version__,
    "uncertainties": uncertainties.__version__,
    "python": platform.python_version(),
}

SOURCE = (
    "astropy.units / astropy.constants (CODATA 2018, IAU 2015 Resolution B3 nominal values, "
    "M_sun = GM_sun/G); uncertainties for first-order propagation; see make_reference.py"
)

# ---------------------------------------------------------------------------------------------
# .syz unit spelling -> astropy unit (explicit table, no free-form parsing)
# ---------------------------------------------------------------------------------------------
PPM = u.def_unit("ppm", 1e-6 * u.dimensionless_unscaled)

SYZ_UNITS = {
    "Msun": u.M_sun,
    "Mjup": u.M_jup,
    "Mearth": u.M_earth,
    "Rsun": u.R_sun,
    "Rjup": u.R_jup,
    "Rearth": u.R_earth,
    "Lsun": u.L_sun,
    "au": u.au,
    "pc": u.pc,
    "kpc": u.kpc,
    "ly": u.lyr,
    "d": u.day,
    "h": u.hour,
    "min": u.minute,
    "s": u.s,
    "yr": u.yr,  # Julian year, 365.25 d (checked below)
    "Myr": u.Myr,
    "Gyr": u.Gyr,
    "K": u.K,
    "deg": u.deg,
    "rad": u.rad,
    "arcsec": u.arcsec,
    "mas": u.mas,
    "m/s": u.m / u.s,
    "km/s": u.km / u.s,
    "km s^-1": u.km * u.s**-1,
    "g/cm^3": u.g / u.cm**3,
    "kg/m^3": u.kg / u.m**3,
    "W/m^2": u.W / u.m**2,
    "cm/s^2": u.cm / u.s**2,
    "ppm": PPM,
    "%": u.percent,
    "mm": u.mm,
    "m": u.m,
    "kg": u.kg,
    "1": u.dimensionless_unscaled,
}

SI_UNITS = {
    "kg": u.kg,
    "m": u.m,
    "s": u.s,
    "K": u.K,
    "rad": u.rad,
    "W": u.W,
    "kg/m^3": u.kg / u.m**3,
    "m/s": u.m / u.s,
    "W/m^2": u.W / u.m**2,
    "m/s^2": u.m / u.s**2,
    "1": u.dimensionless_unscaled,
}

assert u.yr.to(u.s) == 365.25 * 86400.0, "astropy yr is expected to be the Julian year"
assert u.day.to(u.s) == 86400.0


def to_si(value, syz_unit, si_unit):
    """Convert value [syz_unit] to si_unit with astropy; returns a float."""
    q = value * SYZ_UNITS[syz_unit]
    return float(q.to_value(SI_UNITS[si_unit]))


# ---------------------------------------------------------------------------------------------
# units.json
# ---------------------------------------------------------------------------------------------
UNIT_CASES = [
    # (text as written in a .syz file, value, .syz unit, SI unit)
    ("1 Msun", 1.0, "Msun", "kg"),
    ("1 Mjup", 1.0, "Mjup", "kg"),
    ("1 Mearth", 1.0, "Mearth", "kg"),
    ("1 Rsun", 1.0, "Rsun", "m"),
    ("1 Rjup", 1.0, "Rjup", "m"),
    ("1 Rearth", 1.0, "Rearth", "m"),
    ("1 Lsun", 1.0, "Lsun", "W"),
    ("1 au", 1.0, "au", "m"),
    ("1 pc", 1.0, "pc", "m"),
    ("2.5 kpc", 2.5, "kpc", "m"),
    ("1 ly", 1.0, "ly", "m"),
    ("1 d", 1.0, "d", "s"),
    ("1 h", 1.0, "h", "s"),
    ("1 min", 1.0, "min", "s"),
    ("1 yr", 1.0, "yr", "s"),
    ("1 Myr", 1.0, "Myr", "s"),
    ("1 Gyr", 1.0, "Gyr", "s"),
    ("1 deg", 1.0, "deg", "rad"),
    ("1 arcsec", 1.0, "arcsec", "rad"),
    ("1 mas", 1.0, "mas", "rad"),
    ("56 m/s", 56.0, "m/s", "m/s"),
    ("12.3 km/s", 12.3, "km/s", "m/s"),
    ("42 km s^-1", 42.0, "km s^-1", "m/s"),
    ("5.51 g/cm^3", 5.51, "g/cm^3", "kg/m^3"),
    ("1361 W/m^2", 1361.0, "W/m^2", "W/m^2"),
    ("250 ppm", 250.0, "ppm", "1"),
    ("1.12 %", 1.12, "%", "1"),
    ("980 cm/s^2", 980.0, "cm/s^2", "m/s^2"),
    ("3 mm", 3.0, "mm", "m"),
    ("1e-3 Mjup", 1e-3, "Mjup", "kg"),
]


def make_units():
    rows = []
    for text, value, syz_unit, si_unit in UNIT_CASES:
        rows.append({"text": text, "si_value": to_si(value, syz_unit, si_unit), "si_unit": si_unit})
    return {"generator": GENERATOR, "source": SOURCE, "units": rows}


# ---------------------------------------------------------------------------------------------
# derivations.json
# ---------------------------------------------------------------------------------------------
G = const.G.si.value
SIGMA_SB = const.sigma_sb.si.value
PI = math.pi


def _solve_mass(c, mstar, s):
    """Root of F(m) = m^3 s^3 - c (mstar + m)^2 = 0 (the unique positive root), by Newton."""
    # Start from the small-mass limit m ~ (c mstar^2)^(1/3) / s, which is always close.
    m = (c * mstar * mstar) ** (1.0 / 3.0) / s
    for _ in range(100):
        f = m**3 * s**3 - c * (mstar + m) ** 2
        fp = 3.0 * m * m * s**3 - 2.0 * c * (mstar + m)
        step = f / fp
        m -= step
        if abs(step) <= 1e-16 * abs(m):
            break
    return m


def _mass_partials(c, mstar, s):
    """dm/dc, dm/dmstar, dm/ds by implicit differentiation of F(m; c, mstar, s) = 0."""
    m = _solve_mass(c, mstar, s)
    f_m = 3.0 * m * m * s**3 - 2.0 * c * (mstar + m)
    f_c = -((mstar + m) ** 2)
    f_mstar = -2.0 * c * (mstar + m)
    f_s = 3.0 * m**3 * s * s
    return [-f_c / f_m, -f_mstar / f_m, -f_s / f_m]


_solve_mass_u = uncertainties.wrap(
    _solve_mass,
    [
        lambda c, mstar, s: _mass_partials(c, mstar, s)[0],
        lambda c, mstar, s: _mass_partials(c, mstar, s)[1],
        lambda c, mstar, s: _mass_partials(c, mstar, s)[2],
    ],
)
# Same solver, derivatives taken numerically by the library: used only as a cross-check.
_solve_mass_u_numeric = uncertainties.wrap(_solve_mass)


def mass_from_k(k_amp, period, mstar, ecc, sin_i=1.0):
    """Planet mass (sin_i = 1: minimum mass m sin i) from K, P, M*, e in SI units."""
    c = k_amp**3 * (1.0 - ecc**2) ** 1.5 * period / (2.0 * PI * G)
    m = _solve_mass_u(c, mstar, sin_i)
    check = _solve_mass_u_numeric(c, mstar, sin_i)
    _agree(m, check, "mass solver derivatives")
    # The solved value must satisfy the original K equation.
    k_back = (2 * PI * G / period) ** (1 / 3) * m * sin_i / (mstar + m) ** (2 / 3) / (1 - ecc**2) ** 0.5
    kn = _nominal(k_amp)
    assert abs(_nominal(k_back) - kn) <= 1e-12 * kn, (k_back, k_amp)
    return m


def _nominal(x):
    return x.nominal_value if hasattr(x, "nominal_value") else float(x)


def _std(x):
    return x.std_dev if hasattr(x, "std_dev") else 0.0


def _agree(a, b, what):
    assert abs(_nominal(a) - _nominal(b)) <= 1e-12 * abs(_nominal(a)), what
    sa, sb = _std(a), _std(b)
    assert abs(sa - sb) <= 1e-5 * max(sa, sb, 1e-300), (what, sa, sb)


# Input units (the .syz spelling) -> SI unit of the same dimension.
INPUT_SI = {
    "star.mass": "kg",
    "star.radius": "m",
    "star.teff": "K",
    "b.period": "s",
    "b.rv_amplitude": "m/s",
    "b.transit_depth": "1",
    "b.impact": "1",
    "b.eccentricity": "1",
    "b.albedo": "1",
    "b.redistribution": "1",
    "b.scaled_semi_major_axis": "1",
}

OUTPUT_SI = {
    "b.semi_major_axis": "m",
    "b.min_mass": "kg",
    "b.mass": "kg",
    "b.radius_ratio": "1",
    "b.radius": "m",
    "b.inclination": "rad",
    "b.density": "kg/m^3",
    "b.surface_gravity": "m/s^2",
    "b.teq": "K",
    "b.insolation": "W/m^2",
    "star.luminosity": "W",
    "star.log_g": "1",
    "star.density": "kg/m^3",
    "star.mass": "kg",
    "star.radius": "m",
}


def inp(value, sigma, unit):
    return {"value": value, "sigma": sigma, "unit": unit}


# All systems below are invented.
CASES = [
    {
        "name": "hot-giant-circular",
        "note": "Invented Jupiter-mass planet on a 2.9 d circular orbit around an F-type star.",
        "inputs": {
            "star.mass": inp(1.12, 0.05, "Msun"),
            "star.radius": inp(1.21, 0.04, "Rsun"),
            "star.teff": inp(6050.0, 90.0, "K"),
            "b.period": inp(2.87132, 0.00001, "d"),
            "b.rv_amplitude": inp(142.0, 5.0, "m/s"),
            "b.transit_depth": inp(1.38, 0.04, "%"),
            "b.impact": inp(0.22, 0.07, "1"),
            "b.eccentricity": inp(0.0, 0.0, "1"),
            "b.albedo": inp(0.1, 0.0, "1"),
            "b.redistribution": inp(1.0, 0.0, "1"),
        },
    },
    {
        "name": "warm-saturn-k-dwarf",
        "note": "Invented Saturn-mass planet on a 3.52 d circular orbit around a K dwarf "
        "(the numbers of the Veyra demo system).",
        "inputs": {
            "star.mass": inp(0.93, 0.04, "Msun"),
            "star.radius": inp(0.88, 0.03, "Rsun"),
            "star.teff": inp(5310.0, 80.0, "K"),
            "b.period": inp(3.52474, 0.00002, "d"),
            "b.rv_amplitude": inp(56.0, 2.0, "m/s"),
            "b.transit_depth": inp(1.12, 0.05, "%"),
            "b.impact": inp(0.35, 0.05, "1"),
            "b.eccentricity": inp(0.0, 0.0, "1"),
            "b.albedo": inp(0.3, 0.0, "1"),
            "b.redistribution": inp(1.0, 0.0, "1"),
        },
    },
    {
        "name": "warm-sub-neptune",
        "note": "Invented sub-Neptune on a 12.7 d circular orbit around a K dwarf; depth in ppm.",
        "inputs": {
            "star.mass": inp(0.78, 0.03, "Msun"),
            "star.radius": inp(0.76, 0.02, "Rsun"),
            "star.teff": inp(4820.0, 70.0, "K"),
            "b.period": inp(12.7381, 0.0004, "d"),
            "b.rv_amplitude": inp(4.1, 0.6, "m/s"),
            "b.transit_depth": inp(1450.0, 60.0, "ppm"),
            "b.impact": inp(0.48, 0.06, "1"),
            "b.eccentricity": inp(0.0, 0.0, "1"),
            "b.albedo": inp(0.3, 0.0, "1"),
            "b.redistribution": inp(1.0, 0.0, "1"),
        },
    },
    {
        "name": "small-rocky-transiting",
        "note": "Invented super-Earth on a 1.8 d circular orbit around an M dwarf; zero albedo.",
        "inputs": {
            "star.mass": inp(0.42, 0.02, "Msun"),
            "star.radius": inp(0.41, 0.015, "Rsun"),
            "star.teff": inp(3580.0, 60.0, "K"),
            "b.period": inp(1.83526, 0.00001, "d"),
            "b.rv_amplitude": inp(2.1, 0.4, "m/s"),
            "b.transit_depth": inp(820.0, 40.0, "ppm"),
            "b.impact": inp(0.25, 0.08, "1"),
            "b.eccentricity": inp(0.0, 0.0, "1"),
            "b.albedo": inp(0.0, 0.0, "1"),
            "b.redistribution": inp(1.0, 0.0, "1"),
        },
    },
    {
        "name": "rv-only-eccentric",
        "note": "Invented non-transiting giant on a 413 d eccentric orbit around a Sun-like star: "
        "only minimum mass, semi-major axis, insolation (at distance a) and Teq can be derived.",
        "inputs": {
            "star.mass": inp(1.05, 0.05, "Msun"),
            "star.radius": inp(1.02, 0.04, "Rsun"),
            "star.teff": inp(5780.0, 70.0, "K"),
            "b.period": inp(412.6, 1.8, "d"),
            "b.rv_amplitude": inp(38.5, 1.5, "m/s"),
            "b.eccentricity": inp(0.31, 0.04, "1"),
            "b.albedo": inp(0.3, 0.0, "1"),
            "b.redistribution": inp(1.0, 0.0, "1"),
        },
    },
]

# The star's mass or radius missing: a transit's a/R* and the period give the star's density
# (Seager & Mallen-Ornelas 2003 eq. 9, the planet's mass neglected), and the density with the
# other of mass and radius gives the missing one; a = (a/R*) R*. Both invented.
DENSITY_CASES = [
    {
        "name": "transit-density-gives-the-mass",
        "note": "Invented hot giant whose host has a radius and Teff but no mass: the mass "
        "follows from the transit's stellar density, M* = 4/3 pi rho* R*^3.",
        "inputs": {
            "star.radius": inp(0.92, 0.03, "Rsun"),
            "star.teff": inp(5400.0, 80.0, "K"),
            "b.period": inp(3.2145, 0.0001, "d"),
            "b.scaled_semi_major_axis": inp(9.1, 0.3, "1"),
            "b.rv_amplitude": inp(85.0, 5.0, "m/s"),
            "b.eccentricity": inp(0.0, 0.0, "1"),
        },
    },
    {
        "name": "transit-density-gives-the-radius",
        "note": "Invented hot giant whose host has a mass and Teff but no radius: the radius "
        "follows from the transit's stellar density, R* = (3 M* / (4 pi rho*))^(1/3).",
        "inputs": {
            "star.mass": inp(0.80, 0.04, "Msun"),
            "star.teff": inp(5400.0, 80.0, "K"),
            "b.period": inp(3.2145, 0.0001, "d"),
            "b.scaled_semi_major_axis": inp(9.1, 0.3, "1"),
            "b.rv_amplitude": inp(85.0, 5.0, "m/s"),
            "b.eccentricity": inp(0.0, 0.0, "1"),
        },
    },
]


def read_inputs(inputs):
    """SI values, with an uncertainty where sigma > 0 (each input its own variable)."""
    x = {}
    for key, spec in inputs.items():
        si_unit = INPUT_SI[key]
        val = to_si(spec["value"], spec["unit"], si_unit)
        sig = to_si(spec["sigma"], spec["unit"], si_unit)
        x[key] = ufloat(val, sig, key) if spec["sigma"] > 0 else val
    return x


def expected_of(out):
    """The outputs in OUTPUT_SI order, as the test reads them."""
    expected = {}
    for key in OUTPUT_SI:
        if key in out:
            v = out[key]
            expected[key] = {"si": _nominal(v), "sigma_si": _std(v), "si_unit": OUTPUT_SI[key]}
    return expected


def derive_density(inputs):
    x = read_inputs(inputs)
    period, ars = x["b.period"], x["b.scaled_semi_major_axis"]
    k_amp, ecc, teff = x["b.rv_amplitude"], x["b.eccentricity"], x["star.teff"]
    rho = 3 * PI * ars**3 / (G * period**2)
    out = {"star.density": rho}
    if "star.mass" in x:
        mstar = x["star.mass"]
        rstar = (3 * mstar / (4 * PI * rho)) ** (1.0 / 3.0)
        out["star.radius"] = rstar
    else:
        rstar = x["star.radius"]
        mstar = 4.0 / 3.0 * PI * rstar**3 * rho
        out["star.mass"] = mstar
        # a = (a/R*) R* is the value shown only where no Kepler route fills it first.
        out["b.semi_major_axis"] = ars * rstar
    out["star.luminosity"] = 4 * PI * rstar**2 * SIGMA_SB * teff**4
    out["star.log_g"] = umath.log10(G * mstar / rstar**2 * 100.0)
    out["b.min_mass"] = mass_from_k(k_amp, period, mstar, ecc)
    return expected_of(out)


def derive(inputs):
    x = read_inputs(inputs)

    mstar, rstar, teff = x["star.mass"], x["star.radius"], x["star.teff"]
    period, k_amp, ecc = x["b.period"], x["b.rv_amplitude"], x["b.eccentricity"]
    albedo, redist = x["b.albedo"], x["b.redistribution"]

    out = {}
    # Star
    lum = 4 * PI * rstar**2 * SIGMA_SB * teff**4
    out["star.luminosity"] = lum
    out["star.log_g"] = umath.log10(G * mstar / rstar**2 * 100.0)  # m/s^2 -> cm/s^2
    out["star.density"] = mstar / (4.0 / 3.0 * PI * rstar**3)

    # Orbit and minimum mass
    msini = mass_from_k(k_amp, period, mstar, ecc)
    a = (G * (mstar + msini) * period**2 / (4 * PI**2)) ** (1.0 / 3.0)
    out["b.min_mass"] = msini
    out["b.semi_major_axis"] = a
    out["b.insolation"] = lum / (4 * PI * a**2)
    out["b.teq"] = teff * (rstar / (2 * a)) ** 0.5 * (redist * (1 - albedo)) ** 0.25

    # Transit quantities
    if "b.transit_depth" in x:
        k = x["b.transit_depth"] ** 0.5
        rp = k * rstar
        incl = umath.acos(x["b.impact"] * rstar / a)
        mp = mass_from_k(k_amp, period, mstar, ecc, umath.sin(incl))
        out["b.radius_ratio"] = k
        out["b.radius"] = rp
        out["b.inclination"] = incl
        out["b.mass"] = mp
        out["b.density"] = mp / (4.0 / 3.0 * PI * rp**3)
        out["b.surface_gravity"] = G * mp / rp**2

    return expected_of(out)


def make_derivations():
    cases = []
    for case, how in [(c, derive) for c in CASES] + [(c, derive_density) for c in DENSITY_CASES]:
        cases.append(
            {
                "name": case["name"],
                "note": case["note"],
                "inputs": case["inputs"],
                "expected": how(case["inputs"]),
            }
        )
    return {
        "generator": GENERATOR,
        "source": SOURCE,
        "conventions": {
            "propagation": "first-order (linear), independent symmetric inputs; sigma 0 = exact",
            "constants": "treated as exact",
            "semi_major_axis": "a = (G (M* + m) P^2 / 4 pi^2)^(1/3), m = minimum mass",
            "min_mass": "exact root of K = (2 pi G/P)^(1/3) m (M*+m)^(-2/3) (1-e^2)^(-1/2)",
            "mass": "exact root of K = (2 pi G/P)^(1/3) Mp sin i (M*+Mp)^(-2/3) (1-e^2)^(-1/2)",
            "radius_ratio": "k = sqrt(depth), no limb darkening",
            "inclination": "cos i = b R*/a",
            "teq": "Teff sqrt(R*/(2a)) (f (1-A))^(1/4)",
            "insolation": "L*/(4 pi a^2)",
            "star.log_g": "log10(G M*/R*^2 in cm s^-2)",
            "star.density": "M*/(4/3 pi R*^3); without M* or R*: 3 pi (a/R*)^3 / (G P^2), "
            "and M* = 4/3 pi rho R*^3 or R* = (3 M*/(4 pi rho))^(1/3)",
        },
        "cases": cases,
    }


def write(name, data):
    path = os.path.join(HERE, name)
    with open(path, "w", encoding="utf-8") as fh:
        json.dump(data, fh, indent=2, ensure_ascii=False)
        fh.write("\n")
    print("wrote", path)


if __name__ == "__main__":
    write("units.json", make_units())
    write("derivations.json", make_derivations())
