#!/usr/bin/python3
"""SARIF output of `tiers check` against the OASIS SARIF 2.1.0 schema.

The schema is the OASIS SARIF Technical Committee's own (oasis-tcs/sarif-spec,
sarif-2.1/schema/sarif-schema-2.1.0.json, JSON Schema draft 4), read from ../shared/external/
beside the checkout; it is not copied into the project. Without it the test is skipped (exit
status 77, which CTest reports as skipped) with a message.

The log of the whole bad-input corpus, checked in one run, must validate and hold exactly as
many results as the JSON report of the same run has problems, each result naming a rule of the
driver by id and index.

Usage: check_sarif.py TIERS CORPUS_DIR SCHEMA OUTPUT_DIR
"""
import json
import os
import subprocess
import sys


def main():
    tiers, corpus, schema_path, out = sys.argv[1:5]
    if not os.path.exists(schema_path):
        print(f"skipped: the SARIF schema is not at {schema_path}")
        return 77
    import jsonschema
    with open(schema_path) as fh:
        schema = json.load(fh)
    jsonschema.Draft4Validator.check_schema(schema)
    validator = jsonschema.Draft4Validator(schema)
    os.makedirs(out, exist_ok=True)

    def check(fmt):
        r = subprocess.run([tiers, "check", corpus, "--format", fmt, "--jobs", "2"],
                           capture_output=True, text=True)
        if r.returncode != 1:
            raise SystemExit(f"FAIL exit status {r.returncode}, expected 1: {r.stderr}")
        with open(os.path.join(out, f"corpus.{fmt}.json"), "w") as fh:
            fh.write(r.stdout)
        return json.loads(r.stdout)

    log, report = check("sarif"), check("json")
    errors = list(validator.iter_errors(log))
    for e in errors[:10]:
        print("FAIL", "/".join(map(str, e.path)), e.message)
    results = log["runs"][0]["results"]
    rules = log["runs"][0]["tool"]["driver"]["rules"]
    problems = [p for f in report["files"] for p in f["problems"]]
    bad = len(errors)
    if len(results) != len(problems) or not results:
        print(f"FAIL {len(results)} results, {len(problems)} problems")
        bad += 1
    for r, p in zip(results, problems):
        if r["ruleId"] != p["rule"] or rules[r["ruleIndex"]]["id"] != r["ruleId"] or \
                r["level"] != p["severity"]:
            print(f"FAIL result {r} does not match problem {p}")
            bad += 1
    print(f"{len(results)} results for {len(problems)} problems; "
          f"{'valid' if not errors else 'INVALID'} against {os.path.basename(schema_path)}")

    # With a profile: the configuration in force is in the log (SARIF 2.1.0 §3.20.5
    # invocation.ruleConfigurationOverrides, §3.49 reportingConfiguration), and still valid.
    profile = os.path.join(out, "switches-on.profile.json")
    with open(profile, "w") as fh:
        json.dump({"format": "tiers-profile", "version": 1,
                   "rules": {"caption.wpm": {"severity": "error", "max": 150},
                             "time.order": "off"}}, fh)
    r = subprocess.run([tiers, "check", corpus, "--format", "sarif", "--profile", profile],
                       capture_output=True, text=True)
    with open(os.path.join(out, "corpus.profile.sarif.json"), "w") as fh:
        fh.write(r.stdout)
    log = json.loads(r.stdout)
    invalid = list(validator.iter_errors(log))
    for e in invalid[:10]:
        print("FAIL", "/".join(map(str, e.path)), e.message)
    overrides = {o["descriptor"]["id"]: o["configuration"]
                 for o in log["runs"][0]["invocations"][0].get("ruleConfigurationOverrides", [])}
    expected = {"caption.wpm": {"level": "error", "enabled": True, "parameters": {"max": 150}},
                "time.order": {"level": "none", "enabled": False}}
    if overrides != expected:
        print(f"FAIL ruleConfigurationOverrides {overrides}, expected {expected}")
        bad += 1
    if log["runs"][0]["invocations"][0]["properties"]["profile"]["name"] != profile:
        print("FAIL the invocation does not name the profile")
        bad += 1
    bad += len(invalid)
    print(f"with a profile: {len(overrides)} rule configurations overridden; "
          f"{'valid' if not invalid else 'INVALID'}")
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
