#!/usr/bin/python3
"""`tiers check` over a whole dataset, through the command line.

Invented demo data (a study of gestures in neighbourhood meetings that did not take place): 42
sessions, written as native JSON (32) and as the plain-text tier format (10, converted by tiers
itself), each with captions shown 2.5 s after their words, aligned words, gesture units with a
fixed vocabulary and gesture phases that partition them. The test asserts:
  - the clean dataset checks with --jobs 2 and exit status 0, with no problem at all;
  - every file's lag median is within 20 ms of the injected 2.5 s (the issue's acceptance
    figure) and its coverage is reported (1.0: the captions say what the words say);
  - one planted defect in one file makes the exit status 1, with exactly that problem, located
    at that file's line, in JSON and in text;
  - --max-warnings turns a warning into failure, and -o writes the report whole;
  - --lag-table writes one row per cue of every file, each at the injected lag, CSV (from the
    streamed text run) and JSON alike.

Usage: check_dataset.py TIERS OUTPUT_DIR
"""
import csv
import json
import os
import random
import shutil
import subprocess
import sys

WORDS = ("we share the garden beds and water them in turns every spring our street grew beans "
         "peas lettuce and herbs near the library fence with seeds from neighbours who came "
         "to help on saturday mornings").split()
LAG = 2.5


