#!/usr/bin/env python3
"""Make the quasi-dynamic collector and sky long-wave check tables (standard library only,
Python >= 3.8; no third-party library: none with Swinbank's sky model was used).

Writes:
  reference/collector_quasi_dynamic.csv   ISO 9806:2017 quasi-dynamic model without the c5 term:
      q = eta0b (Kb Gb + Kd Gd) - c6 u G - c1 (tm - ta) - c2 (tm - ta)^2 - c3 u (tm - ta)
          + c4 (EL - sigma Ta^4),  G = Gb + Gd
    useful power at given tm, the outlet of a steady flow (closed form, cross-checked by
    bisection on the energy balance) and the no-flow temperature.
  reference/weather_sky.csv   clear-sky emissivity (Swinbank 1963, eps = 9.2e-6 Ta^2), all-sky
    emissivity (1 - 0.84 c) eps + 0.84 c and cloud cover c = 2.33 - 3.33 KT (Campbell & Norman
    1998, ch. 10, as quoted in public code), long-wave irradiance EL = eps sigma Ta^4.

Every expected value is computed here from the formula written beside it, independently of the
Rust code, and each row's arithmetic is written into the table's comment lines. Collector
coefficients are typical of their class (invented, not real products).

Run from the repository root:  python3 reference/scripts/make_collector_quasi_dynamic.py
"""
import math
import os

HERE = os.path.dirname(os.path.abspath(__file__))
REF = os.path.dirname(HERE)

SIGMA = 5.670374419e-8  # W/(m2 K4), CODATA 2018
K0 = 273.15

ISO = ("ISO 9806:2017 quasi-dynamic model without c5 (equation from memory and as quoted by "
       "open-source collector models); hand calculation (this script)")
SKY = ("Swinbank 1963 clear sky eps = 9.2e-6 Ta^2; Campbell & Norman 1998 ch. 10 all-sky "
       "(1 - 0.84 c) eps + 0.84 c and c = 2.33 - 3.33 KT (as quoted in public code); "
       "hand calculation (this script)")

# name: (kind, eta0b, c1, c2, c3, c4, c6, b0, Kd)  -- typical of the class, not real products
COLLECTORS = {
    "uncovered U": ("uncovered", 0.85, 12.0, 0.0, 3.0, 0.5, 0.04, 0.10, 0.95),
    "glazed G": ("flat-plate", 0.78, 3.6, 0.014, 0.05, 0.2, 0.0, 0.12, 0.90),
    "glazed steady": ("flat-plate", 0.78, 3.6, 0.014, 0.0, 0.0, 0.0, 0.12, 0.90),
}


def iam(b0, theta):
    if theta >= 90.0:
        return 0.0
    return min(1.0, max(0.0, 1.0 - b0 * (1.0 / math.cos(math.radians(theta)) - 1.0)))


def terms(c, aoi, gb, gd, ta, u, el):
    """The tm-independent part S and the linear loss coefficient, with the arithmetic."""
    _, e0, c1, c2, c3, c4, c6, b0, kd = c
    k = iam(b0, aoi)
    sb4 = SIGMA * (ta + K0) ** 4
    g = gb + gd
    opt = e0 * (k * gb + kd * gd)
    s = opt - c6 * u * g + c4 * (el - sb4)
    text = (f"optical {e0}*({k:.6f}*{gb} + {kd}*{gd}) = {opt:.6f}; "
            f"c6 u G = {c6}*{u}*{g} = {c6 * u * g:.6f}; "
            f"sigma Ta^4 = {sb4:.6f}; c4 (EL - sigma Ta^4) = {c4}*({el} - {sb4:.6f}) = "
            f"{c4 * (el - sb4):.6f}")
    return s, c1 + c3 * u, c2, text


def useful(c, aoi, gb, gd, tm, ta, u, el):
    s, lin, c2, text = terms(c, aoi, gb, gd, ta, u, el)
    d = tm - ta
    q = s - lin * d - c2 * abs(d) * d
    text += (f"; (c1 + c3 u) dT = ({c[2]} + {c[4]}*{u})*{d} = {lin * d:.6f}; "
             f"c2 dT^2 = {c2}*{d}^2 = {c2 * d * d:.6f}; q = {q:.9f}")
    return q, text


