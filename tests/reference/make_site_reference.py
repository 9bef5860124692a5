"""Altitudes of an invented star and of the Sun from an invented site, computed with
astropy, for lang/tests/site.rs.

Runs offline: IERS downloads are off and astropy's bundled IERS-B table gives UT1 - UTC
(times past its end fall back to UT1 = UTC with a warning, which the record notes).
Altitudes are geometric (pressure 0: no refraction), as Syzygy computes them.

    python3 tests/reference/make_site_reference.py   # writes tests/reference/site.json
"""

import json
import pathlib
import sys
import warnings

import astropy
import numpy
from astropy import units as u
from astropy.coordinates import AltAz, EarthLocation, SkyCoord, get_sun
from astropy.time import Time
from astropy.utils import iers

iers.conf.auto_download = False
iers.conf.auto_max_age = None
iers.conf.iers_degraded_accuracy = "warn"

# Invented star and site (no real object or observatory).
STAR = {"ra_deg": 201.3472, "dec_deg": -12.04}
SITE = {"latitude_deg": 28.76, "longitude_deg": -17.88, "elevation_m": 2300.0}
TIMES = [
    "2024-03-20T00:00:00",
    "2025-06-21T04:30:00",
    "2026-01-15T22:10:00",
    "2026-09-02T12:00:00",
    "2027-04-11T01:45:00",
    "2027-12-30T19:20:00",
    "2028-07-07T06:00:00",
]

loc = EarthLocation.from_geodetic(
    lon=SITE["longitude_deg"] * u.deg,
    lat=SITE["latitude_deg"] * u.deg,
    height=SITE["elevation_m"] * u.m,
)
star = SkyCoord(ra=STAR["ra_deg"] * u.deg, dec=STAR["dec_deg"] * u.deg, frame="icrs")
rows = []
with warnings.catch_warnings(record=True) as caught:
    warnings.simplefilter("always")
    for iso in TIMES:
        t = Time(iso, scale="utc")
        frame = AltAz(obstime=t, location=loc, pressure=0 * u.hPa)
        rows.append(
            {
                "utc": iso + "Z",
                "jd_utc": float(t.jd),
                "star_altitude_deg": float(star.transform_to(frame).alt.deg),
                "sun_altitude_deg": float(get_sun(t).transform_to(frame).alt.deg),
                "gmst_deg": float(t.sidereal_time("mean", "greenwich", model="IAU2006").deg),
            }
        )
    notes = sorted({str(w.message).splitlines()[0] for w in caught})

out = {
    "generated_by": "tests/reference/make_site_reference.py",
    "python": sys.version.split()[0],
    "astropy": astropy.__version__,
    "numpy": numpy.__version__,
    "iers": "bundled IERS-B table, no download; pressure 0 (no refraction)",
    "warnings": notes,
    "star": STAR,
    "site": SITE,
    "rows": rows,
}
path = pathlib.Path(__file__).with_name("site.json")
path.write_text(json.dumps(out, indent=2) + "\n")
print(f"wrote {path}")
