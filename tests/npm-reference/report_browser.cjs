// Opens a `tiers report` page in Debian's chromium (headless, driven by playwright-core) and
// checks it as a person would use it: the page loads offline without script errors, every
// expected tier has its lane and is drawn, the zoom buttons and keys move the view, and
// choosing a problem row zooms the lanes to that problem. Writes a screenshot for a person.
//
// Usage: node report_browser.cjs PAGE.html EXPECT.json SCREENSHOT.png
// EXPECT: {"files": [{"tiers": [names…], "lag": bool, "agreement": bool}], "problems": N,
//          "bounded": bool}
// With "bounded", each lane at the whole-file view holds at most three SVG elements per pixel
// of its width, however many annotations the tier has: drawing costs what the screen shows,
// which is what keeps an hour of dense tiers responsive.
"use strict";
const fs = require("fs");
const os = require("os");
const path = require("path");
const {chromium} = require("playwright-core");

const [pagePath, expectPath, shotPath] = process.argv.slice(2);
const expect = JSON.parse(fs.readFileSync(expectPath, "utf8"));
const failures = [];
function check(ok, what) {
  if (!ok) failures.push(what);
  return ok;
}

(async () => {
  const profile = fs.mkdtempSync(path.join(os.tmpdir(), "tiers-chromium-"));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: process.env.TIERS_CHROMIUM || "/usr/bin/chromium",
    headless: true,
    viewport: {width: 1400, height: 1000},
    args: ["--no-sandbox", "--disable-gpu", "--disable-background-networking", "--no-first-run",
           "--disable-component-update", "--disable-sync", "--disable-quic"],
  });
  try {
    const page = await context.newPage();
    const errors = [], requests = [];
    page.on("pageerror", (e) => errors.push(String(e)));
    page.on("console", (m) => { if (m.type() === "error") errors.push(m.text()); });
    page.on("dialog", (d) => { errors.push(`a dialog opened: ${d.message()}`); d.dismiss(); });
    // The page must need nothing but itself: any other request is refused and counted.
    await page.route("**/*", (route) => {
      const url = route.request().url();
      if (url === "file://" + path.resolve(pagePath)) return route.continue();
      requests.push(url);
      return route.abort();
    });
    await page.goto("file://" + path.resolve(pagePath));
    await page.waitForSelector("html[data-ready=yes]", {timeout: 60000});
    check(errors.length === 0, `script errors: ${errors.join("; ")}`);
    check(requests.length === 0, `requests beyond the page: ${requests.join(", ")}`);

    const sections = await page.$$("section.file");
    check(sections.length === expect.files.length,
          `${sections.length} file sections, expected ${expect.files.length}`);
    for (let k = 0; k < Math.min(sections.length, expect.files.length); ++k) {
      const want = expect.files[k];
      if (want.drawn === false) {
        check(await sections[k].$(".timeline") === null, `file ${k} is drawn, expected only its problems`);
        continue;
      }
      const lanes = await sections[k].$$eval(".lane[data-tier]", (ls) => ls.map((l) => l.dataset.tier));
      check(JSON.stringify(lanes) === JSON.stringify(want.tiers),
            `file ${k}: lanes ${JSON.stringify(lanes)}, expected ${JSON.stringify(want.tiers)}`);
      // Every lane of a tier with annotations has something drawn in it at the whole-file view.
      const empty = await sections[k].$$eval(".lane[data-tier]", (ls, k) => {
        const tiers = JSON.parse(document.getElementById("tiers-data").textContent).files[k].tiers;
        return ls.filter((l) => tiers[Number(l.dataset.index)].annotations.length > 0 &&
                                l.querySelector("svg").childElementCount === 0).map((l) => l.dataset.tier);
      }, k);
      check(empty.length === 0, `file ${k}: nothing drawn in the lanes ${JSON.stringify(empty)}`);
      if (expect.bounded) {
        const sizes = await sections[k].$$eval(".lane svg", (ss) => ss.map((s) =>
          [s.closest(".lane").dataset.tier || s.closest(".lane").className, s.querySelectorAll("*").length,
           Math.round(s.getBoundingClientRect().width)]));
        for (const [name, nodes, px] of sizes)
          check(nodes <= 3 * px, `file ${k}: lane ${name} holds ${nodes} elements for ${px} pixels`);
      }
      const ruler = await sections[k].$$eval(".ruler svg text", (ts) => ts.map((t) => t.textContent));
      check(ruler.length >= 2 && ruler.every((t) => /^-?\d\d:\d\d:\d\d(\.\d+)?$/.test(t)),
            `file ${k}: ruler labels ${JSON.stringify(ruler.slice(0, 4))} are not hh:mm:ss`);
      const lag = await sections[k].$$eval(".lag svg polyline", (ps) => ps.length);
      check((lag > 0) === Boolean(want.lag), `file ${k}: lag plot ${lag > 0}, expected ${want.lag}`);
      const strip = await sections[k].$$eval(".agreement svg rect", (rs) => rs.length);
      check((strip > 0) === Boolean(want.agreement),
            `file ${k}: agreement strip ${strip > 0}, expected ${want.agreement}`);
    }

    const first = sections[0];
    const timeline = await first.$(".timeline");
    const view = async () => (await timeline.evaluate((t) => [Number(t.dataset.viewStart), Number(t.dataset.viewEnd)]));
    const settle = () => page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
    const whole = await view();
    await first.$eval(".toolbar button[data-act=in]", (b) => b.click());
    await settle();
    const zoomed = await view();
    check(Math.abs((zoomed[1] - zoomed[0]) * 2 - (whole[1] - whole[0])) < 1e-3 * (whole[1] - whole[0]) + 0.002,
          `zoom in: view ${zoomed} from ${whole}, expected half as wide`);
    await timeline.focus();
    await page.keyboard.press("ArrowRight");
    await settle();
    const moved = await view();
    check(moved[0] > zoomed[0], `the right arrow key did not move the view (${zoomed} -> ${moved})`);
    await page.keyboard.press("0");
    await settle();
    const back = await view();
    check(Math.abs(back[0] - whole[0]) < 1e-3 && Math.abs(back[1] - whole[1]) < 1e-3,
          `'0' did not show the whole file again: ${back}, expected ${whole}`);

    // Choosing a problem: the view narrows around it and the row is marked as the current one.
    const rows = await first.$$("tbody tr[data-start]");
    check(rows.length >= (expect.problems || 0),
          `${rows.length} problem rows with a time, expected at least ${expect.problems}`);
    if (rows.length > 0) {
      const row = rows[Math.floor(rows.length / 2)];
      const [start, end] = await row.evaluate((r) => [Number(r.dataset.start), Number(r.dataset.end)]);
      await row.click();
      await settle();
      const shown = await view();
      check(shown[0] !== whole[0] || shown[1] !== whole[1], "clicking a problem row did not move the view");
      check(shown[0] <= start + 1e-3 && shown[1] >= end - 1e-3,
            `the view ${shown} does not show the problem at ${start}-${end}`);
      check(await row.evaluate((r) => r.classList.contains("current")), "the chosen row is not marked");
      const tier = await row.evaluate((r) => r.dataset.tier);
      if (tier)
        check(await first.$$eval(".lane[data-tier] svg .focus", (f) => f.length) === 1,
              "the chosen problem is not outlined on its lane");
      // The keyboard reaches the rows too.
      const other = rows[0];
      await other.focus();
      await page.keyboard.press("Enter");
      await settle();
      check(await other.evaluate((r) => r.classList.contains("current")), "Enter on a row did not choose it");
    }
    await first.$eval(".toolbar button[data-act=fit]", (b) => b.click());
    await settle();
    await page.screenshot({path: shotPath, fullPage: true});
    // For the log only (speed is measured by the benchmarks, not asserted here).
    const loadMs = await page.evaluate(() => performance.getEntriesByType("navigation")[0].duration);
    const drawMs = await timeline.evaluate((t) => Number(t.dataset.drawMs));
    console.log(JSON.stringify({page: pagePath, sections: sections.length, loadMs: Math.round(loadMs),
                                drawMs, screenshot: shotPath}));
  } finally {
    await context.close();
    fs.rmSync(profile, {recursive: true, force: true});
  }
  for (const f of failures) console.error("FAIL " + f);
  process.exit(failures.length ? 1 : 0);
})().catch((e) => {
  console.error("FAIL " + (e && e.stack ? e.stack : e));
  process.exit(1);
});
