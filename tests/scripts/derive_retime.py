#!/usr/bin/python3
"""`tiers derive`, `tiers retime` and `tiers edit` through the command line, on invented data.

Invented demo data only: the truths are made up here, so the checks are of the tool against
what was planted, with bounds from the issue that asked for them:
- derive: per-frame scores at 25 fps around known intervals, with dropouts inside them (to be
  bridged) and blips outside them (to be dropped): every boundary within one frame of the truth;
  frame numbers at 30000/1001 exact to the nanosecond (frame n starts at n × 1001/30000 s);
- retime: captions shown after their words with a constant (2.5 s) and a drifting (1 s to 9 s)
  lag: at least 95 % of the re-timed cue starts within 40 ms of their first word, and no cues
  overlapping afterwards;
- edit: a shift by +x then −x, and scaling 25 → 24000/1001 → 25 of frame-aligned times, give back
  the very same file.

Usage: derive_retime.py TIERS OUTPUT_DIR SAMPLES
"""
import json
import os
import random
import subprocess
import sys
from fractions import Fraction

failures = []


def run(tiers, *args):
    r = subprocess.run([tiers, *args], capture_output=True, text=True)
    if r.returncode != 0:
        raise SystemExit(f"FAIL tiers {' '.join(args)}: {r.stderr}")
    return r


def check(what, ok, detail=""):
    print(("ok  " if ok else "FAIL"), what, detail)
    if not ok:
        failures.append(what)


def derive_case(tiers, out):
    rng = random.Random(7)
    frames = 25 * 600  # ten minutes at 25 fps
    truth = {}
    columns = ["person_visible", "hands_moving", "head_turn"]
    scores = {c: [rng.uniform(0.02, 0.3) for _ in range(frames)] for c in columns}
    for c in columns:
        spans, f = [], 50
        while f < frames - 200:
            length = rng.randint(10, 150)  # 0.4 s to 6 s
            spans.append((f, f + length))
            for k in range(f, f + length):
                scores[c][k] = rng.uniform(0.65, 0.95)
            if length > 20:  # a dropout of 1-3 frames inside
                d = rng.randint(f + 5, f + length - 8)
                for k in range(d, d + rng.randint(1, 3)):
                    scores[c][k] = rng.uniform(0.02, 0.2)
            f += length + rng.randint(30, 200)  # gaps of at least 1.2 s
            blip = f - rng.randint(12, 25)  # a blip of 1-2 frames in the gap
            for k in range(blip, blip + rng.randint(1, 2)):
                scores[c][k] = rng.uniform(0.7, 0.99)
        truth[c] = spans
    path = os.path.join(out, "scores.csv")
    with open(path, "w") as fh:
        fh.write("frame," + ",".join(columns) + "\n")
        for k in range(frames):
            fh.write(f"{k}," + ",".join(f"{scores[c][k]:.3f}" for c in columns) + "\n")
    result = os.path.join(out, "derived.json")
    run(tiers, "derive", path, "--rate", "25", "--on", "0.5", "--bridge", "0.2s",
        "--min-duration", "0.2s", "--agent", "demo-detector", "-o", result)
    with open(result) as fh:
        doc = json.load(fh)
    for t in doc["tiers"]:
        got = [(a["start"], a["end"]) for a in t["annotations"]]
        want = [(s / 25, e / 25) for s, e in truth[t["name"]]]
        within = len(got) == len(want) and all(
            abs(g0 - w0) <= 0.04 + 1e-9 and abs(g1 - w1) <= 0.04 + 1e-9
            for (g0, g1), (w0, w1) in zip(got, want))
        check(f"derive {t['name']}: {len(want)} intervals, every boundary within one frame",
              within, f"({len(got)} found)")
        check(f"derive {t['name']}: machine source with the agent given",
              t["source"] == {"kind": "machine", "agent": "demo-detector"})

    ntsc = os.path.join(out, "ntsc.csv")
    with open(ntsc, "w") as fh:
        fh.write("frame,s\n" + "".join(f"{k},{0.9 if 153 <= k < 1000 else 0.1}\n"
                                       for k in range(1100)))
    result = os.path.join(out, "ntsc.json")
    run(tiers, "derive", ntsc, "--rate", "30000/1001", "-o", result)
    with open(result) as fh:
        text = fh.read()
    a = json.loads(text)["tiers"][0]["annotations"][0]
    start, end = Fraction(153 * 1001, 30000), Fraction(1000 * 1001, 30000)
    check("derive at 30000/1001: frame 153 starts at 5.1051 s exactly",
          '"start": 5.1051,' in text and Fraction(str(a["start"])) == start)
    check("derive at 30000/1001: frame 1000 starts at 33.366666667 s (to the nanosecond)",
          Fraction(str(a["end"])) == Fraction(round(end * 10**9), 10**9))


