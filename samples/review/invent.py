#!/usr/bin/python3
"""Invents the review demo (docs/review.md): a head-nod detector's tier over two recordings of
an invented seminar, whose precision rises with its confidence, and — once `tiers sample` has
drawn the sheet — a reviewer's verdicts on it. Nothing here is real: the recordings, the
detector and the reviewer are made up, and the verdicts come from the precision the detector
was invented with (0.35 below confidence 0.5, 0.6 up to 0.7, 0.8 up to 0.9, 0.95 above).

Also a person's coding of the first ten minutes of seminar-a, to merge the detector's tier
with once its threshold is chosen.

Usage: invent.py tiers       writes seminar-a.nods.json, seminar-b.nods.json and
                             seminar-a.coder.json
       invent.py verdicts SHEET OUT   fills SHEET's verdict column into OUT
"""
import csv
import json
import random
import sys
from pathlib import Path

HERE = Path(__file__).resolve().parent
PRECISION = [(0.5, 0.35), (0.7, 0.6), (0.9, 0.8), (1.01, 0.95)]


def precision_at(confidence):
    return next(p for limit, p in PRECISION if confidence < limit)


def invent_tiers():
    for name, length, seed in (("seminar-a", 3000, 11), ("seminar-b", 2400, 12)):
        rng = random.Random(seed)
        annotations, t = [], 0.0
        while True:
            t += rng.uniform(0.4, 2.2)
            end = t + rng.uniform(0.25, 0.9)
            if end > length:
                break
            # Most detections are unsure: the confidences lean low, as a detector's often do.
            confidence = round(min(0.999, rng.betavariate(2.2, 1.8)), 3)
            annotations.append({"start": round(t, 2), "end": round(end, 2), "text": "nod",
                                "confidence": confidence})
            t = end
        doc = {"format": "tiers", "version": 1,
               "media": {"uri": f"{name}.webm", "duration": length, "frame_rate": "25"},
               "metadata": {"scenario": "invented demo: a head-nod detector over a seminar"},
               "tiers": [{"name": "nods", "kind": "interval",
                          "source": {"kind": "machine", "agent": "demo-nod-detector",
                                     "version": "1.2"},
                          "annotations": annotations}]}
        with open(HERE / f"{name}.nods.json", "w", encoding="utf-8") as fh:
            json.dump(doc, fh, indent=1)
            fh.write("\n")


def invent_coding():
    rng = random.Random(13)
    annotations, t = [], 0.0
    while True:
        t += rng.uniform(3.0, 12.0)
        end = t + rng.uniform(0.3, 1.0)
        if end > 600:
            break
        annotations.append({"start": round(t, 2), "end": round(end, 2),
                            "text": rng.choice(["nod", "nod", "nod", "double nod"])})
        t = end
    doc = {"format": "tiers", "version": 1,
           "media": {"uri": "seminar-a.webm", "duration": 3000, "frame_rate": "25"},
           "metadata": {"scenario": "invented demo: a person's coding of ten minutes"},
           "tiers": [{"name": "nods", "kind": "interval",
                      "source": {"kind": "human", "agent": "coder-1"},
                      "annotations": annotations}]}
    with open(HERE / "seminar-a.coder.json", "w", encoding="utf-8") as fh:
        json.dump(doc, fh, indent=1)
        fh.write("\n")


def invent_verdicts(sheet, out):
    with open(sheet, newline="", encoding="utf-8") as fh:
        rows = list(csv.DictReader(fh))
    rng = random.Random(2026)
    for r in rows:
        right = rng.random() < precision_at(float(r["confidence"]))
        r["verdict"] = "unsure" if rng.random() < 0.02 else ("yes" if right else "no")
    with open(out, "w", newline="", encoding="utf-8") as fh:
        w = csv.DictWriter(fh, fieldnames=list(rows[0].keys()), lineterminator="\n")
        w.writeheader()
        w.writerows(rows)


if __name__ == "__main__":
    if sys.argv[1:2] == ["tiers"]:
        invent_tiers()
        invent_coding()
    elif sys.argv[1:2] == ["verdicts"]:
        invent_verdicts(sys.argv[2], sys.argv[3])
    else:
        raise SystemExit(__doc__)
