#!/usr/bin/python3
"""`tiers agree` through the command line, against values from outside the project.

- Cohen's kappa of a tutorial's worked example (../shared/CHECKS.md, read): the 2×2 table
  yes/yes 20, yes/no 5, no/yes 10, no/no 15 gives κ = 0.4; the kappa-paradox tables 45/15/25/15
  and 25/35/5/35 give 3/23 and 7/27 (CHECKS.md, memory; arithmetic verified).
- Cohen's kappa equals scikit-learn's cohen_kappa_score (Debian's python3-sklearn) on random
  label sequences, with "none" for unannotated units.
- `agree --sweep`: frame precision and recall at every threshold equal scikit-learn's
  precision_recall_curve on the same frames (each frame scored by the confidence of the
  candidate annotation over it), for random single-label tiers.
- `--empty label` gives the alpha of the same data with "none" written out as a label.
- Krippendorff's alpha of the reliability data in K. Krippendorff, "Computing Krippendorff's
  Alpha-Reliability" (2011): 4 coders × 12 units, nominal 0.743 and interval 0.849 (the paper's
  values from memory; recomputed 0.7434 and 0.8491).

Each unit is a one-second annotation and the grid step is one second, so that frames are
units. Usage: agree_reference.py TIERS OUTPUT_DIR
"""
import json
import os
import random
import subprocess
import sys

import numpy as np
from sklearn.metrics import cohen_kappa_score, precision_recall_curve

failures = []


def write_doc(path, tiers):
    doc = {"format": "tiers", "version": 1, "tiers": [
        {"name": name, "annotations": [
            {"start": u, "end": u + 1, "text": label} for u, label in enumerate(labels)
            if label is not None]}
        for name, labels in tiers.items()]}
    with open(path, "w") as fh:
        json.dump(doc, fh)


def agree(tiers, *args):
    r = subprocess.run([tiers, "agree", *args, "--step", "1s", "--json"], capture_output=True,
                       text=True)
    if r.returncode != 0:
        raise SystemExit(f"FAIL tiers agree {args}: {r.stderr}")
    return json.loads(r.stdout)


def check(what, got, want, tolerance):
    ok = got is not None and abs(got - want) <= tolerance
    print(("ok  " if ok else "FAIL"), f"{what}: {got} (expected {want} ± {tolerance})")
    if not ok:
        failures.append(what)


def sweeps(tiers, out):
    """Random reference and candidate tiers of one label on a 1 s grid; the candidate's
    annotations never overlap, so each frame has at most one confidence."""
    rng = random.Random(20261204)
    for trial in range(12):
        n = rng.randint(60, 400)
        ref = [rng.random() < 0.4 for _ in range(n)]
        ref[0] = ref[-1] = True  # the grid spans [0, n]
        cand, k = [], 0
        while k < n:
            length = rng.randint(1, 6)
            if rng.random() < 0.5:
                # Few distinct confidences, so that thresholds are shared by several annotations.
                cand.append((k, min(k + length, n), rng.choice([0.2, 0.35, 0.5, 0.65, 0.8, 0.95])))
            k += length + rng.randint(0, 3)
        doc = {"format": "tiers", "version": 1, "tiers": [
            {"name": "ref", "annotations": [
                {"start": u, "end": u + 1, "text": "nod"} for u in range(n) if ref[u]]},
            {"name": "cand", "source": {"kind": "machine"}, "annotations": [
                {"start": a, "end": b, "text": "nod", "confidence": c} for a, b, c in cand]}]}
        path = os.path.join(out, f"sweep-{trial}.json")
        with open(path, "w") as fh:
            json.dump(doc, fh)
        got = agree(tiers, path, "--ref-tier", "ref", "--cand-tier", "cand", "--sweep")
        score = np.full(n, -1.0)  # frames without a candidate annotation: never predicted
        for a, b, c in cand:
            score[a:b] = c
        precision, recall, thresholds = precision_recall_curve(np.array(ref), score)
        at = {float(t): (p, r) for t, p, r in zip(thresholds, precision, recall)}
        points = got["points"]
        check(f"sweep trial {trial}: one point per distinct confidence",
              len(points), len({c for _, _, c in cand}), 0)
        for p in points:
            if p["threshold"] not in at:
                # scikit-learn 1.2 drops thresholds below the first that reaches full recall.
                continue
            want_p, want_r = at[p["threshold"]]
            check(f"sweep trial {trial} at {p['threshold']}: precision = sklearn",
                  p["precision"], want_p, 1e-12)
            check(f"sweep trial {trial} at {p['threshold']}: recall = sklearn",
                  p["recall"], want_r, 1e-12)


