#!/usr/bin/env python3
"""Make the collector-area check tables in reference/ (standard library only, Python >= 3.8).

Writes:
  reference/collector_iso9806.csv     ISO 9806:2017 steady-state efficiency, IAM, outlet temperature
  reference/collector_hx_ntu.csv      counterflow effectiveness, Incropera 7th ed. Table 11.3
  reference/collector_pipe.csv        pipe outlet temperature and loss, Incropera 7th ed. eq. 8.46
  reference/collector_hx_factor.csv   collector heat-exchanger factor, Duffie & Beckman 4th ed. eq. 10.2.3

Every expected value is computed here from the closed form written beside it, independently of
the Rust code. The collector outlet temperature is the textbook root of the quadratic and is
cross-checked by bisection on the energy balance (the script stops if they differ by > 1e-9 K).
Collector coefficients are typical of their class (invented, not a real product).

Run from the repository root:  python3 reference/scripts/make_collector_iso9806.py
"""
import math
import os

HERE = os.path.dirname(os.path.abspath(__file__))
REF = os.path.dirname(HERE)

ISO = "ISO 9806:2017 steady-state model; hand calculation (this script)"
DB_IAM = "ANSI/ASHRAE 93 one-parameter IAM; Duffie & Beckman 4th ed. sec. 6.17 (form from memory)"
DB_CONV = ("Duffie & Beckman 4th ed. sec. 6.19-6.20: F_R = F_av/(1 + A F_av U_L/(2 m cp)) "
           "conversion of mean- to inlet-temperature test results (from memory)")

# name: (kind, eta0, a1, a2, b0, Kd)  -- typical of the class, not real products
COLLECTORS = {
    "flat plate A": ("flat-plate", 0.78, 3.6, 0.014, 0.12, 0.90),
    "flat plate B (linear)": ("flat-plate", 0.74, 4.5, 0.0, 0.15, 0.88),
    "evacuated tube": ("evacuated-tube", 0.64, 1.1, 0.006, 0.05, 0.95),
    "concentrating": ("concentrating", 0.72, 0.35, 0.0015, 0.04, 0.0),
}


def iam(b0, theta):
    if theta >= 90.0:
        return 0.0
    return min(1.0, max(0.0, 1.0 - b0 * (1.0 / math.cos(math.radians(theta)) - 1.0)))


def absorbed(c, gb, gd, theta):
    kind, eta0, a1, a2, b0, kd = c
    if kind == "concentrating":
        gd = 0.0
    return eta0 * (iam(b0, theta) * gb + kd * gd)


def useful(c, gb, gd, theta, tm, ta):
    _, _, a1, a2, _, _ = c
    d = tm - ta
    return absorbed(c, gb, gd, theta) - a1 * d - a2 * d * d  # tm >= ta in every row


def outlet(c, tin, flow, cp, gb, gd, theta, ta):
    """Root of a2 x^2 + (a1 + 2m) x - (S + 2m (tin - ta)) = 0, x = tm - ta (textbook formula)."""
    _, _, a1, a2, _, _ = c
    m = flow * cp
    s = absorbed(c, gb, gd, theta)
    b = a1 + 2.0 * m
    cc = s + 2.0 * m * (tin - ta)
    if a2 == 0.0:
        x = cc / b
    else:
        x = (-b + math.sqrt(b * b + 4.0 * a2 * cc)) / (2.0 * a2)
    tout = 2.0 * (ta + x) - tin
    # independent cross-check: bisection on m (tout - tin) - q((tin + tout)/2) = 0
    f = lambda to: m * (to - tin) - useful(c, gb, gd, theta, 0.5 * (tin + to), ta)
    lo, hi = tin - 200.0, tin + 400.0
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if f(mid) > 0.0:
            hi = mid
        else:
            lo = mid
    assert abs(0.5 * (lo + hi) - tout) < 1e-9, (tout, lo, hi)
    return tout, m * (tout - tin)


