#!/usr/bin/python3
"""Cross-checks tiers' CSV and TSV against Python's csv module, the reference named here.

1. tiers writes CSV/TSV from a JSON document with awkward text; csv.reader must read back
   exactly the tiers, times (compared as exact decimals) and texts of the document.
2. csv.writer writes tables with awkward text (several dialects); tiers must read exactly
   those cells.

Usage: csv_reference.py TIERS WORK_DIR
"""
import csv
import json
import os
import subprocess
import sys
from decimal import Decimal

from checklist import Checklist

AWKWARD = [
    "plain",
    "comma, inside",
    'quote " inside',
    '"starts and ends with quotes"',
    "line\nbreak",
    "crlf\r\nbreak",
    "tab\there",
    "  leading and trailing spaces  ",
    "ünïcödé — and emoji \U0001F600",
    "",
    "trailing backslash \\",
]

results = Checklist()
check = results.check


def run(tiers, *args, stdin=None):
    proc = subprocess.run([tiers, *args], input=stdin, capture_output=True)
    if proc.returncode != 0:
        raise SystemExit(f"tiers {' '.join(args)} failed ({proc.returncode}): {proc.stderr.decode()}")
    return proc.stdout


def writer_check(tiers, work):
    times = ["0", "0.000000001", "1.25", "3599.9964", "12345.123456789", "-0.5"]
    rows = []
    tiers_json = []
    for t, name in enumerate(["notes", "odd, name", 'quo"te']):
        annotations = []
        for k, text in enumerate(AWKWARD):
            start = times[(k + t) % len(times)]
            end = str(Decimal(start) + Decimal("0.75"))
            annotations.append(f'{{"start": {start}, "end": {end}, "text": {json.dumps(text)}}}')
            rows.append((name, Decimal(start), Decimal(end), text))
        tiers_json.append(f'{{"name": {json.dumps(name)}, "annotations": [{", ".join(annotations)}]}}')
    doc = '{"format": "tiers", "version": 1, "tiers": [' + ", ".join(tiers_json) + "]}"
    src = os.path.join(work, "awkward.json")
    with open(src, "w", encoding="utf-8") as fh:
        fh.write(doc)
    for fmt, delimiter in (("csv", ","), ("tsv", "\t")):
        out = os.path.join(work, "awkward." + fmt)
        run(tiers, "convert", src, "-o", out)
        with open(out, newline="", encoding="utf-8") as fh:
            table = list(csv.reader(fh, delimiter=delimiter))
        check(table[0] == ["tier", "start", "end", "text"], f"{fmt}: header {table[0]}")
        got = [(r[0], Decimal(r[1]), Decimal(r[2]), r[3]) for r in table[1:]]
        check(got == rows, f"{fmt}: csv.reader read other rows than the document holds")
        check(all(len(r) == 4 for r in table), f"{fmt}: a row with the wrong field count")


def reader_check(tiers, work):
    header = ["tier", "start", "end", "text", "speaker"]
    rows = [["t", f"{k}.5", f"{k + 1}", text, text[::-1]] for k, text in enumerate(AWKWARD)]
    dialects = [
        ("csv", {"delimiter": ","}),                                    # QUOTE_MINIMAL, CRLF
        ("csv", {"delimiter": ",", "quoting": csv.QUOTE_ALL, "lineterminator": "\n"}),
        ("csv", {"delimiter": ",", "quoting": csv.QUOTE_NONNUMERIC, "lineterminator": "\r"}),
        ("tsv", {"delimiter": "\t", "lineterminator": "\n"}),
    ]
    for n, (fmt, options) in enumerate(dialects):
        path = os.path.join(work, f"written-by-python-{n}.{fmt}")
        with open(path, "w", newline="", encoding="utf-8") as fh:
            w = csv.writer(fh, **options)
            w.writerow(header)
            w.writerows(rows)
        out = run(tiers, "convert", path, "--to", "json")
        with open(os.path.join(work, f"written-by-python-{n}.json"), "wb") as fh:
            fh.write(out)
        doc = json.loads(out, parse_float=Decimal)
        annotations = doc["tiers"][0]["annotations"]
        check(len(annotations) == len(rows), f"dialect {n}: {len(annotations)} annotations")
        for row, a in zip(rows, annotations):
            check(Decimal(a["start"]) == Decimal(row[1]), f"dialect {n}: start {a['start']} != {row[1]}")
            check(Decimal(a["end"]) == Decimal(row[2]), f"dialect {n}: end {a['end']} != {row[2]}")
            check(a["text"] == row[3], f"dialect {n}: text {a['text']!r} != {row[3]!r}")
            # An empty cell means "no attribute": the reversed empty text is absent.
            want = {"speaker": row[4]} if row[4] else None
            check(a.get("attributes") == want, f"dialect {n}: attributes {a.get('attributes')!r}")


def main():
    tiers, work = sys.argv[1:3]
    os.makedirs(work, exist_ok=True)
    writer_check(tiers, work)
    reader_check(tiers, work)
    return results.finish()


if __name__ == "__main__":
    sys.exit(main())
