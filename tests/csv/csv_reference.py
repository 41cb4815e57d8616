#!/usr/bin/env python3
"""Reference parse for tst_csv: Python's csv module with strict=True.

Usage: csv_reference.py FILE...  -> one JSON line per file:
{"records": [[field, ...], ...]} or {"error": "message"}.
Python yields [] for an empty line; RFC 4180's grammar reads it as one empty
field, so it is printed as [""] (the reader under test follows the RFC).
"""
import csv
import json
import sys

for path in sys.argv[1:]:
    try:
        with open(path, newline="", encoding="utf-8-sig") as f:
            records = [row if row else [""] for row in csv.reader(f, strict=True)]
        print(json.dumps({"records": records}))
    except csv.Error as e:
        print(json.dumps({"error": str(e)}))
