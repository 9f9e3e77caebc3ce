#!/usr/bin/python3
"""The alternative a researcher writes: CSV of annotations to tiers-shaped JSON and back, with
Python's standard library only (csv, json). Times become floats, as such a script would make
them; tiers keeps them exact. Used by scripts/bench as the yardstick for `tiers convert`.

Usage: baseline_convert.py IN.csv OUT.json | IN.json OUT.csv
"""
import csv
import json
import sys


def json_to_csv(source, target):
    with open(source, encoding="utf-8") as fh:
        doc = json.load(fh)
    rows, extra = [], []
    for tier in doc["tiers"]:
        for a in tier["annotations"]:
            row = {"tier": tier["name"], "start": a["start"], "end": a.get("end", a["start"]),
                   "text": a.get("text", ""), "confidence": a.get("confidence", ""),
                   "id": a.get("id", ""), "parent": a.get("parent", ""),
                   "markup": a.get("markup", "")}
            for key, value in a.get("attributes", {}).items():
                if key not in extra:
                    extra.append(key)
                row[key] = value
            rows.append(row)
    fields = ["tier", "start", "end", "text", "confidence", "id", "parent", "markup"] + extra
    with open(target, "w", newline="", encoding="utf-8") as fh:
        writer = csv.DictWriter(fh, fieldnames=fields)
        writer.writeheader()
        writer.writerows(rows)


def main():
    source, target = sys.argv[1:3]
    if source.endswith(".json"):
        return json_to_csv(source, target)
    tiers = {}
    with open(source, newline="", encoding="utf-8") as fh:
        for row in csv.DictReader(fh):
            annotation = {"start": float(row.pop("start")), "end": float(row.pop("end")),
                          "text": row.pop("text", "")}
            name = row.pop("tier")
            confidence = row.pop("confidence", "")
            if confidence:
                annotation["confidence"] = float(confidence)
            for key in ("id", "parent", "markup"):
                value = row.pop(key, "")
                if value:
                    annotation[key] = value
            attributes = {k: v for k, v in row.items() if v}
            if attributes:
                annotation["attributes"] = attributes
            tiers.setdefault(name, []).append(annotation)
    doc = {"format": "tiers", "version": 1,
           "tiers": [{"name": n, "kind": "interval", "annotations": a} for n, a in tiers.items()]}
    with open(target, "w", encoding="utf-8") as fh:
        json.dump(doc, fh)


if __name__ == "__main__":
    main()