def retime_case(tiers, out, name, lag):
    rng = random.Random(name)
    vocabulary = ("we share the garden beds and water them in turns every spring our street grew "
                  "beans peas lettuce herbs near the library fence with seeds from neighbours").split()
    words, cues, t = [], [], 1.0
    while t < 600:
        first = len(words)
        for _ in range(rng.randint(5, 9)):
            d = round(rng.uniform(0.25, 0.5), 3)
            words.append({"start": round(t, 3), "end": round(t + d, 3), "text": rng.choice(vocabulary)})
            t = round(t + d + rng.uniform(0.02, 0.1), 3)
        group = words[first:]
        shift = lag(group[0]["start"])
        cues.append({"start": round(group[0]["start"] + shift, 3),
                     "end": round(group[-1]["end"] + shift, 3),
                     "text": " ".join(w["text"] for w in group).upper() + ".",
                     "id": str(first)})
        t = round(t + rng.uniform(0.05, 0.6), 3)
    doc = {"format": "tiers", "version": 1, "media": {"frame_rate": "25"},
           "tiers": [{"name": "captions", "annotations": cues},
                     {"name": "words", "source": {"kind": "machine", "agent": "demo-aligner"},
                      "annotations": words}]}
    path = os.path.join(out, f"{name}.json")
    with open(path, "w") as fh:
        json.dump(doc, fh)
    result = os.path.join(out, f"{name}.retimed.json")
    report = json.loads(run(tiers, "retime", path, "--captions", "captions", "--words", "words",
                            "--json", "-o", result).stdout)
    with open(result) as fh:
        retimed = json.load(fh)["tiers"][0]["annotations"]
    close = sum(abs(c["start"] - words[int(c["id"])]["start"]) <= 0.040 + 1e-9 for c in retimed)
    share = close / len(retimed)
    check(f"retime, {name} lag: at least 95 % of cue starts within 40 ms of their words",
          share >= 0.95, f"({100 * share:.1f} % of {len(retimed)})")
    overlaps = sum(b["start"] < a["end"] for a, b in zip(retimed, retimed[1:]))
    check(f"retime, {name} lag: no overlaps after", overlaps == 0, f"({overlaps})")
    check(f"retime, {name} lag: the report covers every cue",
          report["summary"]["cues"] == len(cues) and len(report["cues"]) == len(cues))


