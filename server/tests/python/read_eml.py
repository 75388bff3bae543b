"""Reads an EML document with Python's own XML parser (xml.etree.ElementTree) and prints
what a harvester takes from it as JSON: the packageId, the title, creator, publisher and
contact, the licence's link and sentence, and the geographic coverage's bounds, for
wrackline's publishing tests.

Usage: python read_eml.py FILE.xml
"""

import json
import sys
import xml.etree.ElementTree as ElementTree


def text(element, path):
    found = element.find(path)
    return None if found is None else "".join(found.itertext()).strip()


def main(path):
    root = ElementTree.parse(path).getroot()
    dataset = root.find("dataset")
    rights = dataset.find("intellectualRights/para")
    link = rights.find("ulink")
    bounds = dataset.find("coverage/geographicCoverage/boundingCoordinates")
    print(json.dumps({
        "root": root.tag,
        "packageId": root.get("packageId"),
        "title": text(dataset, "title"),
        "creator": text(dataset, "creator/organizationName"),
        "publisher": text(dataset, "publisher/organizationName"),
        "contact_name": text(dataset, "contact/individualName/surName"),
        "contact_email": text(dataset, "contact/electronicMailAddress"),
        "licence_url": None if link is None else link.get("url"),
        "licence_sentence": " ".join("".join(rights.itertext()).split()),
        "coverage": text(dataset, "coverage/geographicCoverage/geographicDescription"),
        "bounds": None if bounds is None else {
            side: float(text(bounds, f"{side}BoundingCoordinate")) for side in ("west", "east", "north", "south")
        },
    }))


if __name__ == "__main__":
    main(sys.argv[1])
