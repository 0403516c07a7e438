# Reference table for LiBr-H2O properties: reference/libr_absorptionlib.csv
# Pinned: absorptionlib==1.1.0, CoolProp==8.0.0 (PyPI). Run in /work/venv-absorption:
#   python reference/scripts/make_libr_absorptionlib.py > reference/libr_absorptionlib.csv
#
# * p_kpa: absorptionlib 1.1.0 LiBr.saturation_pressure (Patek & Klomfar 2006 eq. 1, IF97 eq. 30).
# * h_kj_kg, rho_kg_m3, cp_kj_kgk: absorptionlib 1.1.0 implements h and rho by another
#   correlation (Feuerecker 1994) and no cp, so the P&K equations 2-4 are evaluated here from
#   absorptionlib's own coefficient tables (LiBr.functions.Params_PK, Tables 5-7) with the
#   saturated-liquid water terms from CoolProp 8.0.0 (IF97 backend, the water formulation the model uses; the paper
#   uses IAPWS-95, which differs from IF97 here by up to 3e-4 in cp and 2e-4 in h of the water
#   term, measured with CoolProp HEOS vs IF97 at 40 and 80 °C).
# * crystallisation: absorptionlib 1.1.0 LiBr.solubility_temperature.
import absorptionlib
from absorptionlib.LiBr import functions as L
import CoolProp.CoolProp as CP

absorptionlib.disable_warnings()
P = L.Params_PK()
TC, T0 = 647.096, 221.0

def xmol(x):
    return (x / P.M_LiBr) / (x / P.M_LiBr + (1 - x) / P.M_W)

def msum(a, m, n, t, xm, tau):
    return sum(a[i] * xm ** m[i] * (0.4 - xm) ** n[i] * tau ** t[i] for i in range(len(a)))

def pk(x, t_c):
    T = t_c + 273.15
    xm = xmol(x)
    M = xm * P.M_LiBr + (1 - xm) * P.M_W
    tau = TC / (T - T0)
    hw = CP.PropsSI("Hmolar", "T", T, "Q", 0, "IF97::Water")
    cw = CP.PropsSI("Cpmolar", "T", T, "Q", 0, "IF97::Water")
    rw = CP.PropsSI("Dmolar", "T", T, "Q", 0, "IF97::Water")
    h = ((1 - xm) * hw + P.enthalpyCritWmol * msum(P.aTab7, P.mTab7, P.nTab7, P.tTab7, xm, tau)) / M / 1000
    cp = ((1 - xm) * cw + P.cpCritWmol * msum(P.aTab6, P.mTab6, P.nTab6, P.tTab6, xm, tau)) / M / 1000
    rs = sum(P.aTab5[i] * xm ** P.mTab5[i] * (T / TC) ** P.tTab5[i] for i in range(2))
    rho = ((1 - xm) * rw + P.densCritWmol * rs) * M
    return h, rho, cp

def main():
    SRC_P = "absorptionlib 1.1.0 LiBr.saturation_pressure (Patek & Klomfar 2006 eq. 1)"
    SRC_X = "Patek & Klomfar 2006 eqs. 2-4 with absorptionlib 1.1.0 Params_PK tables and CoolProp 8.0.0 IF97 saturated water"
    SRC_C = "absorptionlib 1.1.0 LiBr.solubility_temperature (Boryta 1970 fit)"
    print("# LiBr-H2O solution properties: Patek & Klomfar (2006) via absorptionlib 1.1.0 and CoolProp 8.0.0 (PyPI).")
    print("# Made by reference/scripts/make_libr_absorptionlib.py. Tolerances: p 1e-7 relative (same closed forms);")
    print("# h, rho, cp: 1e-7 relative (same equations and water formulation; measured below 1e-8).")
    print("t_c,x,quantity,expected,tolerance,source")
    for x in (0.40, 0.45, 0.50, 0.55, 0.60, 0.65, 0.70):
        for t in (20.0, 40.0, 60.0, 80.0, 100.0, 120.0, 140.0, 160.0, 180.0):
            p = L.saturation_pressure(x, t) / 1000
            print(f"{t},{x},p_kpa,{p:.10g},{max(p*1e-7,1e-9):.3g},{SRC_P}")
            h, rho, cp = pk(x, t)
            print(f"{t},{x},h_kj_kg,{h:.10g},{max(abs(h),100)*1e-7:.3g},{SRC_X}")
            print(f"{t},{x},rho_kg_m3,{rho:.10g},{rho*1e-7:.3g},{SRC_X}")
            print(f"{t},{x},cp_kj_kgk,{cp:.10g},{cp*1e-7:.3g},{SRC_X}")
    for x in (0.57, 0.60, 0.62, 0.65, 0.68, 0.70, 0.72, 0.75):
        tc = L.solubility_temperature(x)
        print(f"0,{x},t_cryst_c,{tc:.10g},1e-6,{SRC_C}")


if __name__ == "__main__":
    main()
