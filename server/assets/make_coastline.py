"""Cuts the Cardigan Bay / Irish Sea land outline out of Natural Earth's 1:10m land, as
shipped in the npm package world-atlas 2.0.2 (land-10m.json, TopoJSON), and writes it as
RFC 7946 GeoJSON (exterior rings anticlockwise) for wrackline's offline maps.

Usage (shapely from PyPI; world-atlas from npm, e.g. `npm pack world-atlas@2.0.2`):
    python make_coastline.py package/land-10m.json coastline-irish-sea.geojson
"""

import json
import sys

from shapely.geometry import MultiPolygon, Polygon, box, mapping
from shapely.geometry.polygon import orient

# West, south, east, north in degrees: Ireland's east coast to the English Midlands,
# the Scilly Isles to the Clyde.
REGION = (-11.0, 49.8, -1.5, 56.2)
# Douglas–Peucker tolerance in degrees (about 200 m), small against a regional map.
TOLERANCE = 0.002


def decode_arcs(topology):
    scale = topology["transform"]["scale"]
    translate = topology["transform"]["translate"]
    arcs = []
    for arc in topology["arcs"]:
        x = y = 0
        points = []
        for dx, dy in arc:
            x += dx
            y += dy
            points.append((x * scale[0] + translate[0], y * scale[1] + translate[1]))
        arcs.append(points)
    return arcs


def ring(arcs, indexes):
    points = []
    for index in indexes:
        arc = arcs[index] if index >= 0 else list(reversed(arcs[~index]))
        points.extend(arc if not points else arc[1:])
    return points


def polygons(topology):
    arcs = decode_arcs(topology)
    for geometry in topology["objects"]["land"]["geometries"]:
        shapes = geometry["arcs"] if geometry["type"] == "MultiPolygon" else [geometry["arcs"]]
        for rings in shapes:
            outer, *holes = [ring(arcs, r) for r in rings]
            yield Polygon(outer, holes)


def main(source, target):
    with open(source, encoding="utf-8") as handle:
        topology = json.load(handle)
    region = box(*REGION)
    kept = []
    for polygon in polygons(topology):
        if not polygon.intersects(region):
            continue
        clipped = polygon.buffer(0).intersection(region).simplify(TOLERANCE)
        parts = clipped.geoms if hasattr(clipped, "geoms") else [clipped]
        kept.extend(orient(p, 1.0) for p in parts if isinstance(p, Polygon) and not p.is_empty and p.area > 1e-6)
    land = MultiPolygon(kept)
    geometry = mapping(land)
    rounded = [[[[round(x, 4), round(y, 4)] for x, y in r] for r in poly] for poly in geometry["coordinates"]]
    collection = {
        "type": "FeatureCollection",
        "features": [{
            "type": "Feature",
            "properties": {
                "source": "Natural Earth 1:10m land (public domain), via the npm package world-atlas 2.0.2 (land-10m.json)",
                "region": list(REGION),
                "simplified_degrees": TOLERANCE,
            },
            "geometry": {"type": "MultiPolygon", "coordinates": rounded},
        }],
    }
    with open(target, "w", encoding="utf-8") as handle:
        json.dump(collection, handle, separators=(",", ":"))
        handle.write("\n")


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2])
