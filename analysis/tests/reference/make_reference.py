#!/usr/bin/env python3
"""Reference values for the analysis crate's tests, computed with general-purpose libraries.

Nothing here calls wrackline: point sets and count series are generated from fixed seeds,
and every expected value comes from shapely (convex hull), pyproj (geodesic area on WGS84
and the Lambert azimuthal equal-area projection), statsmodels (Poisson GLM) and scipy
(Kendall's tau, Theil-Sen slope). The library versions are written into each file.

Regenerate (from the repository root):

    python3 -m venv /tmp/venv-analysis
    /tmp/venv-analysis/bin/pip install pyproj shapely statsmodels scipy geographiclib numpy
    /tmp/venv-analysis/bin/python analysis/tests/reference/make_reference.py

(or into target/venv, which `cargo xtask test` makes for the export tests).

The grid conventions mirror the crate's documented method, not its code: cells are
floor((x - shift) / cell) in the projection's metres, shifts are 0, 1/4, 1/2 and 3/4 of a
cell east and north (16 origins), and longitudes are read in whichever frame, [-180, 180]
or [0, 360), gives the narrower span before the hull is drawn (only when the points have
both negative and non-negative longitudes; otherwise the signed frame).
"""

import json
import math
import pathlib

import numpy as np
import pyproj
import scipy
import scipy.stats
import shapely
import statsmodels
import statsmodels.api as sm

OUT = pathlib.Path(__file__).resolve().parent
GEOD = pyproj.Geod(ellps="WGS84")
DEFAULT_CENTRE = (52.0, 10.0)


def versions():
    return {
        "pyproj": pyproj.__version__,
        "proj": pyproj.proj_version_str,
        "shapely": shapely.__version__,
        "geos": shapely.geos_version_string,
        "statsmodels": statsmodels.__version__,
        "scipy": scipy.__version__,
        "numpy": np.__version__,
    }


def laea(centre):
    lat0, lon0 = centre
    return pyproj.Proj(
        f"+proj=laea +lat_0={lat0} +lon_0={lon0} +x_0=0 +y_0=0 +ellps=WGS84 +units=m +no_defs"
    )


# ---------------------------------------------------------------- range: EOO and AOO


def narrower_frame(lons):
    if not ((lons < 0).any() and (lons >= 0).any()):
        return "Signed", lons
    signed = lons.max() - lons.min()
    shifted = np.where(lons < 0, lons + 360.0, lons)
    positive = shifted.max() - shifted.min()
    return ("Positive", shifted) if positive < signed else ("Signed", lons)


def eoo_reference(lats, lons):
    frame, frame_lons = narrower_frame(lons)
    hull = shapely.convex_hull(shapely.multipoints(np.column_stack([frame_lons, lats])))
    if hull.geom_type != "Polygon":
        return frame, 0.0, 0
    x, y = hull.exterior.coords.xy
    area, _perimeter = GEOD.polygon_area_perimeter(np.array(x), np.array(y))
    return frame, abs(area) / 1e6, len(x) - 1


def aoo_reference(lats, lons, centre, cell_km):
    x, y = laea(centre)(lons, lats)
    cell = cell_km * 1000.0
    counts = []
    for east in range(4):
        for north in range(4):
            ci = np.floor((x - east * cell / 4) / cell).astype(np.int64)
            cj = np.floor((y - north * cell / 4) / cell).astype(np.int64)
            counts.append(
                {"east_quarters": east, "north_quarters": north,
                 "cells": int(len(np.unique(np.column_stack([ci, cj]), axis=0)))}
            )
    return counts


def coastline_points(rng, n, lat0, lat1, lon0, lon1, spread_deg):
    """Points scattered about a wiggly line, like strandings along a coast."""
    t = rng.uniform(0, 1, n)
    lon = lon0 + (lon1 - lon0) * t
    lat = lat0 + (lat1 - lat0) * (0.5 + 0.4 * np.sin(7 * t))
    return lat + rng.normal(0, spread_deg, n), lon + rng.normal(0, spread_deg, n)


def wrap(lons):
    return (lons + 180.0) % 360.0 - 180.0


