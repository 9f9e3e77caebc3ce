#!/usr/bin/python3
"""The HTML report in a real browser: Debian's chromium, headless, driven through Debian's
chromedriver by python3-selenium (see browser.py for what is checked on every page).

Pages made here, each opened in the browser, with a screenshot left in OUTPUT_DIR:
- the samples' main document, its captions' lag against its words, and its human gestures
  against the invented detector's (another file);
- several files of one recording in different formats, and a check corpus page written by
  `tiers check --html` (with a file that cannot be read: listed, not drawn);
- a document whose tier names and texts try to close the script element and open a dialog;
- an invented hour of media (tiers-corpus, ~12,500 annotations in six tiers), whose lanes must
  hold a bounded number of elements at the whole-file view;
- a lane whose annotations overlap three deep: drawn in three stacked rows, no bar over
  another, and a long lane name with its whole text as a tooltip.
The expected tiers of each file are what `tiers convert --to json` reads from it.

Usage: report_browser.py TIERS TIERS_CORPUS SAMPLES CHECK_CORPUS OUTPUT_DIR
"""
import json
import os
import shutil
import subprocess
import sys

import browser as browser_module

failures = []


def check(what, ok, detail=""):
    print(("ok  " if ok else "FAIL"), what, detail)
    if not ok:
        failures.append(what)


def tiers_of(tiers, path):
    r = subprocess.run([tiers, "convert", path, "--to", "json"], capture_output=True, text=True)
    if r.returncode != 0:
        raise SystemExit(f"FAIL tiers convert {path}: {r.stderr}")
    return [t["name"] for t in json.loads(r.stdout)["tiers"]]


def browse(browser, page, expect, shot, what):
    try:
        problems, log = browser.check_page(page, expect, shot)
    except Exception as e:  # a page that never became ready, a lost browser: a failure, shown
        problems, log = [f"{type(e).__name__}: {e}"], ""
    big_enough = os.path.exists(shot) and os.path.getsize(shot) > 10_000
    check(what, not problems and big_enough,
          "\n".join([log] + ["FAIL " + p for p in problems] +
                    ([] if big_enough else [f"no screenshot of a page at {shot}"])).strip())


def main():
    tiers, corpus, samples, check_corpus, out = sys.argv[1:6]
    shutil.rmtree(out, ignore_errors=True)
    os.makedirs(out)
    for program in (browser_module.CHROMIUM, browser_module.CHROMEDRIVER):
        if not os.path.exists(program):
            raise SystemExit(f"FAIL {program} is missing: run scripts/install-deps")
    reference = browser_module.Browser()
    try:
        return run_pages(reference, tiers, corpus, samples, check_corpus, out)
    finally:
        reference.close()


