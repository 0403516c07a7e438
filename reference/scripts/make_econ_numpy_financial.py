"""Write reference/econ_numpy_financial.csv: NPV and IRR of yearly cash flows.

Reference library: numpy-financial==1.0.0 (numpy 2.4.6), Python 3.11.
    python3 -m venv /work/venv-econ && /work/venv-econ/bin/pip install numpy-financial==1.0.0
    /work/venv-econ/bin/python reference/scripts/make_econ_numpy_financial.py

numpy_financial.npv(rate, values) discounts values[0] by (1+rate)^0 (year 0 undiscounted), the
convention of parhelion's feasibility::economics::npv. numpy_financial.irr returns the real
root closest to zero. Cash flows are invented; 'flows' lists years 0.. separated by spaces.
"""
import os

import numpy_financial as npf

assert npf.__version__ == "1.0.0", npf.__version__
SRC = "numpy-financial 1.0.0"
OUT = os.path.join(os.path.dirname(__file__), "..", "econ_numpy_financial.csv")

CASES = [
    ("c1", 0.05, [-1000, 300, 400, 500]),
    ("c2", 0.08, [-50000] + [6500] * 15),
    ("c3", 0.03, [-120000, 9000, 9500, 10000, 10500, 11000, 11500, 12000, 12500, 13000, 13500,
                  14000, 14500, 15000, 15500, 16000, 16500, 17000, 17500, 18000, 18500]),
    ("c4", 0.10, [-2500, 800, 800, 800, -400, 900, 900]),
    ("c5", 0.0, [-100, 20, 20, 20, 20]),
    ("c6", 0.12, [-10000, 2000, 4000, 6000, 1000]),
    ("c7", -0.02, [-500, 100, 100, 100, 100, 100]),
]


def main():
    with open(OUT, "w") as f:
        f.write("# NPV and IRR of invented yearly cash flows (year 0 first, space separated).\n"
                "# Made by reference/scripts/make_econ_numpy_financial.py with numpy-financial 1.0.0.\n")
        f.write("case,rate,flows,quantity,expected,tolerance,source\n")
        for case, rate, flows in CASES:
            fl = " ".join(str(v) for v in flows)
            v = float(npf.npv(rate, flows))
            f.write(f"{case},{rate},{fl},npv,{v:.9f},1e-6,{SRC} npv\n")
            r = float(npf.irr(flows))
            f.write(f"{case},{rate},{fl},irr,{r:.12f},1e-9,{SRC} irr\n")


if __name__ == "__main__":
    main()
