# Reference table for the single-effect LiBr-water internal cycle: reference/absorption_cycle_reference.csv
# Pinned: absorptionlib==1.1.0, CoolProp==8.0.0 (PyPI). Run in a scratch venv outside the repository:
#   python reference/scripts/make_absorption_cycle.py > reference/absorption_cycle_reference.csv
#
# An independent implementation (written here, in Python, not a translation of the Rust) of the
# single-effect cycle as the model's documentation defines it (state points numbered after Herold,
# Radermacher & Klein, Absorption Chillers and Heat Pumps, ch. 6):
#   1 weak solution leaving the absorber at t1, in equilibrium at the evaporator pressure p(t_e);
#   4 strong solution leaving the generator at t4, in equilibrium at the condenser pressure p(t_c);
#   2 after the pump (h2 = h1 + v1 (p_h - p_l)); 3 after the SHX; 5 strong after the SHX, 6 = 5 throttled;
#   7 vapour leaving the generator at the weak solution's equilibrium temperature at p_h;
#   8 saturated liquid at t_c; 10 saturated vapour at t_e.
#   SHX: the strong stream leaves at t5 = t4 - eps * min(C_weak, C_strong) / C_strong * (t4 - t1)
#   (capacity rates from cp at the inlets; with the strong side the smaller, Herold et al.'s
#   eps = (t4 - t5) / (t4 - t1)); duty = m_s (h4 - h5), h5 the solution enthalpy at t5.
# Properties: equilibrium (mass fraction at p, T; temperature at x, p) from absorptionlib 1.1.0
# LiBr.saturation_concentration / saturation_temperature (Patek & Klomfar 2006 eq. 1); solution h, rho, cp
# from Patek & Klomfar eqs. 2-4 with absorptionlib's Params_PK tables and CoolProp IF97 saturated
# water (as reference/scripts/make_libr_absorptionlib.py); water and steam from CoolProp 8.0.0 IF97.
# Tolerances: 1e-5 relative on heat flows and COP, 1e-4 on mass fractions, 0.001 K on temperatures
# (the same formulations; the margins cover the two codes' root-finding tolerances).
import absorptionlib
from absorptionlib.LiBr import functions as L
import CoolProp.CoolProp as CP

absorptionlib.disable_warnings()
W = "IF97::Water"

# Solution h, rho, cp by Patek & Klomfar eqs. 2-4: the function the property table's script uses.
from make_libr_absorptionlib import pk as props

def psat_pa(t_c):
    return CP.PropsSI("P", "T", t_c + 273.15, "Q", 0, W)

def cycle(t_e, t_c, t1, t4, eps, m1=1.0):
    p_l, p_h = psat_pa(t_e), psat_pa(t_c)
    x_w = L.saturation_concentration(p_l, t1)
    x_s = L.saturation_concentration(p_h, t4)
    t7 = L.saturation_temperature(x_w, p_h)
    m_s = m1 * x_w / x_s
    m_r = m1 - m_s
    h1, rho1, cp1 = props(x_w, t1)
    h4, _, cp4 = props(x_s, t4)
    w_p = m1 * (p_h - p_l) / 1000 / rho1
    h2 = h1 + w_p / m1
    c_w, c_s = m1 * cp1, m_s * cp4
    t5 = t4 - eps * min(c_w, c_s) / c_s * (t4 - t1)
    h5 = props(x_s, t5)[0]
    q_shx = m_s * (h4 - h5)
    h3 = h2 + q_shx / m1
    h7 = CP.PropsSI("H", "P", p_h, "T", t7 + 273.15, W) / 1000
    h8 = CP.PropsSI("H", "T", t_c + 273.15, "Q", 0, W) / 1000
    h10 = CP.PropsSI("H", "T", t_e + 273.15, "Q", 1, W) / 1000
    q_e = m_r * (h10 - h8)
    q_c = m_r * (h7 - h8)
    q_g = m_s * h4 + m_r * h7 - m1 * h3
    q_a = m_r * h10 + m_s * h5 - m1 * h1
    return dict(x_weak=x_w, x_strong=x_s, t7_c=t7, q_evap_kw=q_e, q_gen_kw=q_g,
                q_abs_kw=q_a, q_cond_kw=q_c, cop=q_e / q_g)

SRC = "single-effect cycle written in Python on absorptionlib 1.1.0 + CoolProp 8.0.0 IF97 (script header)"
TOL = dict(x_weak=1e-4, x_strong=1e-4, t7_c=1e-3)
print("# Single-effect LiBr-water internal cycle, weak-solution flow 1 kg/s; made by")
print("# reference/scripts/make_absorption_cycle.py (absorptionlib 1.1.0, CoolProp 8.0.0).")
print("case,t_evap_c,t_cond_c,t_abs_out_c,t_gen_out_c,m_weak_kg_s,sol_hx_effectiveness,quantity,expected,tolerance,source")
for (t_e, t_c, t1, t4, eps) in [(4.0, 38.0, 35.0, 80.0, 0.7), (4.0, 38.0, 35.0, 80.0, 0.5),
                                (7.0, 40.0, 36.0, 85.0, 0.7), (2.0, 35.0, 32.0, 75.0, 0.8),
                                (5.0, 42.0, 38.0, 92.0, 0.6), (3.0, 36.0, 33.0, 78.0, 0.7)]:
    r = cycle(t_e, t_c, t1, t4, eps)
    for k, v in r.items():
        tol = TOL.get(k, abs(v) * 1e-5)
        print(f"python,{t_e},{t_c},{t1},{t4},1.0,{eps},{k},{v:.10g},{tol:.3g},{SRC}")