def generated_sets():
    rng = np.random.default_rng(20240611)
    sets = []

    lat, lon = coastline_points(rng, 300, 49.8, 51.0, -5.5, 1.5, 0.03)
    sets.append(("channel_coast", lat, lon, DEFAULT_CENTRE, 2.0))

    sets.append(("north_sea_sparse", rng.uniform(51, 61, 40), rng.uniform(-3, 9, 40), DEFAULT_CENTRE, 2.0))

    lat, lon = coastline_points(rng, 200, 35.0, 38.0, 10.0, 20.0, 0.05)
    sets.append(("mediterranean", lat, lon, DEFAULT_CENTRE, 2.0))

    sets.append(("high_north", rng.uniform(68, 71, 120), rng.uniform(14, 30, 120), DEFAULT_CENTRE, 2.0))

    lat, lon = coastline_points(rng, 150, -20.0, -15.0, 176.0, 182.0, 0.04)
    sets.append(("antimeridian_pacific", lat, wrap(lon), (-17.0, 179.0), 2.0))

    sets.append(("southern_cape", rng.uniform(-35, -33, 80), rng.uniform(18, 27, 80), (-30.0, 25.0), 2.0))

    lat, lon = 50.2 + rng.normal(0, 0.08, 5000), -4.1 + rng.normal(0, 0.12, 5000)
    sets.append(("estuary_dense", lat, lon, DEFAULT_CENTRE, 2.0))
    sets.append(("estuary_dense_5km_cells", lat, lon, DEFAULT_CENTRE, 5.0))

    lat, lon = 50.37 + rng.uniform(0, 0.003, 3), -4.14 + rng.uniform(0, 0.004, 3)
    sets.append(("tiny_cluster", lat, lon, DEFAULT_CENTRE, 2.0))

    sets.append(("one_meridian", np.array([50.0, 50.5, 51.0, 51.5]), np.full(4, -4.0), DEFAULT_CENTRE, 2.0))
    return sets


def square_corner_set():
    """Corners of a 1.5 km square placed across a cell corner of the fixed grid.

    Projected corners at 1.25 and 2.75 km past a whole cell straddle the fixed grid's lines
    (4 cells) but fit in one cell of the grid shifted by 1 km (IUCN Guidelines' point that
    the origin changes the count).
    """
    base_x, base_y = -400_000.0, -300_000.0
    xs = base_x + np.array([1250.0, 2750.0, 2750.0, 1250.0])
    ys = base_y + np.array([1250.0, 1250.0, 2750.0, 2750.0])
    lon, lat = laea(DEFAULT_CENTRE)(xs, ys, inverse=True)
    return ("square_corners", np.array(lat), np.array(lon), DEFAULT_CENTRE, 2.0)


def rule_centre(lats, lons):
    """The crate's documented default-grid rule (its README and aoo.rs notes), not its code:
    the default centre while every point is within 60 degrees of arc of it, else the mean of
    the points' unit vectors rounded to whole 5 degrees (latitude within +-75)."""
    phi, lam = np.radians(lats), np.radians(lons)
    u = np.column_stack([np.cos(phi) * np.cos(lam), np.cos(phi) * np.sin(lam), np.sin(phi)])
    p0, l0 = np.radians(DEFAULT_CENTRE)
    c = np.array([math.cos(p0) * math.cos(l0), math.cos(p0) * math.sin(l0), math.sin(p0)])
    if np.degrees(np.arccos(np.clip(u @ c, -1, 1))).max() <= 60.0:
        return list(DEFAULT_CENTRE)
    s = u.sum(axis=0)
    lat = math.degrees(math.asin(s[2] / np.linalg.norm(s)))
    lon = math.degrees(math.atan2(s[1], s[0]))
    lat = min(max(round(lat / 5.0) * 5.0, -75.0), 75.0)
    lon = round(lon / 5.0) * 5.0
    lon = lon - 360.0 if lon > 180.0 else lon + 360.0 if lon <= -180.0 else lon
    return [lat, lon]


def range_fixture():
    out = []
    for name, lat, lon, centre, cell_km in generated_sets() + [square_corner_set()]:
        lat, lon = np.round(lat, 7), np.round(lon, 7)
        frame, eoo_km2, hull_corners = eoo_reference(lat, lon)
        counts = aoo_reference(lat, lon, centre, cell_km)
        out.append({
            "name": name,
            "grid_centre": list(centre),
            "cell_size_km": cell_km,
            "points": [[float(a), float(b)] for a, b in zip(lat, lon)],
            "longitude_frame": frame,
            "eoo_km2": eoo_km2,
            "hull_corners": hull_corners,
            "aoo_cells_by_shift": counts,
            "rule_centre": rule_centre(lat, lon),
            "aoo_cells_by_shift_rule_grid": aoo_reference(lat, lon, rule_centre(lat, lon), cell_km),
        })
    return out


def projection_fixture():
    rng = np.random.default_rng(7)
    checks = []
    for centre in [DEFAULT_CENTRE, (-17.0, 179.0), (-30.0, 25.0), (10.0, -60.0)]:
        lat = np.clip(centre[0] + rng.uniform(-40, 40, 25), -89.9, 89.9)
        lon = wrap(centre[1] + rng.uniform(-40, 40, 25))
        x, y = laea(centre)(lon, lat)
        for a, b, e, n in zip(lat, lon, x, y):
            checks.append({"centre": list(centre), "lat": float(a), "lon": float(b),
                           "easting_m": float(e), "northing_m": float(n)})
    return checks


# ---------------------------------------------------------------- trends


