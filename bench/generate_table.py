#!/usr/bin/env python3
"""Write an invented table for timing `syz import`, with its mapping file.

Usage: generate_table.py [ROWS] DIR      (ROWS defaults to 100000)

Writes DIR/table.csv (one planet per row; 1-3 planets per invented system "Synthetic
000001", ...; the star repeated on each of its planets' rows, as survey tables do; asymmetric
mass errors with a negative lower error, some upper limits, some empty cells, one of two
invented papers per row) and DIR/table.toml. Seeded, so the same ROWS gives the same table.
"""
import os
import random
import sys

SEED = 20261202


def main():
    args = sys.argv[1:]
    rows = int(args[0]) if len(args) == 2 else 100000
    out = args[-1]
    os.makedirs(out, exist_ok=True)
    rng = random.Random(SEED)
    with open(os.path.join(out, "table.csv"), "w") as f:
        f.write("system,star,planet,m_star,m_star_err,r_star,r_star_err,teff,teff_err,"
                "period,period_err,m_p,m_p_up,m_p_down,m_p_flag,r_p,r_p_err,paper\n")
        n, system = 0, 0
        while n < rows:
            system += 1
            name = f"Synthetic {system:06d}"
            ms = rng.uniform(0.6, 1.3)
            rs = ms ** 0.8
            teff = 5772 * ms ** 0.5
            period = rng.uniform(1.5, 8.0)
            for letter in "bcd"[: rng.randint(1, 3)]:
                if n >= rows:
                    break
                n += 1
                mp = rng.uniform(0.02, 3.0)
                limit = rng.random() < 0.1
                r_p = "" if rng.random() < 0.3 else f"{rng.uniform(0.2, 1.4):.3f}"
                r_p_err = "" if not r_p else f"{rng.uniform(0.01, 0.05):.3f}"
                paper = rng.choice(["Quillon et al. 2031, invented", "Marrow & Vey 2033, invented"])
                f.write(
                    f"{name},{name},{name} {letter},{ms:.3f},0.03,{rs:.3f},0.02,{teff:.0f},80,"
                    f"{period:.5f},0.0001,{mp:.3f},"
                    + ("," if limit else f"{mp * 0.08:.3f},-{mp * 0.07:.3f}")
                    + f",{'<' if limit else ''},{r_p},{r_p_err},\"{paper}\"\n"
                )
                period *= rng.uniform(2.6, 4.0)
    with open(os.path.join(out, "table.toml"), "w") as f:
        f.write("""[bodies]
system = "system"
star = "star"
planet = "planet"

[refs]
text = ["paper"]

[star.mass]
value = "m_star"
unit = "Msun"
error = "m_star_err"

[star.radius]
value = "r_star"
unit = "Rsun"
error = "r_star_err"

[star.teff]
value = "teff"
unit = "K"
error = "teff_err"

[planet.period]
value = "period"
unit = "d"
error = "period_err"

[planet.mass]
value = "m_p"
unit = "Mjup"
above = "m_p_up"
below = "m_p_down"
limit = "m_p_flag"

[planet.radius]
value = "r_p"
unit = "Rjup"
error = "r_p_err"
""")


if __name__ == "__main__":
    main()