def stagnation(c, gb, gd, theta, ta):
    """tm where a1 d + a2 d^2 = S."""
    _, _, a1, a2, _, _ = c
    s = absorbed(c, gb, gd, theta)
    d = s / a1 if a2 == 0.0 else (-a1 + math.sqrt(a1 * a1 + 4.0 * a2 * s)) / (2.0 * a2)
    return ta + d


def fmt(x):
    return repr(float(x))


def write(name, comment, header, rows):
    with open(os.path.join(REF, name), "w") as fh:
        for line in comment.strip().splitlines():
            fh.write("# " + line.strip() + "\n")
        fh.write(",".join(header) + "\n")
        for r in rows:
            assert all("," not in str(v) for v in r), r
            fh.write(",".join(str(v) for v in r) + "\n")


def iso_table():
    header = ["case", "collector", "kind", "eta0", "a1_w_m2k", "a2_w_m2k2", "iam_b0", "iam_diffuse",
              "aoi_deg", "g_beam_w_m2", "g_diffuse_w_m2", "t_c", "ta_c", "flow_kg_s_m2", "cp_j_kgk",
              "quantity", "expected", "tolerance", "source"]
    rows = []

    def add(case, name, quantity, value, tol, source, aoi=0.0, gb=0.0, gd=0.0, t=0.0, ta=0.0,
            flow=0.0, cp=0.0):
        kind, eta0, a1, a2, b0, kd = COLLECTORS[name]
        rows.append([case, name, kind, eta0, a1, a2, b0, kd, aoi, gb, gd, t, ta, flow, cp,
                     quantity, fmt(value), tol, source])

    # efficiency curve: eta = eta0 - a1 (tm-ta)/G - a2 (tm-ta)^2/G at normal incidence, G total
    for name, tm, ta, g in [("flat plate A", 70.0, 20.0, 1000.0), ("flat plate A", 45.0, 25.0, 800.0),
                            ("evacuated tube", 120.0, 20.0, 900.0), ("concentrating", 180.0, 30.0, 850.0)]:
        _, eta0, a1, a2, _, _ = COLLECTORS[name]
        d = tm - ta
        eta = eta0 - a1 * d / g - a2 * d * d / g
        add(f"{name} tm {tm} ta {ta} G {g}", name, "efficiency", eta, 1e-12, ISO,
            gb=g, t=tm, ta=ta)
    # one-parameter IAM K = 1 - b0 (1/cos th - 1), clipped to [0, 1]
    for name, th in [("flat plate A", 30.0), ("flat plate A", 60.0), ("flat plate A", 85.0),
                     ("evacuated tube", 50.0)]:
        add(f"{name} theta {th}", name, "iam_beam", iam(COLLECTORS[name][4], th), 1e-12, DB_IAM, aoi=th)
    # useful power at tm: q = eta0 (Kb Gb + Kd Gd) - a1 d - a2 d^2
    for name, aoi, gb, gd, tm, ta in [("flat plate A", 35.0, 650.0, 150.0, 60.0, 22.0),
                                      ("evacuated tube", 55.0, 500.0, 200.0, 95.0, 15.0),
                                      ("concentrating", 20.0, 800.0, 120.0, 160.0, 28.0)]:
        add(f"{name} useful at tm {tm}", name, "useful_w_m2", useful(COLLECTORS[name], gb, gd, aoi, tm, ta),
            1e-9, ISO, aoi=aoi, gb=gb, gd=gd, t=tm, ta=ta)
    # outlet temperature and gain: m cp (tout - tin) = q((tin + tout)/2), quadratic in tout
    cases = [("flat plate A", 40.0, 0.02, 4180.0, 700.0, 150.0, 25.0, 20.0),
             ("flat plate A", 75.0, 0.005, 3800.0, 800.0, 100.0, 10.0, 30.0),
             ("evacuated tube", 85.0, 0.012, 4190.0, 600.0, 150.0, 45.0, 18.0),
             ("concentrating", 150.0, 0.03, 4250.0, 850.0, 100.0, 15.0, 32.0),
             ("flat plate B (linear)", 50.0, 0.015, 4180.0, 750.0, 120.0, 20.0, 25.0),
             ("flat plate B (linear)", 30.0, 0.004, 3900.0, 500.0, 250.0, 40.0, 28.0)]
    for name, tin, flow, cp, gb, gd, aoi, ta in cases:
        c = COLLECTORS[name]
        tout, q = outlet(c, tin, flow, cp, gb, gd, aoi, ta)
        kw = dict(aoi=aoi, gb=gb, gd=gd, t=tin, ta=ta, flow=flow, cp=cp)
        add(f"{name} tin {tin} flow {flow}", name, "t_out_c", tout, 1e-9, ISO, **kw)
        add(f"{name} tin {tin} flow {flow}", name, "q_w_m2", q, 1e-7, ISO, **kw)
        if c[3] == 0.0:
            # D&B conversion: with a linear loss the mean-temperature model is the inlet model with
            # F_R(ta) = eta0/(1 + a1/(2 m cp)), F_R U_L = a1/(1 + a1/(2 m cp))
            r = 1.0 + c[2] / (2.0 * flow * cp)
            q_db = absorbed(c, gb, gd, aoi) / r - c[2] / r * (tin - ta)
            add(f"{name} tin {tin} flow {flow} inlet basis", name, "q_w_m2", q_db, 1e-7, DB_CONV, **kw)
    # stagnation (no-flow) mean temperature: S = a1 d + a2 d^2
    for name, aoi, gb, gd, ta in [("flat plate A", 20.0, 800.0, 100.0, 25.0),
                                  ("evacuated tube", 30.0, 700.0, 150.0, 30.0)]:
        add(f"{name} no flow", name, "stagnation_c", stagnation(COLLECTORS[name], gb, gd, aoi, ta), 1e-9, ISO,
            aoi=aoi, gb=gb, gd=gd, ta=ta)
    write("collector_iso9806.csv", """
ISO 9806:2017 steady-state collector model, q = eta0 (Kb(theta) Gb + Kd Gd) - a1 (tm - ta) - a2 (tm - ta)^2,
checked against hand calculations made by reference/scripts/make_collector_iso9806.py (Python standard library).
Coefficients are typical of their class (invented, not real products); eta0 is eta0,b on the coefficients' area basis.
quantity: efficiency = eta0 - a1 (tm-ta)/G - a2 (tm-ta)^2/G with G = g_beam at normal incidence, t_c = tm;
iam_beam = max(0, 1 - b0 (1/cos theta - 1)); useful_w_m2 at tm = t_c;
t_out_c and q_w_m2: outlet for inlet t_c, x = tm - ta = (-b + sqrt(b^2 + 4 a2 c))/(2 a2), b = a1 + 2 m cp,
c = S + 2 m cp (tin - ta), tout = 2 (ta + x) - tin, q = m cp (tout - tin); cross-checked by bisection to 1e-9 K;
inlet basis rows (a2 = 0): q = [S - a1 (tin - ta)]/(1 + a1/(2 m cp)) per Duffie & Beckman 4th ed. sec. 6.19-6.20;
stagnation_c = ta + d with a1 d + a2 d^2 = S. Temperatures degC, flow kg/(s m2), cp J/(kg K), irradiance W/m2.
""", header, rows)


