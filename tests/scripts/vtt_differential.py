#!/usr/bin/python3
"""Differential test of tiers' WebVTT reader against an independent parser.

The reference is the npm package webvtt-parser 2.2.0 — the parser behind the W3C WebVTT
validator — pinned by tests/npm-reference/package-lock.json and installed by
scripts/install-deps. Both read the bundled samples and 600 generated files (valid and
invalid, deterministic from a seed); for every file they must agree on whether the signature is
valid and on every cue: count, identifier, start, end and cue text as written.

Then every sample .vtt goes through tiers to JSON and back to WebVTT, and the package must read
the same cues, with the same settings, from the original and from the copy.

Where the package departs from the specification, the specification (W3C WebVTT, w3c/webvtt
index.bs) wins: each known departure is listed in DEPARTURES with its section, recognised
precisely, and counted; any other difference fails the test.

Usage: vtt_differential.py TIERS REFERENCE_DIR SAMPLES_DIR WORK_DIR
"""
import glob
import json
import os
import random
import subprocess
import sys

from checklist import Checklist

SEED = 20261201
FILES = 600

# Each entry: the section of the specification, what it says, and what the package does.
DEPARTURES = {
    "signature": "§6.1 steps 4-6: without the WebVTT signature the parser aborts and no cues are "
                 "added; the package reports 'No valid signature' and parses the cues anyway",
    "note-identifier": "§6.1 'collect a WebVTT block': a block whose second line holds '-->' is "
                       "a cue, and its first line is the identifier, even when that line is "
                       "'NOTE'; the package drops such a cue as 'a timestamp in a comment'",
}


def is_note_line(text):
    return text == "NOTE" or text.startswith("NOTE ") or text.startswith("NOTE\t")


def stamp(rng, valid=True):
    h, m, s, ms = rng.randrange(0, 3), rng.randrange(0, 60), rng.randrange(0, 60), rng.randrange(0, 1000)
    if valid:
        return rng.choice([f"{m:02d}:{s:02d}.{ms:03d}", f"{h:02d}:{m:02d}:{s:02d}.{ms:03d}",
                           f"{h:03d}:{m:02d}:{s:02d}.{ms:03d}", f"{h + 100}:{m:02d}:{s:02d}.{ms:03d}"])
    return rng.choice([f"{m}:{s:02d}.{ms:03d}", f"{m:02d}:{s:02d}.{ms // 10:02d}",
                       f"{m:02d}:{s:02d},{ms:03d}", f"{m:02d}:{s:03d}.{ms:03d}",
                       f"{m:02d}::{s:02d}.{ms:03d}", f"60:{s:02d}.{ms:03d}", f"{m:02d}:60.{ms:03d}",
                       f"{h:02d}:60:{s:02d}.{ms:03d}", f"{m:02d}:{s:02d}.{ms:03d}0", "", "x"])


SETTINGS = ["align:start", "align:middle", "align:left", "line:0", "line:-1,end", "line:50%",
            "line:abc", "line:,start", "position:10%", "position:101%", "position:20%,line-left",
            "size:50%", "size:100%", "size:x", "vertical:rl", "vertical:up", "region:r1",
            "region:nope", "bogus:1", "novalue:", ":x", "align:end align:start"]
TEXT = ["Hello world", "<v Ana>Hi there", "<v.loud Bo>Hey</v> <i>laughs</i>", "fish &amp; chips",
        "&lt;3 &notit; &#x263A;", "<c.yellow>colour</c>", "tab\tand  spaces", "ünïcödé 漢字",
        "<00:00:01.000>timed <00:00:02.000>words", "<b>bold", "a --> b", "NOTE not a note",
        "STYLE in a cue", "", "x\x00y", "&bogus; & <", "   ", "<ruby>漢<rt>kan</rt></ruby>"]


def generate(rng):
    eol = rng.choice(["\n"] * 6 + ["\r\n"] * 3 + ["\r"])
    sig = rng.choice(["WEBVTT"] * 12 + ["WEBVTT - title", "WEBVTT\tx", "\ufeffWEBVTT", "WEBVTTX",
                                        "webvtt", "", " WEBVTT", "WEBVTT-x"])
    lines = [sig]
    if rng.random() < 0.2:
        lines.append("Kind: captions")
    lines.append("")
    for _ in range(rng.randrange(0, 9)):
        kind = rng.choices(["cue", "note", "style", "region", "junk", "blank"], [10, 2, 1, 1, 1, 1])[0]
        if kind == "cue":
            if rng.random() < 0.5:
                lines.append(rng.choice(["id1", "cue 2", "crédit", "NOTE", "-->", "00:01.000"]))
            valid = rng.random() < 0.8
            arrow = rng.choice([" --> ", "-->", "\t-->\t", " -> ", "  -->  "]) if valid else rng.choice([" --> ", " - > "])
            timing = stamp(rng, valid or rng.random() < 0.5) + arrow + stamp(rng, valid)
            if rng.random() < 0.4:
                timing += " " + " ".join(rng.sample(SETTINGS, rng.randrange(1, 4)))
            lines.append(timing)
            for _ in range(rng.randrange(0, 4)):
                lines.append(rng.choice(TEXT))
        elif kind == "note":
            lines += ["NOTE " + rng.choice(["a comment", "with --> arrow", ""]), "more"][: rng.randrange(1, 3)]
        elif kind == "style":
            lines += ["STYLE", "::cue { color: lime }"]
        elif kind == "region":
            lines += ["REGION", "id:r1 width:40%"]
        elif kind == "junk":
            lines += ["junk line", "another"]
        lines.append("")
        if rng.random() < 0.2:
            lines.append("")
    text = eol.join(lines)
    if rng.random() < 0.5:
        text += eol
    return text


