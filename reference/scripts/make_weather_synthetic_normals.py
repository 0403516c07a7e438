"""Make reference/weather_synthetic_normals.csv: the monthly normals of the two demo climates.

No library: the values are invented, typical of their climate type (not measured data of any
real place; the coordinates are invented too). The table is both the input of the synthetic
weather generator and the expected result of its round trip (monthly means of the synthetic
year must reproduce the normals). Tolerances: 1 % of GHI, 0.05 K for temperatures and dew
point, 0.1 %-point for RH.

Run: python3 reference/scripts/make_weather_synthetic_normals.py
"""
import os

CLIMATES = [
    # name, lat, lon, utc offset, elevation, {quantity: 12 values}
    ("Port Meridian (invented; hot-humid coastal)", 11.7, 88.1, 6.0, 5.0, {
        "ghi_kwh_m2_day": [5.0, 5.7, 6.3, 6.4, 5.7, 4.9, 4.6, 4.7, 4.9, 4.8, 4.7, 4.7],
        "t_mean_c": [26.0, 26.8, 28.0, 29.2, 29.4, 28.6, 28.1, 28.0, 27.8, 27.6, 27.0, 26.2],
        "t_range_k": [7.0, 7.2, 7.0, 6.6, 6.0, 5.4, 5.2, 5.2, 5.4, 5.8, 6.4, 6.8],
        "t_dew_c": [20.0, 20.8, 22.0, 23.4, 24.0, 24.0, 23.6, 23.6, 23.4, 23.0, 22.0, 20.6],
    }),
    ("Qasr Alvar (invented; hot-dry inland)", 27.9, 5.1, 1.0, 600.0, {
        "ghi_kwh_m2_day": [4.4, 5.4, 6.5, 7.4, 7.9, 8.3, 8.1, 7.6, 6.8, 5.7, 4.6, 4.1],
        "t_mean_c": [12.5, 15.0, 19.0, 24.0, 28.5, 32.0, 33.0, 32.5, 29.5, 24.0, 17.5, 13.5],
        "t_range_k": [13.5, 14.0, 14.5, 15.0, 15.5, 15.5, 15.0, 14.5, 14.5, 14.0, 13.5, 13.0],
        "rh_pct": [40.0, 33.0, 27.0, 21.0, 18.0, 16.0, 17.0, 19.0, 22.0, 28.0, 36.0, 42.0],
    }),
]
TOL = {"t_mean_c": 0.05, "t_range_k": 0.05, "t_dew_c": 0.05, "rh_pct": 0.1}

here = os.path.dirname(os.path.abspath(__file__))
path = os.path.join(here, "..", "weather_synthetic_normals.csv")
with open(path, "w") as f:
    f.write("# Monthly normals of two demo climates (invented places and values, typical of their\n")
    f.write("# climate type). Inputs of the synthetic weather year AND its expected round trip:\n")
    f.write("# the synthetic year's monthly mean of daily GHI (kWh/m2/day), of daily (max+min)/2\n")
    f.write("# dry-bulb, of daily max-min range, of dew point (or RH at the monthly mean dry-bulb\n")
    f.write("# from the mean dew point) must reproduce them. Seed 1.\n")
    f.write("# Made by reference/scripts/make_weather_synthetic_normals.py.\n")
    f.write("climate,latitude_deg,longitude_deg,utc_offset_h,elevation_m,month,quantity,"
            "expected,tolerance,source\n")
    for name, lat, lon, utc, elev, q in CLIMATES:
        for key, vals in q.items():
            for m, v in enumerate(vals, start=1):
                tol = round(0.01 * v, 4) if key == "ghi_kwh_m2_day" else TOL[key]
                f.write(f"{name},{lat},{lon},{utc},{elev},{m},{key},{v},{tol},"
                        f"input normals (round trip)\n")
print(path)
