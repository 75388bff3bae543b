"""Reads a GeoJSON file with Python's json module and shapely.geometry.shape (PyPI), and
prints each feature's geometry type, x (longitude) and y (latitude) as shapely sees them,
and the Python type json gave each property (int, float, str), for wrackline's export
tests.

Usage: python read_geojson.py FILE.geojson
"""

import json
import sys

from shapely.geometry import shape


def main(path):
    with open(path, encoding="utf-8") as handle:
        collection = json.load(handle)
    features = []
    for feature in collection["features"]:
        geometry = feature["geometry"]
        if geometry is None:
            features.append({"id": feature["id"], "geometry": None, "properties": feature["properties"]})
            continue
        point = shape(geometry)
        features.append({
            "id": feature["id"],
            "geometry": point.geom_type,
            "valid": point.is_valid,
            "x": point.x,
            "y": point.y,
            "properties": feature["properties"],
            "property_types": {name: type(value).__name__ for name, value in feature["properties"].items()},
        })
    print(json.dumps({"type": collection["type"], "notes": collection.get("notes"), "features": features}))


if __name__ == "__main__":
    main(sys.argv[1])
