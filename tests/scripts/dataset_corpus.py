#!/usr/bin/python3
"""A whole corpus through every command with one call each, from its dataset description.

Invented data: 24 recordings in three folders, as three tools leave them —
  captions/EP.vtt           WebVTT captions, each recording's cues late on their words by a lag
                            of its own (0.200 s + 10 ms per recording), planted here;
  aligner/EP.csv            an aligner's words, times in milliseconds under its own column
                            names (t_begin_ms, t_end_ms, token);
  coding/EP.gestures.csv    two human coders' gestures (tiers coder-a and coder-b), times as
                            frame numbers at 25 frames a second;
and a fourth folder for `derive`: detector/EP.csv, a hand detector's per-frame scores.
The test writes the description with `tiers dataset --source …`, completes it by hand (reading
options, sources, renames), and asserts:
  - `tiers dataset` lists 24 complete recordings and their tiers;
  - `convert --dataset` writes one JSON document per recording with every source's tiers, the
    aligner's milliseconds and the coders' frames read as the description says; with --resume
    it redoes only the recording whose file changed;
  - `check --dataset --captions captions --words words` measures in each recording the lag
    planted in it, within 1 ms;
  - `merge --dataset --plan` shifts each recording's captions onto its words;
  - `derive --dataset` turns a fourth source, a detector's per-frame scores marked as a signal
    source, into intervals on the frames planted in them;
  - `report --dataset` writes a page per recording and an index linking them all;
  - `retime --dataset` moves each recording's cues by exactly its lag; `edit --dataset` edits
    every recording alike;
  - `agree --dataset` pools the recordings: its pooled kappa equals scikit-learn's
    cohen_kappa_score on the concatenated frames (an outside reference), and each recording's
    own kappa equals scikit-learn's on its frames;
  - `check --dataset --shard K/3` and `agree --dataset --shard K/3` for K = 1…3, combined,
    print what one run prints;
  - a recording that lacks a source is reported (dataset.missing-source, exit status 1) while
    the others are converted, and nothing is written for it.

Usage: dataset_corpus.py TIERS WORK_DIR OUTPUT_DIR (the corpus goes to WORK_DIR; the JSON
written goes to OUTPUT_DIR, for the schema test)
"""
import json
import os
import random
import re
import shutil
import subprocess
import sys

from sklearn.metrics import cohen_kappa_score

from checklist import Checklist

RECORDINGS = 24
WORDS = ["the", "kettle", "sang", "while", "our", "guide", "pointed", "north", "across",
         "a", "frozen", "lake", "and", "everyone", "laughed", "at", "once"]
GESTURES = ["beat", "point", "shrug"]
STEP_NS = 40_000_000  # one frame at 25 frames a second
PLANTED = [(100, 160), (400, 475), (900, 1000)]  # frames of the detector's hands


def lag_ns(k):
    return 200_000_000 + 10_000_000 * k


def clock(ns):
    ms = ns // 1_000_000
    return f"{ms // 3_600_000:02d}:{ms // 60_000 % 60:02d}:{ms // 1000 % 60:02d}.{ms % 1000:03d}"


