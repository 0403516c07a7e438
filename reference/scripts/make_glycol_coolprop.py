"""Propylene glycol–water properties for parhelion's collector-loop fluid table.

Writes two tables of density and specific heat of aqueous propylene glycol (200 kPa) from
CoolProp's incompressible-fluid data "MPG" (a fit of Melinder, Properties of Secondary
Working Fluids for Indirect Systems, IIR 2010):
- reference/glycol_grid_coolprop.csv: the data table src/props/glycol.rs interpolates
  (mass fraction 0.25, 0.30, 0.40, 0.50; 0 to 100 °C every 10 K);
- reference/glycol_check_coolprop.csv: points between the grid lines, against which
  `parhelion checks` tests the interpolation (tolerances: the measured interpolation error,
  rounded up).

Pinned: CoolProp==6.6.0 (pip install CoolProp==6.6.0 in a virtual environment outside the
repository).
"""
import CoolProp
from CoolProp.CoolProp import PropsSI

assert CoolProp.__version__ == "6.6.0", CoolProp.__version__
import sys

grid_x = [0.25, 0.30, 0.40, 0.50]
grid_t = list(range(0, 101, 10))
check_x = [0.275, 0.35, 0.45]
check_t = [5, 25, 45, 65, 85, 95]
SRC = "CoolProp 6.6.0 INCOMP::MPG (Melinder 2010)"


def props(x, t):
    fl = f"INCOMP::MPG[{x}]"
    return PropsSI("D", "T", t + 273.15, "P", 2e5, fl), PropsSI("C", "T", t + 273.15, "P", 2e5, fl)


with open("reference/glycol_grid_coolprop.csv", "w") as f:
    f.write("# Aqueous propylene glycol data table (" + SRC + "), 200 kPa.\n")
    f.write("# Made by reference/scripts/make_glycol_coolprop.py; interpolated by src/props/glycol.rs.\n")
    f.write("mass_fraction,t_c,rho_kg_m3,cp_j_kgk\n")
    for x in grid_x:
        for t in grid_t:
            rho, cp = props(x, t)
            f.write(f"{x},{t},{rho:.4f},{cp:.3f}\n")

with open("reference/glycol_check_coolprop.csv", "w") as f:
    f.write("# Aqueous propylene glycol between the grid lines of glycol_grid_coolprop.csv (" + SRC + ").\n")
    f.write("# Tolerance: bilinear interpolation error measured on these points, rounded up.\n")
    f.write("mass_fraction,t_c,quantity,expected,tolerance,source\n")
    for x in check_x:
        for t in check_t:
            rho, cp = props(x, t)
            f.write(f"{x},{t},rho_kg_m3,{rho:.4f},0.5,{SRC}\n")
            f.write(f"{x},{t},cp_j_kgk,{cp:.3f},4.0,{SRC}\n")
print("written", file=sys.stderr)