def session(seed):
    rng = random.Random(seed)
    t = 1.0
    words, captions, gestures, phases = [], [], [], []
    while t < 240:
        n = rng.randint(5, 8)
        group = []
        for _ in range(n):
            d = round(rng.uniform(0.3, 0.5), 3)
            group.append({"start": round(t, 3), "end": round(t + d, 3), "text": rng.choice(WORDS)})
            t = round(t + d + 0.05, 3)
        words += group
        text = " ".join(w["text"] for w in group[: n // 2]) + "\n" + \
            " ".join(w["text"] for w in group[n // 2:])
        captions.append({"start": round(group[0]["start"] + LAG, 3),
                         "end": round(group[-1]["end"] + LAG, 3),
                         "text": text[0].upper() + text[1:] + "."})
        t = round(t + rng.uniform(0.3, 0.8), 3)
    g = 2.0
    while g < 230:
        length = round(rng.uniform(1.2, 3.0), 3)
        gestures.append({"start": g, "end": round(g + length, 3),
                         "text": rng.choice(["beat", "deictic", "iconic"])})
        a, b = round(g + length * 0.3, 3), round(g + length * 0.7, 3)
        phases += [{"start": g, "end": a, "text": "prep"}, {"start": a, "end": b, "text": "stroke"},
                   {"start": b, "end": round(g + length, 3), "text": "retract"}]
        g = round(g + length + rng.uniform(1, 6), 3)
    return {
        "format": "tiers", "version": 1,
        "media": {"uri": f"session-{seed:03d}.mp4", "duration": 250, "frame_rate": "25"},
        "metadata": {"scenario": "invented demo: gestures at a neighbourhood meeting"},
        "tiers": [
            {"name": "captions", "source": {"kind": "human"}, "annotations": captions},
            {"name": "words", "source": {"kind": "machine", "agent": "demo-aligner"},
             "annotations": words},
            {"name": "gestures", "vocabulary": ["beat", "deictic", "iconic"],
             "annotations": gestures},
            {"name": "phases", "parent": {"tier": "gestures", "relation": "partition"},
             "vocabulary": ["prep", "stroke", "hold", "retract"], "annotations": phases},
        ],
    }


PROFILE = {
    "format": "tiers-profile", "version": 1,
    "description": "invented demo: a gesture study's sessions",
    "extends": "broadcast-captions",
    "captions": "captions", "words": "words",
    "tiers": [
        {"name": "captions", "kind": "interval"},
        {"name": "words", "kind": "interval"},
        {"name": "gestures", "kind": "interval", "vocabulary": ["beat", "deictic", "iconic"]},
        {"name": "phases", "parent": {"tier": "gestures", "relation": "partition"},
         "vocabulary": ["prep", "stroke", "hold", "retract"]},
    ],
    "rules": {"dataset.tier-unexpected": "warning"},
}


def report_paths(report):
    return [f["path"] for f in report["files"]]


def run(tiers, *args, cwd=None):
    return subprocess.run([tiers, *args], capture_output=True, text=True, cwd=cwd)


def fail(message):
    print("FAIL", message)
    sys.exit(1)


def main():
    tiers, out = sys.argv[1], sys.argv[2]
    shutil.rmtree(out, ignore_errors=True)
    data = os.path.join(out, "dataset")
    os.makedirs(data)
    for k in range(42):
        path = os.path.join(data, f"session-{k:03d}.json")
        with open(path, "w") as fh:
            json.dump(session(k), fh, indent=1)
        if k % 4 == 1:  # ten sessions in the plain-text format
            r = run(tiers, "convert", path, "-o", path[:-5] + ".tiers")
            if r.returncode:
                fail(r.stderr)
            os.remove(path)
    profile = os.path.join(out, "study.profile.json")
    with open(profile, "w") as fh:
        json.dump(PROFILE, fh, indent=1)
    shutil.copy(profile, os.path.join(out, "study.json"))  # for the schema test

    r = run(tiers, "check", data, "--profile", profile, "--jobs", "2", "--format", "json")
    report = json.loads(r.stdout)
    with open(os.path.join(out, "clean.report.json"), "w") as fh:
        fh.write(r.stdout)
    if r.returncode != 0:
        fail(f"clean dataset: exit status {r.returncode}: {r.stderr}")
    if len(report["files"]) != 42:
        fail(f"{len(report['files'])} files checked, not 42")
    problems = [p for f in report["files"] for p in f["problems"]]
    if problems:
        fail(f"clean dataset has problems: {problems[:3]}")
    for f in report["files"]:
        lag = f.get("lag")
        if not lag or abs(lag["median"] - LAG) > 0.020 or lag["coverage"] != 1:
            fail(f"{f['path']}: lag {lag}")
    print(f"ok   42 clean files, exit 0; lag medians within 20 ms of {LAG} s, coverage reported")

    # The lag table: every cue of every file, not only those over a limit, each at the lag it
    # was shown with; the streamed text run (CSV) and the JSON run say the same.
    table = os.path.join(out, "lag.csv")
    r = run(tiers, "check", data, "--profile", profile, "--jobs", "2", "--lag-table", table)
    if r.returncode != 0:
        fail(f"--lag-table: exit status {r.returncode}: {r.stderr}")
    with open(table, newline="") as fh:
        rows = list(csv.DictReader(fh))
    cues = sum(len(session(k)["tiers"][0]["annotations"]) for k in range(42))
    if len(rows) != cues:
        fail(f"lag table: {len(rows)} rows for {cues} cues")
    bad = [x for x in rows if abs(float(x["lag"]) - LAG) > 1e-9
           or abs(float(x["start"]) - float(x["word_start"]) - LAG) > 1e-9
           or x["words"] != x["matched"] or int(x["words"]) < 5]
    if bad:
        fail(f"lag table rows off the planted lag: {bad[:3]}")
    if sorted({x["file"] for x in rows}) != sorted(report_paths(report)):
        fail("lag table: not every file is in it")
    as_json = os.path.join(out, "lag.json")
    r = run(tiers, "check", data, "--profile", profile, "--format", "json", "-o",
            os.path.join(out, "lag-run.report.json"), "--lag-table", as_json)
    with open(as_json) as fh:
        json_rows = json.load(fh)["cues"]
    if [(x["file"], x["cue"], x["lag"]) for x in json_rows] != \
            [(x["file"], int(x["cue"]), float(x["lag"])) for x in rows]:
        fail("the JSON lag table differs from the CSV one")
    print(f"ok   lag table: {cues} cues of 42 files, each {LAG} s late, CSV and JSON alike")

    # One planted defect: a phase label outside the vocabulary, in one file.
    broken = os.path.join(data, "session-020.json")
    with open(broken) as fh:
        text = fh.read()
    text = text.replace('"text": "stroke"', '"text": "strok"', 1)
    with open(broken, "w") as fh:
        fh.write(text)
    # The problem is located at the annotation's object, which opens before its text.
    line = text[: text.rindex("{", 0, text.index('"strok"'))].count("\n") + 1
    r = run(tiers, "check", data, "--profile", profile, "--jobs", "2", "--format", "json")
    report = json.loads(r.stdout)
    found = [(f["path"], p["rule"], p.get("line")) for f in report["files"] for p in f["problems"]]
    if r.returncode != 1 or found != [(broken, "structure.vocabulary", line)]:
        fail(f"one broken file: exit {r.returncode}, problems {found}")
    r = run(tiers, "check", data, "--profile", profile, "--jobs", "2")
    if r.returncode != 1 or not r.stderr.startswith(f"{broken}:{line}:") or \
            "[structure.vocabulary]" not in r.stderr:
        fail(f"text report: {r.returncode} {r.stderr}")
    if "checked 42 files: 1 error" not in r.stdout:
        fail(f"text summary: {r.stdout}")
    print(f"ok   one broken file: exit 1, exactly its problem at line {line}")

    # A warning, and --max-warnings.
    doc = json.loads(text.replace('"strok"', '"stroke"'))
    doc["tiers"].append({"name": "notes", "annotations": [{"start": 5, "end": 6, "text": "rain"}]})
    with open(broken, "w") as fh:
        json.dump(doc, fh)
    r = run(tiers, "check", data, "--profile", profile, "--jobs", "2")
    if r.returncode != 0 or "[dataset.tier-unexpected]" not in r.stderr:
        fail(f"a warning alone must pass: {r.returncode} {r.stderr}")
    r = run(tiers, "check", data, "--profile", profile, "--jobs", "2", "--max-warnings", "0")
    if r.returncode != 1 or "more than --max-warnings 0" not in r.stderr:
        fail(f"--max-warnings 0: {r.returncode} {r.stderr}")
    target = os.path.join(out, "report.txt")
    r = run(tiers, "check", data, "--profile", profile, "-o", target)
    with open(target) as fh:
        written = fh.read()
    if r.returncode != 0 or r.stdout or "[dataset.tier-unexpected]" not in written or \
            "checked 42 files" not in written:
        fail(f"-o: {r.returncode} {r.stdout!r} {written[:200]!r}")
    print("ok   --max-warnings fails on warnings; -o holds problems and summary")
    return 0


if __name__ == "__main__":
    sys.exit(main())
