#!/usr/bin/env python3
"""Reference Darcy friction factors for lossledger's tests.

Source library: fluids 1.3.1 (pip install fluids==1.3.1), run
offline. Writes (relative to the repository root):

fixtures/reference/friction_colebrook.csv
  Grid: 21 Reynolds numbers log-spaced 4e3..1e8 x relative roughness
  {0, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.05}.
  f_fluids = fluids.friction.friction_factor(Re, eD, Method='Colebrook'), which calls
             fluids.friction.Colebrook(Re, eD): the closed-form Lambert-W solution of the
             Colebrook-White equation in double precision.
  f_secant = fluids.friction.Colebrook(Re, eD, tol=1e-14): fluids' numerical solution of the
             implicit equation (secant iteration from the Clamond start), a second path
             independent of the Lambert-W closed form.
  Note: fluids' "bit-correct" mpmath path Colebrook(Re, eD, tol=0) is deliberately not used:
  on this grid it differs from both double-precision paths by up to 2.5e-11 relative at
  eD = 0.05, Re = 1e8 (the Lambert-W form cancels ln(10) eD Re against 18.574 W), and a
  40-digit root-finding check of the implicit equation sides with the double-precision paths.

fixtures/reference/friction_rough.csv
  Relative roughness {1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.05, 0.1}.
  f_re1e20 = fluids.friction.Colebrook(1e20, eD, tol=1e-14): fluids' numerical (secant)
             solution of Colebrook-White at Re = 1e20, which is the fully rough limit to about
             1e-12 relative (the 2.51/(Re sqrt f) term is then negligible). The mpmath exact
             path (tol=0) is NOT used here: at Re = 1e20 its 50-digit Lambert-W evaluation
             loses all accuracy (cancellation), giving wrong values.
  f_re1e12 = fluids.friction.friction_factor(1e12, eD, Method='Colebrook') (double precision).

fixtures/reference/friction_head.csv
  A few pipe cases (density, velocity, diameter, viscosity, friction factor, length):
  re_fluids   = fluids.core.Reynolds(V=v, D=D, rho=rho, mu=mu)
  head_fluids = fluids.core.head_from_K(K=fluids.core.K_from_f(fd=f, L=L, D=D), V=v)
                (Darcy-Weisbach, g = 9.80665 m/s^2 in fluids)

Usage: python3 scripts/reference/friction.py
"""

import csv
import math
import pathlib

import fluids
from fluids.core import K_from_f, Reynolds, head_from_K
from fluids.friction import Colebrook, friction_factor

assert fluids.__version__ == "1.3.1", fluids.__version__

OUT_DIR = pathlib.Path(__file__).resolve().parents[2] / "fixtures" / "reference"
ROUGHNESS = [0.0, 1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.05]
ROUGH_LIMIT = [1e-6, 1e-5, 1e-4, 1e-3, 1e-2, 0.05, 0.1]
N_RE = 21
# density kg/m3, velocity m/s, diameter m, viscosity Pa.s, Darcy factor, length m
HEAD_CASES = [
    (998.2, 1.5, 0.1023, 1.0016e-3, 0.0195, 100.0),
    (1000.0, 0.3, 0.0266, 1.3e-3, 0.035, 12.5),
    (965.3, 2.8, 0.3048, 3.15e-4, 0.0142, 850.0),
    (850.0, 0.05, 0.05, 0.05, 0.9, 3.0),
    (1025.0, 3.2, 0.6, 1.08e-3, 0.011, 2500.0),
]


def reynolds_grid() -> list[float]:
    lo, hi = math.log10(4e3), 8.0
    return [10.0 ** (lo + (hi - lo) * i / (N_RE - 1)) for i in range(N_RE)]


def main() -> None:
    OUT_DIR.mkdir(parents=True, exist_ok=True)
    path = OUT_DIR / "friction_colebrook.csv"
    with path.open("w", newline="") as fh:
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["re", "relative_roughness", "f_fluids", "f_secant"])
        for ed in ROUGHNESS:
            for re in reynolds_grid():
                f_fluids = float(friction_factor(re, ed, Method="Colebrook"))
                f_secant = float(Colebrook(re, ed, tol=1e-14))
                w.writerow([repr(re), repr(ed), repr(f_fluids), repr(f_secant)])
    print(f"wrote {path}")

    path = OUT_DIR / "friction_rough.csv"
    with path.open("w", newline="") as fh:
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["relative_roughness", "f_re1e20", "f_re1e12"])
        for ed in ROUGH_LIMIT:
            f20 = float(Colebrook(1e20, ed, tol=1e-14))
            f12 = float(friction_factor(1e12, ed, Method="Colebrook"))
            w.writerow([repr(ed), repr(f20), repr(f12)])
    print(f"wrote {path}")

    path = OUT_DIR / "friction_head.csv"
    with path.open("w", newline="") as fh:
        w = csv.writer(fh, lineterminator="\n")
        w.writerow(["density_kg_m3", "velocity_m_s", "diameter_m", "viscosity_pa_s", "factor",
                    "length_m", "re_fluids", "head_fluids_m"])
        for rho, v, d, mu, f, length in HEAD_CASES:
            re = float(Reynolds(V=v, D=d, rho=rho, mu=mu))
            head = float(head_from_K(K=K_from_f(fd=f, L=length, D=d), V=v))
            w.writerow([repr(rho), repr(v), repr(d), repr(mu), repr(f), repr(length), repr(re),
                        repr(head)])
    print(f"wrote {path}")


if __name__ == "__main__":
    main()
