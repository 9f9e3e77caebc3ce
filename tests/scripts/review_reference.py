#!/usr/bin/python3
"""`tiers sample` and `tiers estimate` through the command line, against references outside the
project.

- Intervals: one sheet whose 240 strata are 240 random (correct, reviewed) cases, estimated at
  the levels 0.90, 0.95 and 0.99: each stratum's Wilson and Clopper–Pearson interval equals
  statsmodels' proportion_confint(method="wilson" / "beta") (Debian python3-statsmodels) to
  1e-7.
- The stratified estimator Σ W_h p_h and its standard error with the finite-population
  correction, sqrt(Σ W_h² (1 − n_h/N_h) p_h q_h / (n_h − 1)) (Cochran, Sampling Techniques,
  1977, ch. 5), recomputed here from the same sheet; the overall interval is Wilson's
  at the effective size p q / se², recomputed with statsmodels.
- --target-precision: the threshold equals a plain recomputation that tries every reviewed
  confidence from the lowest (the domain estimator, as docs/review.md gives it).
- The plan (--plan --json): n0 and each stratum's size equal Cochran's formulas with the normal
  quantile of scipy.stats.norm (Debian python3-scipy).
- The draw: the same seed gives the same sheet byte for byte whatever --jobs and whatever the
  order the files are named in; another seed another sheet; the strata's sizes and shares are
  those the plan and the allocation say; every row is an annotation of its file.

Usage: review_reference.py TIERS OUTPUT_DIR
"""
import csv
import io
import json
import math
import os
import random
import shutil
import subprocess
import sys

from scipy.stats import norm
from statsmodels.stats.proportion import proportion_confint

from checklist import Checklist

checks = Checklist()
COLUMNS = ["sample_id", "file", "tier", "start", "end", "label", "confidence", "stratum",
           "stratum_size", "weight", "link", "verdict", "note"]


def run(tiers, *args):
    r = subprocess.run([tiers, *args], capture_output=True, text=True)
    if r.returncode != 0:
        raise SystemExit(f"FAIL tiers {' '.join(args)}: {r.returncode}\n{r.stderr}")
    return r.stdout


def write_sheet(path, rows):
    with open(path, "w", newline="", encoding="utf-8") as fh:
        w = csv.DictWriter(fh, fieldnames=COLUMNS)
        w.writeheader()
        w.writerows(rows)


def interval_cases(tiers, out):
    rng = random.Random(1998)
    rows, cases = [], {}
    for h in range(240):
        n = rng.choice([1, 2, 3, 5, 10, 20, 29, 50, 148, 263, 400, 1000])
        k = rng.choice([0, n, rng.randint(0, n)])
        size = n + rng.randint(0, 5000)
        name = f"case-{h:03d}"
        cases[name] = (k, n, size)
        for j in range(n):
            rows.append({"sample_id": len(rows) + 1, "stratum": name, "stratum_size": size,
                         "label": "nod", "confidence": "0.5",
                         "verdict": "yes" if j < k else "no"})
    sheet = os.path.join(out, "intervals.csv")
    write_sheet(sheet, rows)
    for level in (0.90, 0.95, 0.99):
        e = json.loads(run(tiers, "estimate", sheet, "--level", str(level), "--json"))
        worst = 0.0
        for s in e["strata"]:
            k, n, size = cases[s["name"]]
            checks.check((s["reviewed"], s["correct"], s["size"]) == (n, k, size),
                         f"{s['name']}: counts {s['reviewed']}/{s['correct']}/{s['size']}")
            for method, low, high in (("wilson", "wilson_low", "wilson_high"),
                                      ("beta", "cp_low", "cp_high")):
                ref = proportion_confint(k, n, alpha=1 - level, method=method)
                worst = max(worst, abs(s[low] - ref[0]), abs(s[high] - ref[1]))
                checks.check(abs(s[low] - ref[0]) < 1e-7 and abs(s[high] - ref[1]) < 1e-7,
                             f"{s['name']} {k}/{n} at {level} {method}: "
                             f"{s[low]}-{s[high]}, statsmodels {ref}")
        print(f"ok   {len(e['strata'])} cases at level {level}: largest difference from "
              f"statsmodels {worst:.2e}")
        overall_against_cochran(e, cases, level)


