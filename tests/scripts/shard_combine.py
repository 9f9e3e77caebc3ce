#!/usr/bin/python3
"""Sharded runs of `tiers check`, combined, against one run over everything; and batch convert.

Invented data: bench/tiers-corpus makes 1,000 one-minute sessions (a few without their head-nod
tier, so that the files disagree with one another). The test asserts:
  - the shards 1/4 … 4/4 split the files without overlap and miss none;
  - the four JSON reports joined with --combine hold exactly the problems of one unsharded run
    (the dataset rule included, judged over all files again) and the same summary;
  - the combined SARIF log has a result per problem; a report given twice is refused;
  - on 150 more sessions, three shards combined print byte for byte what one run prints, in
    text, JSON and SARIF, with and without a profile; --combine refuses reports of another
    profile or of none; SARIF shows a rule the profile switched on as enabled;
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


def byte_identical(tiers, data, out, common):
    """Combined shards print exactly what one run prints, in every format, with and without a
    profile; reports of another profile, or of none, are refused; SARIF says what a profile
    switched on."""
    common = [c for c in common if c not in ("--format", "json")]
    profile = os.path.join(out, "wpm-on.profile.json")
    with open(profile, "w") as fh:
        json.dump({"format": "tiers-profile", "version": 1, "extends": "broadcast-captions",
                   "rules": {"caption.wpm": {"severity": "warning", "max": 150}}}, fh)
    for with_profile in ([], ["--profile", profile]):
        label = "with a profile" if with_profile else "without a profile"
        parts = []
        for k in range(1, 4):
            path = os.path.join(out, f"third-{k}{'-p' if with_profile else ''}.report.json")
            run(tiers, "check", data, *common, *with_profile, "--shard", f"{k}/3", "--format",
                "json", "-o", path)
            parts.append(path)
        for fmt in ("text", "json", "sarif"):
            whole = run(tiers, "check", data, *common, *with_profile, "--format", fmt)
            combined = run(tiers, "check", "--combine", *parts, *with_profile, "--format", fmt)
            check(f"combined shards print byte for byte what one run prints ({fmt}, {label})",
                  whole.stdout == combined.stdout and whole.stderr == combined.stderr and
                  whole.returncode == combined.returncode,
                  f"({len(whole.stdout)} and {len(combined.stdout)} bytes)")
            if fmt == "sarif" and with_profile:
                log = json.loads(combined.stdout)
                overrides = {o["descriptor"]["id"]: o["configuration"]
                             for inv in log["runs"][0].get("invocations", [])
                             for o in inv.get("ruleConfigurationOverrides", [])}
                wpm = overrides.get("caption.wpm", {})
                default = next(r for r in log["runs"][0]["tool"]["driver"]["rules"]
                               if r["id"] == "caption.wpm")["defaultConfiguration"]
                check("SARIF: a rule off by default but on in the profile is enabled in the "
                      "invocation's ruleConfigurationOverrides, with its threshold",
                      default.get("enabled") is False and wpm.get("enabled") is True and
                      wpm.get("level") == "warning" and wpm.get("parameters") == {"max": 150},
                      json.dumps(wpm))
        # Reports made with the profile cannot be combined without it, nor with another.
        refused = run(tiers, "check", "--combine", *parts, "--format", "json",
                      *([] if with_profile else ["--profile", "broadcast-captions"]))
        check(f"--combine refuses reports made {label} when given "
              f"{'none' if with_profile else 'a profile'}",
              refused.returncode == 1 and "report.profile" in refused.stderr,
              refused.stderr.strip()[:200])
    other = os.path.join(out, "wpm-other.profile.json")
    with open(other, "w") as fh:
        json.dump({"format": "tiers-profile", "version": 1, "extends": "broadcast-captions",
                   "rules": {"caption.wpm": {"severity": "warning", "max": 140}}}, fh)
    refused = run(tiers, "check", "--combine", *parts, "--profile", other, "--format", "json")
    check("--combine refuses reports made with a profile of other settings",
          refused.returncode == 1 and "report.profile" in refused.stderr, refused.stderr[:200])


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
    twice = run(tiers, "check", "--combine", *parts, parts[1], "--format", "json")
    check("--combine refuses a shard's report given twice, naming it", twice.returncode == 1 and
          "report.repeated" in twice.stderr and parts[1] in twice.stderr, twice.stderr[:300])
    sarif = json.loads(run(tiers, "check", "--combine", *parts, "--format", "sarif").stdout)
    check("the combined SARIF log has a result per problem",
          len(sarif["runs"][0]["results"]) == len(a))

    # A smaller dataset of its own keeps this quick under the sanitizers.
    few = os.path.join(work, "few")
    run(corpus_tool, "--files", "150", "--minutes", "1", "--seed", "7", "--out", few, ok=(0,))
    byte_identical(tiers, few, out, common)

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
