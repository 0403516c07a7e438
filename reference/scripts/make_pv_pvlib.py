"""Write reference/pv_pvlib.csv: PV cell temperature, DC and AC power from pvlib.

Reference library: pvlib==0.16.1 (numpy 2.4.6, pandas 3.1.1), Python 3.11.
Run from anywhere with a virtual environment outside the repo:
    python3 -m venv /work/venv-econ && /work/venv-econ/bin/pip install pvlib==0.16.1
    /work/venv-econ/bin/python reference/scripts/make_pv_pvlib.py

Array (invented, typical of the class): 10 kWp, gamma -0.0037 1/K, module efficiency 0.20,
DC losses 0.14, inverter eta_nom 0.96, DC/AC ratio 1.2 (P_ac0 = 8.3333 kW, inverter
pdc0 = P_ac0/0.96). For ~15 invented hours (plane irradiance, ambient, wind) it records:
  t_cell_faiman_c  pvlib.temperature.faiman(poa, t_amb, wind, u0=25.0, u1=6.84)
  t_cell_noct_c    pvlib.temperature.noct_sam(poa, t_amb, wind, noct=45, module_efficiency=0.20,
                   transmittance_absorptance=0.9, array_height=1, mount_standoff=4)
  dc_gross_kw      pvlib.pvsystem.pvwatts_dc(poa, t_cell_faiman, pdc0=10, gamma_pdc=-0.0037)
  ac_kw            pvlib.inverter.pvwatts(dc_gross*(1-0.14), pdc0=(10/1.2)/0.96, eta_inv_nom=0.96)
  dc_gross_noct_kw and ac_noct_kw: the same with the NOCT cell temperature.
"""
import csv
import os

import pvlib
from pvlib import temperature, pvsystem, inverter

assert pvlib.__version__ == "0.16.1", pvlib.__version__
SRC = "pvlib 0.16.1"
OUT = os.path.join(os.path.dirname(__file__), "..", "pv_pvlib.csv")

KWP, GAMMA, ETA_MOD, LOSS, ETA_INV, DC_AC = 10.0, -0.0037, 0.20, 0.14, 0.96, 1.2
PAC0 = KWP / DC_AC
PDC0_INV = PAC0 / ETA_INV

# (case, poa W/m2, ambient C, wind m/s)
HOURS = [
    ("h01", 0.0, 12.0, 2.0),
    ("h02", 0.5, 8.0, 1.0),
    ("h03", 50.0, 5.0, 3.0),
    ("h04", 120.0, 15.0, 0.0),
    ("h05", 250.0, 18.0, 1.5),
    ("h06", 400.0, 22.0, 4.0),
    ("h07", 550.0, 25.0, 2.0),
    ("h08", 700.0, 28.0, 1.0),
    ("h09", 800.0, 20.0, 1.0),
    ("h10", 850.0, 35.0, 0.5),
    ("h11", 950.0, 30.0, 3.0),
    ("h12", 1000.0, 25.0, 1.0),
    ("h13", 1050.0, 10.0, 6.0),
    ("h14", 1100.0, -5.0, 8.0),
    ("h15", 1150.0, 42.0, 0.2),
]


def main():
    rows = []
    for case, g, ta, ws in HOURS:
        tf = float(temperature.faiman(g, ta, ws, u0=25.0, u1=6.84))
        tn = float(temperature.noct_sam(g, ta, ws, noct=45.0, module_efficiency=ETA_MOD,
                                        transmittance_absorptance=0.9, array_height=1,
                                        mount_standoff=4))
        q = {"t_cell_faiman_c": (tf, 1e-9, "temperature.faiman u0=25 u1=6.84"),
             "t_cell_noct_c": (tn, 1e-9, "temperature.noct_sam noct=45 eta=0.20 height=1 standoff=4")}
        for model, tc in (("faiman", tf), ("noct", tn)):
            dc = float(pvsystem.pvwatts_dc(g, tc, KWP, GAMMA))
            ac = float(inverter.pvwatts(dc * (1 - LOSS), PDC0_INV, eta_inv_nom=ETA_INV))
            sfx = "" if model == "faiman" else "_noct"
            q["dc_gross" + sfx + "_kw"] = (dc, 1e-9, f"pvsystem.pvwatts_dc gamma=-0.0037 ({model} T_cell)")
            q["ac" + sfx + "_kw"] = (ac, 1e-9, f"inverter.pvwatts eta_nom=0.96 on dc*(1-0.14) ({model} T_cell)")
        for name, (v, tol, how) in q.items():
            rows.append([case, g, ta, ws, name, f"{v:.9f}", tol, f"{SRC} {how}"])
    with open(OUT, "w", newline="") as f:
        f.write("# PV cell temperature (Faiman, NOCT/SAM), PVWatts DC power and PVWatts inverter AC\n"
                "# power for invented hours; 10 kWp, gamma -0.0037/K, module eff 0.20, DC losses 0.14,\n"
                "# inverter eta_nom 0.96, DC/AC 1.2. Made by reference/scripts/make_pv_pvlib.py with\n"
                "# pvlib 0.16.1. Irradiance W/m2 (also the effective irradiance), temperatures C, kW.\n")
        w = csv.writer(f, lineterminator="\n")
        w.writerow(["case", "poa_w_m2", "t_amb_c", "wind_m_s", "quantity", "expected", "tolerance", "source"])
        w.writerows(rows)


if __name__ == "__main__":
    main()
