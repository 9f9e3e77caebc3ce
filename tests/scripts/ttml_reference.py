#!/usr/bin/python3
"""Cross-checks tiers' TTML with the IMSC reference implementation.

The reference is the npm package imsc 1.1.5 (fromXML, getMediaTimeEvents, generateISD),
pinned by tests/npm-reference/package-lock.json and installed by scripts/install-deps.

1. Every sample tiers can convert is written as TTML by tiers (allowing the losses it
   reports); the package must read each file without errors.
2. For those files and the hand-written ones in tests/ttml-reference/ (frames at 30000/1001,
   ticks, seq containment, timed spans), tiers reads the TTML back, and the two must agree on
   the media time events and, from each event on, on the texts presented.

3. Every TTML document the unit tests wrote (UNIT_OUTPUT_DIR/*.ttml) goes through the same
   checks as 1 and 2.

Usage: ttml_reference.py TIERS REFERENCE_DIR SAMPLES_DIR INPUTS_DIR WORK_DIR UNIT_OUTPUT_DIR
"""
import glob
import json
import os
import subprocess
import sys
from decimal import Decimal

from checklist import Checklist

results = Checklist()


def run(tiers, *args):
    proc = subprocess.run([tiers, *args], capture_output=True)
    results.check(proc.returncode == 0, f"tiers {' '.join(args)}: {proc.stderr.decode()}")
    return proc


def our_view(tiers, path):
    """Event times and, per time, the texts tiers would present."""
    proc = run(tiers, "convert", path, "--to", "json")
    if proc.returncode:
        return None
    doc = json.loads(proc.stdout, parse_float=Decimal, parse_int=Decimal)
    tiers_by_name = {t["name"]: t for t in doc["tiers"]}
    lines = []  # (start, end, text or None, words)
    for t in doc["tiers"]:
        parent = t.get("parent")
        if parent and parent.get("relation") == "within" and t["name"] == parent["tier"] + ".words":
            continue
        w = tiers_by_name.get(t["name"] + ".words", {})
        linked = (w.get("parent") or {}).get("tier") == t["name"]
        words = w["annotations"] if linked else []
        for a in t["annotations"]:
            start, end = Decimal(a["start"]), Decimal(a.get("end", a["start"]))
            inside = [w for w in words if start <= Decimal(w["start"]) and Decimal(w["end"]) <= end]
            lines.append((start, end, a["text"], inside))
    events = {Decimal(0)}  # the package always counts the start of the timeline as an event
    for start, end, _, inside in lines:
        events |= {start, end}
        for w in inside:
            events |= {Decimal(w["start"]), Decimal(w["end"])}
    return lines, sorted(events)


def shown_at(lines, t):
    out = []
    for start, end, text, inside in lines:
        if not (start <= t < end):
            continue
        if inside:  # a p of timed spans only: the spans active at t
            out.append(" ".join(w["text"] for w in inside if Decimal(w["start"]) <= t < Decimal(w["end"])))
        else:
            out.append(text)
    return sorted(out)


def norm(text):
    return "\n".join(" ".join(line.split()) for line in text.split("\n")).strip()


def main():
    tiers, reference, samples, inputs, work, unit_output = sys.argv[1:7]
    os.makedirs(work, exist_ok=True)
    written = []
    for src in sorted(glob.glob(os.path.join(samples, "*"))):
        if os.path.isdir(src) or src.endswith((".md", ".frames.csv", ".timecode.csv")):
            continue
        out = os.path.join(work, os.path.basename(src) + ".ttml")
        proc = subprocess.run([tiers, "convert", src, "-o", out, "--allow-loss"], capture_output=True)
        results.check(proc.returncode == 0, f"tiers could not write {src} as TTML: {proc.stderr.decode()}")
        if proc.returncode == 0:
            written.append(out)
    written += sorted(glob.glob(os.path.join(unit_output, "*.ttml")))
    handwritten = sorted(glob.glob(os.path.join(inputs, "*.ttml")))
    paths = written + handwritten
    proc = subprocess.run(["node", os.path.join(reference, "imsc.cjs"), *paths], capture_output=True, check=True)
    reference_view = {r["path"]: r for r in map(json.loads, proc.stdout.decode().splitlines())}
    for path in paths:
        ref = reference_view[path]
        results.check(not ref["errors"], f"{path}: the IMSC implementation reports {ref['errors'][:3]}")
        ours = our_view(tiers, path)
        if ours is None:
            continue
        lines, events = ours
        theirs = [Decimal(repr(t)) for t in ref["events"]]
        # The package computes in doubles: compare event times to the microsecond.
        q = lambda ts: sorted({round(t, 6) for t in ts})
        if not results.check(q(events) == q(theirs), f"{path}: event times differ: tiers {q(events)[:8]}, imsc {q(theirs)[:8]}"):
            continue
        for t, texts in zip(theirs, ref["shown"]):
            # Sample ours at the reference's event time, nudged past rounding in its doubles.
            ours_at = shown_at(lines, round(t, 6) + Decimal("0.0000005"))
            results.check(sorted(map(norm, texts)) == sorted(map(norm, ours_at)),
                          f"{path} at {t}: imsc shows {texts}, tiers {ours_at}")
    print(f"{len(written)} written by tiers, {len(handwritten)} by hand")
    return results.finish()


if __name__ == "__main__":
    sys.exit(main())
