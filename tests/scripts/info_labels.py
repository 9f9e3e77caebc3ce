#!/usr/bin/python3
"""`tiers info --labels` against a recomputation in Python of the bundled samples.

The samples are read here by Python's own json and csv modules — not through tiers — and each
tier's labels counted: count, summed duration, mean and median duration (statistics.median:
the mean of the middle two for an even count), share of the tier's summed durations, and mean
confidence over the annotations that carry one. Tiers of one name and source kind are pooled
over the files, as the command pools them. The CSV sample has no source column, so its tiers
are unmarked. Every figure must equal the command's JSON (times to the nanosecond, the rest to
1e-12). The CSV and text forms are checked to hold the same rows.

Usage: info_labels.py TIERS SAMPLES_DIR
"""
import csv
import io
import json
import os
import statistics
import subprocess
import sys
from fractions import Fraction

failures = []


def check(ok, what):
    print(("ok  " if ok else "FAIL"), what)
    if not ok:
        failures.append(what)


def seconds(text):
    return Fraction(str(text))


def add(table, tier, source, label, start, end, confidence):
    row = table.setdefault((tier, source), {}).setdefault(
        label, {"durations": [], "confidences": []})
    row["durations"].append(seconds(end) - seconds(start))
    if confidence not in (None, ""):
        row["confidences"].append(float(confidence))


def from_json(table, path):
    with open(path) as fh:
        doc = json.load(fh)
    for t in doc["tiers"]:
        source = (t.get("source") or {}).get("kind")
        for a in t["annotations"]:
            end = a.get("end", a["start"])
            add(table, t["name"], source, a.get("text", ""), a["start"], end, a.get("confidence"))


def from_csv(table, path):
    with open(path, newline="") as fh:
        for r in csv.DictReader(fh):
            add(table, r["tier"], None, r["text"], r["start"], r["end"] or r["start"],
                r.get("confidence"))


def expected(table):
    out = {}
    for (tier, source), labels in table.items():
        tier_total = sum(sum(l["durations"]) for l in labels.values())
        for label, l in labels.items():
            d = l["durations"]
            c = l["confidences"]
            out[(tier, source, label)] = {
                "count": len(d), "total": sum(d), "mean": float(sum(d) / len(d)),
                "median": float(statistics.median(d)),
                "share": float(sum(d) / tier_total) if tier_total else None,
                "mean_confidence": sum(c) / len(c) if c else None}
    return out


def run(tiers, *args):
    r = subprocess.run([tiers, "info", "--labels", *args], capture_output=True, text=True)
    if r.returncode != 0:
        raise SystemExit(f"FAIL tiers info --labels {args}: {r.stderr}")
    return r.stdout


def close(a, b):
    if a is None or b is None:
        return a is None and b is None
    return abs(a - b) <= 1e-12


def compare(name, got, want):
    rows = {(r["tier"], r["source"], r["label"]): r for r in got["labels"]}
    check(set(rows) == set(want), f"{name}: the same (tier, source, label) rows "
                                  f"({len(rows)} got, {len(want)} expected)")
    bad = 0
    for key, w in want.items():
        g = rows.get(key)
        if g is None:
            continue
        ok = (g["count"] == w["count"] and seconds(g["total"]) == w["total"]
              and close(g["mean"], w["mean"]) and close(g["median"], w["median"])
              and close(g["share"], w["share"])
              and close(g["mean_confidence"], w["mean_confidence"]))
        if not ok:
            bad += 1
            print(f"     {key}: got {g}, expected {w}")
    check(bad == 0, f"{name}: every row's figures ({bad} differ)")


def main():
    tiers, samples = sys.argv[1:3]
    files = [os.path.join(samples, f) for f in
             ("panel-discussion.json", "panel-discussion.machine-gestures.json")]
    table = {}
    for f in files:
        from_json(table, f)
    got = json.loads(run(tiers, *files, "--format", "json"))
    check(got["documents"] == 2, "two documents counted")
    compare("panel-discussion JSON samples", got, expected(table))

    table = {}
    from_csv(table, os.path.join(samples, "panel-discussion.csv"))
    got = json.loads(run(tiers, os.path.join(samples, "panel-discussion.csv"), "--json"))
    compare("panel-discussion CSV sample", got, expected(table))

    both = json.loads(run(tiers, *files, "--json"))["labels"]
    rows = list(csv.DictReader(io.StringIO(run(tiers, *files, "--format", "csv"))))
    check([(r["tier"], r["label"], int(r["count"])) for r in rows] ==
          [(r["tier"], r["label"], r["count"]) for r in both], "the CSV form holds the JSON's rows")
    check(set(rows[0]) == {"tier", "source", "label", "count", "total", "mean", "median",
                           "share", "mean_confidence"}, "the CSV form's columns")
    print(f"{len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