def poisson_fit(exog, counts, offsets):
    model = sm.GLM(counts, exog, family=sm.families.Poisson(), offset=offsets)
    fit = model.fit(tol=1e-12)
    scaled = model.fit(scale="X2", tol=1e-12)
    # With the dispersion estimated, intervals come from Student's t on the residual
    # degrees of freedom (use_t=True); with the Poisson scale fixed at 1, from the normal.
    scaled_t = model.fit(scale="X2", tol=1e-12, use_t=True)
    return {
        "params": fit.params.tolist(),
        "bse": fit.bse.tolist(),
        "bse_scaled_pearson": scaled.bse.tolist(),
        "conf_int_95": fit.conf_int(alpha=0.05).tolist(),
        "conf_int_95_scaled_t": scaled_t.conf_int(alpha=0.05).tolist(),
        "deviance": float(fit.deviance),
        "pearson_chi2": float(fit.pearson_chi2),
        "df_resid": int(fit.df_resid),
    }


def dobson_fixture():
    deaths = [32, 104, 206, 186, 102, 2, 12, 28, 28, 31]
    person_years = [52407, 43248, 28612, 12663, 5317, 18790, 10673, 5710, 2585, 1462]
    rows = []
    for i in range(10):
        age, smoke = (i % 5) + 1, 1 if i < 5 else 0
        rows.append([1.0, age, age * age, smoke, smoke * age])
    fit = poisson_fit(np.array(rows, float), np.array(deaths, float), np.log(person_years))
    return {"rows": rows, "deaths": deaths, "person_years": person_years, **fit}


def yearly_series(rng, name, slope, overdispersion, first_year=2005):
    years = np.arange(first_year, 2025)
    effort = np.round(rng.uniform(20, 80, len(years)), 1)
    rate = np.exp(-1.0 + slope * (years - years.mean()))
    mean = effort * rate
    if overdispersion:
        size = 2.0
        counts = rng.negative_binomial(size, size / (size + mean))
    else:
        counts = rng.poisson(mean)
    exog = np.column_stack([np.ones(len(years)), years - years.mean()])
    fit = poisson_fit(exog, counts.astype(float), np.log(effort))
    return {"name": name, "years": years.tolist(), "counts": counts.tolist(),
            "effort": effort.tolist(), **fit}


def general_design(rng):
    n = 60
    x1 = rng.uniform(-1, 1, n)
    x2 = rng.integers(0, 2, n).astype(float)
    offsets = np.log(rng.uniform(5, 50, n))
    exog = np.column_stack([np.ones(n), x1, x2, x1 * x2])
    mean = np.exp(offsets + exog @ np.array([-1.2, 0.6, 0.4, -0.5]))
    counts = rng.poisson(mean).astype(float)
    fit = poisson_fit(exog, counts, offsets)
    return {"rows": exog.tolist(), "counts": counts.tolist(), "offsets": offsets.tolist(), **fit}


def mann_kendall_series(rng):
    """S and Var(S) recovered from scipy's Kendall tau-b against time, Sen from Theil-Sen."""
    out = []
    for name, values in [
        ("rounded_decline", np.round(10 - 0.3 * np.arange(25) + rng.normal(0, 2, 25))),
        ("noisy_flat", np.round(rng.normal(5, 2, 30), 1)),
        ("gappy_rise", np.round(np.arange(15) * 0.2 + rng.normal(0, 1, 15), 1)),
    ]:
        times = np.arange(len(values), dtype=float)
        if name == "gappy_rise":
            times = np.cumsum(rng.integers(1, 4, len(values))).astype(float)
        n = len(values)
        tau, p_plain = scipy.stats.kendalltau(times, values, method="asymptotic")
        pairs = n * (n - 1) / 2
        _, tie_counts = np.unique(values, return_counts=True)
        tied_pairs = float(np.sum(tie_counts * (tie_counts - 1) / 2))
        s = tau * math.sqrt(pairs * (pairs - tied_pairs))
        z_plain = scipy.stats.norm.isf(p_plain / 2)
        var_s = (s / z_plain) ** 2
        s_int = int(round(s))
        z_cc = (s_int - np.sign(s_int)) / math.sqrt(var_s)
        sen = scipy.stats.theilslopes(values, times).slope
        out.append({"name": name, "times": times.tolist(), "values": values.tolist(),
                    "s": s_int, "var_s": var_s, "z": float(z_cc),
                    "p_value": float(2 * scipy.stats.norm.sf(abs(z_cc))), "sen_slope": float(sen)})
    return out


def write(name, payload):
    path = OUT / name
    path.write_text(json.dumps({"generated_by": "make_reference.py", "versions": versions(), **payload},
                               indent=1) + "\n")
    print(f"wrote {path}")


def main():
    write("range.json", {"sets": range_fixture(), "projection": projection_fixture()})
    rng = np.random.default_rng(31337)
    write("trend.json", {
        "dobson": dobson_fixture(),
        "yearly": [yearly_series(rng, "walks_poisson", -0.04, False),
                   yearly_series(rng, "walks_overdispersed", -0.06, True),
                   yearly_series(rng, "walks_poisson_rising", 0.03, False),
                   # Five years, as a new network has: its own seed, so the sets above
                   # keep their values.
                   yearly_series(np.random.default_rng(2024), "walks_overdispersed_five_years", -0.08, True, 2020)],
        "general_design": general_design(rng),
        "mann_kendall": mann_kendall_series(rng),
    })


if __name__ == "__main__":
    main()
