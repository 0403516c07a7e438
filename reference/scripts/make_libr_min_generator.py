# Reference table: ideal lowest generator temperature of a single-effect LiBr-water machine.
# Pinned: absorptionlib==1.1.0, CoolProp==8.0.0 (PyPI). Run in a venv with both:
#   python reference/scripts/make_libr_min_generator.py > reference/libr_min_generator.csv
#
# At vanishing cooling every external exchanger carries no heat, so the evaporator sits at the
# chilled-water temperature, absorber and condenser at the cooling-water temperature, and the
# weak solution is in equilibrium with the evaporator's vapour at the absorber temperature:
#   p_e = p_sat(t_chw), x_w = x_eq(p_e, t_cw);  p_c = p_sat(t_cw), t_g,min = t_eq(p_c, x_w).
# The generator must be at least t_g,min before any refrigerant boils off (the Duhring-chart
# argument of every absorption text, e.g. K. E. Herold, R. Radermacher, S. A. Klein,
# Absorption Chillers and Heat Pumps, ch. 6 -- cited from memory). Solution equilibrium from
# absorptionlib 1.1.0 (Patek & Klomfar 2006 eq. 1), water saturation from CoolProp 8.0.0 IF97.
import absorptionlib
from absorptionlib.LiBr import functions as L
import CoolProp.CoolProp as CP

absorptionlib.disable_warnings()


def psat_kpa(t_c):
    return CP.PropsSI("P", "T", t_c + 273.15, "Q", 0, "IF97::Water") / 1000


def bisect(f, a, b, tol=1e-12):
    fa = f(a)
    for _ in range(200):
        m = 0.5 * (a + b)
        fm = f(m)
        if (fm > 0) == (fa > 0):
            a, fa = m, fm
        else:
            b = m
        if b - a < tol:
            break
    return 0.5 * (a + b)


# Rows (the model's value is its lowest hot-water supply that makes 1e-4 of rated cooling,
# for the 35 kW machine of Rating::typical with the SHX effectiveness of the row):
# * sol_hx_effectiveness 0.999: the circulating solution's heat is all but recovered, so the
#   model must reach the ideal; tolerance 0.35 K (the remainder is the SHX duty taken at the
#   inlet cp instead of the enthalpy change: measured 0.10-0.22 K, 2026-12-02).
# * sol_hx_effectiveness 0.7: the unrecovered solution heat passes through generator and
#   absorber, so the supply must sit above the ideal, by at most 3.5 K (measured 1.6-2.9 K):
#   expected = ideal + 1.75, tolerance 1.75, i.e. the band [ideal, ideal + 3.5 K].
SRC = "ideal limit from absorptionlib 1.1.0 equilibrium + CoolProp 8.0.0 IF97 (script header)"
print("# Ideal (zero-cooling) lowest generator temperature of a single-effect LiBr-water machine,")
print("# absorptionlib 1.1.0 + CoolProp 8.0.0 IF97; made by reference/scripts/make_libr_min_generator.py.")
print("t_cw_c,t_chw_c,sol_hx_effectiveness,x_weak_ideal,t_gen_min_ideal_c,expected,tolerance,source")
for t_cw in (25.0, 27.0, 30.0, 32.0, 35.0):
    for t_chw in (5.0, 7.0, 10.0):
        p_e = psat_kpa(t_chw)
        x_w = bisect(lambda x: L.saturation_pressure(x, t_cw) / 1000 - p_e, 0.30, 0.70)
        p_c = psat_kpa(t_cw)
        t_g = bisect(lambda t: L.saturation_pressure(x_w, t) / 1000 - p_c, t_cw, 150.0)
        print(f"{t_cw},{t_chw},0.999,{x_w:.8f},{t_g:.6f},{t_g:.6f},0.35,{SRC}")
        print(f"{t_cw},{t_chw},0.7,{x_w:.8f},{t_g:.6f},{t_g + 1.75:.6f},1.75,{SRC}")
