#!/usr/bin/env python3
"""Write an invented catalogue of planetary systems, one `.syz` file per system.

Usage: generate_catalogue.py [N] DIR      (N defaults to 5000)

Every star and planet is made up ("Synthetic 0001", ...). Each system has 1-4 planets
with period ratios of at least 2.5, a mix of transiting planets (with a radial-velocity
amplitude, a transit depth and an impact parameter) and radial-velocity-only planets.
The random generator is seeded, so the same N gives the same files.
"""
import math
import os
import random
import sys

SEED = 20261201

# Nominal constants for building self-consistent inputs (IAU 2015 Resolution B3 nominal
# values; the Jupiter and Earth masses from the same resolution's GM values).
G = 6.67430e-11  # CODATA 2018
MSUN = 1.988409870698051e30
RSUN = 6.957e8
MJUP = 1.8981245973360505e27
MEARTH = 5.972167867791379e24
RJUP = 7.1492e7
REARTH = 6.3781e6
DAY = 86400.0


def star_block(rng, name):
    mass = rng.uniform(0.55, 1.35)
    # A rough main-sequence mass-radius and mass-temperature relation (common practice).
    radius = mass ** 0.8 * rng.uniform(0.92, 1.08)
    teff = 5772.0 * mass ** 0.55 * rng.uniform(0.96, 1.04)
    dist = rng.uniform(15.0, 400.0)
    m_err = mass * rng.uniform(0.03, 0.06)
    lines = [f"  star {name} {{", f"    mass     = {mass:.3f} ± {m_err:.3f} Msun"]
    if rng.random() < 0.4:
        up = radius * rng.uniform(0.02, 0.05)
        lo = radius * rng.uniform(0.02, 0.05)
        lines.append(f"    radius   = {radius:.3f} +{up:.3f}/-{lo:.3f} Rsun")
    else:
        lines.append(f"    radius   = {radius:.3f} ± {radius * rng.uniform(0.02, 0.05):.3f} Rsun")
    lines.append(f"    teff     = {teff:.0f} ± {rng.uniform(50, 120):.0f} K")
    lines.append(f"    distance = {dist:.1f} ± {dist * rng.uniform(0.005, 0.02):.1f} pc")
    lines.append("  }")
    return mass, radius, lines


def planet_mass_radius(rng):
    """An invented planet: mass in kg and radius in m, on a rough mass-radius relation."""
    kind = rng.random()
    if kind < 0.35:
        mp = rng.uniform(3.0, 20.0) * MEARTH
        rp = (mp / MEARTH) ** 0.55 * REARTH * rng.uniform(0.9, 1.1)
    elif kind < 0.6:
        mp = rng.uniform(20.0, 100.0) * MEARTH
        rp = rng.uniform(3.5, 9.0) * REARTH
    else:
        mp = rng.uniform(0.3, 5.0) * MJUP
        rp = rng.uniform(0.85, 1.4) * RJUP
    return mp, rp


def planet_block(rng, letter, host, mstar, rstar, period, transiting):
    mp, rp = planet_mass_radius(rng)
    ecc = 0.0
    if rng.random() < 0.3:
        ecc = rng.uniform(0.02, 0.15)
    a = (G * (mstar * MSUN + mp) * (period * DAY) ** 2 / (4 * math.pi ** 2)) ** (1 / 3)
    a_rs = a / (rstar * RSUN)
    impact = rng.uniform(0.0, 0.7) if transiting else 0.0
    cos_i = impact / (a_rs * (1 - ecc))  # omega = 90 deg
    sin_i = math.sqrt(1 - cos_i ** 2) if transiting else rng.uniform(0.5, 1.0)
    k_amp = ((2 * math.pi * G / (period * DAY)) ** (1 / 3) * mp * sin_i
             / (mstar * MSUN + mp) ** (2 / 3) / math.sqrt(1 - ecc ** 2))
    k_err = max(0.4, k_amp * rng.uniform(0.03, 0.12))
    # Keep every amplitude a clear detection.
    k_amp = max(k_amp, 5 * k_err)
    p_err = period * rng.uniform(2e-6, 2e-5) if transiting else period * rng.uniform(5e-4, 5e-3)
    lines = [f"  planet {letter} orbits {host} {{",
             f"    period        = {period:.6f} ± {p_err:.6f} d",
             f"    rv_amplitude  = {k_amp:.2f} ± {k_err:.2f} m/s"]
    if transiting:
        depth = (rp / (rstar * RSUN)) ** 2 * 100.0
        d_err = depth * rng.uniform(0.02, 0.06)
        if rng.random() < 0.3:
            lines.append(f"    transit_depth = {depth:.5f} +{d_err * 1.2:.5f}/-{d_err * 0.8:.5f} %")
        else:
            lines.append(f"    transit_depth = {depth:.5f} ± {d_err:.5f} %")
        lines.append(f"    impact        = {impact:.3f} ± {rng.uniform(0.03, 0.08):.3f}")
    if ecc > 0:
        lines.append(f"    eccentricity  = {ecc:.3f} ± {max(0.005, ecc * rng.uniform(0.1, 0.3)):.3f}")
    lines.append("  }")
    return lines


def system_text(rng, index):
    name = f"Synthetic {index:04d}"
    host = f"synthetic_{index:04d}"
    mstar, rstar, lines = star_block(rng, host)
    n_planets = rng.choice([1, 1, 2, 2, 3, 4])
    period = rng.uniform(1.2, 12.0)
    body = []
    for j in range(n_planets):
        # Inner planets transit more often; about half the planets transit overall.
        transiting = rng.random() < (0.7 if j == 0 else 0.4)
        body.append("")
        body += planet_block(rng, "bcde"[j], host, mstar, rstar, period, transiting)
        period *= rng.uniform(2.5, 4.0)
    head = [f"# {name}: an invented system for benchmarking. All numbers are made up.",
            "", f'system "{name}" {{']
    return "\n".join(head + lines + body + ["}", ""])


def main(argv):
    if len(argv) == 2:
        n, out = 5000, argv[1]
    elif len(argv) == 3:
        n, out = int(argv[1]), argv[2]
    else:
        sys.exit("usage: generate_catalogue.py [N] DIR")
    if n < 1:
        sys.exit("N must be at least 1")
    os.makedirs(out, exist_ok=True)
    rng = random.Random(SEED)
    for i in range(1, n + 1):
        with open(os.path.join(out, f"synthetic_{i:04d}.syz"), "w", encoding="utf-8") as f:
            f.write(system_text(rng, i))


if __name__ == "__main__":
    main(sys.argv)
