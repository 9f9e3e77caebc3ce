// The tiers report: draws each file's tiers as lanes on a shared time axis from the data in
// #tiers-data (docs/report.md). Only what is in view is drawn, and annotations narrower than a
// pixel are drawn together, so that an hour of dense tiers stays quick at any zoom.
"use strict";
(function () {
  const data = JSON.parse(document.getElementById("tiers-data").textContent);
  // Ruler steps in seconds: the first that leaves at least 90 pixels between ticks is used.
  const steps = [0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10, 15, 30, 60, 120, 300, 600, 900,
                 1800, 3600, 7200, 21600, 43200, 86400];
  const LANE = 30, LAG = 110, STRIP = 22;
  // Annotations of one lane that overlap go in stacked rows of this height, at most MAX_ROWS
  // (more overlap is drawn on the last row).
  const ROW = 14, MAX_ROWS = 8;
  const colours = {human: [61, 90, 128], machine: [122, 92, 153]};  // as in report.css
  const pad = (n, w) => String(n).padStart(w, "0");
  function clock(t, decimals) {
    const sign = t < 0 ? "-" : "";
    t = Math.abs(t);
    const whole = decimals ? Number(t.toFixed(decimals)) : Math.floor(t + 1e-9);
    const h = Math.floor(whole / 3600), m = Math.floor((whole % 3600) / 60), s = whole % 60;
    const secs = decimals ? s.toFixed(decimals).padStart(3 + decimals, "0") : pad(Math.floor(s), 2);
    return sign + pad(h, 2) + ":" + pad(m, 2) + ":" + secs;
  }
  const esc = (s) => String(s).replace(/[&<>"]/g, (c) => ({"&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;"}[c]));

  // White or black text, whichever contrasts more with `rgb` laid at `opacity` over white
  // (relative luminance and contrast ratio as WCAG 2 defines them). With black, the worse of
  // the two is never below 4.58 : 1, whatever the background; with a dark grey it could be 4.
  function labelClass(rgb, opacity) {
    const lin = (c) => { c /= 255; return c <= 0.04045 ? c / 12.92 : Math.pow((c + 0.055) / 1.055, 2.4); };
    const mix = rgb.map((c) => 255 * (1 - opacity) + c * opacity);
    const L = 0.2126 * lin(mix[0]) + 0.7152 * lin(mix[1]) + 0.0722 * lin(mix[2]);
    return 1.05 / (L + 0.05) >= (L + 0.05) / 0.05 ? "label light" : "label dark";
  }

  function setup(section, file) {
    const timeline = section.querySelector(".timeline");
    const info = section.querySelector(".toolbar .view");
    const ruler = timeline.querySelector(".ruler svg");
    const lanes = Array.from(timeline.querySelectorAll(".lane[data-index]"));
    // The whole file, with a little room after the last annotation so that its end shows.
    const length = Math.max(file.span[1] - file.span[0], 1);
    const full = [file.span[0], file.span[0] + length * 1.02];
    const view = {start: full[0], end: full[1]};
    let focus = null;  // the chosen problem's span, outlined
    for (const t of file.tiers) {
      t.longest = 0;
      for (const a of t.annotations) t.longest = Math.max(t.longest, a[1] - a[0]);
      // Annotations that end before they start (time.reversed) are drawn apart, over the span
      // between their two times, so that the problem can be seen; they are few.
      t.reversed = t.annotations.filter((a) => a[1] < a[0]);
      // Each interval to the first row free at its start (annotations come in start order),
      // so that overlapping ones sit one above the other rather than on top of each other.
      t.row = [];
      const ends = [];
      for (const a of t.annotations) {
        let r = 0;
        if (t.kind !== "instant" && a[1] >= a[0]) {
          while (r < ends.length && ends[r] > a[0]) ++r;
          r = Math.min(r, MAX_ROWS - 1);
          ends[r] = Math.max(ends[r] || -Infinity, a[1]);
        }
        t.row.push(r);
      }
      t.rows = Math.max(1, ends.length);
    }
    for (const lane of lanes) {
      const t = file.tiers[Number(lane.dataset.index)];
      if (t.rows > 1) {
        lane.querySelector("svg").setAttribute("height", String(10 + t.rows * ROW));
        lane.dataset.rows = String(t.rows);  // read by the tests
      }
    }
    const problemsBy = new Map();
    for (const p of file.problems) {
      if (!p.tier || p.start === undefined) continue;
      if (!problemsBy.has(p.tier)) problemsBy.set(p.tier, []);
      problemsBy.get(p.tier).push(p);
    }

    const width = () => Math.max(100, ruler.getBoundingClientRect().width || 800);
    function firstFrom(list, t) {  // the first index whose start is at least t
      let lo = 0, hi = list.length;
      while (lo < hi) { const mid = (lo + hi) >> 1; if (list[mid][0] < t) lo = mid + 1; else hi = mid; }
      return lo;
    }

    function drawRuler(w) {
      const span = view.end - view.start;
      let step = steps[steps.length - 1];
      for (const s of steps) if (s * w / span >= 90) { step = s; break; }
      const decimals = step < 0.1 ? 2 : step < 1 ? 1 : 0;
      let out = "";
      for (let k = Math.ceil(view.start / step); k * step <= view.end; ++k) {
        const x = (k * step - view.start) * w / span;
        out += `<line class="tick" x1="${x}" x2="${x}" y1="16" y2="26"/><text x="${x + 3}" y="13">${clock(k * step, decimals)}</text>`;
      }
      ruler.innerHTML = out;
    }

    function drawLane(lane, w) {
      const svg = lane.querySelector("svg");
      const tier = file.tiers[Number(lane.dataset.index)];
      const span = view.end - view.start, k = w / span;
      const x = (t) => (t - view.start) * k;
      const list = tier.annotations, who = tier.source === "machine" ? "machine" : "human";
      const rowHeight = tier.rows > 1 ? ROW : LANE - 10, laneHeight = 8 + tier.rows * rowHeight;
      let out = "";
      let run = null;  // annotations narrower than a pixel, drawn as one stretch
      const flush = () => {
        if (!run) return;
        out += `<rect class="ann ${who} run" x="${run.x0}" y="8" width="${Math.max(1, run.x1 - run.x0)}" height="${laneHeight - 8}"><title>${run.n} annotations</title></rect>`;
        run = null;
      };
      for (let i = firstFrom(list, view.start - tier.longest); i < list.length; ++i) {
        const a = list[i];
        if (a[0] > view.end) break;
        if (a[1] < view.start || a[1] < a[0]) continue;
        const x0 = Math.max(0, x(a[0])), x1 = Math.min(w, x(a[1]));
        const conf = a[3] === null ? "" : ` (confidence ${a[3]})`;
        if (tier.kind === "instant") {
          out += `<line class="ann instant ${who}" x1="${x0}" x2="${x0}" y1="6" y2="${laneHeight - 2}"><title>${clock(a[0], 3)} ${esc(a[2])}${conf}</title></line>`;
          continue;
        }
        if (x1 - x0 < 1) {
          if (run && x0 <= run.x1 + 1) { run.x1 = Math.max(run.x1, x1); ++run.n; continue; }
          flush();
          run = {x0, x1, n: 1};
          continue;
        }
        flush();
        const opacity = a[3] === null ? 1 : 0.25 + 0.75 * a[3];
        const y = 8 + tier.row[i] * rowHeight;
        out += `<rect class="ann ${who}" x="${x0}" y="${y}" width="${x1 - x0}" height="${rowHeight - (tier.rows > 1 ? 2 : 0)}" fill-opacity="${opacity.toFixed(2)}" data-row="${tier.row[i]}">`;
        // Tooltips only where there is room to point at them: fewer nodes when zoomed out.
        if (x1 - x0 >= 3) out += `<title>${clock(a[0], 3)}–${clock(a[1], 3)} ${esc(a[2])}${conf}</title>`;
        out += "</rect>";
        const room = x1 - x0 - 6;
        if (room > 14 && a[2]) {
          const chars = Math.floor(room / 6.4);
          const text = a[2].length > chars ? a[2].slice(0, Math.max(1, chars - 1)) + "…" : a[2];
          out += `<text class="${labelClass(colours[who], opacity)}" x="${x0 + 3}" y="${y + rowHeight - (tier.rows > 1 ? 5 : 8)}">${esc(text)}</text>`;
        }
      }
      flush();
      for (const a of tier.reversed) {
        if (a[0] < view.start || a[1] > view.end) continue;
        const x0 = Math.max(0, x(a[1])), x1 = Math.min(w, Math.max(x(a[0]), x0 + 3));
        out += `<rect class="ann reversed" x="${x0}" y="8" width="${x1 - x0}" height="${laneHeight - 8}"><title>ends at ${clock(a[1], 3)}, before it starts at ${clock(a[0], 3)}: ${esc(a[2])}</title></rect>`;
      }
      for (const p of problemsBy.get(tier.name) || []) {
        const lo = Math.min(p.start, p.end), hi = Math.max(p.start, p.end);
        if (hi < view.start || lo > view.end) continue;
        const x0 = x(lo), x1 = Math.max(x0 + 4, x(hi));
        out += `<rect class="problem ${p.severity}" x="${x0}" y="1" width="${x1 - x0}" height="6"><title>${esc(p.severity + ": " + p.message + " [" + p.rule + "]")}</title></rect>`;
      }
      if (focus && focus.tier === tier.name)
        out += `<rect class="focus" x="${x(focus.start) - 2}" y="1" width="${Math.max(4, x(focus.end) - x(focus.start)) + 4}" height="${laneHeight}"/>`;
      svg.innerHTML = out;
    }

    function drawLag(svg, w) {
      const lag = file.lag, span = view.end - view.start;
      let lo = -lag.early - 0.5, hi = lag.late + 0.5;
      for (const p of lag.points) { lo = Math.min(lo, p[1]); hi = Math.max(hi, p[1]); }
      const y = (v) => LAG - 8 - (v - lo) * (LAG - 16) / (hi - lo);
      const x = (t) => (t - view.start) * w / span;
      const margin = span * 0.05;
      const shown = lag.points.filter((p) => p[0] >= view.start - margin && p[0] <= view.end + margin);
      let out = `<line class="zero" x1="0" x2="${w}" y1="${y(0)}" y2="${y(0)}"/>` +
                `<text x="${w - 4}" y="${y(0) - 3}" text-anchor="end">0 s</text>` +
                `<line class="threshold" x1="0" x2="${w}" y1="${y(lag.late)}" y2="${y(lag.late)}"/>` +
                `<text x="4" y="${y(lag.late) - 3}">late limit ${lag.late} s</text>` +
                `<line class="threshold" x1="0" x2="${w}" y1="${y(-lag.early)}" y2="${y(-lag.early)}"/>` +
                `<text x="4" y="${y(-lag.early) + 12}">early limit ${lag.early} s</text>`;
      if (shown.length > 1)
        out += `<polyline class="lagline" points="${shown.map((p) => x(p[0]).toFixed(1) + "," + y(p[1]).toFixed(1)).join(" ")}"/>`;
      if (shown.length < 500)
        for (const p of shown) {
          const over = p[1] > lag.late || p[1] < -lag.early;
          // Points beyond a limit are squares, the others circles: shape as well as colour.
          out += over
            ? `<rect class="lagpoint over" x="${x(p[0]) - 3.5}" y="${y(p[1]) - 3.5}" width="7" height="7">`
            : `<circle class="lagpoint" cx="${x(p[0])}" cy="${y(p[1])}" r="2.5">`;
          const cue = p.length > 2 ? `cue ${p[2]}` : "cue";
          out += `<title>${esc(cue)} at ${clock(p[0], 1)}: ${p[1] >= 0 ? "late" : "early"} by ${Math.abs(p[1]).toFixed(2)} s</title>${over ? "</rect>" : "</circle>"}`;
        }
      svg.innerHTML = out;
    }

    // Stretches narrower than a pixel share their pixel, which shows the least agreement among
    // them: a disagreement stays visible at any zoom.
    const rank = {"agree": 0, "only-candidate": 1, "only-reference": 2, "differ": 3};
    function drawAgreement(svg, w) {
      const span = view.end - view.start, x = (t) => (t - view.start) * w / span;
      let out = "", cell = null;
      const flush = () => {
        if (cell) out += `<rect class="${cell.what}" x="${cell.px}" y="3" width="1" height="${STRIP - 6}"/>`;
        cell = null;
      };
      for (const s of file.agreement.stretches) {
        if (s[1] < view.start || s[0] > view.end) continue;
        const x0 = Math.max(0, x(s[0])), x1 = Math.min(w, x(s[1]));
        if (x1 - x0 < 1) {
          const px = Math.floor(x0);
          if (cell && cell.px === px) { if (rank[s[2]] > rank[cell.what]) cell.what = s[2]; continue; }
          flush();
          cell = {px, what: s[2]};
          continue;
        }
        flush();
        out += `<rect class="${s[2]}" x="${x0}" y="3" width="${x1 - x0}" height="${STRIP - 6}">`;
        if (x1 - x0 >= 3) out += `<title>${s[2].replace("-", " ")}: ${clock(s[0], 2)}–${clock(s[1], 2)}</title>`;
        out += "</rect>";
      }
      flush();
      svg.innerHTML = out;
    }

    function redraw() {
      const began = performance.now();
      const w = width();
      drawRuler(w);
      for (const lane of lanes) drawLane(lane, w);
      const lag = timeline.querySelector(".lag svg");
      if (lag && file.lag) drawLag(lag, w);
      const strip = timeline.querySelector(".agreement svg");
      if (strip && file.agreement) drawAgreement(strip, w);
      timeline.dataset.viewStart = view.start.toFixed(3);
      timeline.dataset.viewEnd = view.end.toFixed(3);
      info.textContent = `showing ${clock(view.start, 1)} – ${clock(view.end, 1)}`;
      timeline.dataset.drawMs = (performance.now() - began).toFixed(1);  // read by the tests
    }
    let pending = false;
    function schedule() {
      if (pending) return;
      pending = true;
      requestAnimationFrame(() => { pending = false; redraw(); });
    }
    function setView(start, end) {
      const total = full[1] - full[0];
      const span = Math.min(Math.max(end - start, 0.05), total * 1.2);
      start = Math.min(Math.max(start, full[0] - total * 0.1), full[1] + total * 0.1 - span);
      view.start = start;
      view.end = start + span;
      schedule();
    }
    function zoom(factor, at) {
      if (at === undefined) at = (view.start + view.end) / 2;
      setView(at - (at - view.start) * factor, at + (view.end - at) * factor);
    }
    function move(share) {
      const span = view.end - view.start;
      setView(view.start + span * share, view.end + span * share);
    }
    const actions = {in: () => zoom(0.5), out: () => zoom(2), left: () => move(-0.25),
                     right: () => move(0.25), fit: () => { focus = null; setView(full[0], full[1]); }};
    section.querySelectorAll(".toolbar button").forEach((b) => b.addEventListener("click", () => actions[b.dataset.act]()));
    timeline.addEventListener("keydown", (e) => {
      const act = {"+": "in", "=": "in", "-": "out", "ArrowLeft": "left", "ArrowRight": "right", "0": "fit", "Home": "fit"}[e.key];
      if (act) { actions[act](); e.preventDefault(); }
    });
    timeline.addEventListener("wheel", (e) => {
      const box = ruler.getBoundingClientRect();
      if (e.clientX < box.left) return;  // over the lanes' names: let the page scroll
      e.preventDefault();
      if (e.shiftKey || Math.abs(e.deltaX) > Math.abs(e.deltaY)) return move((e.deltaX || e.deltaY) / 500);
      zoom(e.deltaY > 0 ? 1.25 : 0.8, view.start + (e.clientX - box.left) / box.width * (view.end - view.start));
    }, {passive: false});
    let drag = null;
    timeline.addEventListener("pointerdown", (e) => {
      if (e.button !== 0) return;
      drag = {x: e.clientX, start: view.start, end: view.end};
      timeline.setPointerCapture(e.pointerId);
    });
    timeline.addEventListener("pointerup", () => { drag = null; });
    timeline.addEventListener("pointermove", (e) => {
      if (!drag) return;
      const shift = (drag.x - e.clientX) / ruler.getBoundingClientRect().width * (drag.end - drag.start);
      setView(drag.start + shift, drag.end + shift);
    });
    function show(row) {
      // A reversed annotation's problem ends before it starts: show the span between the two.
      const a = parseFloat(row.dataset.start), b = parseFloat(row.dataset.end);
      const start = Math.min(a, b), end = Math.max(a, b);
      const margin = Math.max(2, (end - start) * 0.5);
      focus = {tier: row.dataset.tier, start, end};
      section.querySelectorAll("tbody tr.current").forEach((r) => r.classList.remove("current"));
      row.classList.add("current");
      setView(start - margin, end + margin);
      timeline.scrollIntoView({block: "nearest"});
    }
    section.querySelectorAll("tbody tr[data-start]").forEach((row) => {
      row.addEventListener("click", () => show(row));
      row.addEventListener("keydown", (e) => { if (e.key === "Enter" || e.key === " ") { show(row); e.preventDefault(); } });
    });
    window.addEventListener("resize", schedule);
    redraw();
  }

  document.querySelectorAll("section.file").forEach((section) => {
    const file = data.files[Number(section.dataset.file)];
    if (file.drawn && section.querySelector(".timeline")) setup(section, file);
  });
  document.documentElement.dataset.ready = "yes";
})();
