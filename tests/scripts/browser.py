"""Opens `tiers report` pages in Debian's chromium, headless, through Debian's chromedriver and
python3-selenium, and checks each as a person would use it: the page loads offline without
script errors or dialogs, every expected tier has its lane and is drawn, the zoom buttons and
keys move the view, and choosing a problem row zooms the lanes to that problem. Writes a
screenshot of each page for a person to look at.

Chromium, chromedriver and selenium all come from Debian 12's packages (chromium and
chromium-driver are one source package, so their versions always match); nothing is downloaded.

An expectation is {"files": [{"tiers": [names…], "lag": bool, "agreement": bool} or
{"drawn": false}], "problems": N, "bounded": bool}. With "bounded", each lane at the whole-file
view holds at most three SVG elements per pixel of its width, however many annotations the
tier has: drawing costs what the screen shows, which keeps an hour of dense tiers responsive.
"""
import base64
import json
import os
import re
import shutil
import subprocess
import tempfile
import time

from selenium import webdriver
from selenium.webdriver.chrome.options import Options
from selenium.webdriver.chrome.service import Service
from selenium.webdriver.common import utils
from selenium.webdriver.common.action_chains import ActionChains
from selenium.webdriver.common.by import By
from selenium.webdriver.common.keys import Keys
from selenium.webdriver.support.ui import WebDriverWait

CHROMIUM = os.environ.get("TIERS_CHROMIUM", "/usr/bin/chromium")
CHROMEDRIVER = os.environ.get("TIERS_CHROMEDRIVER", "/usr/bin/chromedriver")

# Runs before any script of the page: script errors, console errors and dialogs are recorded
# where the test can read them (a dialog would otherwise block the page).
WATCH = """
window.__tiersErrors = [];
window.addEventListener('error', (e) => window.__tiersErrors.push('error: ' + e.message));
window.addEventListener('unhandledrejection', (e) => window.__tiersErrors.push('rejection: ' + e.reason));
const consoleError = console.error.bind(console);
console.error = (...a) => { window.__tiersErrors.push('console: ' + a.join(' ')); consoleError(...a); };
for (const name of ['alert', 'confirm', 'prompt'])
  window[name] = (m) => { window.__tiersErrors.push('a dialog opened: ' + m); };
"""

SETTLE = """
const done = arguments[arguments.length - 1];
requestAnimationFrame(() => requestAnimationFrame(() => done(true)));
"""


class LoopbackService(Service):
    """chromedriver reached at 127.0.0.1 rather than by the name `localhost`, which a minimal
    root (a fresh debootstrap has no /etc/hosts) cannot resolve."""

    @property
    def service_url(self):
        return f"http://127.0.0.1:{self.port}"

    def is_connectable(self):
        return utils.is_connectable(self.port, host="127.0.0.1")


