#!/usr/bin/env python3
"""Reference tables for the organic Rankine / vapour-compression area, from CoolProp.

Pinned: CoolProp==6.6.0, numpy==1.26.4 (python3 -m venv /work/venv-rankine;
/work/venv-rankine/bin/pip install CoolProp==6.6.0 numpy==1.26.4).

Writes
* reference/fluid_constants_coolprop.txt – Tc, pc, acentric factor, molar mass (CoolProp 6.6.0
  fluid files) and a quartic least-squares fit of the ideal-gas heat capacity cp0/R to
  CoolProp's CP0MOLAR (its Helmholtz ideal-gas part), pasted into src/props/fluids.rs;
* reference/fluid_coolprop.csv – saturation pressure, latent heat, saturated liquid and vapour
  enthalpy (IIR reference state: h = 200 kJ/kg, s = 1 kJ/(kg K) for saturated liquid at 0 C),
  for the eight Peng-Robinson fluids and for water (IAPWS-95; shifted to IIR by hand, since
  CoolProp refuses the IIR state below water's triple point);
* reference/rankine_coolprop.csv – organic Rankine efficiency and vapour-compression COP of the
  cycles defined in src/components/rankine.rs and vapour_compression.rs, computed with CoolProp.

Tolerances are written as placeholders (`TOL`) and then set from the measured deviation of
the Peng-Robinson model (reference/fluid_coolprop_deviation.csv, written by
`cargo test --lib checks::rankine -- --ignored write_deviation_table` with the placeholders
set wide): 1.2 x the fluid's worst deviation for that quantity, rounded up to two significant
digits; relative (x |expected|) for saturation pressure, cycle efficiency and COP, absolute
for enthalpies. They describe what the model is, not a fit.
"""
import sys
import numpy as np
import CoolProp
import CoolProp.CoolProp as CP

assert CoolProp.__version__ == "6.6.0", CoolProp.__version__
R = 8.314462618
FLUIDS = [  # (our name, CoolProp name, fit range K)
    ("R245fa", "R245fa", (200, 600)),
    ("n-pentane", "n-Pentane", (200, 650)),
    ("R1233zd(E)", "R1233zd(E)", (200, 600)),
    ("toluene", "Toluene", (250, 750)),
    ("R134a", "R134a", (180, 500)),
    ("R32", "R32", (180, 500)),
    ("R290", "Propane", (180, 500)),
    ("R1234ze(E)", "R1234ze(E)", (180, 500)),
]
SRC = "CoolProp 6.6.0 (PyPI) HEOS; IIR reference state"


def constants(out):
    for name, cp, (lo, hi) in FLUIDS:
        T = np.linspace(lo, hi, 200)
        y = np.array([CP.PropsSI("CP0MOLAR", "T", t, "P", 1.0e3, cp) / R for t in T])
        x = T / 100.0
        c = np.polyfit(x, y, 4)[::-1]  # cp0/R = sum_k c_k (T/100)^k, k = 0..4
        err = np.max(np.abs(np.polyval(c[::-1], x) / y - 1.0))
        out.write(
            f"{name}: Tc={CP.PropsSI('Tcrit', cp)!r} pc={CP.PropsSI('pcrit', cp)!r} "
            f"omega={CP.PropsSI('acentric', cp)!r} M={CP.PropsSI('molar_mass', cp)!r} "
            f"Ttriple={CP.PropsSI('Ttriple', cp)!r} cp0/R(T/100) = {[float(v) for v in c]} "
            f"fit {lo}-{hi} K, max rel err {err:.2e}\n"
        )


ENGINE_T = [0.0, 30.0, 60.0, 90.0, 120.0]
CHILL_T = [-20.0, 0.0, 20.0, 40.0, 60.0]
# Water (IAPWS-95 in CoolProp) has no Peng-Robinson constants: it is only in the saturation and
# cycle tables, checking src/props/steam.rs (IAPWS-IF97 through seuif97).
WATER_T = [5.0, 50.0, 100.0, 150.0, 200.0, 250.0, 300.0, 340.0]
T_OF = {
    "water": WATER_T,
    "R245fa": ENGINE_T, "n-pentane": ENGINE_T, "R1233zd(E)": ENGINE_T,
    "toluene": [30.0, 90.0, 150.0, 200.0, 250.0],
    "R134a": CHILL_T, "R32": CHILL_T, "R290": CHILL_T, "R1234ze(E)": CHILL_T,
}


def sat_table(out):
    out.write("# Saturation properties from CoolProp 6.6.0 (PyPI), HEOS backend, IIR reference state\n")
    out.write("# (h = 200 kJ/kg, s = 1 kJ/(kg K) for saturated liquid at 0 C).\n")
    out.write("# Made by reference/scripts/make_fluid_coolprop.py. Tolerance per fluid and quantity:\n")
    out.write("# the measured worst Peng-Robinson deviation over the fluid's rows (see\n")
    out.write("# reference/fluid_coolprop_deviation.csv) x 1.2 rounded up: relative for psat, absolute for h.\n")
    out.write("fluid,t_c,quantity,expected,tolerance,source\n")
    for name, cp, _ in FLUIDS + [("water", "Water", None)]:
        if cp == "Water":
            # CoolProp refuses the IIR state for water (0 C is below its triple point,
            # 0.01 C), but evaluates the saturated liquid there: shift by hand.
            dh = 200.0 - CP.PropsSI("H", "T", 273.15, "Q", 0, cp) / 1e3
        else:
            CP.set_reference_state(cp, "IIR")
            dh = 0.0
        for t in T_OF[name]:
            T = t + 273.15
            p = CP.PropsSI("P", "T", T, "Q", 0, cp) / 1e3
            hl = CP.PropsSI("H", "T", T, "Q", 0, cp) / 1e3 + dh
            hv = CP.PropsSI("H", "T", T, "Q", 1, cp) / 1e3 + dh
            for q, v in [("psat_kpa", p), ("hfg_kj_kg", hv - hl), ("h_liq_kj_kg", hl), ("h_vap_kj_kg", hv)]:
                out.write(f"{name},{t},{q},{v:.6g},TOL,{SRC}\n")
        CP.set_reference_state(cp, "DEF")


