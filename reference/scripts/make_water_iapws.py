#!/usr/bin/env python3
# Reference tables for liquid water and tank heat content from the `iapws` PyPI package.
#
# Library pinned: iapws==1.5.5 (IAPWS97 class, IAPWS-IF97 implementation by J.J. Gomez Romera).
# Run (outside the repo venv):
#   python3 -m venv /work/venv-storage && /work/venv-storage/bin/pip install iapws==1.5.5
#   /work/venv-storage/bin/python reference/scripts/make_water_iapws.py
# Writes reference/water_iapws.csv and reference/storage_tank.csv.
import os

import iapws
from iapws import IAPWS97

assert iapws.__version__ == "1.5.5", iapws.__version__

HERE = os.path.dirname(os.path.abspath(__file__))
REF = os.path.dirname(HERE)
SRC = "iapws 1.5.5 (PyPI) IAPWS97 class"  # no commas: it is a CSV cell


def state(t_c, p_kpa):
    w = IAPWS97(T=t_c + 273.15, P=p_kpa / 1000.0)
    assert w.region == 1, (t_c, p_kpa, w.region)
    return w


# (t_c, p_kpa): storage and loop temperatures at the project's 300 kPa default, plus an
# atmospheric tank, a pressurised 140 degC loop and a hot 200 degC point.
POINTS = [
    (5.0, 300.0),
    (20.0, 101.325),
    (40.0, 300.0),
    (60.0, 300.0),
    (80.0, 300.0),
    (95.0, 300.0),
    (120.0, 500.0),
    (140.0, 1000.0),
    (200.0, 2000.0),
]

with open(os.path.join(REF, "water_iapws.csv"), "w") as f:
    f.write("# Liquid water properties at (t_c, p_kpa) from the iapws PyPI package, version 1.5.5,\n")
    f.write("# IAPWS97 class (IF97 region 1). Made by reference/scripts/make_water_iapws.py.\n")
    f.write("# quantity: rho_kg_m3 (density), cp_j_kgk (isobaric heat capacity), h_kj_kg (enthalpy).\n")
    f.write("# Tolerances: 1e-6 relative; both sides implement the same IF97 equations.\n")
    f.write("t_c,p_kpa,quantity,expected,tolerance,source\n")
    for t_c, p_kpa in POINTS:
        w = state(t_c, p_kpa)
        rho = w.rho
        cp = w.cp * 1000.0
        h = w.h
        f.write(f"{t_c},{p_kpa},rho_kg_m3,{rho:.10g},{rho * 1e-6:.3g},{SRC}\n")
        f.write(f"{t_c},{p_kpa},cp_j_kgk,{cp:.10g},{cp * 1e-6:.3g},{SRC}\n")
        f.write(f"{t_c},{p_kpa},h_kj_kg,{h:.10g},{max(abs(h) * 1e-6, 1e-6):.3g},{SRC}\n")

# Heat to raise a full tank by delta_t_k: Q = V rho cp dT with rho, cp at (t_c, p_kpa).
TANKS = [
    (0.3, 60.0, 300.0, 10.0),
    (1.0, 50.0, 300.0, 40.0),
    (2.0, 75.0, 300.0, 20.0),
    (5.0, 85.0, 300.0, 15.0),
    (10.0, 90.0, 300.0, 30.0),
    (50.0, 120.0, 500.0, 50.0),
]
with open(os.path.join(REF, "storage_tank.csv"), "w") as f:
    f.write("# Heat to raise a fully mixed tank by delta_t_k: Q = V rho cp dT (J), rho and cp of liquid\n")
    f.write("# water at (t_c, p_kpa) from the iapws PyPI package, version 1.5.5 (IAPWS97, IF97 region 1).\n")
    f.write("# Made by reference/scripts/make_water_iapws.py. Tolerance 1e-6 relative.\n")
    f.write("volume_m3,t_c,p_kpa,delta_t_k,quantity,expected,tolerance,source\n")
    for v, t_c, p_kpa, dt in TANKS:
        w = state(t_c, p_kpa)
        q = v * w.rho * w.cp * 1000.0 * dt
        f.write(f"{v},{t_c},{p_kpa},{dt},heat_j,{q:.10g},{q * 1e-6:.3g},{SRC} rho and cp\n")
print("written")