def make_recording(root, k, rng):
    ep = f"ep{k + 1:02d}"
    # Words one a second, 0.8 s long; a cue every three words, late by the recording's lag.
    words = [(i * 1_000_000_000, i * 1_000_000_000 + 800_000_000, rng.choice(WORDS))
             for i in range(60)]
    with open(os.path.join(root, "aligner", ep + ".csv"), "w") as fh:
        fh.write("t_begin_ms,t_end_ms,token\n")
        for s, e, w in words:
            fh.write(f"{s // 1_000_000},{e // 1_000_000},{w}\n")
    with open(os.path.join(root, "captions", ep + ".vtt"), "w") as fh:
        fh.write("WEBVTT\n\n")
        for c in range(0, len(words), 3):
            group = words[c:c + 3]
            start, end = group[0][0] + lag_ns(k), group[-1][1] + lag_ns(k)
            fh.write(f"{clock(start)} --> {clock(end)}\n{' '.join(w for _, _, w in group)}\n\n")
    # Two coders: the same gestures, the second coder's boundaries and labels now and then off.
    rows = []
    frame = 5
    while frame < 1400:
        length = rng.randint(8, 40)
        label = rng.choice(GESTURES)
        rows.append(("coder-a", frame, frame + length, label))
        b_start = frame + rng.choice([0, 0, 1, -1, 3])
        b_label = label if rng.random() < 0.8 else rng.choice(GESTURES)
        rows.append(("coder-b", b_start, frame + length + rng.choice([0, 0, 2, -2]), b_label))
        frame += length + rng.randint(5, 30)
    with open(os.path.join(root, "coding", ep + ".gestures.csv"), "w") as fh:
        fh.write("coder,start_frame,end_frame,gesture\n")
        for row in sorted(rows, key=lambda r: r[0]):
            fh.write(",".join(map(str, row)) + "\n")
    # A hand detector's per-frame scores: high inside planted intervals, low elsewhere.
    with open(os.path.join(root, "detector", ep + ".csv"), "w") as fh:
        fh.write("frame,hands\n")
        for f in range(1400):
            inside = any(a <= f < b for a, b in PLANTED)
            fh.write(f"{f},{0.9 if inside else 0.1}\n")
    return ep, rows


def frames_of(rows, coder, first, count):
    """The label of each 40 ms frame from `first` to `count`: the annotation that covers the
    frame's middle, as docs/agreement.md defines it; annotations here lie on frame boundaries."""
    labels = ["none"] * (count - first)
    for c, s, e, label in sorted((r for r in rows if r[0] == coder), key=lambda r: r[1]):
        for f in range(max(s, first), min(e, count)):
            labels[f - first] = label
    return labels


def run(*argv, ok=(0,)):
    r = subprocess.run(list(argv), capture_output=True, text=True)
    if r.returncode not in ok:
        raise SystemExit(f"FAIL {' '.join(argv)}: status {r.returncode}\n{r.stderr[-3000:]}")
    return r