def main():
    tiers, out = sys.argv[1:3]
    os.makedirs(out, exist_ok=True)

    tables = [((20, 5, 10, 15), 0.4, "worked example 20/5/10/15 (read)"),
              ((45, 15, 25, 15), 3 / 23, "kappa paradox 45/15/25/15 (memory)"),
              ((25, 35, 5, 35), 7 / 27, "kappa paradox 25/35/5/35 (memory)")]
    for (yy, yn, ny, nn), want, name in tables:
        ref = ["yes"] * (yy + yn) + ["no"] * (ny + nn)
        cand = ["yes"] * yy + ["no"] * yn + ["yes"] * ny + ["no"] * nn
        write_doc(os.path.join(out, "ref.json"), {"judgement": ref})
        write_doc(os.path.join(out, "cand.json"), {"judgement": cand})
        got = agree(tiers, os.path.join(out, "ref.json"), os.path.join(out, "cand.json"))
        check(f"kappa, {name}", got["kappa"], want, 1e-9)

    rng = random.Random(20261202)
    for trial in range(20):
        n = rng.randint(30, 400)
        labels = ["beat", "deictic", "iconic", None][: rng.randint(2, 4)]
        ref = [rng.choice(labels) for _ in range(n)]
        # A candidate that agrees more often than chance, so that kappa is informative.
        cand = [r if rng.random() < 0.6 else rng.choice(labels) for r in ref]
        # The first and last units fix the grid (the union of the tiers' spans) at [0, n].
        ref[0] = ref[0] or "beat"
        ref[-1] = ref[-1] or "beat"
        path = os.path.join(out, f"random-{trial}.json")
        write_doc(path, {"ref": ref, "cand": cand})
        got = agree(tiers, path, "--ref-tier", "ref", "--cand-tier", "cand")
        want = cohen_kappa_score([x or "none" for x in ref], [x or "none" for x in cand])
        check(f"kappa = sklearn cohen_kappa_score, random trial {trial} (n={n})", got["kappa"],
              want, 1e-9)

    _ = None
    coders = {"A": [1, 2, 3, 3, 2, 1, 4, 1, 2, _, _, _],
              "B": [1, 2, 3, 3, 2, 2, 4, 1, 2, 5, _, 3],
              "C": [_, 3, 3, 3, 2, 3, 4, 2, 2, 5, 1, _],
              "D": [1, 2, 3, 3, 2, 4, 4, 1, 2, 5, 1, _]}
    path = os.path.join(out, "reliability.json")
    write_doc(path, {k: [None if v is None else str(v) for v in vs] for k, vs in coders.items()})
    got = agree(tiers, path, "--tiers", "A,B,C,D")
    check("alpha nominal, Krippendorff 2011 (0.743)", got["alpha"], 0.743, 5e-4)
    check("alpha interval, Krippendorff 2011 (0.849)", got["alpha_interval"], 0.849, 5e-4)
    check("alpha nominal, recomputed 0.7434", got["alpha"], 0.7434, 5e-5)

    got = agree(tiers, path, "--tiers", "A,B,C,D", "--empty", "label")
    spelled = os.path.join(out, "reliability-none.json")
    write_doc(spelled, {k: ["none" if v is None else str(v) for v in vs]
                        for k, vs in coders.items()})
    want = agree(tiers, spelled, "--tiers", "A,B,C,D")
    check("alpha, --empty label = alpha with 'none' written out", got["alpha"], want["alpha"],
          1e-12)
    check("alpha, --empty label is not --empty missing's 0.7434 (1: differs)",
          int(abs(got["alpha"] - 0.7434) > 0.01), 1, 0)

    sweeps(tiers, out)
    print(f"{len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
