#!/usr/bin/python3
"""Sharded runs of `tiers check`, combined, against one run over everything; and batch convert.

Invented data: bench/tiers-corpus makes 1,000 one-minute sessions (a few without their head-nod
tier, so that the files disagree with one another). The test asserts:
  - the shards 1/4 … 4/4 split the files without overlap and miss none;
  - the four JSON reports joined with --combine hold exactly the problems of one unsharded run
    (the dataset rule included, judged over all files again) and the same summary;
  - the combined SARIF log has a result per problem;
  - convert -d in shards converts every file once, and --resume skips what is done.

Usage: shard_combine.py TIERS CORPUS_TOOL WORK_DIR OUTPUT_DIR (the sessions go to WORK_DIR, the
reports to OUTPUT_DIR, for the schema test)
"""
import json
import os
import shutil
import subprocess
import sys

failures = []


def run(*argv, ok=(0, 1)):
    r = subprocess.run(list(argv), capture_output=True, text=True)
    if r.returncode not in ok:
        raise SystemExit(f"FAIL {' '.join(argv)}: status {r.returncode}: {r.stderr[-2000:]}")
    return r


def check(what, ok, detail=""):
    print(("ok  " if ok else "FAIL"), what, detail)
    if not ok:
        failures.append(what)


def problems(report):
    return sorted((f["path"], p["rule"], p.get("line", 0), p.get("column", 0), p["message"])
                  for f in report["files"] for p in f["problems"])


def main():
    tiers, corpus_tool, work, out = sys.argv[1:5]
    shutil.rmtree(work, ignore_errors=True)
    os.makedirs(out, exist_ok=True)
    data = os.path.join(work, "sessions")
    run(corpus_tool, "--files", "1000", "--minutes", "1", "--seed", "42", "--out", data, ok=(0,))
    common = ["--captions", "captions", "--words", "words", "--jobs", "2", "--format", "json"]

    whole = json.loads(run(tiers, "check", data, *common).stdout)
    with open(os.path.join(out, "whole.report.json"), "w") as fh:
        json.dump(whole, fh)
    parts, seen = [], []
    for k in range(1, 5):
        path = os.path.join(out, f"part-{k}.report.json")
        run(tiers, "check", data, *common, "--shard", f"{k}/4", "-o", path)
        with open(path) as fh:
            part = json.load(fh)
        seen += [f["path"] for f in part["files"]]
        parts.append(path)
    check("the shards cover every file once", sorted(seen) == sorted(f["path"] for f in whole["files"])
          and len(seen) == 1000, f"({len(seen)} files in 4 shards)")

    combined = json.loads(run(tiers, "check", "--combine", *parts, "--format", "json").stdout)
    with open(os.path.join(out, "combined.report.json"), "w") as fh:
        json.dump(combined, fh)
    a, b = problems(whole), problems(combined)
    check("combined shards hold exactly the problems of one run", a == b,
          f"({len(a)} problems, {sum(1 for x in a if x[1] == 'dataset.inconsistent')} of them "
          f"dataset.inconsistent)")
    check("and the same summary", whole["summary"] == combined["summary"])
    check("the dataset rule was judged over all files", any(x[1] == "dataset.inconsistent" for x in a))
    sarif = json.loads(run(tiers, "check", "--combine", *parts, "--format", "sarif").stdout)
    check("the combined SARIF log has a result per problem",
          len(sarif["runs"][0]["results"]) == len(a))

    converted = os.path.join(work, "converted")
    for k in range(1, 4):
        run(tiers, "convert", data, "-d", converted, "--to", "tiers", "--shard", f"{k}/3",
            "--jobs", "2", ok=(0,))
    made = sorted(os.listdir(converted))
    check("convert -d in shards converts every file once", len(made) == 1000 and
          all(m.endswith(".tiers") for m in made))
    stamp = os.path.getmtime(os.path.join(converted, made[0]))
    os.remove(os.path.join(converted, made[1]))
    run(tiers, "convert", data, "-d", converted, "--to", "tiers", "--resume", ok=(0,))
    check("--resume converts only what is missing",
          os.path.getmtime(os.path.join(converted, made[0])) == stamp and
          os.path.exists(os.path.join(converted, made[1])))
    print(f"{len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