def outlet(c, aoi, gb, gd, tin, ta, u, el, flow, cp):
    s, lin, c2, text = terms(c, aoi, gb, gd, ta, u, el)
    m = flow * cp
    b = lin + 2.0 * m
    cc = s + 2.0 * m * (tin - ta)
    if c2 > 0.0:
        x = (-b + math.sqrt(b * b + 4.0 * c2 * cc)) / (2.0 * c2)
    else:
        x = cc / b
    tout = 2.0 * (ta + x) - tin

    # bisection on m (tout - tin) = q((tin + tout)/2)
    def f(t):
        tm = 0.5 * (tin + t)
        d = tm - ta
        return m * (t - tin) - (s - lin * d - c2 * abs(d) * d)

    lo, hi = tin - 200.0, tin + 200.0
    for _ in range(200):
        mid = 0.5 * (lo + hi)
        if f(lo) * f(mid) <= 0.0:
            hi = mid
        else:
            lo = mid
    if abs(0.5 * (lo + hi) - tout) > 1e-9:
        raise SystemExit(f"outlet: closed form {tout} vs bisection {0.5 * (lo + hi)}")
    text += (f"; m cp = {m:.6f}; b = c1 + c3 u + 2 m cp = {b:.6f}; "
             f"c = S + 2 m cp (tin - ta) = {cc:.6f}; x = tm - ta = {x:.9f}; "
             f"tout = 2 (ta + x) - tin = {tout:.9f} (bisection agrees to 1e-9 K)")
    return tout, text


def stagnation(c, aoi, gb, gd, ta, u, el):
    s, lin, c2, text = terms(c, aoi, gb, gd, ta, u, el)
    if c2 > 0.0:
        d = (-lin + math.sqrt(lin * lin + 4.0 * c2 * s)) / (2.0 * c2)
    else:
        d = s / lin
    text += f"; S = {s:.6f}; (c1 + c3 u) d + c2 d^2 = S: d = {d:.9f}; t = ta + d = {ta + d:.9f}"
    return ta + d, text


def collector_rows():
    rows, notes = [], []
    #        name, quantity, aoi, gb, gd, t (tm or tin), ta, u, EL, flow, cp
    cases = [
        ("uncovered U", "useful_w_m2", 0.0, 800.0, 100.0, 30.0, 25.0, 1.0, 350.0, 0.0, 0.0),
        ("uncovered U", "useful_w_m2", 0.0, 800.0, 100.0, 30.0, 25.0, 5.0, 350.0, 0.0, 0.0),
        ("uncovered U", "useful_w_m2", 0.0, 0.0, 0.0, 20.0, 15.0, 3.0, 300.0, 0.0, 0.0),
        ("uncovered U", "useful_w_m2", 45.0, 400.0, 150.0, 22.0, 28.0, 2.0, 380.0, 0.0, 0.0),
        ("glazed G", "useful_w_m2", 60.0, 500.0, 150.0, 60.0, 20.0, 3.0, 330.0, 0.0, 0.0),
        ("glazed steady", "useful_w_m2", 35.0, 650.0, 150.0, 60.0, 22.0, 4.0, 250.0, 0.0, 0.0),
        ("uncovered U", "t_out_c", 0.0, 800.0, 100.0, 28.0, 25.0, 2.0, 350.0, 0.02, 4180.0),
        ("glazed G", "t_out_c", 30.0, 700.0, 150.0, 50.0, 20.0, 3.0, 320.0, 0.015, 4180.0),
        ("uncovered U", "stagnation_c", 0.0, 800.0, 100.0, 0.0, 25.0, 2.0, 350.0, 0.0, 0.0),
        ("uncovered U", "stagnation_c", 0.0, 0.0, 0.0, 0.0, 10.0, 1.0, 280.0, 0.0, 0.0),
    ]
    for (name, qty, aoi, gb, gd, t, ta, u, el, flow, cp) in cases:
        c = COLLECTORS[name]
        if qty == "useful_w_m2":
            v, text = useful(c, aoi, gb, gd, t, ta, u, el)
            case = f"{name} tm {t} ta {ta} u {u} EL {el} aoi {aoi}"
        elif qty == "t_out_c":
            v, text = outlet(c, aoi, gb, gd, t, ta, u, el, flow, cp)
            case = f"{name} tin {t} ta {ta} u {u} EL {el} aoi {aoi}"
        else:
            v, text = stagnation(c, aoi, gb, gd, ta, u, el)
            case = f"{name} no flow ta {ta} u {u} EL {el} aoi {aoi}"
        notes.append(f"{case}, {qty}: {text}")
        kind, e0, c1, c2, c3, c4, c6, b0, kd = c
        rows.append([case, name, kind, e0, c1, c2, c3, c4, c6, b0, kd, aoi, gb, gd, t, ta, u, el,
                     flow, cp, qty, repr(v), "1e-09", ISO])
    return rows, notes


