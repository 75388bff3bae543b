#!/usr/bin/env python3
"""Times EOO and AOO with pyproj + shapely + numpy on the benchmark's points, for comparison.

Called by benches/range.rs as: range_reference.py POINTS_FILE CENTRE_LAT CENTRE_LON CELL_KM
POINTS_FILE holds little-endian f64 pairs (latitude, longitude). Prints one JSON object
with the figures and the best of three timings (file reading excluded). The method is the
crate's documented one written with general-purpose libraries: the records' mean direction
(numpy), pyproj's gnomonic projection centred there, shapely's convex hull, pyproj.Geod's
area of the corners on WGS84; pyproj's laea projection and numpy floor + unique over 16
origins shifted by quarter cells. (The benchmark's points lie within one zone.)
"""

import json
import sys
import time

import numpy as np
import pyproj
import shapely

GEOD = pyproj.Geod(ellps="WGS84")


def eoo_km2(lats, lons):
    phi, lam = np.radians(lats), np.radians(lons)
    s = np.array([(np.cos(phi) * np.cos(lam)).sum(), (np.cos(phi) * np.sin(lam)).sum(), np.sin(phi).sum()])
    s /= np.linalg.norm(s)
    clat, clon = np.degrees(np.arcsin(s[2])), np.degrees(np.arctan2(s[1], s[0]))
    to_plane = pyproj.Transformer.from_crs(
        "+proj=longlat +R=1", f"+proj=gnom +lat_0={clat} +lon_0={clon} +R=1", always_xy=True
    )
    x, y = to_plane.transform(lons, lats)
    hull = shapely.convex_hull(shapely.multipoints(np.column_stack([x, y])))
    if hull.geom_type != "Polygon":
        return 0.0
    hx, hy = hull.exterior.coords.xy
    hlon, hlat = to_plane.transform(np.array(hx), np.array(hy), direction="INVERSE")
    return abs(GEOD.polygon_area_perimeter(hlon, hlat)[0]) / 1e6


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
