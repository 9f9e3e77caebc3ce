#!/usr/bin/python3
"""Round trips of the bundled samples through every table format, checked outside tiers.

For every samples/*.json: tiers converts it to the plain-text tier format and back, which must
give the same bytes (the format is lossless); then to CSV and TSV (allowing the declared losses) and
back to JSON; Python's json module, with exact decimals, then compares every tier, time (to
the nanosecond), text, confidence, id, parent id, markup and attribute that tables carry.
samples/panel-discussion.flat.json holds only what CSV carries, so its conversion must pass
without --allow-loss and come back identical.

Usage: roundtrip_samples.py TIERS SAMPLES_DIR WORK_DIR
"""
import glob
import json
import os
import subprocess
import sys
from decimal import Decimal

from checklist import Checklist

results = Checklist()
CARRIED = ("text", "confidence", "id", "parent", "markup", "attributes")


def tiers_run(tiers, *args):
    proc = subprocess.run([tiers, *args], capture_output=True)
    results.check(proc.returncode == 0,
                  f"tiers {' '.join(args)}: exit {proc.returncode}: {proc.stderr.decode()}")
    return proc


def load(path):
    with open(path, encoding="utf-8") as fh:
        return json.load(fh, parse_float=Decimal, parse_int=Decimal)


def table_view(doc):
    """What a table keeps: non-empty tiers in order, each annotation's carried fields."""
    out = []
    for t in doc.get("tiers", []):
        if not t.get("annotations"):
            continue
        rows = []
        for a in t["annotations"]:
            start = Decimal(a["start"])
            row = {"start": start, "end": Decimal(a.get("end", start))}
            row.update({k: a[k] for k in CARRIED if k in a})
            row.setdefault("text", "")
            rows.append(row)
        out.append((t["name"], rows))
    return out


def round_trip(tiers, src, work, stem, fmt, lossy):
    """Converts src to fmt and back to JSON; returns the JSON's path, or None on failure."""
    there = os.path.join(work, f"{stem}.{fmt}")
    back = os.path.join(work, f"{stem}.from-{fmt}.json")
    tiers_run(tiers, "convert", src, "-o", there, *(["--allow-loss"] if lossy else []))
    tiers_run(tiers, "convert", there, "-o", back)
    return back if os.path.exists(back) else None


def ttml_view(doc):
    out = [doc.get("media", {}).get("frame_rate")]
    for t in doc.get("tiers", []):
        rows = []
        for a in t.get("annotations", []):
            start, end = Decimal(a["start"]), Decimal(a.get("end", a["start"]))
            if end > start:
                rows.append((start, end, a.get("text", ""), a.get("id"), (a.get("attributes") or {}).get("speaker")))
        if rows:
            out.append((t["name"], rows))
    return out


def main():
    tiers, samples, work = sys.argv[1:4]
    os.makedirs(work, exist_ok=True)
    sources = sorted(glob.glob(os.path.join(samples, "*.json")))
    if not sources:
        print("no samples found")
        return 1
    for src in sources:
        stem = os.path.splitext(os.path.basename(src))[0]
        original = load(src)
        # The plain-text format is lossless: the JSON comes back byte for byte.
        back = round_trip(tiers, src, work, stem, "tiers", lossy=False)
        if back:
            with open(src, "rb") as a, open(back, "rb") as b:
                results.check(a.read() == b.read(), f"{src} -> tiers -> json is not identical")
        # TTML: tiers with annotations that end after they start; times, texts, ids, speakers
        # and the frame rate. Tables: what table_view keeps.
        for fmt, view in (("ttml", ttml_view), ("csv", table_view), ("tsv", table_view)):
            back = round_trip(tiers, src, work, stem, fmt, lossy=True)
            if back:
                results.check(view(load(back)) == view(original),
                              f"{src} -> {fmt} -> json changed what {fmt} carries")
    # The 'Done when' command of the foundation issue, word for word but for the paths.
    flat = os.path.join(samples, "panel-discussion.flat.json")
    x_csv, y_json = os.path.join(work, "x.csv"), os.path.join(work, "y.json")
    tiers_run(tiers, "convert", flat, "-o", x_csv)
    tiers_run(tiers, "convert", x_csv, "-o", y_json)
    if os.path.exists(y_json):
        results.check(load(y_json) == load(flat),
                      "panel-discussion.flat.json -> csv -> json is not identical")
    return results.finish()


if __name__ == "__main__":
    sys.exit(main())