def sky_rows():
    rows, notes = [], []
    for t in [-10.0, 0.0, 20.0, 35.0]:
        e = 9.2e-6 * (t + K0) ** 2
        notes.append(f"clear emissivity at {t} C: 9.2e-6 * {t + K0}^2 = {e:.9f}")
        rows.append([f"clear sky ta {t}", t, 0.0, 0.0, "clear_emissivity", repr(e), "1e-12", SKY])
    for kt in [0.2, 0.45, 0.6, 0.8]:
        c = min(1.0, max(0.0, 2.33 - 3.33 * kt))
        notes.append(f"cloud cover at KT {kt}: clip(2.33 - 3.33*{kt}, 0, 1) = {c:.9f}")
        rows.append([f"cloud KT {kt}", 0.0, 0.0, kt, "cloud_cover", repr(c), "1e-12", SKY])
    for t, c in [(20.0, 0.0), (20.0, 0.5), (20.0, 1.0), (-5.0, 0.3), (32.0, 0.0)]:
        e = min(1.0, 9.2e-6 * (t + K0) ** 2)
        ea = min(1.0, (1.0 - 0.84 * c) * e + 0.84 * c)
        el = ea * SIGMA * (t + K0) ** 4
        tsky = (el / SIGMA) ** 0.25 - K0
        notes.append(f"long wave at {t} C, cloud {c}: eps_clear = {e:.9f}; eps = (1 - 0.84*{c})*"
                     f"{e:.9f} + 0.84*{c} = {ea:.9f}; EL = eps sigma ({t + K0})^4 = {el:.9f} W/m2; "
                     f"Tsky = (EL/sigma)^0.25 - 273.15 = {tsky:.9f} C")
        rows.append([f"sky ta {t} cloud {c}", t, c, 0.0, "long_wave_w_m2", repr(el), "1e-09", SKY])
        rows.append([f"sky ta {t} cloud {c}", t, c, 0.0, "sky_temperature_c", repr(tsky), "1e-09",
                     SKY])
    return rows, notes


def write(path, header_lines, notes, columns, rows):
    with open(path, "w", newline="\n") as f:
        for line in header_lines:
            f.write(f"# {line}\n")
        for line in notes:
            f.write(f"# {line}\n")
        f.write(",".join(columns) + "\n")
        for r in rows:
            f.write(",".join(str(x) for x in r) + "\n")


def main():
    rows, notes = collector_rows()
    write(
        os.path.join(REF, "collector_quasi_dynamic.csv"),
        [
            "ISO 9806:2017 quasi-dynamic collector model without the c5 dtm/dt term:",
            "q = eta0b (Kb(theta) Gb + Kd Gd) - c6 u G - c1 (tm - ta) - c2 (tm - ta)^2 - c3 u (tm - ta)"
            " + c4 (EL - sigma Ta^4), G = Gb + Gd, sigma = 5.670374419e-8 W/(m2 K4), Ta = ta + 273.15 K.",
            "Hand calculations by reference/scripts/make_collector_quasi_dynamic.py (Python standard"
            " library); the arithmetic of every row follows. Coefficients typical of their class"
            " (invented). eta0 = eta0b, a1 = c1 W/(m2K), a2 = c2 W/(m2K2), c3 J/(m3K), c4 -, c6 s/m,"
            " Kb one-parameter b0 form, Kd = iam_diffuse.",
            "quantity: useful_w_m2 at tm = t_c; t_out_c for inlet t_c at flow kg/(s m2) and cp"
            " J/(kg K) (m cp (tout - tin) = q((tin + tout)/2), closed form, bisection cross-check);"
            " stagnation_c: tm where q = 0.",
        ],
        notes,
        ["case", "collector", "kind", "eta0", "a1_w_m2k", "a2_w_m2k2", "c3_j_m3k", "c4", "c6_s_m",
         "iam_b0", "iam_diffuse", "aoi_deg", "g_beam_w_m2", "g_diffuse_w_m2", "t_c", "ta_c",
         "wind_m_s", "long_wave_w_m2", "flow_kg_s_m2", "cp_j_kgk", "quantity", "expected",
         "tolerance", "source"],
        rows,
    )
    rows, notes = sky_rows()
    write(
        os.path.join(REF, "weather_sky.csv"),
        [
            "Long-wave sky irradiance for the collectors (src/weather/sky.rs): clear-sky emissivity"
            " of Swinbank (1963) eps = 9.2e-6 Ta^2 (Ta in K, capped at 1); all-sky emissivity"
            " (1 - 0.84 c) eps + 0.84 c and cloud cover c = clip(2.33 - 3.33 KT, 0, 1) of Campbell"
            " & Norman (1998) ch. 10 (as quoted in public code; the book was not read);"
            " EL = eps sigma Ta^4, sigma = 5.670374419e-8; Tsky = (EL/sigma)^0.25.",
            "Hand calculations by reference/scripts/make_collector_quasi_dynamic.py (Python standard"
            " library); the arithmetic of every row follows. Temperatures degC, EL W/m2.",
        ],
        notes,
        ["case", "t_air_c", "cloud_cover", "kt", "quantity", "expected", "tolerance", "source"],
        rows,
    )


if __name__ == "__main__":
    main()
