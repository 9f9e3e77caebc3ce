#!/usr/bin/python3
"""The documentation agrees with the program and stands on its own.

- every subcommand `tiers --help` lists is named in docs/cli.md's opening list, has a section
  of its own there, and appears in docs/README.md's row for cli.md;
- no page of docs/, README.md or samples/README.md links to or cites `../shared/` (users have
  only the repository: sources are cited by name in the docs themselves);
- every `docs/…` path that a public header or a page cites exists.

Usage: docs_consistency.py TIERS SOURCE_DIR
"""
import glob
import os
import re
import subprocess
import sys

from checklist import Checklist


def subcommands(tiers):
    out = subprocess.run([tiers, "--help"], capture_output=True, text=True).stdout
    names, listing = [], False
    for line in out.splitlines():
        if re.match(r"^(SUBCOMMANDS|Subcommands):", line):
            listing = True
            continue
        if listing:
            m = re.match(r"^\s+([a-z][a-z-]*)\s", line)
            if m:
                names.append(m.group(1))
            elif line.strip() and not line.startswith(" "):
                listing = False
    return names


def main():
    tiers, source = sys.argv[1:3]
    c = Checklist()
    commands = subcommands(tiers)
    c.check(len(commands) >= 8, f"tiers --help lists {commands}")
    with open(os.path.join(source, "docs", "cli.md"), encoding="utf-8") as fh:
        cli = fh.read()
    with open(os.path.join(source, "docs", "README.md"), encoding="utf-8") as fh:
        index = fh.read()
    opening = cli.split("\n## ", 1)[0]
    index_row = next((l for l in index.splitlines() if "(cli.md)" in l), "")
    for name in commands:
        c.check(f"`{name}`" in opening, f"docs/cli.md's opening list omits `{name}`")
        c.check(re.search(rf"^## `tiers {name}\b", cli, re.M) is not None,
                f"docs/cli.md has no section for `tiers {name}`")
        c.check(f"`{name}`" in index_row, f"docs/README.md's row for cli.md omits `{name}`")

    pages = (glob.glob(os.path.join(source, "docs", "**", "*.md"), recursive=True) +
             [os.path.join(source, "README.md"), os.path.join(source, "samples", "README.md")])
    for page in pages:
        with open(page, encoding="utf-8") as fh:
            text = fh.read()
        c.check("../shared" not in text, f"{os.path.relpath(page, source)} cites ../shared/")

    cited = set()
    for path in glob.glob(os.path.join(source, "libtiers", "include", "tiers", "**", "*.hpp"),
                          recursive=True) + pages:
        with open(path, encoding="utf-8") as fh:
            for m in re.finditer(r"\bdocs/[A-Za-z0-9_./-]+\.md", fh.read()):
                cited.add((os.path.relpath(path, source), m.group(0)))
    for where, doc in sorted(cited):
        c.check(os.path.exists(os.path.join(source, doc)), f"{where} cites {doc}, which is missing")
    return c.finish()


if __name__ == "__main__":
    sys.exit(main())