def st(cp, **kw):
    (k1, v1), (k2, v2) = kw.items()
    return CP.PropsSI("H", k1, v1, k2, v2, cp), CP.PropsSI("S", k1, v1, k2, v2, cp)


def rankine(cp, te, tc, sh, eta_p, eta_e, eps):
    Te, Tc = te + 273.15, tc + 273.15
    pe = CP.PropsSI("P", "T", Te, "Q", 0, cp)
    pc = CP.PropsSI("P", "T", Tc, "Q", 0, cp)
    h1, s1 = st(cp, P=pc, Q=0)
    h2s = CP.PropsSI("H", "P", pe, "S", s1, cp)
    h2 = h1 + (h2s - h1) / eta_p
    t2 = CP.PropsSI("T", "P", pe, "H", h2, cp)
    h3, s3 = st(cp, P=pe, Q=1) if sh == 0 else st(cp, P=pe, T=Te + sh)
    h4s = CP.PropsSI("H", "P", pc, "S", s3, cp)
    h4 = h3 - eta_e * (h3 - h4s)
    q_rec = 0.0
    if eps > 0:
        q_rec = eps * (h4 - CP.PropsSI("H", "P", pc, "T", t2, cp))
    q_in = h3 - (h2 + q_rec)
    w = (h3 - h4) - (h2 - h1)
    return w / q_in


def vc(cp, te, tc, sh, sc, eta_c):
    Te, Tc = te + 273.15, tc + 273.15
    pe = CP.PropsSI("P", "T", Te, "Q", 0, cp)
    pc = CP.PropsSI("P", "T", Tc, "Q", 0, cp)
    h1, s1 = st(cp, P=pe, Q=1) if sh == 0 else st(cp, P=pe, T=Te + sh)
    h2s = CP.PropsSI("H", "P", pc, "S", s1, cp)
    h2 = h1 + (h2s - h1) / eta_c
    h3 = CP.PropsSI("H", "P", pc, "Q", 0, cp) if sc == 0 else CP.PropsSI("H", "P", pc, "T", Tc - sc, cp)
    return (h1 - h3) / (h2 - h1)


def cycles(out):
    out.write("# Whole cycles with CoolProp 6.6.0 (PyPI) properties, HEOS backend; cycle definitions as in\n")
    out.write("# src/components/rankine.rs (eta = net work / heat in, recuperator effectiveness on the vapour\n")
    out.write("# side, to the pump-outlet temperature) and src/components/vapour_compression.rs (COP = cooling /\n")
    out.write("# compressor work). Made by reference/scripts/make_fluid_coolprop.py. Tolerance: from the\n")
    out.write("# measured worst relative Peng-Robinson deviation (reference/fluid_coolprop_deviation.csv) x 1.2 x expected.\n")
    out.write("cycle,fluid,t_evap_c,t_cond_c,superheat_k,subcool_k,eta_pump,eta_machine,recuperator,quantity,expected,tolerance,source\n")
    src = "CoolProp 6.6.0 (PyPI) cycle"
    for name, cp in [("R245fa", "R245fa"), ("n-pentane", "n-Pentane"), ("R1233zd(E)", "R1233zd(E)"), ("toluene", "Toluene"), ("water", "Water")]:
        cases = [(80, 30, 0, 0.6, 0.75, 0), (100, 35, 5, 0.6, 0.75, 0), (120, 40, 10, 0.6, 0.8, 0.7), (130, 30, 0, 1.0, 1.0, 0)]
        if name == "toluene":
            cases = [(150, 40, 0, 0.6, 0.75, 0), (200, 40, 10, 0.6, 0.8, 0.8), (250, 60, 0, 1.0, 1.0, 0)]
        if name == "water":
            # Steam expansion ends wet, where the recuperator does nothing: none here.
            cases = [(120, 40, 0, 0.6, 0.75, 0), (150, 40, 5, 0.6, 0.75, 0), (180, 45, 10, 0.7, 0.8, 0), (200, 40, 0, 1.0, 1.0, 0), (300, 50, 40, 0.8, 0.85, 0)]
        for te, tc, sh, ep, ee, eps in cases:
            v = rankine(cp, te, tc, sh, ep, ee, eps)
            out.write(f"rankine,{name},{te},{tc},{sh},0,{ep},{ee},{eps},eta_th,{v:.6g},TOL,{src}\n")
    for name, cp in [("R134a", "R134a"), ("R32", "R32"), ("R290", "Propane"), ("R1234ze(E)", "R1234ze(E)")]:
        for te, tc, sh, sc, ec in [(3.7, 40.4, 5, 3, 0.75), (0, 50, 0, 0, 1.0), (-10, 35, 10, 5, 0.7), (5, 30, 5, 0, 0.8)]:
            v = vc(cp, te, tc, sh, sc, ec)
            out.write(f"vc,{name},{te},{tc},{sh},{sc},1,{ec},0,cop,{v:.6g},TOL,{src}\n")


if __name__ == "__main__":
    root = sys.argv[1] if len(sys.argv) > 1 else "reference"
    with open(f"{root}/fluid_constants_coolprop.txt", "w") as f:
        constants(f)
    with open(f"{root}/fluid_coolprop.csv", "w") as f:
        sat_table(f)
    with open(f"{root}/rankine_coolprop.csv", "w") as f:
        cycles(f)
