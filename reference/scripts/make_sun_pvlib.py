"""Write reference/sun_position_pvlib.csv and reference/sun_tracking_pvlib.csv from pvlib.

Reference library: pvlib==0.16.1 (numpy 2.4.6, pandas 3.1.1), Python 3.11.
Run from the repository root with a virtual environment outside the repo:
    python3 -m venv /work/venv-sun && /work/venv-sun/bin/pip install pvlib==0.16.1
    /work/venv-sun/bin/python reference/scripts/make_sun_pvlib.py

Positions: pvlib.solarposition.get_solarposition(method='nrel_numpy') -- NREL SPA -- at the
middle of 20 hours (i + 0.5 h local standard time, hour index i of the 365-day year, leap
years skip 29 February) at two invented sites, with the project's refraction assumptions:
pressure = ASHRAE 2017 standard atmosphere at the site elevation,
101325 (1 - 2.25577e-5 z)^5.2559 Pa, temperature 15 C; delta_t left to pvlib's own estimate
(its effect on position is ~1e-5 deg per second). Recorded: apparent_zenith and azimuth.

Tracking: pvlib.tracking.singleaxis(backtrack=False, max_angle=90, axis_tilt=0) for a
horizontal north-south axis (axis_azimuth=180) and east-west axis (axis_azimuth=90) at
invented sun positions: aoi and surface_tilt.
"""
import csv
import datetime as dt
import os

import numpy as np
import pandas as pd
import pvlib

assert pvlib.__version__ == "0.16.1", pvlib.__version__
SRC = "pvlib 0.16.1"
HERE = os.path.dirname(__file__)
MONTH_DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31]

# Invented sites: (name, lat, lon, elevation m, UTC offset h, year).
SITES = [
    ("A", 34.6, 33.0, 650.0, 2.0, 2023),
    ("B", -23.7, 133.9, 550.0, 9.5, 2024),
]
# Hour indices of the 365-day year (sun up mostly, a few night hours, both seasons).
HOURS = [10, 12, 15, 23, 1000, 1452, 2000, 2163, 3000, 3970, 4100, 4298,
         4740, 5000, 5770, 6100, 6800, 7300, 8000, 8749]


def month_day(n):
    for m, ln in enumerate(MONTH_DAYS, start=1):
        if n <= ln:
            return m, n
        n -= ln
    raise ValueError(n)


def positions():
    rows = []
    for name, lat, lon, elev, off, year in SITES:
        tz = dt.timezone(dt.timedelta(hours=off))
        times = []
        for i in HOURS:
            m, d = month_day(i // 24 + 1)
            times.append(dt.datetime(year, m, d, i % 24, 30, tzinfo=tz))
        idx = pd.DatetimeIndex(times)
        pressure = 101325.0 * (1.0 - 2.25577e-5 * elev) ** 5.2559
        sp = pvlib.solarposition.get_solarposition(
            idx, lat, lon, altitude=elev, pressure=pressure, method="nrel_numpy",
            temperature=15.0)
        for i, (_, r) in zip(HOURS, sp.iterrows()):
            for q, col, tol in (("zenith_deg", "apparent_zenith", 0.01),
                                ("azimuth_deg", "azimuth", 0.01)):
                rows.append(dict(case=f"site {name} hour {i}", latitude_deg=lat,
                                 longitude_deg=lon, elevation_m=elev, utc_offset_h=off,
                                 year=year, hour_index=i, quantity=q,
                                 expected=f"{r[col]:.7f}", tolerance=tol,
                                 source=f"{SRC} solarposition.get_solarposition "
                                        f"nrel_numpy {col}"))
    path = os.path.join(HERE, "..", "sun_position_pvlib.csv")
    with open(path, "w", newline="") as f:
        f.write("# Solar position (apparent topocentric zenith, azimuth clockwise from north) at\n")
        f.write("# hour midpoints of a 365-day year at two invented sites, NREL SPA in pvlib\n")
        f.write("# 0.16.1 (method nrel_numpy), pressure = ASHRAE standard atmosphere at the\n")
        f.write("# elevation, 15 C. Made by reference/scripts/make_sun_pvlib.py.\n")
        w = csv.DictWriter(f, fieldnames=list(rows[0].keys()))
        w.writeheader()
        w.writerows(rows)
    print(f"wrote {len(rows)} rows to {path}")


# Invented sun positions (apparent zenith, azimuth).
SUNS = [(20, 150), (35, 100), (50, 250), (65, 80), (75, 290), (85, 60), (45, 180),
        (30, 20), (60, 340), (80, 120)]


def tracking():
    rows = []
    z = np.array([s[0] for s in SUNS], dtype=float)
    a = np.array([s[1] for s in SUNS], dtype=float)
    for mode, axis_az in (("one_axis_ns", 180.0), ("one_axis_ew", 90.0)):
        t = pvlib.tracking.singleaxis(z, a, axis_tilt=0, axis_azimuth=axis_az,
                                      max_angle=90, backtrack=False)
        for k, (zz, aa) in enumerate(SUNS):
            for q, col in (("aoi_deg", "aoi"), ("tilt_deg", "surface_tilt")):
                rows.append(dict(case=f"{mode} z{zz} a{aa}", mode=mode, zenith_deg=zz,
                                 azimuth_deg=aa, quantity=q,
                                 expected=f"{float(t[col][k]):.9f}", tolerance=1e-6,
                                 source=f"{SRC} tracking.singleaxis axis_azimuth={axis_az:g} "
                                        f"backtrack=False {col}"))
    path = os.path.join(HERE, "..", "sun_tracking_pvlib.csv")
    with open(path, "w", newline="") as f:
        f.write("# Horizontal single-axis tracking (true tracking, no backtracking): angle of\n")
        f.write("# incidence and plane tilt for invented sun positions, pvlib 0.16.1\n")
        f.write("# tracking.singleaxis. Made by reference/scripts/make_sun_pvlib.py.\n")
        w = csv.DictWriter(f, fieldnames=list(rows[0].keys()))
        w.writeheader()
        w.writerows(rows)
    print(f"wrote {len(rows)} rows to {path}")


if __name__ == "__main__":
    positions()
    tracking()