def retime_vtt_case(tiers, out, samples):
    """Re-timing into WebVTT works on its millisecond grid: the minimum duration (5/6 s) rounds
    up to 834 ms, uneven splits of a gap stay whole milliseconds, sub-millisecond word times
    round to the nearest; the file written needs no --allow-loss, and `tiers check` finds
    none of the caption rules retime says it met (the task's own acceptance check)."""
    rule_ids = ("caption.min-duration", "caption.gap", "caption.overlap")
    words = [(1.0002, 1.2001, "yes"),                      # one short word: grows to 5/6 s
             (3.0004, 3.4003, "we"), (3.4003, 3.9007, "planted"),
             (3.9011, 4.3009, "beans"),                     # then, 0.4 ms later:
             (4.3013, 4.7001, "then"), (4.7002, 5.6999, "rain"),
             (8.0006, 8.5004, "and"), (8.5004, 9.0001, "sun")]
    csv_path = os.path.join(out, "grid.words.csv")
    with open(csv_path, "w") as fh:
        fh.write("start,end,text\n")
        for start, end, text in words:
            fh.write(f"{start},{end},{text}\n")
    vtt = os.path.join(out, "grid.vtt")
    with open(vtt, "w") as fh:
        fh.write("WEBVTT\n\n00:00:03.000 --> 00:00:03.300\nYes.\n\n"
                 "00:00:05.000 --> 00:00:06.000\nWe planted beans.\n\n"
                 "00:00:06.300 --> 00:00:07.700\nThen rain.\n\n"
                 "00:00:10.000 --> 00:00:11.000\nAnd sun.\n")
    cases = [("invented cues on sub-millisecond words", vtt, csv_path),
             ("the samples' WebVTT onto their words", os.path.join(samples, "panel-discussion.vtt"),
              os.path.join(samples, "panel-discussion.json") + ":words")]
    for what, captions, word_spec in cases:
        result = os.path.join(out, os.path.basename(captions).replace(".vtt", ".retimed.vtt"))
        r = subprocess.run([tiers, "retime", captions, "--words", word_spec, "-o", result,
                            "--json"], capture_output=True, text=True)
        check(f"retime into WebVTT, {what}: exits 0 without --allow-loss",
              r.returncode == 0 and os.path.exists(result), r.stderr)
        if r.returncode != 0:
            continue
        moves = json.loads(r.stdout)["cues"]
        check(f"retime into WebVTT, {what}: every new time is a whole millisecond",
              all(round(m[k] * 1000, 6) == round(m[k] * 1000) for m in moves
                  for k in ("new_start", "new_end")), str(moves[:3]))
        unfixed = [m for m in moves if m.get("unfixed")]
        c = subprocess.run([tiers, "check", result, "--format", "json"], capture_output=True,
                           text=True)
        problems = [p for f in json.loads(c.stdout)["files"] for p in f["problems"]]
        undone = [p for p in problems if p["rule"] in rule_ids]
        check(f"retime into WebVTT, {what}: checked again, no rule retime met is violated",
              not undone and not unfixed, json.dumps(undone + unfixed))
        if what.startswith("invented"):
            short = next(m for m in moves if m["cue"] == 0)
            check("retime into WebVTT: the minimum duration is 5/6 s rounded up to 834 ms",
                  round((short["new_end"] - short["new_start"]) * 1000) == 834, json.dumps(short))
            text = " ".join(m.get("adjusted", "") for m in moves)
            check("retime into WebVTT: no cue is said to be lengthened by 0 s",
                  "lengthened by 0 s" not in text, text)


def edit_case(tiers, out):
    rng = random.Random(3)
    doc = {"format": "tiers", "version": 1, "media": {"duration": 3600, "frame_rate": "25"},
           "tiers": [{"name": "shots", "annotations": []}]}
    f = 0
    while f < 25 * 3500:
        length = rng.randint(1, 400)
        doc["tiers"][0]["annotations"].append(
            {"start": f / 25, "end": (f + length) / 25, "text": "shot"})
        f += length + rng.randint(0, 50)
    source = os.path.join(out, "shots.source.json")
    with open(source, "w") as fh:
        json.dump(doc, fh)
    original = os.path.join(out, "shots.json")
    run(tiers, "convert", source, "-o", original)  # tiers' own layout, to compare bytes
    shifted = os.path.join(out, "shots.shifted.json")
    run(tiers, "edit", original, "--shift", "12.345678901s", "--shift", "-12.345678901s",
        "-o", shifted)
    check("edit: shift by +x then -x is the identity", open(shifted).read() == open(original).read())
    scaled = os.path.join(out, "shots.scaled.json")
    run(tiers, "edit", original, "--scale", "25:24000/1001", "-o", scaled)
    back = os.path.join(out, "shots.back.json")
    run(tiers, "edit", scaled, "--scale", "24000/1001:25", "--snap", "25", "-o", back)
    check("edit: scaling 25 -> 24000/1001 -> 25 is the identity after rounding to frames",
          open(back).read() == open(original).read())
    check("edit: the scaled file really moved", open(scaled).read() != open(original).read())


def main():
    tiers, out, samples = sys.argv[1:4]
    os.makedirs(out, exist_ok=True)
    derive_case(tiers, out)
    retime_case(tiers, out, "constant", lambda t: 2.5)
    retime_case(tiers, out, "drifting", lambda t: 1.0 + 8.0 * t / 600)
    retime_vtt_case(tiers, out, samples)
    edit_case(tiers, out)
    print(f"{len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
