#!/usr/bin/python3
"""text.nfc of `tiers check` against the Unicode Consortium's NormalizationTest.txt.

Source: Unicode 15.0.0 NormalizationTest.txt (Debian's unicode-data package; bzip2), the
conformance data of UAX #15. Each line gives c1;c2;c3;c4;c5 with NFC(c1) = NFC(c2) = NFC(c3) =
c2 and NFC(c4) = NFC(c5) = c4. So a string of the line is in NFC exactly when it equals its
line's NFC form; every one of the five strings of every line becomes an annotation, and
text.nfc must fire for exactly those that are not in NFC.

Usage: check_nfc.py TIERS OUTPUT_DIR
"""
import bz2
import json
import os
import subprocess
import sys

SOURCE = "/usr/share/unicode/NormalizationTest.txt.bz2"


def main():
    tiers, out = sys.argv[1:3]
    if not os.path.exists(SOURCE):
        print(f"FAIL {SOURCE} is missing: install Debian's unicode-data (scripts/install-deps)")
        return 1
    lines = []  # (annotation line in the document, string, is NFC)
    with bz2.open(SOURCE, "rt", encoding="utf-8") as fh:
        for raw in fh:
            body = raw.split("#")[0].strip()
            if not body or body.startswith("@"):
                continue
            cols = ["".join(chr(int(cp, 16)) for cp in c.split()) for c in body.split(";")[:5]]
            for k, c in enumerate(cols):
                nfc = cols[1] if k < 3 else cols[3]
                lines.append((c, c == nfc))
    os.makedirs(out, exist_ok=True)
    path = os.path.join(out, "normalization.json")
    with open(path, "w", encoding="utf-8") as fh:
        fh.write('{"format": "tiers", "version": 1, "tiers": [{"name": "text", '
                 '"kind": "instant", "annotations": [\n')
        for n, (c, _) in enumerate(lines):
            fh.write(("," if n else "") + json.dumps({"start": n, "text": c}) + "\n")
        fh.write("]}]}\n")
    r = subprocess.run([tiers, "check", path, "--format", "json"], capture_output=True, text=True)
    report = json.loads(r.stdout)
    flagged = {p["line"] for p in report["files"][0]["problems"] if p["rule"] == "text.nfc"}
    expected = {n + 2 for n, (_, is_nfc) in enumerate(lines) if not is_nfc}
    missed, extra = expected - flagged, flagged - expected
    print(f"{len(lines)} strings, {len(expected)} not in NFC; "
          f"{len(missed)} not flagged, {len(flagged - expected)} flagged wrongly")
    if missed or extra or not expected:
        print("FAIL e.g. lines", sorted(missed)[:5], sorted(extra)[:5])
        return 1
    return 0


if __name__ == "__main__":
    sys.exit(main())
