#!/usr/bin/env python3
"""Reference values for the fitting (minor loss) models, written as committed CSV fixtures.

Run offline from the repository root:  python3 scripts/reference/fittings.py
Needs the general-purpose reference library `fluids` 1.3.1 (pip). The Rust tests
(tests/fittings.rs) read the CSVs only, so the test suite needs no Python.

Outputs (fixtures/reference/):
  fittings_kfactor.csv  Darby 3-K and Hooper 2-K entries at two sizes and two Re
                        (fluids.fittings.Darby3K / Hooper2K by fluids' own entry names)
  fittings_methods.csv  bends, mitres, diffusers, contractions, entrances, exit, orifice
                        plate, each against the fluids function of the same published method
  fittings_le_d.csv     Le/D -> K with the fully rough factor (fluids.friction.von_Karman)
  fittings_kv.csv       Kv->K and Cv->K (fluids.fittings.Kv_to_K / Cv_to_K)
  fittings_foot_valve.csv
                        foot valves with strainer, poppet and hinged disc, at NPS 1/2..24
                        schedule 40 bores (fluids.fittings.K_foot_valve_Crane, its own f_T)
  fittings_entrance_wall.csv
                        projecting entrance with the wall of the pipe's schedule
                        (fluids.piping.nearest_pipe for bore and wall, then
                        fluids.fittings.entrance_distance(method='Rennels'))
"""
import csv
import math
import os

import fluids
from fluids import fittings as ff
from fluids import flow_meter as fm
from fluids.friction import Clamond

assert fluids.__version__ == "1.3.1", fluids.__version__
V = "fluids " + fluids.__version__

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "..", "fixtures", "reference")
INCH = 0.0254

# Our catalogue ids -> fluids' entry names (Darby 3-K).
DARBY = {
    "elbow-90": "Elbow, 90°, flanged, welded, bends, (r/D = 1)",
    "elbow-90-long": "Elbow, 90°, threaded, long radius, (r/D = 1.5)",
    "elbow-90-threaded": "Elbow, 90°, threaded, standard, (r/D = 1)",
    "elbow-45": "Elbow, 45°, long radius, (r/D = 1.5)",
    "elbow-45-threaded": "Elbow, 45°, threaded standard, (r/D = 1)",
    "elbow-180": "Elbow, 180°, flanged, (r/D = 1)",
    "elbow-180-long": "Elbow, 180°, all, (r/D = 1.5)",
    "elbow-180-threaded": "Elbow, 180°, threaded, close-return bend, (r/D = 1)",
    "bend-90-2d": "Elbow, 90°, (r/D = 2)",
    "bend-90-4d": "Elbow, 90°, (r/D = 4)",
    "bend-90-6d": "Elbow, 90°, (r/D = 6)",
    "mitre-90-1weld": "Elbow, 90°, mitered, 1 weld, (90°)",
    "mitre-90-2weld": "Elbow, 90°, 2 welds, (45°)",
    "mitre-90-3weld": "Elbow, 90°, 3 welds, (30°)",
    "mitre-45-1weld": "Elbow, 45°, mitered, 1 weld, (45°)",
    "mitre-45-2weld": "Elbow, 45°, mitered, 2 welds, (22.5°)",
    "tee-run": "Tee, Run-through, flanged, (r/D = 1)",
    "tee-run-threaded": "Tee, Run-through, threaded, (r/D = 1)",
    "tee-run-stub-in": "Tee, Run-through, stub-in branch",
    "tee-branch": "Tee, Through-branch, (as elbow), flanged, (r/D = 1)",
    "tee-branch-threaded": "Tee, Through-branch, (as elbow), threaded, (r/D = 1)",
    "tee-branch-swept": "Tee, Through-branch,(as elbow), (r/D = 1.5)",
    "tee-branch-stub-in": "Tee, Through-branch, (as elbow), stub-in branch",
    "valve-gate": "Valve, Gate valve, standard, β = 1",
    "valve-globe": "Valve, Globe valve, standard, β = 1",
    # Darby gives one standard globe valve; the seat types differ only when partly open.
    "valve-globe-bevel-seat": "Valve, Globe valve, standard, β = 1",
    "valve-globe-composition-seat": "Valve, Globe valve, standard, β = 1",
    "valve-globe-y": "Valve, Angle valve, 45°, full line size, β = 1",
    "valve-angle": "Valve, Angle valve, 90°, full line size, β = 1",
    "valve-ball": "Valve, Ball valve, standard, β = 1",
    "valve-plug": "Valve, Plug valve, straight through",
    "valve-plug-branch": "Valve, Plug valve, branch flow",
    "valve-plug-3way-run": "Valve, Plug valve, three-way (flow through)",
    "valve-diaphragm": "Valve, Diaphragm, dam type",
    "check-swing": "Valve, Swing check",
    "check-lift": "Valve, Lift check",
}