def overall_against_cochran(e, cases, level):
    big_n = sum(size for k, n, size in cases.values())
    p = sum(size / big_n * k / n for k, n, size in cases.values())
    v = sum((size / big_n) ** 2 * (1 - n / size) * (k / n) * (1 - k / n) / (n - 1)
            for k, n, size in cases.values() if n > 1)
    o = e["overall"]
    checks.check(abs(o["precision"] - p) < 1e-12, f"stratified estimate {o['precision']}, Cochran {p}")
    checks.check(abs(o["se"] - math.sqrt(v)) < 1e-12 * max(1, math.sqrt(v)) + 1e-15,
                 f"standard error {o['se']}, Cochran {math.sqrt(v)}")
    effective = p * (1 - p) / v
    ref = proportion_confint(p * effective, effective, alpha=1 - level, method="wilson")
    checks.check(abs(o["low"] - ref[0]) < 1e-9 and abs(o["high"] - ref[1]) < 1e-9,
                 f"overall interval {o['low']}-{o['high']}, Wilson at n_eff {ref}")


def invent_detector(path, seed, n, media):
    rng = random.Random(seed)
    annotations, t = [], 0.0
    for _ in range(n):
        t += rng.uniform(0.5, 2.0)
        annotations.append({"start": round(t, 3), "end": round(t + rng.uniform(0.2, 0.8), 3),
                            "text": rng.choice(["nod", "shake", "tilt"]),
                            "confidence": round(rng.random(), 3)})
        t = annotations[-1]["end"]
    doc = {"format": "tiers", "version": 1, "media": {"uri": media},
           "tiers": [{"name": "heads", "source": {"kind": "machine", "agent": "invented"},
                      "annotations": annotations}]}
    with open(path, "w", encoding="utf-8") as fh:
        json.dump(doc, fh)
    return annotations


def domain_threshold(rows, target, level):
    """The lowest reviewed confidence whose annotations at or above it reach the target by the
    lower bound: the weighted ratio, its linearized variance, Wilson at the effective size."""
    z_rows = [r for r in rows if r["verdict"] in ("yes", "no")]
    strata = {}
    for r in z_rows:
        strata.setdefault(r["stratum"], []).append(r)
    for c in sorted({float(r["confidence"]) for r in z_rows}):
        def w(r):
            return int(r["stratum_size"]) / len(strata[r["stratum"]])
        inside = [r for r in z_rows if float(r["confidence"]) >= c]
        total = sum(w(r) for r in inside)
        p = sum(w(r) for r in inside if r["verdict"] == "yes") / total
        v = 0.0
        for name, members in strata.items():
            n, size = len(members), int(members[0]["stratum_size"])
            if n < 2:
                continue
            z = [((r["verdict"] == "yes") - p) / total if float(r["confidence"]) >= c else 0.0
                 for r in members]
            mean = sum(z) / n
            v += size * size * (1 - n / size) * sum((x - mean) ** 2 for x in z) / (n - 1) / n
        if v > 0:
            effective = p * (1 - p) / v
        else:
            f = len(inside) / total
            if f >= 1 - 1e-12:
                if p >= target:
                    return c
                continue
            effective = len(inside) / (1 - f)
        low = proportion_confint(p * effective, effective, alpha=1 - level, method="wilson")[0]
        if low >= target:
            return c
    return None


