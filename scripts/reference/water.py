#!/usr/bin/env python3
"""Reference properties of liquid water for lossledger's tests.

Writes fixtures/reference/water_iapws.csv (relative to the repository root).

Source library: iapws 1.5.5 (pip install iapws==1.5.5), run offline.

Columns, per temperature t_c (degrees Celsius, T = t_c + 273.15 K):
  density_kg_m3        iapws.IAPWS97(T=T, P=0.101325).rho
                       (IAPWS-IF97 region 1 at 101.325 kPa)
  viscosity_pa_s       iapws.IAPWS97(T=T, P=0.101325).mu, which iapws computes as
                       iapws._iapws._Viscosity(rho_IF97, T): the IAPWS 2008 viscosity
                       formulation without the critical enhancement (negligible here)
  vapour_pressure_pa   iapws.IAPWS97(T=T, x=0).P * 1e6
                       (IAPWS-IF97 region 4 saturation-pressure equation)
  density_iapws95_kg_m3  iapws.IAPWS95(T=T, P=0.101325).rho
                       (IAPWS-95 scientific formulation, a second independent check)

Usage: python3 scripts/reference/water.py   (from the repository root or anywhere)
"""

import csv
import pathlib

import iapws
from iapws import IAPWS95, IAPWS97

assert iapws.__version__ == "1.5.5", iapws.__version__

P_MPA = 0.101325
OUT = pathlib.Path(__file__).resolve().parents[2] / "fixtures" / "reference" / "water_iapws.csv"


def main() -> None:
    temps = [0.01] + [float(t) for t in range(1, 100)]
    OUT.parent.mkdir(parents=True, exist_ok=True)
    with OUT.open("w", newline="") as fh:
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["t_c", "density_kg_m3", "viscosity_pa_s", "vapour_pressure_pa",
                    "density_iapws95_kg_m3"])
        for t_c in temps:
            t_k = t_c + 273.15
            liquid = IAPWS97(T=t_k, P=P_MPA)
            assert liquid.region == 1, (t_c, liquid.region)
            sat = IAPWS97(T=t_k, x=0)
            sci = IAPWS95(T=t_k, P=P_MPA)
            w.writerow([repr(t_c), repr(float(liquid.rho)), repr(float(liquid.mu)), repr(float(sat.P) * 1e6),
                        repr(float(sci.rho))])
    print(f"wrote {OUT} ({len(temps)} rows)")


if __name__ == "__main__":
    main()