def ntu_table():
    header = ["case", "ntu", "c_ratio", "quantity", "expected", "tolerance", "source"]
    rows = []
    for cr in (0.0, 0.5, 1.0):
        for ntu in (1.0, 2.0, 3.0):
            if cr == 1.0:
                eps = ntu / (1.0 + ntu)
            else:
                e = math.exp(-ntu * (1.0 - cr))
                eps = (1.0 - e) / (1.0 - cr * e)
            rows.append([f"counterflow NTU {ntu} Cr {cr}", ntu, cr, "effectiveness", fmt(eps), 1e-12,
                         "Incropera et al. Fundamentals of Heat and Mass Transfer 7th ed. Table 11.3 counterflow"])
    write("collector_hx_ntu.csv", """
Counterflow heat exchanger effectiveness, Incropera, DeWitt, Bergman, Lavine, Fundamentals of Heat and Mass
Transfer, 7th ed., Wiley 2011, Table 11.3: eps = (1 - exp(-NTU (1 - Cr)))/(1 - Cr exp(-NTU (1 - Cr))) for Cr < 1,
eps = NTU/(1 + NTU) for Cr = 1. Values computed from these closed forms by
reference/scripts/make_collector_iso9806.py.
""", header, rows)


def pipe_table():
    header = ["case", "t_in_c", "flow_kg_s", "cp_j_kgk", "t_amb_c", "length_m", "ua_w_mk",
              "quantity", "expected", "tolerance", "source"]
    src = "Incropera et al. 7th ed. sec. 8.3.3 eq. 8.46 (constant surrounding temperature; eq. number from memory)"
    rows = []
    for case, tin, flow, cp, ta, length, ua in [("supply run hot day", 80.0, 0.5, 4180.0, 20.0, 40.0, 0.25),
                                               ("long run low flow", 95.0, 0.05, 3900.0, 5.0, 150.0, 0.35),
                                               ("pipe colder than air", 15.0, 0.3, 4190.0, 30.0, 25.0, 0.3)]:
        tout = ta + (tin - ta) * math.exp(-ua * length / (flow * cp))
        loss = flow * cp * (tin - tout)
        rows.append([case, tin, flow, cp, ta, length, ua, "t_out_c", fmt(tout), 1e-9, src])
        rows.append([case, tin, flow, cp, ta, length, ua, "loss_w", fmt(loss), 1e-7, src])
    write("collector_pipe.csv", """
Pipe with uniform loss conductance per metre UA' to a constant surrounding temperature ta:
t_out = ta + (t_in - ta) exp(-UA' L/(m cp)), loss = m cp (t_in - t_out)
(Incropera et al., Fundamentals of Heat and Mass Transfer, 7th ed., sec. 8.3.3, eq. 8.46 with U A_s = UA' L).
Computed by reference/scripts/make_collector_iso9806.py. Temperatures degC, flow kg/s, cp J/(kg K), W/(m K), W.
""", header, rows)