class Browser:
    """One headless chromium for a whole test run; `check_page` opens one page in it."""

    def __init__(self):
        self.profile = tempfile.mkdtemp(prefix="tiers-chromium-")
        # Chromium is started here and chromedriver attaches to it at 127.0.0.1: left to start
        # the browser itself, chromedriver reaches it by the name `localhost`, which a minimal
        # root (a fresh debootstrap has no /etc/hosts) cannot resolve.
        port = utils.free_port()
        # As this machine needs them: no sandbox as root, no background connections to a
        # closed network, a fresh profile.
        self.chromium = subprocess.Popen(
            [CHROMIUM, "--headless=new", "--no-sandbox", "--disable-gpu", "--disable-dev-shm-usage",
             "--disable-background-networking", "--no-first-run", "--disable-component-update",
             "--disable-sync", "--disable-quic", "--window-size=1400,1000",
             f"--user-data-dir={self.profile}", "--remote-debugging-address=127.0.0.1",
             f"--remote-debugging-port={port}", "about:blank"],
            stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        try:
            deadline = time.monotonic() + 60
            while not utils.is_connectable(port, host="127.0.0.1"):
                if self.chromium.poll() is not None or time.monotonic() > deadline:
                    raise RuntimeError(f"{CHROMIUM} did not open its DevTools port "
                                       f"(exit status {self.chromium.poll()})")
                time.sleep(0.1)
            options = Options()
            options.debugger_address = f"127.0.0.1:{port}"
            options.set_capability("goog:loggingPrefs", {"performance": "ALL"})
            self.driver = webdriver.Chrome(service=LoopbackService(CHROMEDRIVER), options=options)
        except BaseException:
            self._stop_chromium()
            raise
        self.driver.set_script_timeout(60)
        self.driver.execute_cdp_cmd("Network.enable", {})
        self.driver.execute_cdp_cmd("Page.addScriptToEvaluateOnNewDocument", {"source": WATCH})

    def _stop_chromium(self):
        self.chromium.terminate()
        try:
            self.chromium.wait(timeout=20)
        except subprocess.TimeoutExpired:
            self.chromium.kill()
            self.chromium.wait()
        shutil.rmtree(self.profile, ignore_errors=True)

    def close(self):
        try:
            self.driver.quit()
        finally:
            self._stop_chromium()

    def requests(self):
        """Every URL the page asked for since the last call (from the DevTools network log)."""
        urls = []
        for entry in self.driver.get_log("performance"):
            message = json.loads(entry["message"])["message"]
            if message.get("method") == "Network.requestWillBeSent":
                urls.append(message["params"]["request"]["url"])
        return urls

    def settle(self):
        self.driver.execute_async_script(SETTLE)

    def js(self, script, *args):
        return self.driver.execute_script(script, *args)

    def press(self, key):
        ActionChains(self.driver).send_keys(key).perform()

    def screenshot(self, path):
        """The whole page, not only the window (DevTools captures beyond the viewport)."""
        size = self.driver.execute_cdp_cmd("Page.getLayoutMetrics", {})["cssContentSize"]
        shot = self.driver.execute_cdp_cmd("Page.captureScreenshot", {
            "format": "png", "captureBeyondViewport": True,
            "clip": {"x": 0, "y": 0, "width": size["width"], "height": size["height"], "scale": 1}})
        with open(path, "wb") as fh:
            fh.write(base64.b64decode(shot["data"]))

    def check_page(self, page_path, expect, shot_path):
        """Opens the page and returns (failures, a line for the log)."""
        failures = []

        def check(ok, what):
            if not ok:
                failures.append(what)
            return ok

        url = "file://" + os.path.abspath(page_path)
        self.requests()  # forget the previous page's
        self.driver.get(url)
        WebDriverWait(self.driver, 60).until(
            lambda d: d.find_elements(By.CSS_SELECTOR, "html[data-ready=yes]"))
        errors = self.js("return window.__tiersErrors || []")
        check(not errors, f"script errors: {'; '.join(errors)}")
        # The page must need nothing but itself (data: URLs are part of the page).
        others = [u for u in self.requests() if u != url and not u.startswith("data:")]
        check(not others, f"requests beyond the page: {', '.join(others)}")

        sections = self.driver.find_elements(By.CSS_SELECTOR, "section.file")
        check(len(sections) == len(expect["files"]),
              f"{len(sections)} file sections, expected {len(expect['files'])}")
        for k, (section, want) in enumerate(zip(sections, expect["files"])):
            if want.get("drawn") is False:
                check(not section.find_elements(By.CSS_SELECTOR, ".timeline"),
                      f"file {k} is drawn, expected only its problems")
                continue
            lanes = self.js("return [...arguments[0].querySelectorAll('.lane[data-tier]')]"
                            ".map((l) => l.dataset.tier)", section)
            check(lanes == want["tiers"], f"file {k}: lanes {lanes}, expected {want['tiers']}")
            # Every lane of a tier with annotations has something drawn at the whole-file view.
            empty = self.js("""
                const tiers = JSON.parse(document.getElementById('tiers-data').textContent)
                                  .files[arguments[1]].tiers;
                return [...arguments[0].querySelectorAll('.lane[data-tier]')]
                  .filter((l) => tiers[Number(l.dataset.index)].annotations.length > 0 &&
                                 l.querySelector('svg').childElementCount === 0)
                  .map((l) => l.dataset.tier);""", section, k)
            check(not empty, f"file {k}: nothing drawn in the lanes {empty}")
            if expect.get("bounded"):
                sizes = self.js("""
                    return [...arguments[0].querySelectorAll('.lane svg')].map((s) =>
                      [s.closest('.lane').dataset.tier || s.closest('.lane').className,
                       s.querySelectorAll('*').length,
                       Math.round(s.getBoundingClientRect().width)]);""", section)
                for name, nodes, px in sizes:
                    check(nodes <= 3 * px, f"file {k}: lane {name} holds {nodes} elements for {px} pixels")
            ruler = self.js("return [...arguments[0].querySelectorAll('.ruler svg text')]"
                            ".map((t) => t.textContent)", section)
            check(len(ruler) >= 2 and all(_is_clock(t) for t in ruler),
                  f"file {k}: ruler labels {ruler[:4]} are not hh:mm:ss")
            lag = self.js("return arguments[0].querySelectorAll('.lag svg polyline').length", section)
            check((lag > 0) == bool(want.get("lag")), f"file {k}: lag plot {lag > 0}, expected {want.get('lag')}")
            strip = self.js("return arguments[0].querySelectorAll('.agreement svg rect').length", section)
            check((strip > 0) == bool(want.get("agreement")),
                  f"file {k}: agreement strip {strip > 0}, expected {want.get('agreement')}")

        first = sections[0]
        timeline = first.find_element(By.CSS_SELECTOR, ".timeline")

        def view():
            return self.js("return [Number(arguments[0].dataset.viewStart),"
                           " Number(arguments[0].dataset.viewEnd)]", timeline)

        whole = view()
        self.js("arguments[0].querySelector('.toolbar button[data-act=in]').click()", first)
        self.settle()
        zoomed = view()
        width = whole[1] - whole[0]
        check(abs((zoomed[1] - zoomed[0]) * 2 - width) < 1e-3 * width + 0.002,
              f"zoom in: view {zoomed} from {whole}, expected half as wide")
        self.js("arguments[0].focus()", timeline)
        self.press(Keys.ARROW_RIGHT)
        self.settle()
        moved = view()
        check(moved[0] > zoomed[0], f"the right arrow key did not move the view ({zoomed} -> {moved})")
        self.press("0")
        self.settle()
        back = view()
        check(abs(back[0] - whole[0]) < 1e-3 and abs(back[1] - whole[1]) < 1e-3,
              f"'0' did not show the whole file again: {back}, expected {whole}")

        # Choosing a problem: the view narrows around it and the row is marked as current.
        rows = first.find_elements(By.CSS_SELECTOR, "tbody tr[data-start]")
        check(len(rows) >= expect.get("problems", 0),
              f"{len(rows)} problem rows with a time, expected at least {expect.get('problems', 0)}")
        if rows:
            row = rows[len(rows) // 2]
            if expect.get("choose"):  # the row of this rule
                chosen = [r for r in rows if expect["choose"] in r.text]
                check(bool(chosen), f"no problem row of {expect['choose']}")
                row = chosen[0] if chosen else row
            # A reversed annotation's problem ends before it starts: its span is between the two.
            start, end = sorted(self.js("return [Number(arguments[0].dataset.start),"
                                        " Number(arguments[0].dataset.end)]", row))
            self.js("arguments[0].scrollIntoView({block: 'center'})", row)
            row.click()
            self.settle()
            shown = view()
            check(shown != whole, "clicking a problem row did not move the view")
            check(shown[0] <= start + 1e-3 and shown[1] >= end - 1e-3,
                  f"the view {shown} does not show the problem at {start}-{end}")
            check(self.js("return arguments[0].classList.contains('current')", row),
                  "the chosen row is not marked")
            check(shown[1] - shown[0] >= end - start,
                  f"the view {shown} is narrower than the problem's span {start}-{end}")
            if self.js("return arguments[0].dataset.tier", row):
                check(len(first.find_elements(By.CSS_SELECTOR, ".lane[data-tier] svg .focus")) == 1,
                      "the chosen problem is not outlined on its lane")
            # The keyboard reaches the rows too.
            other = rows[0]
            self.js("arguments[0].focus()", other)
            self.press(Keys.ENTER)
            self.settle()
            check(self.js("return arguments[0].classList.contains('current')", other),
                  "Enter on a row did not choose it")
        self.js("arguments[0].querySelector('.toolbar button[data-act=fit]').click()", first)
        self.settle()
        if expect.get("reversed"):
            drawn = first.find_elements(By.CSS_SELECTOR, ".lane[data-tier] svg .ann.reversed")
            check(len(drawn) == expect["reversed"],
                  f"{len(drawn)} reversed annotations drawn, expected {expect['reversed']}")
            widths = [d.rect["width"] for d in drawn]
            check(all(w >= 3 for w in widths), f"reversed annotations drawn {widths} px wide")
        self.screenshot(shot_path)
        # For the log only: speed is measured by the benchmarks, not asserted here.
        load_ms = self.js("return performance.getEntriesByType('navigation')[0].duration")
        draw_ms = self.js("return Number(arguments[0].dataset.drawMs)", timeline)
        log = json.dumps({"page": page_path, "sections": len(sections), "loadMs": round(load_ms),
                          "drawMs": draw_ms, "screenshot": shot_path})
        return failures, log


def _is_clock(text):
    return re.fullmatch(r"-?\d\d:\d\d:\d\d(\.\d+)?", text) is not None
