#!/usr/bin/python3
"""Validates tiers JSON documents against schemas/tiers.schema.json.

The validator is python3-jsonschema (Debian), Draft 2020-12: an implementation independent of
tiers, so that a writer bug and a schema bug cannot hide each other.

Usage: validate_json.py SCHEMA PATH... (folders are searched for *.json; at least one file
must be found, so that an empty run cannot pass).
"""
import json
import os
import sys

import jsonschema


def files(paths):
    for p in paths:
        if os.path.isdir(p):
            for dirpath, _, names in os.walk(p):
                for n in sorted(names):
                    if n.endswith(".json"):
                        yield os.path.join(dirpath, n)
        else:
            yield p


def main():
    with open(sys.argv[1]) as fh:
        schema = json.load(fh)
    jsonschema.Draft202012Validator.check_schema(schema)
    validator = jsonschema.Draft202012Validator(schema)
    count = 0
    bad = 0
    for path in files(sys.argv[2:]):
        with open(path, encoding="utf-8") as fh:
            doc = json.load(fh)
        count += 1
        errors = sorted(validator.iter_errors(doc), key=lambda e: list(e.path))
        for e in errors[:5]:
            print(f"{path}: {'/'.join(map(str, e.path))}: {e.message}")
        bad += bool(errors)
    print(f"{count - bad} passed, {bad} failed")
    if count == 0:
        print("no JSON files found")
        return 1
    return 1 if bad else 0


if __name__ == "__main__":
    sys.exit(main())