def hx_factor_table():
    header = ["case", "area_m2", "fr_ul_w_m2k", "c_collector_w_k", "eff", "c_min_w_k",
              "quantity", "expected", "tolerance", "source"]
    src = "Duffie & Beckman 4th ed. sec. 10.2 eq. 10.2.3; hand calculation"
    rows = []
    for case, a, frul, cc, eff, cmin in [("typical antifreeze loop", 50.0, 4.0, 2000.0, 0.7, 2000.0),
                                         ("small loop tank side smaller", 10.0, 4.5, 600.0, 0.55, 500.0),
                                         ("large field good exchanger", 400.0, 3.2, 20000.0, 0.85, 18000.0)]:
        f = 1.0 / (1.0 + a * frul / cc * (cc / (eff * cmin) - 1.0))
        rows.append([case, a, frul, cc, eff, cmin, "fr_ratio", fmt(f), 1e-12, src])
    write("collector_hx_factor.csv", """
Collector heat-exchanger factor for an indirect collector loop, Duffie & Beckman, Solar Engineering of Thermal
Processes, 4th ed., Wiley 2013, eq. 10.2.3: F_R'/F_R = [1 + (A F_R U_L/C_c)(C_c/(eps C_min) - 1)]^-1.
Inputs typical of small and large systems (invented); computed by reference/scripts/make_collector_iso9806.py.
""", header, rows)


if __name__ == "__main__":
    iso_table()
    ntu_table()
    pipe_table()
    hx_factor_table()
