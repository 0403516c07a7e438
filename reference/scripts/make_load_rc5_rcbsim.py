# Reference table for the ISO 13790:2008 Annex C hour step (5R1C), made with the PyPI
# library rcbsim 0.3b0 (pip install rcbsim==0.3b0; numpy 2.4.6 came with it), an independent
# implementation of ISO 13790 Annex C (eqs. C.1-C.13, building_physics.py, class Zone).
#
# Each case sets the zone's network directly (areas, capacity, conductances) so the table
# tests the hour step itself: gain split C.1-C.3, Crank-Nicolson mass node C.4-C.9, star and
# air nodes C.10-C.11, and the ideal-load search of C.4.2 (free-floating test, 10 W/m2 test,
# eq. C.13). Heating/cooling enters the air node (rcbsim emission system AirConditioning),
# supply air = outdoor air, unlimited capacity.
#
# Run: /work/venv-load/bin/python reference/scripts/make_load_rc5_rcbsim.py > reference/load_rc5_rcbsim.csv
import rcbsim.building_physics as bp
import rcbsim.emission_system as em
import rcbsim.supply_system as ss

# ISO 13790:2008 Table 12 (A_m/A_f, C_m/A_f); the same constants as src/load/rc5.rs.
MASS = {
    "very-light": (2.5, 80000.0),
    "light": (2.5, 110000.0),
    "medium": (2.5, 165000.0),
    "heavy": (3.0, 260000.0),
    "very-heavy": (3.5, 370000.0),
}

# name, A_f, mass, H_tr,op, H_tr,w, H_ve, theta_e, Phi_int, Phi_sol, theta_m_prev, t_heat, t_cool
CASES = [
    ("summer afternoon office", 100.0, "medium", 60.0, 40.0, 100.0, 32.0, 2500.0, 1800.0, 25.0, 20.0, 26.0),
    ("winter morning office", 100.0, "medium", 60.0, 40.0, 100.0, -5.0, 1500.0, 200.0, 18.0, 20.0, 26.0),
    ("mild free-floating", 100.0, "medium", 60.0, 40.0, 100.0, 15.0, 1500.0, 600.0, 22.0, 20.0, 26.0),
    ("heavy clinic hot day", 500.0, "heavy", 250.0, 300.0, 800.0, 38.0, 9000.0, 6000.0, 27.0, 21.0, 24.0),
    ("very light hall sunny", 250.0, "very-light", 150.0, 200.0, 300.0, 28.0, 4000.0, 12000.0, 24.0, 19.0, 25.0),
    ("very heavy cold night", 80.0, "very-heavy", 40.0, 30.0, 20.0, -10.0, 0.0, 0.0, 16.0, 18.0, 27.0),
    ("light no windows", 60.0, "light", 45.0, 0.0, 50.0, 30.0, 900.0, 0.0, 26.0, 20.0, 25.0),
]


def zone(a_f, mass, h_op, h_w, h_ve, t_heat, t_cool):
    am, cm = MASS[mass]
    z = bp.Zone(
        floor_area=a_f,
        total_internal_area=4.5 * a_f,
        t_set_heating=t_heat,
        t_set_cooling=t_cool,
        heating_supply_system=ss.DirectHeater,
        cooling_supply_system=ss.DirectCooler,
        heating_emission_system=em.AirConditioning,
        cooling_emission_system=em.AirConditioning,
    )
    z.mass_area = am * a_f
    z.A_t = 4.5 * a_f
    z.c_m = cm * a_f
    z.h_tr_ms = 9.1 * z.mass_area
    z.h_tr_is = 3.45 * z.A_t
    z.h_tr_em = 1.0 / (1.0 / h_op - 1.0 / z.h_tr_ms)
    z.h_tr_w = h_w
    z.h_ve_adj = h_ve
    return z


SRC = "rcbsim 0.3b0 (PyPI) Zone.solve_energy; ISO 13790:2008 Annex C"
print("# ISO 13790:2008 Annex C hour step of the 5R1C network against rcbsim 0.3b0 (PyPI).")
print("# Made by reference/scripts/make_load_rc5_rcbsim.py (network set per case: A_m, C_m from")
print("# Table 12, A_t = 4.5 A_f, H_tr,is = 3.45 A_t, H_tr,ms = 9.1 A_m, 1/H_tr,em = 1/H_tr,op - 1/H_tr,ms).")
print("# phi_hc_w: heating + / cooling - need, W. Tolerance 1e-6 in W or K: the same algebra in double precision.")
print("case,a_f_m2,mass_class,ua_opaque_w_k,ua_windows_w_k,h_ve_w_k,t_e_c,phi_int_w,phi_sol_w,t_m_prev_c,t_heat_c,t_cool_c,quantity,expected,tolerance,source")
for (name, a_f, mass, h_op, h_w, h_ve, te, pint, psol, tm, th, tc) in CASES:
    z = zone(a_f, mass, h_op, h_w, h_ve, th, tc)
    z.solve_energy(pint, psol, te, tm)
    out = {
        "phi_hc_w": float(z.energy_demand),
        "t_air_c": float(z.t_air),
        "t_s_c": float(z.t_s),
        "t_m_end_c": float(z.t_m_next),
    }
    for q, v in out.items():
        print(f"{name},{a_f},{mass},{h_op},{h_w},{h_ve},{te},{pint},{psol},{tm},{th},{tc},{q},{v!r},1e-6,{SRC}")
