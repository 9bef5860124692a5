"""Read a VOTable written by `syz eval --format votable` with astropy's VOTable parser (a
general-purpose reader from outside the project) and print, as JSON, what it found: each
FIELD's name, datatype, UCD, the unit astropy understood and that unit's size in SI, and every
row of every table. tests/tests/votable.rs compares this record with syz's own numbers.

    python3 tests/reference/read_votable.py tests/reference/examples.vot > tests/reference/examples.vot.json
"""
import json
import sys
import warnings

import astropy
import astropy.units as u
import numpy as np
from astropy.io.votable import parse


def si_scale(unit):
    """The SI value of one of `unit`, or None when astropy has no unit for the FIELD."""
    if unit is None:
        return None
    return float(u.Unit(unit).decompose().scale)


def cell(v):
    if v is np.ma.masked or v is None:
        return None
    if isinstance(v, (bytes, str)):
        return v.decode() if isinstance(v, bytes) else str(v)
    f = float(v)
    return None if np.isnan(f) else f


def main(path):
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always")
        doc = parse(path, verify="warn")
    out = {
        "generator": {"astropy": astropy.__version__, "numpy": np.__version__},
        "warnings": [str(w.message) for w in caught],
        "tables": [],
    }
    for resource in doc.resources:
        for table in resource.tables:
            fields = [
                {
                    "name": f.name,
                    "datatype": f.datatype,
                    "ucd": f.ucd,
                    "unit": None if f.unit is None else str(f.unit),
                    "si": si_scale(f.unit),
                }
                for f in table.fields
            ]
            data = table.to_table()
            rows = [[cell(row[f["name"]]) for f in fields] for row in data]
            out["tables"].append({"name": table.name, "fields": fields, "rows": rows})
    json.dump(out, sys.stdout, indent=1)
    print()


if __name__ == "__main__":
    main(sys.argv[1])
