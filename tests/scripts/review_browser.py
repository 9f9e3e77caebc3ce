#!/usr/bin/python3
"""The review page (`tiers sample --page`) in a real browser: Debian's chromium, headless, driven
through Debian's chromedriver by python3-selenium (browser.py starts them), with a short video
Debian's video encoder makes here (a test pattern and a tone, VP8 and Vorbis in WebM).

What a reviewer does, checked step by step:
- the page opens offline without script errors, asks for nothing but itself and its media, and
  lists every clip of the sheet; a label that tries to close the script element is only text;
- the first clip's media fragment (W3C Media Fragments URI 1.0, `#t=start,end`, resolved from the
  page's own folder) plays from its start and stops at its end;
- y, n and u judge a clip and move to the next not judged; e opens the note, typed text is kept;
  a verdict button works as its key; the progress says how many are judged;
- a reload keeps every verdict and note (the browser's local storage);
- s saves the sheet as CSV: the rows exactly as `tiers sample` wrote them, with the verdicts and
  notes filled in, which `tiers estimate` then reads;
- a page whose media cannot be reached says so beside the player, and still takes verdicts.

Usage: review_browser.py TIERS OUTPUT_DIR
"""
import csv
import io
import json
import os
import shutil
import subprocess
import sys
import time

from selenium.webdriver.common.by import By
from selenium.webdriver.common.keys import Keys
from selenium.webdriver.support.ui import WebDriverWait

import browser as browser_module
from checklist import Checklist

checks = Checklist()
VIDEO_ENCODER = os.environ.get("TIERS_VIDEO_ENCODER", "/usr/bin/ffmpeg")  # Debian package
HOSTILE = 'nod</script><script>alert("x")</script>, "quoted"'


def run(*args):
    r = subprocess.run(list(args), capture_output=True, text=True)
    if r.returncode != 0:
        raise SystemExit(f"FAIL {' '.join(args)}: {r.returncode}\n{r.stderr}")
    return r.stdout


def make_inputs(out):
    media = os.path.join(out, "media")
    os.makedirs(media)
    run(VIDEO_ENCODER, "-loglevel", "error", "-f", "lavfi", "-i", "testsrc=duration=12:size=320x240:rate=25",
        "-f", "lavfi", "-i", "sine=frequency=440:duration=12", "-c:v", "libvpx", "-b:v", "300k",
        "-c:a", "libvorbis", "-shortest", os.path.join(media, "seminar.webm"))
    labels = ["nod", "shake", HOSTILE, "tilt", "nod", "nod"]
    doc = {"format": "tiers", "version": 1, "media": {"uri": "seminar.webm", "duration": 12},
           "tiers": [{"name": "heads", "source": {"kind": "machine", "agent": "invented"},
                      "annotations": [{"start": 1 + 1.6 * k, "end": 1.8 + 1.6 * k,
                                       "text": labels[k], "confidence": 0.3 + 0.1 * k}
                                      for k in range(6)]}]}
    path = os.path.join(media, "seminar.json")
    with open(path, "w", encoding="utf-8") as fh:
        json.dump(doc, fh)
    lost = dict(doc, media={"uri": "nowhere/missing.webm"})
    lost_path = os.path.join(media, "lost.json")
    with open(lost_path, "w", encoding="utf-8") as fh:
        json.dump(lost, fh)
    return path, lost_path


def wait(b, condition, what, timeout=30):
    try:
        WebDriverWait(b.driver, timeout).until(lambda d: condition())
        return True
    except Exception:
        return checks.check(False, what)


def open_page(b, page):
    b.requests()
    b.driver.get("file://" + os.path.abspath(page))
    WebDriverWait(b.driver, 60).until(
        lambda d: d.find_elements(By.CSS_SELECTOR, "html[data-ready=yes]"))


