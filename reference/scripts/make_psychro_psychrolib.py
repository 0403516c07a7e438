#!/usr/bin/env python3
# Makes reference/psychro_psychrolib.csv from psychrolib==2.5.0 (PyPI), SI units.
#
#   python3 -m venv /work/venv-psychro && /work/venv-psychro/bin/pip install psychrolib==2.5.0
#   /work/venv-psychro/bin/python reference/scripts/make_psychro_psychrolib.py > reference/psychro_psychrolib.csv
#
# Grid: dry-bulb -10..55 degC (5 K steps), RH 0, 10, 30, 50, 80, 100 %, pressure 101.325, 90, 80 kPa.
# For each state: humidity ratio from RH (GetHumRatioFromRelHum), then from that humidity ratio the
# wet-bulb (GetTWetBulbFromHumRatio), dew point (GetTDewPointFromHumRatio), enthalpy
# (GetMoistAirEnthalpy), specific volume (GetMoistAirVolume) and density (GetMoistAirDensity).
#
# Conventions of psychrolib that matter here:
# * psychrolib floors every humidity ratio at MIN_HUM_RATIO = 1e-7 kg/kg. At RH 0 it returns 1e-7,
#   not 0, so the W row at RH 0 is left out (the Rust model gives exactly 0 there) and the other
#   quantities at RH 0 are evaluated at the floored W = 1e-7, which is written in column w_kg_kg as
#   the model input.
# * Its solvers stop at PSYCHROLIB_TOLERANCE (0.001 K in SI by default; bisection for wet-bulb, so the
#   default answer is only good to about 0.0005 K). This script tightens it to 1e-10 K so that the
#   table is accurate to far better than the Rust solvers' tolerance.
# * Wet-bulb just above freezing: eq. 35 (ice) at t* = 0 gives a larger W than eq. 33 (water) at
#   t* = 0, so for dry-bulb >= 0 and W between those two values both a water root (t* >= 0) and an
#   ice root (t* < 0) exist. psychrolib's bisection returns either, depending on its bracket. The
#   Rust model takes the water root; for such rows this script finds it by bisection on [0, t_db]
#   of psychrolib's own GetHumRatioFromTWetBulb (eq. 33 there), and says so in the source column.
import psychrolib as psy

from importlib.metadata import version

assert version("psychrolib") == "2.5.0", version("psychrolib")
psy.SetUnitSystem(psy.SI)
psy.PSYCHROLIB_TOLERANCE = 1e-10

SRC_WATER = "psychrolib 2.5.0 (PyPI) SI units; water root of its GetHumRatioFromTWetBulb by bisection (two roots)"


def water_root(t, w, p):
    """Root on [0, t] of psychrolib's GetHumRatioFromTWetBulb(t, x, p) = w, bisection to 1e-12 K."""
    lo, hi = 0.0, float(t)
    while hi - lo > 1e-12:
        mid = 0.5 * (lo + hi)
        if psy.GetHumRatioFromTWetBulb(t, mid, p) > w:
            hi = mid
        else:
            lo = mid
    return 0.5 * (lo + hi)


# Tolerances (absolute). Measured differences of the Rust model against this table: W 4e-15
# relative, h 6e-14 kJ/kg, v and rho 7e-16, wet-bulb 6e-10 K, dew point 8e-9 K (Brent stops on the
# log-pressure residual, 1e-9, i.e. about 1e-8 K). Tolerances are set about ten times above those
# and far below any physical significance: W 1e-9 relative, h 1e-10 kJ/kg, v 1e-12 m3/kg,
# rho 1e-12 kg/m3, wet-bulb and dew point 1e-7 K.
TOL_K = 1e-7

TEMPS = [-10, -5, 0, 5, 10, 15, 20, 25, 30, 35, 40, 45, 50, 55]
RHS = [0, 10, 30, 50, 80, 100]
PRESSURES_KPA = [101.325, 90.0, 80.0]

SRC = "psychrolib 2.5.0 (PyPI) SI units; solver tolerance set to 1e-10 K"

print("# Humid-air properties from psychrolib 2.5.0 (PyPI, D. Thevenard and D. Meyer), SI units,")
print("# ASHRAE Handbook-Fundamentals 2017 ch. 1 formulation.")
print("# Made by reference/scripts/make_psychro_psychrolib.py (see it for the conventions:")
print("# psychrolib floors W at 1e-7 kg/kg, so rows at RH 0 use w_kg_kg = 1e-7 as input and have no W row;")
print("# solver tolerance set to 1e-10 K).")
print("# quantity: w_kg_kg (from t_c, rh_pct, p_kpa), and from (t_c, w_kg_kg, p_kpa): t_wb_c, t_dp_c,")
print("# h_kj_kg, v_m3_kg, rho_kg_m3. Tolerances about ten times the measured model differences (see the script).")
print("t_c,rh_pct,p_kpa,w_kg_kg,quantity,expected,tolerance,source")


def row(t, rh, p_kpa, w, q, expected, tol):
    print(f"{t},{rh},{p_kpa},{w!r},{q},{expected!r},{tol:g},{SRC}")


for p_kpa in PRESSURES_KPA:
    p = p_kpa * 1000.0
    for t in TEMPS:
        for rh in RHS:
            w = psy.GetHumRatioFromRelHum(t, rh / 100.0, p)
            if rh > 0:
                row(t, rh, p_kpa, w, "w_kg_kg", w, max(1e-9 * w, 1e-12))
            twb = psy.GetTWetBulbFromHumRatio(t, w, p)
            if t > 0:
                w_water0 = psy.GetHumRatioFromTWetBulb(t, 0.0, p)  # eq. 33 at t* = 0 (floored at 1e-7)
                w_ice0 = psy.GetHumRatioFromTWetBulb(t, -1e-12, p)  # eq. 35 at t* = 0- (floored)
            if t > 0 and w_water0 <= w <= w_ice0 and w_ice0 > psy.MIN_HUM_RATIO:
                water = water_root(t, w, p)
                print(f"# two wet-bulb roots at {t} C, {rh} %, {p_kpa} kPa: psychrolib gave {twb!r}, water root {water!r}")
                print(f"{t},{rh},{p_kpa},{w!r},t_wb_c,{water!r},{TOL_K:g},{SRC_WATER}")
            else:
                row(t, rh, p_kpa, w, "t_wb_c", twb, TOL_K)
            tdp = psy.GetTDewPointFromHumRatio(t, w, p)
            row(t, rh, p_kpa, w, "t_dp_c", tdp, TOL_K)
            h = psy.GetMoistAirEnthalpy(t, w) / 1000.0
            row(t, rh, p_kpa, w, "h_kj_kg", h, 1e-10)
            v = psy.GetMoistAirVolume(t, w, p)
            row(t, rh, p_kpa, w, "v_m3_kg", v, 1e-12)
            rho = psy.GetMoistAirDensity(t, w, p)
            row(t, rh, p_kpa, w, "rho_kg_m3", rho, 1e-12)
