#!/usr/bin/python3
"""The bad-input corpus of `tiers check`: each case is named for the one rule it must trigger.

A case is a file `RULE.EXT`, or a folder `RULE/` checked as one dataset (by its dataset
description, when it holds a `dataset.json`), in tests/check-corpus/.
`RULE.args` holds extra arguments (shell quoting), run from the corpus folder; files ending in
`.profile.json` are profiles the arguments name, not cases. For every case the test asserts
that the rules reported are exactly {RULE} and that the exit status is 1 when RULE's severity
is error, else 0. Every rule of the catalogue outside the readers' own group must have a case.

Usage: check_corpus.py TIERS CORPUS_DIR OUTPUT_DIR (the JSON reports are saved there).
"""
import json
import os
import shlex
import subprocess
import sys


def rules(tiers):
    out = {}
    listing = subprocess.run([tiers, "check", "--list-rules"], capture_output=True, text=True,
                             check=True).stdout
    for line in listing.splitlines():
        rule_id, level = line.split()[:2]
        out[rule_id] = level
    return out


def groups(tiers):
    """Rule id -> group, from the SARIF driver (the only place that lists groups)."""
    sarif = subprocess.run([tiers, "check", "--format", "sarif", os.devnull, "--from", "json"],
                           capture_output=True, text=True).stdout
    driver = json.loads(sarif)["runs"][0]["tool"]["driver"]
    return {r["id"]: r["properties"]["group"] for r in driver["rules"]}


def main():
    tiers, corpus, out_dir = sys.argv[1:4]
    os.makedirs(out_dir, exist_ok=True)
    levels = rules(tiers)
    group = groups(tiers)
    cases = sorted(n for n in os.listdir(corpus)
                   if not n.endswith(".args") and not n.endswith(".profile.json"))
    failures = []
    covered = set()
    for name in cases:
        path = os.path.join(corpus, name)
        rule = name if os.path.isdir(path) else os.path.splitext(name)[0]
        covered.add(rule)
        if rule not in levels:
            failures.append(f"{name}: {rule} is not a rule of the catalogue")
            continue
        args = []
        if os.path.exists(os.path.join(corpus, rule + ".args")):
            with open(os.path.join(corpus, rule + ".args")) as fh:
                args = shlex.split(fh.read())
        described = os.path.join(name, "dataset.json")
        inputs = (["--dataset", described] if os.path.exists(os.path.join(corpus, described))
                  else [name])
        run = subprocess.run([tiers, "check", "--format", "json", "--jobs", "2"] + inputs + args,
                             cwd=corpus, capture_output=True, text=True)
        try:
            report = json.loads(run.stdout)
        except json.JSONDecodeError:
            failures.append(f"{name}: no JSON report (status {run.returncode}): {run.stderr}")
            continue
        with open(os.path.join(out_dir, rule + ".report.json"), "w") as fh:
            fh.write(run.stdout)
        fired = {p["rule"] for f in report["files"] for p in f["problems"]}
        want_status = 1 if levels[rule] == "error" else 0
        if fired != {rule}:
            failures.append(f"{name}: expected exactly {{{rule}}}, got {sorted(fired)}")
        elif run.returncode != want_status:
            failures.append(f"{name}: exit status {run.returncode}, expected {want_status}")
        else:
            print(f"ok   {name}: {rule}")
    missing = sorted(r for r in levels if group.get(r) != "read" and r not in covered)
    for r in missing:
        failures.append(f"rule {r} has no case in {corpus}")
    for f in failures:
        print("FAIL", f)
    print(f"{len(cases)} cases, {len(failures)} failures")
    return 1 if failures else 0


if __name__ == "__main__":
    sys.exit(main())
