#!/usr/bin/python3
"""Every rule the checker can emit is in the catalogue `tiers check --list-rules` prints.

A rule id given to `checker::emit` that the catalogue does not know would have no level and
be switched off without a word, so the check it belongs to would never run. The checker's
sources must name each rule as a string literal (`emit("time.order", …)`), so that this test
sees them all; debug builds also assert it at run time.

Usage: rule_ids.py TIERS SOURCE_DIR
"""
import glob
import os
import re
import subprocess
import sys

from checklist import Checklist


def main():
    tiers, source = sys.argv[1], sys.argv[2]
    out = subprocess.run([tiers, "check", "--list-rules"], capture_output=True, text=True,
                         check=True).stdout
    catalogue = {line.split()[0] for line in out.splitlines() if line.strip()}
    checks = Checklist()
    checks.check(len(catalogue) > 20, f"--list-rules listed only {sorted(catalogue)}")
    emitted = set()
    for path in sorted(glob.glob(os.path.join(source, "libtiers/src/check/*.cpp"))):
        text = open(path, encoding="utf-8").read()
        name = os.path.relpath(path, source)
        for call in re.finditer(r"\bemit\(\s*([^,)]*)", text):
            argument = call.group(1).strip()
            if argument.startswith("std::string_view"):  # the definition itself
                continue
            literal = re.fullmatch(r'"([a-z0-9.-]+)"', argument)
            line = text.count("\n", 0, call.start()) + 1
            if not checks.check(literal, f"{name}:{line}: emit() names its rule by "
                                f"'{argument}', not a string literal"):
                continue
            emitted.add(literal.group(1))
            checks.check(literal.group(1) in catalogue,
                         f"{name}:{line}: rule '{literal.group(1)}' is not in the catalogue")
    checks.check(len(emitted) > 20, f"found only {len(emitted)} rules emitted")
    return checks.finish()


if __name__ == "__main__":
    sys.exit(main())
