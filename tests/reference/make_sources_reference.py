"""Reference values for combining several published values of one quantity.

The inverse-variance weighted mean, its uncertainty 1/sqrt(sum w), chi2 about the mean, the
Birge ratio sqrt(chi2 / (n - 1)) (Birge 1932, Phys. Rev. 40, 207) and the uncertainty scaled up
by that ratio when it exceeds 1 (the scale-factor procedure of the Particle Data Group's
reviews, "Introduction: averaging" section), computed with numpy in vectorised form,
independently of Syzygy's loop. The points are invented.

Run: python3 make_sources_reference.py > sources.json
"""
import json

import numpy as np

cases = [
    # Two consistent periods (days): Birge ratio below 1, no scaling.
    ("consistent", [(10.0021, 0.0005), (10.0019, 0.0004)]),
    # Three radii (Earth radii) that disagree: Birge ratio above 1, scaled.
    ("discrepant", [(2.31, 0.05), (2.52, 0.04), (2.40, 0.10)]),
    # Unequal uncertainties, four masses (Earth masses).
    ("four", [(5.1, 0.9), (6.3, 0.4), (5.8, 0.6), (7.0, 1.5)]),
]

out = []
for name, pts in cases:
    x = np.array([p[0] for p in pts])
    s = np.array([p[1] for p in pts])
    w = 1.0 / s**2
    mean = float(np.average(x, weights=w))
    sigma = float(1.0 / np.sqrt(w.sum()))
    chi2 = float(np.sum(w * (x - mean) ** 2))
    birge = float(np.sqrt(chi2 / (len(x) - 1)))
    scaled = sigma * birge if birge > 1 else sigma
    out.append(
        {
            "name": name,
            "points": pts,
            "mean": mean,
            "sigma": sigma,
            "chi2": chi2,
            "birge": birge,
            "scaled_sigma": scaled,
        }
    )

print(json.dumps({"numpy": np.__version__, "cases": out}, indent=2))