# Our catalogue ids -> fluids' entry names (Hooper 2-K), where Darby has no entry.
HOOPER = {
    "mitre-90-4weld": "Elbow, 90°, Mitered (R/D = 1.5), 4 weld (22.5° angle)",
    "mitre-90-5weld": "Elbow, 90°, Mitered (R/D = 1.5), 5 weld (18° angle)",
    "valve-butterfly": "Valve, Butterfly,",
    "valve-ball-reduced": "Valve, Ball, Reduced trim, Beta = 0.9",
    "valve-plug-reduced": "Valve, Plug, Reduced trim, Beta = 0.8",
    "check-tilting-disc": "Valve, Check, Tilting-disc",
}


def write(name, header, rows):
    path = os.path.join(OUT, name)
    with open(path, "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(header)
        for r in rows:
            w.writerow(["" if x is None else (repr(x) if isinstance(x, float) else x) for x in r])
    print(f"wrote {len(rows)} rows to {os.path.relpath(path)}")


def kfactor_rows():
    rows = []
    # (NPS inches, inside diameter m): NPS 2 and NPS 8 schedule 40 (ASME B36.10M).
    sizes = [(2.0, 0.0525), (8.0, 0.2027)]
    for kid, name in DARBY.items():
        for nps, di in sizes:
            for re in (1.0e4, 1.0e6):
                k = ff.Darby3K(NPS=nps, Re=re, name=name)
                rows.append([kid, "darby", nps, di, re, k, f"{V} fittings.Darby3K(name='{name}')"])
    for kid, name in HOOPER.items():
        for nps, di in sizes:
            for re in (1.0e4, 1.0e6):
                k = ff.Hooper2K(Di=di / INCH, Re=re, name=name)
                rows.append([kid, "hooper", nps, di, re, k,
                             f"{V} fittings.Hooper2K(Di=inside diameter in inches, name='{name}')"])
    return rows


def method_rows():
    # case, id, d_in_m, d_out_m, re_in, rel_rough, bend_radius_d, angle_deg, length_ratio, beta,
    # k_ref, tol_rel, source
    rows = []
    tol = 0.01

    # Bends, Rennels & Hudson (f from Colebrook inside fluids).
    d = 0.1
    for angle in (30.0, 90.0, 180.0):
        for r_d in (1.0, 1.5, 3.0, 5.0):
            for re, rr in ((1e4, 0.0), (1e5, 4.5e-4), (1e6, 1e-4)):
                k = ff.bend_rounded(Di=d, angle=angle, rc=r_d * d, Re=re, roughness=rr * d,
                                    method="Rennels")
                rows.append(["bend", "bend", d, None, re, rr, r_d, angle, None, None, k, tol,
                             f"{V} fittings.bend_rounded(method='Rennels')"])
    # Mitre bends (single joint), Rennels & Hudson.
    for angle in (15.0, 45.0, 90.0, 150.0):
        k = ff.bend_miter(angle=angle, method="Rennels")
        rows.append(["mitre", "mitre-bend", d, None, 1e5, 0.0, None, angle, None, None, k, tol,
                     f"{V} fittings.bend_miter(method='Rennels')"])

    # Sudden expansion: Borda-Carnot, K on the smaller (inlet) bore.
    for d1, d2 in ((0.05, 0.1), (0.08, 0.1), (0.02, 0.1)):
        k = ff.diffuser_sharp(Di1=d1, Di2=d2, method="Rennels")
        rows.append(["expansion", "expansion", d1, d2, 1e5, 0.0, None, None, None, None, k, tol,
                     f"{V} fittings.diffuser_sharp(method='Rennels')"])

    # Conical diffusers, Rennels & Hudson; f at the inlet (smaller) bore.
    for d1, d2 in ((0.05, 0.1), (0.05, 0.12), (0.08, 0.1)):
        for angle in (5.0, 10.0, 20.0, 30.0, 45.0, 60.0, 90.0, 120.0, 180.0):
            re, rr = 1e5, 1e-4
            fd = Clamond(Re=re, eD=rr)
            k = ff.diffuser_conical(Di1=d1, Di2=d2, angle=angle, fd=fd, method="Rennels")
            rows.append(["diffuser", "expansion-tapered", d1, d2, re, rr, None, angle, None, None,
                         k, tol, f"{V} fittings.diffuser_conical(method='Rennels', fd=Clamond(Re, eD) at inlet)"])
    # Reducer used as expander (default 30 deg cone) and as reducer.
    re, rr = 2e5, 2e-4
    k = ff.diffuser_conical(Di1=0.05, Di2=0.1, angle=30.0, fd=Clamond(Re=re, eD=rr), method="Rennels")
    rows.append(["reducer-expanding", "reducer", 0.05, 0.1, re, rr, None, None, None, None, k, tol,
                 f"{V} fittings.diffuser_conical(method='Rennels', angle=30)"])
    re_s, rr_s = re * 0.1 / 0.05, rr * 0.1 / 0.05
    k = ff.contraction_conical(Di1=0.1, Di2=0.05, angle=30.0, fd=Clamond(Re=re_s, eD=rr_s), method="Rennels")
    rows.append(["reducer-contracting", "reducer", 0.1, 0.05, re, rr, None, None, None, None, k, tol,
                 f"{V} fittings.contraction_conical(method='Rennels', angle=30)"])
    k = ff.diffuser_conical(Di1=0.05, Di2=0.1, angle=14.0, fd=Clamond(Re=re, eD=rr), method="Rennels")
    rows.append(["reducer-angle-given", "reducer", 0.05, 0.1, re, rr, None, 14.0, None, None, k, tol,
                 f"{V} fittings.diffuser_conical(method='Rennels', angle=14)"])

    # Contractions, Rennels & Hudson; K on the smaller (outlet) bore.
    for d1, d2 in ((0.1, 0.05), (0.1, 0.08), (0.1, 0.02)):
        k = ff.contraction_sharp(Di1=d1, Di2=d2, method="Rennels")
        rows.append(["contraction", "contraction", d1, d2, 1e5, 0.0, None, None, None, None, k, tol,
                     f"{V} fittings.contraction_sharp(method='Rennels')"])
        for r in (0.02, 0.1, 0.3):
            k = ff.contraction_round(Di1=d1, Di2=d2, rc=r * d2, method="Rennels")
            rows.append(["contraction-radiused", "contraction-radiused", d1, d2, 1e5, 0.0, r, None, None,
                         None, k, tol, f"{V} fittings.contraction_round(method='Rennels')"])
        for angle in (10.0, 30.0, 60.0, 120.0):
            re, rr = 1e5, 1e-4  # at the inlet bore d1
            re_s, rr_s = re * d1 / d2, rr * d1 / d2
            k = ff.contraction_conical(Di1=d1, Di2=d2, angle=angle, fd=Clamond(Re=re_s, eD=rr_s),
                                       method="Rennels")
            rows.append(["contraction-tapered", "contraction-tapered", d1, d2, re, rr, None, angle, None,
                         None, k, tol,
                         f"{V} fittings.contraction_conical(method='Rennels', fd=Clamond at outlet bore)"])

    # Entrances and exit.
    rows.append(["entrance-square-edged", "entrance-square-edged", d, None, 1e5, 0.0, None, None, None, None,
                 ff.entrance_sharp(method="Rennels"), tol, f"{V} fittings.entrance_sharp(method='Rennels')"])
    for r in (0.0, 0.02, 0.05, 0.1, 0.2, 0.5, 1.5):
        k = ff.entrance_rounded(Di=d, rc=r * d, method="Rennels")
        rows.append(["entrance-radiused", "entrance-radiused", d, None, 1e5, 0.0, r, None, None, None, k,
                     tol, f"{V} fittings.entrance_rounded(method='Rennels')"])
    for l_d, angle in ((0.03, 45.0), (0.05, 30.0), (0.1, 45.0), (0.2, 60.0), (0.1, 15.0)):
        k = ff.entrance_beveled(Di=d, l=l_d * d, angle=angle, method="Rennels")
        rows.append(["entrance-chamfered", "entrance-chamfered", d, None, 1e5, 0.0, None, angle, l_d, None, k,
                     tol, f"{V} fittings.entrance_beveled(method='Rennels')"])
    for t_d in (0.0, 0.005, 0.02, 0.05, 0.1):
        k = ff.entrance_distance(Di=d, t=t_d * d, method="Rennels")
        rows.append(["entrance-projecting", "entrance-projecting", d, None, 1e5, 0.0, None, None, t_d, None,
                     k, tol, f"{V} fittings.entrance_distance(method='Rennels')"])
    rows.append(["exit", "exit", d, None, 1e5, 0.0, None, None, None, None, ff.exit_normal(), tol,
                 f"{V} fittings.exit_normal()"])

    # Orifice plate, ISO 5167-2 (Reader-Harris/Gallagher, flange taps) permanent loss as K on D.
    rho, mu, p1 = 1000.0, 1.0e-3, 1.0e8
    for dd in (0.05, 0.1, 0.3):
        for beta in (0.3, 0.5, 0.7):
            for re in (1e5, 1e6):
                do = beta * dd
                vel = re * mu / (rho * dd)
                mdot = rho * vel * math.pi / 4.0 * dd * dd
                c = fm.C_Reader_Harris_Gallagher(D=dd, Do=do, rho=rho, mu=mu, m=mdot, taps="flange")
                p2 = fm.differential_pressure_meter_solver(D=dd, rho=rho, mu=mu, D2=do, P1=p1, m=mdot,
                                                           meter_type="ISO 5167 orifice", taps="flange",
                                                           epsilon_specified=1.0, k=1.4)
                loss = fm.dP_orifice(D=dd, Do=do, P1=p1, P2=p2, C=c)
                k = loss / (0.5 * rho * vel * vel)
                rows.append(["orifice", "orifice-plate", dd, None, re, 0.0, None, None, None, beta, k, 0.005,
                             f"{V} flow_meter.C_Reader_Harris_Gallagher(taps='flange') + "
                             "differential_pressure_meter_solver + dP_orifice"])
    return rows


def le_d_rows():
    from fluids.friction import von_Karman
    rows = []
    for ed in (1e-5, 1e-4, 4.5e-4, 1e-3, 5e-3):
        for le_d in (8.0, 30.0, 340.0):
            rows.append([ed, le_d, von_Karman(ed) * le_d, f"{V} friction.von_Karman(eD) * Le/D"])
    return rows


def kv_rows():
    rows = []
    for kv, dd in ((2.312, 0.015), (100.0, 0.1), (1500.0, 0.3), (35.0, 0.05)):
        rows.append(["kv", kv, dd, ff.Kv_to_K(kv, dd), f"{V} fittings.Kv_to_K"])
    for cv, dd in ((2.7, 0.015), (115.0, 0.1), (1800.0, 0.3), (40.0, 0.05)):
        rows.append(["cv", cv, dd, ff.Cv_to_K(cv, dd), f"{V} fittings.Cv_to_K"])
    return rows


def foot_valve_rows():
    from fluids.piping import nearest_pipe
    rows = []
    for nps in (0.5, 1.0, 2.0, 4.0, 6.0, 8.0, 12.0, 16.0, 24.0):
        _, di, _, _ = nearest_pipe(NPS=nps, schedule="40")
        for style, disc in ((0, "poppet"), (1, "hinged")):
            k = ff.K_foot_valve_Crane(D=di, style=style)
            rows.append([disc, nps, di, k, f"{V} fittings.K_foot_valve_Crane(D, style={style})"])
    return rows


def entrance_wall_rows():
    from fluids.piping import nearest_pipe
    rows = []
    for nps, sch in ((1.0, "40"), (2.0, "40"), (4.0, "40"), (4.0, "80"), (8.0, "40"), (12.0, "40"),
                     (12.0, "10"), (24.0, "40")):
        _, di, do, t = nearest_pipe(NPS=nps, schedule=sch)
        k = ff.entrance_distance(Di=di, t=t, method="Rennels")
        rows.append([nps, sch, do, t, di, k,
                     f"{V} piping.nearest_pipe(NPS, schedule) + fittings.entrance_distance(Di, t, method='Rennels')"])
    return rows


if __name__ == "__main__":
    os.makedirs(OUT, exist_ok=True)
    write("fittings_kfactor.csv", ["id", "model", "nps_in", "d_in_m", "re", "k_ref", "source"], kfactor_rows())
    write("fittings_methods.csv",
          ["case", "id", "d_in_m", "d_out_m", "re_in", "rel_rough", "bend_radius_d", "angle_deg",
           "length_ratio", "beta", "k_ref", "tol_rel", "source"], method_rows())
    write("fittings_le_d.csv", ["rel_rough", "le_d", "k_ref", "source"], le_d_rows())
    write("fittings_kv.csv", ["coefficient", "value", "d_m", "k_ref", "source"], kv_rows())
    write("fittings_foot_valve.csv", ["disc", "nps_in", "d_in_m", "k_ref", "source"], foot_valve_rows())
    write("fittings_entrance_wall.csv",
          ["nps_in", "schedule", "od_m", "wall_m", "d_in_m", "k_ref", "source"], entrance_wall_rows())
