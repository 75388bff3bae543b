#!/usr/bin/env python3
"""Times EOO and AOO with shapely + pyproj on the benchmark's points, for comparison.

Called by benches/range.rs as: range_reference.py POINTS_FILE CENTRE_LAT CENTRE_LON CELL_KM
POINTS_FILE holds little-endian f64 pairs (latitude, longitude). Prints one JSON object
with the figures and the best of three timings (file reading excluded). The method is the
crate's documented one written with general-purpose libraries: shapely convex hull in the
longitude frame with the narrower span, pyproj.Geod area, pyproj laea projection, numpy
floor + unique over 16 origins shifted by quarter cells.
"""

import json
import sys
import time

import numpy as np
import pyproj
import shapely

GEOD = pyproj.Geod(ellps="WGS84")


def eoo_km2(lats, lons):
    if (lons < 0).any() and (lons >= 0).any():
        shifted = np.where(lons < 0, lons + 360.0, lons)
        if np.ptp(shifted) < np.ptp(lons):
            lons = shifted
    hull = shapely.convex_hull(shapely.multipoints(np.column_stack([lons, lats])))
    if hull.geom_type != "Polygon":
        return 0.0
    x, y = hull.exterior.coords.xy
    return abs(GEOD.polygon_area_perimeter(np.array(x), np.array(y))[0]) / 1e6


def aoo_cells(lats, lons, centre_lat, centre_lon, cell_km):
    proj = pyproj.Proj(f"+proj=laea +lat_0={centre_lat} +lon_0={centre_lon} +x_0=0 +y_0=0 +ellps=WGS84 +units=m")
    x, y = proj(lons, lats)
    cell = cell_km * 1000.0
    counts = []
    for east in range(4):
        for north in range(4):
            ci = np.floor((x - east * cell / 4) / cell).astype(np.int64)
            cj = np.floor((y - north * cell / 4) / cell).astype(np.int64)
            counts.append(len(np.unique(ci * (1 << 32) + cj)))
    return counts[0], min(counts)


def main():
    path, centre_lat, centre_lon, cell_km = sys.argv[1], *map(float, sys.argv[2:5])
    points = np.fromfile(path, dtype="<f8").reshape(-1, 2)
    lats, lons = points[:, 0].copy(), points[:, 1].copy()
    best = {"eoo": float("inf"), "aoo": float("inf")}
    for _ in range(3):
        start = time.perf_counter()
        eoo = eoo_km2(lats, lons)
        middle = time.perf_counter()
        fixed, minimum = aoo_cells(lats, lons, centre_lat, centre_lon, cell_km)
        end = time.perf_counter()
        best["eoo"] = min(best["eoo"], middle - start)
        best["aoo"] = min(best["aoo"], end - middle)
    print(json.dumps({
        "eoo_km2": eoo, "aoo_cells": fixed, "aoo_min_cells": minimum,
        "eoo_seconds": best["eoo"], "aoo_seconds": best["aoo"],
        "versions": {"pyproj": pyproj.__version__, "shapely": shapely.__version__, "numpy": np.__version__},
    }))


if __name__ == "__main__":
    main()
