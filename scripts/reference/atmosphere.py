#!/usr/bin/env python3
"""Reference pressures of the standard atmosphere for lossledger's NPSH tests.

Writes fixtures/reference/atmosphere_1976.csv (relative to the repository root).

Source library: fluids 1.3.1 (pip install fluids==1.3.1), run offline.

Columns, per geometric elevation z_m (m above mean sea level):
  pressure_pa   fluids.atmosphere.ATMOSPHERE_1976(Z=z_m).P
                (U.S. Standard Atmosphere 1976, which is identical to the ISO 2533:1975
                standard atmosphere below 32 km)

Usage: python3 scripts/reference/atmosphere.py   (from the repository root or anywhere)
"""

import csv
import pathlib

import fluids
from fluids.atmosphere import ATMOSPHERE_1976

assert fluids.__version__ == "1.3.1", fluids.__version__

OUT = pathlib.Path(__file__).resolve().parents[2] / "fixtures" / "reference" / "atmosphere_1976.csv"


def main() -> None:
    OUT.parent.mkdir(parents=True, exist_ok=True)
    with OUT.open("w", newline="") as fh:
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["z_m", "pressure_pa"])
        for z in [-500.0, 0.0, 500.0, 1000.0, 1500.0, 2000.0, 3000.0, 4500.0]:
            w.writerow([repr(z), repr(ATMOSPHERE_1976(Z=z).P)])


if __name__ == "__main__":
    main()