def tiers_cues(tiers, path, json_dir):
    proc = subprocess.run([tiers, "convert", path, "--to", "json", "--tier-name", "t"],
                          capture_output=True)
    if proc.returncode != 0:
        return None, proc.stderr.decode(errors="replace")
    # Kept for the schema test, which validates every JSON document the suite writes.
    with open(os.path.join(json_dir, os.path.basename(path) + ".json"), "wb") as fh:
        fh.write(proc.stdout)
    doc = json.loads(proc.stdout)
    cues = []
    for a in doc["tiers"][0]["annotations"]:
        cues.append({"id": a.get("id", ""), "start": round(a["start"] * 1000),
                     "end": round(a["end"] * 1000), "text": a.get("markup", a["text"])})
    return cues, ""


def reference_parse(reference, paths):
    proc = subprocess.run(["node", os.path.join(reference, "webvtt.cjs"), *paths],
                          capture_output=True, check=True)
    return {r["path"]: r for r in map(json.loads, proc.stdout.decode().splitlines())}


def sample_round_trips(tiers, reference, samples, work, results):
    """vtt -> json -> vtt keeps cue timings, identifiers, settings and cue text."""
    back_dir = os.path.join(work, "round-trip")
    os.makedirs(back_dir, exist_ok=True)
    pairs = []
    for src in sorted(glob.glob(os.path.join(samples, "*.vtt"))):
        stem = os.path.splitext(os.path.basename(src))[0]
        as_json = os.path.join(back_dir, stem + ".json")
        back = os.path.join(back_dir, stem + ".vtt")
        for args in (["convert", src, "-o", as_json], ["convert", as_json, "-o", back]):
            proc = subprocess.run([tiers, *args], capture_output=True)
            results.check(proc.returncode == 0, f"tiers {' '.join(args)}: {proc.stderr.decode()}")
        pairs.append((src, back))
    results.check(bool(pairs), "no sample .vtt files")
    parsed = reference_parse(reference, [p for pair in pairs for p in pair if os.path.exists(p)])
    for src, back in pairs:
        if back in parsed:
            results.check(parsed[src]["cues"] == parsed[back]["cues"],
                          f"{src}: the package reads other cues after vtt -> json -> vtt")
    return len(pairs)


def main():
    tiers, reference, samples, work = sys.argv[1:5]
    os.makedirs(work, exist_ok=True)
    rng = random.Random(SEED)
    paths = sorted(glob.glob(os.path.join(samples, "*.vtt")))
    for k in range(FILES):
        path = os.path.join(work, f"generated-{k:04d}.vtt")
        with open(path, "w", encoding="utf-8", newline="") as fh:
            fh.write(generate(rng))
        paths.append(path)
    expected = reference_parse(reference, paths)

    results = Checklist()
    json_dir = os.path.join(work, "json")
    os.makedirs(json_dir, exist_ok=True)
    round_trips = sample_round_trips(tiers, reference, samples, work, results)
    seen = {name: 0 for name in DEPARTURES}
    for path in paths:
        ref = expected[path]
        ours, errors = tiers_cues(tiers, path, json_dir)
        signature_error = any(e.startswith("No valid signature") for e in ref["errors"])
        if ours is None:
            # tiers rejected the file: only a bad signature may do that, and the package says so.
            if results.check(signature_error and "vtt.signature" in errors,
                             f"{path}: tiers rejected it ({errors.strip()}), the package did not"):
                if ref["cues"]:
                    seen["signature"] += 1
            continue
        results.check(not signature_error, f"{path}: the package found no signature, tiers did")
        theirs = [{"id": c["id"], "start": round(c["start"] * 1000), "end": round(c["end"] * 1000),
                   "text": c["text"]} for c in ref["cues"]]
        # The text track list of cues is in start-time order (HTML's "text track cue order"),
        # which the package applies and tiers does not (it keeps the file's order): compare
        # the cues as sorted lists.
        key = lambda c: (c["start"], c["end"], c["id"], c["text"])
        ours, theirs = sorted(ours, key=key), sorted(theirs, key=key)
        extra = [c for c in ours if c not in theirs]
        if extra and all(c in ours for c in theirs) and all(is_note_line(c["id"]) for c in extra):
            seen["note-identifier"] += 1
            ours = [c for c in ours if c not in extra]
        if not results.check(len(ours) == len(theirs),
                             f"{path}: {len(ours)} cues in tiers, {len(theirs)} in the package"):
            continue
        for k, (a, b) in enumerate(zip(ours, theirs)):
            for field in ("id", "start", "end", "text"):
                results.check(a[field] == b[field],
                              f"{path}: cue {k} {field}: tiers {a[field]!r}, package {b[field]!r}")
    for name, count in seen.items():
        print(f"known departure '{name}' ({DEPARTURES[name]}): {count} files")
    print(f"{len(paths)} files compared, {round_trips} samples round-tripped")
    return results.finish()


if __name__ == "__main__":
    sys.exit(main())