def review(b, page, sheet, out):
    url = "file://" + os.path.abspath(page)
    open_page(b, page)
    b.js("localStorage.clear()")  # a fresh reviewer
    open_page(b, page)
    errors = b.js("return window.__tiersErrors || []")
    checks.check(not errors, f"script errors: {errors}")
    media_url = "file://" + os.path.abspath(os.path.join(out, "media", "seminar.webm"))
    others = [u for u in b.requests()
              if u != url and not u.startswith(("data:", "blob:")) and u.split("#")[0] != media_url]
    checks.check(not others, f"requests beyond the page and its media: {others}")
    rows = list(csv.DictReader(open(sheet, encoding="utf-8", newline="")))
    listed = b.js("return [...document.querySelectorAll('.list tbody tr')].map((r) => r.cells[1].textContent)")
    checks.check(listed == [r["label"] for r in rows], f"clips listed {listed}")
    checks.check(b.js("return document.querySelectorAll('script').length") == 2,
                 "a label closed the script element")

    # The first clip plays its fragment: from its start, stopping at its end.
    first = rows[0]
    start, end = float(first["start"]) - 0.5, float(first["end"]) + 0.5  # --context 0.5s
    src = b.js("return document.querySelector('video').getAttribute('src')")
    checks.check(src == first["link"].replace("../media/", "../media/") and src.endswith(
        f"#t={max(0, start):g},{end:g}"), f"the player's source {src}, the sheet's link {first['link']}")
    b.js("document.querySelector('video').muted = true")
    b.press(" ")
    video = "document.querySelector('video')"
    wait(b, lambda: b.js(f"return {video}.readyState") >= 2 and not b.js(f"return {video}.paused"),
         "the clip did not start playing")
    began = b.js(f"return {video}.currentTime")
    checks.check(max(0, start) - 0.05 <= began <= end, f"playing at {began}, the fragment is {start}-{end}")
    wait(b, lambda: b.js(f"return {video}.paused"), "the clip did not stop at the fragment's end", 20)
    stopped = b.js(f"return {video}.currentTime")
    checks.check(end - 0.3 <= stopped <= end + 0.3, f"stopped at {stopped}, the fragment ends at {end}")
    checks.check(b.js(f"return {video}.error") is None, "the video reported an error")

    # Verdicts by key and by button; a note.
    b.press("y")
    b.press("n")
    b.press("e")
    b.driver.switch_to.active_element.send_keys('hand in the way, "mostly"')
    b.press(Keys.ESCAPE)
    b.press("u")
    b.js("document.querySelector('.verdicts button[data-verdict=yes]').click()")
    b.settle()
    progress = b.js("return document.querySelector('.progress p').textContent")
    checks.check(progress.startswith("4 of 6 clips judged: 2 yes, 1 no, 1 unsure"), f"progress: {progress}")
    checks.check(b.js("return document.querySelector('.position').textContent") == "Clip 5 of 6",
                 "after four verdicts the fifth clip is not shown")
    expected = {rows[0]["sample_id"]: "yes", rows[1]["sample_id"]: "no",
                rows[2]["sample_id"]: "unsure", rows[3]["sample_id"]: "yes"}
    notes = {rows[2]["sample_id"]: 'hand in the way, "mostly"'}

    # A reload keeps them.
    open_page(b, page)
    checks.check(b.js("return document.documentElement.dataset.judged") == "4",
                 "a reload lost the verdicts")
    shown = b.js("return [...document.querySelectorAll('.list tbody tr')].map((r) => r.lastChild.textContent)")
    checks.check(shown == ["yes", "no", "unsure", "yes", "", ""], f"verdicts listed after a reload: {shown}")

    # Saving: the sheet as written, verdicts and notes filled in.
    downloads = os.path.join(out, "downloads")
    os.makedirs(downloads)
    b.driver.execute_cdp_cmd("Browser.setDownloadBehavior",
                             {"behavior": "allow", "downloadPath": downloads})
    b.press("s")
    saved = os.path.join(downloads, "sheet.reviewed.csv")
    deadline = time.monotonic() + 30
    while not os.path.exists(saved) and time.monotonic() < deadline:
        time.sleep(0.1)
    if not checks.check(os.path.exists(saved), f"nothing saved in {downloads}: {os.listdir(downloads)}"):
        return
    time.sleep(0.3)
    text = open(saved, encoding="utf-8", newline="").read()
    got = list(csv.DictReader(io.StringIO(text)))
    for r, g in zip(rows, got):
        want = dict(r, verdict=expected.get(r["sample_id"], ""), note=notes.get(r["sample_id"], ""))
        checks.check(g == want, f"saved row {g} differs from {want}")
    checks.check(len(got) == len(rows), f"{len(got)} rows saved of {len(rows)}")
    # Emptied of the verdicts again, byte for byte the sheet tiers wrote.
    blank = io.StringIO()
    w = csv.writer(blank, lineterminator="\n")
    reader = csv.reader(io.StringIO(text))
    header = next(reader)
    w.writerow(header)
    for fields in reader:
        fields[header.index("verdict")] = fields[header.index("note")] = ""
        w.writerow(fields)
    checks.check(blank.getvalue() == open(sheet, encoding="utf-8", newline="").read(),
                 "the saved sheet's other fields are not as tiers wrote them")
    estimate = json.loads(run(sys.argv[1], "estimate", saved, "--json"))
    o = estimate["overall"]
    checks.check((o["reviewed"], o["correct"]) == (3, 2), f"estimate of the saved sheet: {o}")
    b.screenshot(os.path.join(out, "review.png"))


def lost_media(b, page):
    open_page(b, page)
    b.js("localStorage.clear()")
    open_page(b, page)
    wait(b, lambda: "cannot be played" in b.js("return document.querySelector('.media-status').textContent"),
         "a clip whose media is missing does not say so")
    b.press("n")
    checks.check(b.js("return document.documentElement.dataset.judged") == "1",
                 "without its media a clip takes no verdict")
    errors = b.js("return window.__tiersErrors || []")
    checks.check(not errors, f"script errors with missing media: {errors}")


def main():
    tiers, out = sys.argv[1:3]
    shutil.rmtree(out, ignore_errors=True)
    os.makedirs(out)
    for program in (browser_module.CHROMIUM, browser_module.CHROMEDRIVER, VIDEO_ENCODER):
        if not os.path.exists(program):
            raise SystemExit(f"FAIL {program} is missing: run scripts/install-deps")
    doc, lost = make_inputs(out)
    sheet = os.path.join(out, "sheet", "sheet.csv")
    os.makedirs(os.path.dirname(sheet))
    page = os.path.join(out, "page", "review.html")
    os.makedirs(os.path.dirname(page))
    run(tiers, "sample", doc, "--tier", "heads", "--n", "6", "--seed", "3", "--context", "0.5s",
        "-o", sheet, "--page", page)
    lost_page = os.path.join(out, "page", "lost.html")
    run(tiers, "sample", lost, "--tier", "heads", "--n", "3", "-o", os.path.join(out, "lost.csv"),
        "--page", lost_page)
    b = browser_module.Browser()
    try:
        review(b, page, sheet, out)
        lost_media(b, lost_page)
    finally:
        b.close()
    return checks.finish()


if __name__ == "__main__":
    sys.exit(main())
