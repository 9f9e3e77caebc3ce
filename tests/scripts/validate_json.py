#!/usr/bin/python3
"""Validates every JSON document the tests wrote against the schema of its kind.

The validator is python3-jsonschema (Debian): an implementation independent of tiers, so that a
writer bug and a schema bug cannot hide each other. The kind is the document's `format` member:
`tiers` (schemas/tiers.schema.json), `tiers-profile` (profile.schema.json), `tiers-check`
(check.schema.json), `tiers-merge-plan` (merge-plan.schema.json), `tiers-dataset`
(dataset.schema.json), `tiers-lag-table` (lag-table.schema.json), `tiers-cooccur-counts` (cooccur-counts.schema.json),
all Draft 2020-12. SARIF logs (`"version": "2.1.0"` with `runs`) are
validated against the OASIS SARIF 2.1.0 schema (Draft 4) when --sarif names it; without it
they are counted as skipped. A document of another kind fails.

Usage: validate_json.py SCHEMA_DIR [--sarif SCHEMA] [--invalid FILE]... PATH... (folders are
searched for *.json; at least one file must be found, so that an empty run cannot pass). Each
--invalid FILE is a document that is wrong on purpose: it must fail its schema, as tiers refuses
it.
"""
import json
import os
import sys

import jsonschema

KINDS = {"tiers": "tiers.schema.json", "tiers-profile": "profile.schema.json",
         "tiers-check": "check.schema.json", "tiers-merge-plan": "merge-plan.schema.json",
         "tiers-dataset": "dataset.schema.json", "tiers-lag-table": "lag-table.schema.json",
         "tiers-cooccur-counts": "cooccur-counts.schema.json",
         "tiers-estimate": "estimate.schema.json", "tiers-sample-plan": "sample-plan.schema.json"}


def files(paths):
    for p in paths:
        if os.path.isdir(p):
            for dirpath, _, names in os.walk(p):
                for n in sorted(names):
                    if n.endswith(".json"):
                        yield os.path.join(dirpath, n)
        else:
            yield p


def validator(path, draft):
    with open(path) as fh:
        schema = json.load(fh)
    draft.check_schema(schema)
    return draft(schema)


def main():
    args = sys.argv[1:]
    schema_dir = args.pop(0)
    sarif = None
    if args and args[0] == "--sarif":
        args.pop(0)
        sarif_path = args.pop(0)
        if os.path.exists(sarif_path):
            sarif = validator(sarif_path, jsonschema.Draft4Validator)
    invalid = []
    while args and args[0] == "--invalid":
        args.pop(0)
        invalid.append(args.pop(0))
    validators = {k: validator(os.path.join(schema_dir, v), jsonschema.Draft202012Validator)
                  for k, v in KINDS.items()}
    count = bad = skipped = 0
    for path in invalid:
        with open(path, encoding="utf-8") as fh:
            doc = json.load(fh)
        count += 1
        if validators[doc["format"]].is_valid(doc):
            print(f"{path}: valid, but it is wrong on purpose and must fail its schema")
            bad += 1
    for path in files(args):
        with open(path, encoding="utf-8") as fh:
            doc = json.load(fh)
        if isinstance(doc, dict) and doc.get("version") == "2.1.0" and "runs" in doc:
            if sarif is None:
                skipped += 1
                continue
            v = sarif
        elif isinstance(doc, dict) and doc.get("format") in validators:
            v = validators[doc["format"]]
        else:
            print(f"{path}: not a document of a kind with a schema")
            bad += 1
            count += 1
            continue
        count += 1
        errors = sorted(v.iter_errors(doc), key=lambda e: list(e.path))
        for e in errors[:5]:
            print(f"{path}: {'/'.join(map(str, e.path))}: {e.message}")
        bad += bool(errors)
    print(f"{count - bad} passed, {bad} failed" +
          (f", {skipped} SARIF logs skipped (no SARIF schema)" if skipped else ""))
    if count == 0:
        print("no JSON files found")
        return 1
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