def main():
    tiers, work, output = sys.argv[1:4]
    shutil.rmtree(work, ignore_errors=True)
    os.makedirs(output, exist_ok=True)
    root = os.path.join(work, "corpus")
    for folder in ("captions", "aligner", "coding", "detector"):
        os.makedirs(os.path.join(root, folder))
    rng = random.Random(7)
    recordings = [make_recording(root, k, rng) for k in range(RECORDINGS)]
    checks = Checklist()
    description = os.path.join(root, "dataset.json")

    # A description from the patterns, then completed by hand as docs/dataset.md shows.
    r = run(tiers, "dataset", "--source", os.path.join(root, "captions/{id}.vtt"),
            "--source", os.path.join(root, "aligner/{id}.csv"),
            "--source", os.path.join(root, "coding/{id}.gestures.csv"), "-o", description)
    with open(description) as fh:
        written = json.load(fh)
    checks.check([s["pattern"] for s in written["sources"]] ==
                 ["captions/{id}.vtt", "aligner/{id}.csv", "coding/{id}.gestures.csv"],
                 f"dataset --source wrote {written}")
    written["sources"][0]["rename"] = {"*": "captions"}
    written["sources"][1].update(
        {"read": {"columns": "start=t_begin_ms,end=t_end_ms,text=token", "time_unit": "ms",
                  "tier_name": "words"},
         "source": {"kind": "machine", "agent": "aligner", "version": "2.1"}})
    written["sources"][2].update(
        {"read": {"columns": "tier=coder,start=start_frame,end=end_frame,text=gesture",
                  "time_unit": "frames", "rate": "25"},
         "kind": "interval", "source": {"kind": "human"}})
    written["sources"].append({"pattern": "detector/{id}.csv", "kind": "signal",
                               "read": {"rate": "25"},
                               "source": {"kind": "machine", "agent": "hands", "version": "1"}})
    with open(description, "w") as fh:
        json.dump(written, fh, indent=1)
    shutil.copy(description, os.path.join(output, "dataset.json"))

    listing = run(tiers, "dataset", description, "--json")
    inventory = json.loads(listing.stdout)
    checks.check(len(inventory["recordings"]) == RECORDINGS and
                 all(not x["lacks"] for x in inventory["recordings"]),
                 f"dataset lists {len(inventory['recordings'])} recordings")
    checks.check(inventory["recordings"][0]["tiers"] == 4,
                 f"a recording has 4 tiers: {inventory['recordings'][0]}")

    # Into one form: a JSON document per recording.
    converted = os.path.join(work, "converted")
    run(tiers, "convert", "--dataset", description, "-d", converted, "--to", "json",
        "--jobs", "2")
    names = sorted(os.listdir(converted))
    checks.check(names == [f"ep{k + 1:02d}.json" for k in range(RECORDINGS)],
                 f"convert --dataset wrote {names}")
    stamps = {n: os.stat(os.path.join(converted, n)).st_mtime_ns for n in names}
    later = max(stamps.values()) + 10_000_000_000  # one input newer than every output
    os.utime(os.path.join(root, "aligner", "ep07.csv"), ns=(later, later))
    run(tiers, "convert", "--dataset", description, "-d", converted, "--to", "json", "--resume")
    redone = sorted(n for n in names
                    if os.stat(os.path.join(converted, n)).st_mtime_ns != stamps[n])
    checks.check(redone == ["ep07.json"],
                 f"convert --dataset --resume redid only the changed recording: {redone}")
    with open(os.path.join(converted, "ep03.json")) as fh:
        doc = json.load(fh)
    shutil.copy(os.path.join(converted, "ep03.json"), os.path.join(output, "converted-ep03.json"))
    by_name = {t["name"]: t for t in doc["tiers"]}
    checks.check(sorted(by_name) == ["captions", "coder-a", "coder-b", "words"],
                 f"ep03 joins {sorted(by_name)}")
    words = by_name.get("words", {})
    checks.check(words.get("source") == {"kind": "machine", "agent": "aligner", "version": "2.1"},
                 f"the words' source: {words.get('source')}")
    checks.check(words.get("annotations", [{}])[1].get("start") == 1 and
                 words["annotations"][1].get("end") == 1.8,
                 "the aligner's milliseconds are read as milliseconds")
    first = next(r for r in recordings[2][1] if r[0] == "coder-a")
    coded = by_name.get("coder-a", {}).get("annotations", [{}])[0]
    checks.check(abs(coded.get("start", -1) - first[1] / 25) < 1e-9 and
                 abs(coded.get("end", -1) - first[2] / 25) < 1e-9,
                 f"frame {first[1]} at 25 fps is {first[1] / 25} s: {coded}")
    checks.check(by_name.get("coder-a", {}).get("source") == {"kind": "human"},
                 "the coders' tiers are marked human")

    # Checked: the lag planted in each recording is measured, within 1 ms.
    report_path = os.path.join(output, "dataset-check.json")
    run(tiers, "check", "--dataset", description, "--captions", "captions", "--words", "words",
        "--format", "json", "-o", report_path, ok=(0, 1))
    with open(report_path) as fh:
        report = json.load(fh)
    lags = {f["path"]: f.get("lag", {}).get("median") for f in report["files"]}
    for k in range(RECORDINGS):
        ep = f"ep{k + 1:02d}"
        measured = lags.get(ep)
        checks.check(measured is not None and abs(measured - lag_ns(k) / 1e9) <= 0.001,
                     f"{ep}: lag {measured} s, planted {lag_ns(k) / 1e9} s")

    # Sharded checks combined print what one run prints.
    common = ["--dataset", description, "--captions", "captions", "--words", "words"]
    parts = []
    for k in range(1, 4):
        part = os.path.join(output, f"dataset-shard-{k}.json")
        run(tiers, "check", *common, "--shard", f"{k}/3", "--format", "json", "-o", part,
            ok=(0, 1))
        parts.append(part)
    whole = run(tiers, "check", *common, ok=(0, 1))
    combined = run(tiers, "check", "--combine", *parts, ok=(0, 1))
    checks.check(whole.stdout == combined.stdout and whole.stderr == combined.stderr and
                 whole.returncode == combined.returncode,
                 "check --dataset in three shards, combined, prints what one run prints")

    # Merged: each recording's captions shifted onto its words.
    plan = os.path.join(work, "plan.json")
    with open(plan, "w") as fh:
        json.dump({"format": "tiers-merge-plan", "version": 1,
                   "shift": [{"tier": "captions", "align_to": "words", "max": "1s"}]}, fh)
    merged = os.path.join(work, "merged")
    run(tiers, "merge", "--dataset", description, "--plan", plan, "-d", merged, "--to", "json")
    for k in (0, RECORDINGS - 1):
        ep = f"ep{k + 1:02d}"
        with open(os.path.join(merged, ep + ".json")) as fh:
            doc = json.load(fh)
        tiers_of = {t["name"]: t for t in doc["tiers"]}
        cue = tiers_of["captions"]["annotations"][0]
        checks.check(abs(cue["start"] - 0) < 1e-9,
                     f"{ep}: the first cue starts with its first word after the shift: {cue}")

    # Derived: the detector's scores, a signal source, into intervals on the planted frames.
    derived = os.path.join(work, "derived")
    run(tiers, "derive", "--dataset", description, "--on", "0.5", "-d", derived, "--to", "json")
    with open(os.path.join(derived, "ep09.json")) as fh:
        doc = json.load(fh)
    spans = [(round(a["start"] * 25), round(a["end"] * 25)) for a in doc["tiers"][0]["annotations"]]
    checks.check(spans == PLANTED and doc["tiers"][0]["source"] ==
                 {"kind": "machine", "agent": "hands", "version": "1"},
                 f"derive --dataset found the planted frames {PLANTED}: {spans}")

    # Re-timed: each recording's cues moved onto their words, by its own lag.
    retimed = os.path.join(work, "retimed")
    r = run(tiers, "retime", "--dataset", description, "--captions", "captions", "--words",
            "words", "-d", retimed, "--to", "json", "--json")
    moves = {x["id"]: x["report"]["cues"] for x in json.loads(r.stdout)["recordings"]}
    for k in range(RECORDINGS):
        ep = f"ep{k + 1:02d}"
        shifts = {round(c["new_start"] - c["old_start"], 6) for c in moves.get(ep, [])}
        checks.check(shifts == {round(-lag_ns(k) / 1e9, 6)},
                     f"{ep}: retime moved the cues by {sorted(shifts)}, the lag is {lag_ns(k)} ns")
    # Edited alike: one tier kept, every time shifted.
    edited = os.path.join(work, "edited")
    run(tiers, "edit", "--dataset", description, "--select", "words", "--shift", "2s",
        "-d", edited, "--to", "json")
    with open(os.path.join(edited, "ep02.json")) as fh:
        doc = json.load(fh)
    checks.check([t["name"] for t in doc["tiers"]] == ["words"] and
                 doc["tiers"][0]["annotations"][0]["start"] == 2,
                 f"edit --dataset kept the words, shifted by 2 s: {doc['tiers'][0]['annotations'][0]}")

    # Reported: a page per recording and an index linking them.
    pages = os.path.join(work, "report")
    run(tiers, "report", "--dataset", description, "--captions", "captions", "--words", "words",
        "--ref-tier", "coder-a", "--cand-tier", "coder-b", "-d", pages)
    with open(os.path.join(pages, "index.html"), encoding="utf-8") as fh:
        index = fh.read()
    links = re.findall(r'<a href="(recordings/[^"]+)">', index)
    checks.check(links == [f"recordings/ep{k + 1:02d}.html" for k in range(RECORDINGS)] and
                 "24 recordings" in index,
                 f"report --dataset's index links every recording's page: {links[:3]}…")
    checks.check(all(os.path.exists(os.path.join(pages, x)) for x in links),
                 "every page the index links is there")

    # Agreement pooled over the recordings against scikit-learn on the concatenated frames.
    agree = run(tiers, "agree", "--dataset", description, "--ref-tier", "coder-a",
                "--cand-tier", "coder-b", "--step", "40ms", "--json")
    result = json.loads(agree.stdout)
    ref_all, cand_all = [], []
    for ep, rows in recordings:
        # Without the media's duration, the grid spans the union of the two tiers' spans.
        first, count = min(s for _, s, _, _ in rows), max(e for _, _, e, _ in rows)
        a, b = frames_of(rows, "coder-a", first, count), frames_of(rows, "coder-b", first, count)
        own = next((x for x in result["recordings"] if x["id"] == ep), {})
        expected = cohen_kappa_score(a, b)  # reference: scikit-learn
        checks.check(abs(own.get("kappa", 2) - expected) < 1e-9,
                     f"{ep}: kappa {own.get('kappa')}, scikit-learn {expected}")
        ref_all += a
        cand_all += b
    pooled = cohen_kappa_score(ref_all, cand_all)  # reference: scikit-learn, frames joined
    checks.check(abs(result["pooled"]["kappa"] - pooled) < 1e-9,
                 f"pooled kappa {result['pooled']['kappa']}, scikit-learn {pooled}")
    checks.check(result["pooled"]["frames"]["count"] == len(ref_all),
                 f"pooled frames {result['pooled']['frames']['count']} of {len(ref_all)}")

    # Agreement in three shards, pooled with --combine: what one run prints.
    parts = []
    for k in range(1, 4):
        part = run(tiers, "agree", "--dataset", description, "--ref-tier", "coder-a",
                   "--cand-tier", "coder-b", "--step", "40ms", "--shard", f"{k}/3", "--json")
        parts.append(os.path.join(work, f"agree-{k}.json"))
        with open(parts[-1], "w") as fh:
            fh.write(part.stdout)
    combined = run(tiers, "agree", "--combine", *parts, "--json")
    checks.check(combined.stdout == agree.stdout,
                 "agree --dataset in three shards, combined, prints what one run prints")

    # A recording without its aligner file: reported, the others converted.
    os.remove(os.path.join(root, "aligner", "ep05.csv"))
    lacking = run(tiers, "dataset", description, ok=(1,))
    checks.check("ep05" in lacking.stdout + lacking.stderr,
                 f"dataset names the incomplete recording: {lacking.stdout[-500:]}")
    partial = os.path.join(work, "partial")
    r = run(tiers, "convert", "--dataset", description, "-d", partial, "--to", "json", ok=(1,))
    checks.check("dataset.missing-source" in r.stderr and "ep05" in r.stderr,
                 f"convert says which recording lacks what: {r.stderr[-500:]}")
    names = sorted(os.listdir(partial))
    checks.check(len(names) == RECORDINGS - 1 and "ep05.json" not in names,
                 f"the complete recordings are converted, ep05 is not: {names}")
    r = run(tiers, "check", "--dataset", description, "--format", "json", ok=(1,))
    rules = {p["rule"] for f in json.loads(r.stdout)["files"] if f["path"] == "ep05"
             for p in f["problems"]}
    checks.check("dataset.missing-source" in rules, f"check reports ep05's lack: {rules}")
    return checks.finish()


if __name__ == "__main__":
    sys.exit(main())
