#!/usr/bin/env python3
"""Write reference fixtures for the pipe-dimension and roughness tables of lossledger.

Run offline (no network needed):

    python3 scripts/reference/pipes.py

Requires the general-purpose reference library `fluids` 1.3.1. Writes:

* fixtures/reference/pipe_asme.csv       every (NPS, schedule) pair that `fluids.piping.schedule_lookup`
                                          holds for ASME B36.10M-2004 ('10'..'160', 'STD', 'XS', 'XXS',
                                          and '5') and ASME B36.19M-2004 ('5S', '10S', '40S', '80S');
                                          DN from fluids' own B36.19M DN arrays (SS5DN, SS10DN, SS40DN, SS80DN).
* fixtures/reference/pipe_roughness.csv  the roughness values of `fluids.friction._roughness` (values of
                                          Moody 1944 converted to metres), `fluids.friction._Farshad_roughness`
                                          (Farshad & Rieke 2006, average values) and
                                          `fluids.friction.HHR_roughness` (Idel'chik & Ginevskii 2007, min/max/avg).

The Rust tests read these CSVs; the test suite itself needs no Python.
"""
import csv
import os

import fluids
import fluids.friction as friction
import fluids.piping as piping

assert fluids.__version__ == "1.3.1", fluids.__version__

HERE = os.path.dirname(os.path.abspath(__file__))
OUT = os.path.join(HERE, "..", "..", "fixtures", "reference")

ASME_10M = ["10", "20", "30", "40", "60", "80", "100", "120", "140", "160", "STD", "XS", "XXS", "5"]
ASME_19M = ["5S", "10S", "40S", "80S"]


def dn_map():
    """NPS -> DN from fluids' B36.19M arrays (the same DN/NPS pairs as ASME B36.10M Table 1)."""
    out = {}
    for nps, dn in [
        (piping.NPSS5, piping.SS5DN),
        (piping.NPSS10, piping.SS10DN),
        (piping.NPSS40, piping.SS40DN),
        (piping.NPSS80, piping.SS80DN),
    ]:
        for n, d in zip(nps, dn):
            out[float(n)] = int(d)
    return out


def write_asme():
    dns = dn_map()
    path = os.path.join(OUT, "pipe_asme.csv")
    rows = 0
    with open(path, "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["standard", "schedule", "nps_in", "dn", "od_m", "wall_m", "id_m"])
        for std, names in [("ASME B36.10M", ASME_10M), ("ASME B36.19M", ASME_19M)]:
            for name in names:
                nps_list = piping.schedule_lookup[name][0]
                for nps in nps_list:
                    nps = float(nps)
                    # nearest_pipe is the library's public look-up (values in metres).
                    nps_out, di, do, t = piping.nearest_pipe(NPS=nps, schedule=name)
                    assert nps_out == nps
                    dn = dns.get(nps, "")
                    w.writerow([std, name, repr(nps), dn, repr(do), repr(t), repr(di)])
                    rows += 1
    print(f"wrote {rows} rows to {path}")


def write_roughness():
    path = os.path.join(OUT, "pipe_roughness.csv")

    def num(v):
        return "" if v is None else repr(float(v))

    with open(path, "w", newline="") as f:
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["table", "name", "epsilon_m", "min_m", "max_m"])
        # Single values (no source named in fluids; they are Moody 1944's values in metres).
        for name, eps in friction._roughness.items():
            w.writerow(["fluids.friction._roughness", name, num(eps), "", ""])
        # Farshad & Rieke 2006 average values (the coefficients A, B are not needed).
        for name, (eps, _a, _b) in friction._Farshad_roughness.items():
            w.writerow(["fluids.friction._Farshad_roughness", name, num(eps), "", ""])
        # Idel'chik & Ginevskii 2007 (Handbook of Hydraulic Resistance): (min, max, average).
        for name, (lo, hi, avg) in friction.HHR_roughness.items():
            w.writerow(["fluids.friction.HHR_roughness", name, num(avg), num(lo), num(hi)])
    print(f"wrote {path}")


if __name__ == "__main__":
    write_asme()
    write_roughness()
