"""Reads a Darwin Core Archive with python-dwca-reader (PyPI) and prints what it found as
JSON, for wrackline's export tests. Every term IRI in meta.xml is checked against the
term list shipped in python-dwca-reader (dwca.darwincore.terms, built from the TDWG
Darwin Core term list) and against reference/dwc_terms_extract.csv (terms newer than
that list, and the row types' classes, taken from the TDWG term list or a package's copy).

Usage: python read_dwca.py ARCHIVE.zip TERMS_EXTRACT.csv
"""

import csv
import json
import sys

import dwca
from dwca.darwincore.terms import TERMS
from dwca.read import DwCAReader


def known_terms(extract_path):
    known = set(TERMS)
    with open(extract_path, newline="", encoding="utf-8") as handle:
        rows = (line for line in handle if not line.startswith("#"))
        for row in csv.DictReader(rows):
            if row["status"] == "recommended":
                known.add(row["term_iri"])
    return known


def metadata(reader):
    eml = reader.metadata
    root = eml
    dataset = root.find("dataset")
    text = lambda path: (dataset.findtext(path) or "").strip() if dataset is not None else ""
    licence = dataset.find("intellectualRights/para/ulink") if dataset is not None else None
    return {
        "packageId": root.get("packageId"),
        "scope": root.get("scope"),
        "system": root.get("system"),
        "title": text("title"),
        "creator": text("creator/organizationName"),
        "pubDate": text("pubDate"),
        "abstract": " ".join(p.text or "" for p in dataset.findall("abstract/para")) if dataset is not None else "",
        "contact": text("contact/organizationName"),
        "licence_url": licence.get("url") if licence is not None else None,
        "methods": " ".join(p.text or "" for p in dataset.findall("methods/methodStep/description/para")) if dataset is not None else "",
    }


def main(archive, extract):
    known = known_terms(extract)
    with DwCAReader(archive) as reader:
        core = reader.descriptor.core
        extensions = reader.descriptor.extensions
        all_terms = list(core.terms) + [t for e in extensions for t in e.terms]
        rows = []
        for row in reader:
            rows.append({
                "id": row.id,
                "data": row.data,
                "extensions": [{"rowtype": e.rowtype, "data": e.data} for e in row.extensions],
            })
        print(json.dumps({
            "reader_version": dwca.__version__ if hasattr(dwca, "__version__") else None,
            "core_row_type": core.type,
            "extension_row_types": [e.type for e in extensions],
            "core_terms": list(core.terms),
            "unknown_terms": sorted(t for t in all_terms if t not in known),
            "unknown_row_types": sorted(t for t in [core.type] + [e.type for e in extensions] if t not in known),
            "orphaned_extension_rows": {k: len(v) for k, v in reader.orphaned_extension_rows().items()},
            "metadata": metadata(reader),
            "rows": rows,
        }))


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2])
