#!/usr/bin/python3
"""The alternative a researcher writes: CSV of annotations to tiers-shaped JSON, with Python's
standard library only (csv, json). Times become floats, as such a script would make them; tiers
keeps them exact. Used by scripts/bench as the yardstick for `tiers convert`.

Usage: baseline_convert.py IN.csv OUT.json
"""
import csv
import json
import sys


def main():
    source, target = sys.argv[1:3]
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