def run_pages(reference, tiers, corpus, samples, check_corpus, out):

    # 1. The samples: lanes, lag, agreement with a tier of another file.
    main_doc = os.path.join(samples, "panel-discussion.json")
    machine = os.path.join(samples, "panel-discussion.machine-gestures.json")
    page = os.path.join(out, "samples.html")
    r = subprocess.run([tiers, "report", main_doc, "--captions", "captions", "--words", "words",
                        "--ref-tier", "gestures", "--cand-tier", machine, "-o", page,
                        "--title", "Panel discussion (invented demo)"],
                       capture_output=True, text=True)
    check("report of the samples exits 0", r.returncode == 0, r.stderr)
    names = tiers_of(tiers, main_doc) + ["gestures (panel-discussion.machine-gestures.json)"]
    browse(reference, page, {"files": [{"tiers": names, "lag": True, "agreement": True}],
                             "problems": 1}, os.path.join(out, "samples.png"),
           "samples page: lanes, lag, agreement, problem rows")

    # 2. One recording in several formats, on one page.
    files = [os.path.join(samples, f) for f in
             ("panel-discussion.tiers", "panel-discussion.vtt", "panel-discussion.ttml",
              "gesture-types.timecode.csv")]
    page = os.path.join(out, "formats.html")
    r = subprocess.run([tiers, "report", *files, "--columns",
                        "tier=track,start=onset,end=offset,text=label", "--rate", "25", "-o", page],
                       capture_output=True, text=True)
    if r.returncode != 0:  # --columns applies to the table only; the others ignore it
        check("report of several formats exits 0", False, r.stderr)
    else:
        expect = {"files": [{"tiers": tiers_of_with(tiers, f), "lag": False, "agreement": False}
                            for f in files]}
        browse(reference, page, expect, os.path.join(out, "formats.png"),
               "several formats on one page")

    # 3. `tiers check --html`: exit status as check's; an unreadable file listed, not drawn.
    picked = ["time.order.json", "tier.duplicate-name.json", "time.range.json"]
    paths = [os.path.join(check_corpus, f) for f in picked]
    page = os.path.join(out, "check.html")
    r = subprocess.run([tiers, "check", *paths, "--html", page], capture_output=True, text=True)
    check("check --html exits 1 for a file with errors", r.returncode == 1, r.stderr)
    check("check --html still prints its text report", "time.order" in r.stderr + r.stdout)
    expect = {"files": [{"tiers": tiers_of(tiers, paths[0]), "lag": False, "agreement": False},
                        {"tiers": tiers_of(tiers, paths[1]), "lag": False, "agreement": False},
                        {"drawn": False}], "problems": 1}
    browse(reference, page, expect, os.path.join(out, "check.png"),
           "check --html: duplicate tier names each have a lane; the unreadable file is listed")
    with open(page, encoding="utf-8") as fh:
        text = fh.read()
    check("the unreadable file's error is in the page", "time.range" in text)

    # 4. Names and texts that try to break out of the page.
    hostile = "</script><script>alert(1)</script><!-- \"q\" & 'a'"
    doc = {"format": "tiers", "version": 1, "tiers": [
        {"name": hostile, "kind": "interval", "annotations": [
            {"start": 1, "end": 2, "text": hostile}, {"start": 3, "end": 4, "text": "<b>x</b>"}]},
        {"name": "plain", "kind": "interval", "annotations": [
            {"start": 0.5, "end": 3.5, "text": "]]></svg><img src=x onerror=alert(2)>"}]}]}
    hostile_path = os.path.join(out, "hostile.json")
    with open(hostile_path, "w") as fh:
        json.dump(doc, fh)
    page = os.path.join(out, "hostile.html")
    r = subprocess.run([tiers, "report", hostile_path, "-o", page, "--title", hostile],
                       capture_output=True, text=True)
    check("report of hostile names exits 0", r.returncode == 0, r.stderr)
    browse(reference, page, {"files": [{"tiers": [hostile, "plain"], "lag": False,
                                        "agreement": False}]},
           os.path.join(out, "hostile.png"), "hostile names stay text: no script runs, lanes match")

    # 5. An annotation that ends before it starts (time.reversed): choosing its problem shows
    #    the span between its two times, and the annotation is drawn over that span.
    reversed_doc = {"format": "tiers", "version": 1, "tiers": [
        {"name": "gestures", "kind": "interval", "annotations": [
            {"start": 1, "end": 2, "text": "beat"}, {"start": 12, "end": 4, "text": "wave"},
            {"start": 14, "end": 15, "text": "rest"}]}]}
    reversed_path = os.path.join(out, "reversed.json")
    with open(reversed_path, "w") as fh:
        json.dump(reversed_doc, fh)
    page = os.path.join(out, "reversed.html")
    r = subprocess.run([tiers, "check", reversed_path, "--html", page], capture_output=True,
                       text=True)
    check("check --html of a reversed annotation exits 1", r.returncode == 1, r.stderr)
    browse(reference, page, {"files": [{"tiers": ["gestures"], "lag": False, "agreement": False}],
                             "problems": 1, "choose": "time.reversed", "reversed": 1},
           os.path.join(out, "reversed.png"),
           "a reversed annotation: drawn over its span, its problem shown whole")

    # 6. An invented hour: opens, every lane drawn, drawing bounded by the screen.
    hour_dir = os.path.join(out, "hour")
    subprocess.run([corpus, "--hours", "1", "--only", "json", "--out", hour_dir], check=True,
                   capture_output=True)
    hour = os.path.join(hour_dir, "corpus.json")
    page = os.path.join(out, "hour.html")
    r = subprocess.run([tiers, "report", hour, "--captions", "captions", "--words", "words",
                        "--ref-tier", "gestures", "--cand-tier", "detector", "-o", page],
                       capture_output=True, text=True)
    check("report of an hour exits 0", r.returncode == 0, r.stderr)
    browse(reference, page, {"files": [{"tiers": tiers_of(tiers, hour), "lag": True,
                                        "agreement": True}], "problems": 1, "bounded": True},
           os.path.join(out, "hour.png"), "an hour of media: opens, drawn, bounded")

    # 7. Overlapping annotations of one lane: stacked in rows, none drawn over another.
    stacked_doc = {"format": "tiers", "version": 1, "tiers": [
        {"name": "gestures of the first speaker in the left-hand chair, coded twice",
         "kind": "interval", "annotations": [
             {"start": 1, "end": 5, "text": "iconic"}, {"start": 2, "end": 3, "text": "beat"},
             {"start": 2.5, "end": 6, "text": "deictic"}, {"start": 5.5, "end": 7, "text": "beat"},
             {"start": 8, "end": 9, "text": "rest"}]}]}
    stacked_path = os.path.join(out, "stacked.json")
    with open(stacked_path, "w") as fh:
        json.dump(stacked_doc, fh)
    page = os.path.join(out, "stacked.html")
    r = subprocess.run([tiers, "report", stacked_path, "-o", page], capture_output=True, text=True)
    check("report of overlapping annotations exits 0", r.returncode == 0, r.stderr)
    browse(reference, page, {"files": [{"tiers": [stacked_doc["tiers"][0]["name"]], "lag": False,
                                        "agreement": False}]},
           os.path.join(out, "stacked.png"), "overlapping annotations: page opens")
    try:
        boxes = reference.js(
            "return Array.from(document.querySelectorAll('.lane[data-index] svg rect.ann'))"
            ".map((r) => [Number(r.getAttribute('x')), Number(r.getAttribute('width')),"
            " Number(r.getAttribute('y')), Number(r.getAttribute('height'))]);")
        rows = reference.js("return document.querySelector('.lane[data-index]').dataset.rows;")
        title = reference.js("return document.querySelector('.lane[data-index] .name')"
                             ".getAttribute('title');")
    except Exception as e:
        boxes, rows, title = [], None, None
        print("FAIL", e)
    check("three rows for annotations that overlap three deep", rows == "3", str(rows))
    clash = [(a, b) for i, a in enumerate(boxes) for b in boxes[i + 1:]
             if a[0] < b[0] + b[1] and b[0] < a[0] + a[1]
             and a[2] < b[2] + b[3] and b[2] < a[2] + a[3]]
    check("no annotation's bar covers another's", len(boxes) == 5 and not clash,
          f"{len(boxes)} bars, overlapping: {clash}")
    check("the long lane name has its whole text as a tooltip",
          title is not None and title.startswith(stacked_doc["tiers"][0]["name"]), str(title))

    print(f"screenshots in {out}")
    if failures:
        print(f"{len(failures)} failed")
        return 1
    return 0


def tiers_of_with(tiers, path):
    r = subprocess.run([tiers, "convert", path, "--to", "json", "--columns",
                        "tier=track,start=onset,end=offset,text=label", "--rate", "25"],
                       capture_output=True, text=True)
    if r.returncode != 0:
        raise SystemExit(f"FAIL tiers convert {path}: {r.stderr}")
    return [t["name"] for t in json.loads(r.stdout)["tiers"]]


if __name__ == "__main__":
    sys.exit(main())
