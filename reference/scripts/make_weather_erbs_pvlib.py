"""Make reference/weather_erbs_pvlib.csv: Erbs et al. (1982) GHI -> DNI, DHI by pvlib.

Reference library: pvlib-python 0.16.1 (pip install pvlib==0.16.1), function
pvlib.irradiance.erbs with its defaults (min_cos_zenith=0.065, max_zenith=87).
The extraterrestrial normal irradiance pvlib uses internally (get_extra_radiation, Spencer,
solar constant 1366.1 W/m2) is written to the table so the Rust model gets the same input.

Run: /work/venv-weather/bin/python reference/scripts/make_weather_erbs_pvlib.py
"""
import os

import numpy as np
import pvlib

assert pvlib.__version__ == "0.16.1", pvlib.__version__

# (case, ghi W/m2, zenith deg, day of year): overcast to clear, high to low sun,
# the kt breakpoints 0.22 / 0.8, the low-sun guards (86.27 deg and 87 deg) and zero GHI.
CASES = [
    ("overcast high sun", 120.0, 20.0, 172),
    ("kt 0.15", 190.0, 35.0, 100),
    ("just below kt 0.22", 250.0, 30.0, 15),
    ("just above kt 0.22", 270.0, 30.0, 15),
    ("broken cloud", 420.0, 45.0, 200),
    ("partly cloudy", 520.0, 30.0, 250),
    ("kt 0.5 winter", 300.0, 60.0, 355),
    ("hazy", 650.0, 25.0, 150),
    ("clear noon summer", 980.0, 12.0, 180),
    ("clear noon winter", 560.0, 55.0, 10),
    ("clear morning", 420.0, 62.0, 80),
    ("just below kt 0.8", 900.0, 35.0, 300),
    ("above kt 0.8", 1020.0, 25.0, 3),
    ("clear low sun", 180.0, 78.0, 120),
    ("cloudy low sun", 60.0, 80.0, 330),
    ("zenith 85", 70.0, 85.0, 45),
    ("zenith 86.5 (cos floored)", 40.0, 86.5, 60),
    ("zenith 86.9 (cos floored)", 25.0, 86.9, 270),
    ("zenith 88 (beam zeroed)", 12.0, 88.0, 220),
    ("zero ghi", 0.0, 50.0, 90),
]

rows = []
for case, ghi, zen, doy in CASES:
    out = pvlib.irradiance.erbs(np.array([ghi]), np.array([zen]), np.array([doy]))
    extra = float(pvlib.irradiance.get_extra_radiation(doy))
    for q in ("dni", "dhi"):
        rows.append((case, ghi, zen, doy, extra, q, float(out[q][0])))

here = os.path.dirname(os.path.abspath(__file__))
path = os.path.join(here, "..", "weather_erbs_pvlib.csv")
with open(path, "w") as f:
    f.write("# Erbs et al. (1982) decomposition of GHI into DNI and DHI, W/m2.\n")
    f.write("# Expected values from pvlib-python 0.16.1 pvlib.irradiance.erbs (defaults:\n")
    f.write("# min_cos_zenith=0.065, max_zenith=87); dni_extra_w_m2 is pvlib's\n")
    f.write("# get_extra_radiation(doy) (Spencer, 1366.1 W/m2), passed to the Rust model.\n")
    f.write("# Made by reference/scripts/make_weather_erbs_pvlib.py.\n")
    f.write("case,ghi_w_m2,zenith_deg,doy,dni_extra_w_m2,quantity,expected,tolerance,source\n")
    for case, ghi, zen, doy, extra, q, v in rows:
        f.write(f"{case},{ghi},{zen},{doy},{extra:.6f},{q}_w_m2,{v:.6f},0.001,"
                f"pvlib-python 0.16.1 irradiance.erbs\n")
print(path, len(rows))
