"""Reads a CSV file with Python's own csv module (strict UTF-8, the header row as
field names) and prints it as JSON, for wrackline's sample register tests.

Usage: python read_csv.py FILE.csv
"""

import csv
import json
import sys


def main(path):
    with open(path, newline="", encoding="utf-8", errors="strict") as handle:
        reader = csv.DictReader(handle, strict=True)
        rows = list(reader)
        print(json.dumps({"header": reader.fieldnames, "rows": rows}))


if __name__ == "__main__":
    main(sys.argv[1])
