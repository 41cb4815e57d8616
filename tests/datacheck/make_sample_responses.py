#!/usr/bin/env python3
"""Writes sample_projects/household-energy-responses.csv: invented responses to
the household-energy sample instrument (no real survey's data), with deliberate
problems for the data check to find: routing violations (a value in an item the
routing skipped), item nonresponse (blank, don't know, refused), invalid values
(out of range, not a number, impossible dates) and break-offs.

Usage: make_sample_responses.py [N] (default 300 records, fixed seed)."""
import csv
import random
import sys
from pathlib import Path

import yaml

ROOT = Path(__file__).resolve().parents[2]
SAMPLE = ROOT / "sample_projects" / "household-energy.yaml"
OUT = ROOT / "sample_projects" / "household-energy-responses.csv"

# The sample's conditions, written out by hand (the script does not parse the
# condition language). Values are ints, sets (multi) or None (not presented / blank).
CONDITIONS = {
    "main_fuel = 5": lambda v: v.get("main_fuel") == 5,
    "main_fuel = 3": lambda v: v.get("main_fuel") == 3,
    "thermostat <> 1": lambda v: v.get("thermostat") != 1,
    "has_vehicle in (2, 8, 9)": lambda v: v.get("has_vehicle") in (2, 8, 9),
    "main_vehicle_fuel = 4": lambda v: v.get("main_vehicle_fuel") == 4,
    "appliance_list has 2": lambda v: 2 in (v.get("appliance_list") or set()),
    "tenure in (1, 2)": lambda v: v.get("tenure") in (1, 2),
    "has_solar = 1": lambda v: v.get("has_solar") == 1,
    "not (insulation_done has 5)": lambda v: 5 not in (v.get("insulation_done") or set()),
    "follow_up <> 1": lambda v: v.get("follow_up") != 1,
}


def codes_of(doc, item):
    codes = item.get("codes")
    if isinstance(codes, str):
        codes = doc["code_lists"][codes]
    return (codes or []) + item.get("missing", [])


def main():
    n = int(sys.argv[1]) if len(sys.argv) > 1 else 300
    rng = random.Random(2026)
    doc = yaml.safe_load(SAMPLE.read_text())
    items = []  # (item, module ask_if)
    for module in doc["modules"]:
        for item in module["items"]:
            items.append((item, module.get("ask_if")))
    position = {it["name"]: k for k, (it, _) in enumerate(items)}
    position.update({m["name"]: position[m["items"][0]["name"]] for m in doc["modules"]})
    columns = []
    for it, _ in items:
        if it["type"] == "multi":
            columns += [f'{it["name"]}_{c["code"]}' for c in codes_of(doc, it)]
        elif it["type"] != "statement":
            columns.append(it["name"])

    def answer(it):
        kind = it["type"]
        codes = codes_of(doc, it)
        if kind in ("single",):
            plain = [c["code"] for c in codes if "missing" not in c]
            missing = [c["code"] for c in codes if "missing" in c]
            return rng.choice(missing) if missing and rng.random() < 0.05 else rng.choice(plain)
        if kind == "multi":
            chosen = {c["code"] for c in codes if rng.random() < 0.4}
            return chosen or {codes[0]["code"]}
        if kind in ("integer", "decimal"):
            lo, hi = it["range"]
            if it.get("missing") and rng.random() < 0.04:
                return it["missing"][0]["code"]
            value = rng.uniform(lo, min(hi, lo + 40))
            return int(value) if kind == "integer" else round(value, 1)
        if kind == "date":
            return f"20{rng.randint(0, 25):02d}-{rng.randint(1, 12):02d}-{rng.randint(1, 28):02d}"
        return rng.choice(["", "Warm enough", "Bills too high", "Thinking about a heat pump"])

    with OUT.open("w", newline="") as f:
        out = csv.writer(f, lineterminator="\n")
        out.writerow(["respondent_id"] + columns)
        for r in range(n):
            values, cells = {}, {}
            breakoff = len(items) * 2 if rng.random() > 0.03 else rng.randint(5, len(items) - 3)
            pos = 0
            while pos < len(items):
                it, module_if = items[pos]
                filters = [c for c in (module_if, it.get("ask_if")) if c]
                if not all(CONDITIONS[c](values) for c in filters):
                    pos += 1
                    continue
                value = None if pos >= breakoff else answer(it)
                if rng.random() < 0.03 and it["type"] not in ("statement", "multi"):
                    value = None  # item nonresponse: left blank
                values[it["name"]] = value
                cells[it["name"]] = value
                nxt = pos + 1
                for rule in it.get("routing", []):
                    if "if" not in rule or CONDITIONS[rule["if"]](values):
                        nxt = len(items) if rule["goto"] == "END" else position[rule["goto"]]
                        break
                pos = nxt
            row = [f"R{r + 1:04d}"]
            for it, _ in items:
                name, kind = it["name"], it["type"]
                if kind == "statement":
                    continue
                presented = name in cells
                value = cells.get(name)
                if not presented and kind != "multi" and rng.random() < 0.02:
                    value, presented = answer(it), True  # deliberate routing violation
                if presented and kind in ("integer", "decimal") and rng.random() < 0.01:
                    value = rng.choice(["abc", 999999])  # invalid value
                if presented and kind == "date" and rng.random() < 0.02:
                    value = "2023-02-30"
                if kind == "multi":
                    for c in codes_of(doc, it):
                        if not presented:
                            row.append("-1")
                        elif value is None:
                            row.append("")
                        else:
                            row.append("1" if c["code"] in value else "0")
                else:
                    row.append("-1" if not presented else ("" if value is None else str(value)))
            out.writerow(row)


if __name__ == "__main__":
    main()