def draws(tiers, out):
    files = []
    for k, n in enumerate((3000, 1200, 40)):
        path = os.path.join(out, f"recording-{k}.json")
        invent_detector(path, 40 + k, n, f"recording-{k}.webm")
        files.append(path)
    common = ["--tier", "heads", "--n", "300", "--strata", "0.3,0.6,0.9", "--seed", "5"]
    sheets = {}
    for jobs in ("1", "2", "4"):
        for order in (files, files[::-1]):
            sheets[(jobs, order[0])] = run(tiers, "sample", *order, *common, "--jobs", jobs)
    first = next(iter(sheets.values()))
    checks.check(all(s == first for s in sheets.values()),
                 "the same seed gives the same sheet whatever --jobs and the files' order")
    other = run(tiers, "sample", *files, *common[:-1], "6")
    checks.check(other != first, "another seed gives another sheet")
    rows = list(csv.DictReader(io.StringIO(first)))
    checks.check(len(rows) == 300, f"{len(rows)} rows drawn, 300 asked for")
    # Sizes: every annotation of the three files, counted by band here.
    bands = {}
    annotations = {}
    for path in files:
        doc = json.load(open(path, encoding="utf-8"))
        for a in doc["tiers"][0]["annotations"]:
            c = a["confidence"]
            band = ("[0,0.3)" if c < 0.3 else "[0.3,0.6)" if c < 0.6 else
                    "[0.6,0.9)" if c < 0.9 else "[0.9,1]")
            bands[band] = bands.get(band, 0) + 1
            annotations[(os.path.basename(path), a["start"], a["end"])] = (a["text"], c, band)
    total = sum(bands.values())
    for band, size in bands.items():
        mine = [r for r in rows if r["stratum"] == band]
        checks.check(all(int(r["stratum_size"]) == size for r in mine),
                     f"{band}: stratum_size {mine[0]['stratum_size'] if mine else None}, counted {size}")
        share = 300 * size / total  # proportional allocation, rounded by largest remainder
        checks.check(abs(len(mine) - share) < 1, f"{band}: {len(mine)} drawn, share {share:.2f}")
        checks.check(all(abs(float(r["weight"]) - size / len(mine)) < 1e-9 for r in mine),
                     f"{band}: weights are N_h/n_h")
    for r in rows:
        key = (os.path.basename(r["file"]), float(r["start"]), float(r["end"]))
        found = annotations.get(key)
        if not checks.check(found is not None, f"row {r['sample_id']} is no annotation: {key}"):
            continue
        checks.check((r["label"], float(r["confidence"]), r["stratum"]) == found,
                     f"row {r['sample_id']}: {r['label']}, {r['confidence']}, {r['stratum']}; "
                     f"the file has {found}")
        # The sheet went to standard output: its links start from the working folder.
        media = os.path.relpath(os.path.splitext(r["file"])[0] + ".webm")
        checks.check(r["link"] == f"{media}#t={r['start']},{r['end']}",
                     f"row {r['sample_id']}: link {r['link']}, expected {media}#t=…")
    checks.check(len({r["sample_id"] for r in rows}) == 300, "sample ids are unique")

    # Verdicts from an invented truth, then the threshold against the recomputation.
    rng = random.Random(7)
    for r in rows:
        r["verdict"] = "yes" if rng.random() < 0.3 + 0.7 * float(r["confidence"]) else "no"
    reviewed = os.path.join(out, "reviewed.csv")
    write_sheet(reviewed, rows)
    for target in (0.6, 0.8, 0.9, 0.99):
        e = json.loads(run(tiers, "estimate", reviewed, "--target-precision", str(target), "--json"))
        expected = domain_threshold(rows, target, 0.95)
        checks.check(e["threshold"]["confidence"] == expected,
                     f"threshold for {target}: {e['threshold']['confidence']}, recomputed {expected}")

    # The plan: Cochran's sizes per band and for one simple random sample.
    plan = json.loads(run(tiers, "sample", *files, "--tier", "heads", "--strata", "0.3,0.6,0.9",
                          "--plan", "--margin", "0.04", "--level", "0.9", "--json"))
    z = norm.ppf(0.95)
    n0 = z * z * 0.25 / 0.04 ** 2
    checks.check(abs(plan["n0"] - n0) < 1e-9, f"n0 {plan['n0']}, Cochran {n0}")
    for s in plan["strata"]:
        size = bands[s["name"]]
        want = min(size, math.ceil(n0 / (1 + (n0 - 1) / size) - 1e-9))
        checks.check(s["annotations"] == size and s["sample"] == want,
                     f"plan {s['name']}: {s['sample']} of {s['annotations']}, Cochran {want} of {size}")
    want = math.ceil(n0 / (1 + (n0 - 1) / total) - 1e-9)
    checks.check(plan["simple"]["sample"] == want, f"simple sample {plan['simple']['sample']}, {want}")


def main():
    tiers, out = sys.argv[1:3]
    shutil.rmtree(out, ignore_errors=True)
    os.makedirs(out)
    interval_cases(tiers, out)
    draws(tiers, out)
    return checks.finish()


if __name__ == "__main__":
    sys.exit(main())
