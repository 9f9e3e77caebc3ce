// The review page: one clip at a time, a verdict per clip by button or key, progress kept in
// the browser's local storage (review can stop and go on later), and the sheet saved as CSV
// with the verdicts and notes filled in, every other field exactly as it was written.
'use strict';
(() => {
  const data = JSON.parse(document.getElementById('review-data').textContent);

  // RFC 4180: quoted fields may hold commas, doubled quotes and line breaks.
  function parseCsv(text) {
    const records = [];
    let record = [], field = '', at = 0, quoted = false, started = false;
    while (at < text.length) {
      const c = text[at];
      if (quoted) {
        if (c === '"' && text[at + 1] === '"') { field += '"'; at += 2; continue; }
        if (c === '"') { quoted = false; at++; continue; }
        field += c; at++; continue;
      }
      if (c === '"' && field === '') { quoted = true; started = true; at++; continue; }
      if (c === ',') { record.push(field); field = ''; started = true; at++; continue; }
      if (c === '\n' || c === '\r') {
        if (started || field !== '' || record.length) { record.push(field); records.push(record); }
        record = []; field = ''; started = false;
        at += c === '\r' && text[at + 1] === '\n' ? 2 : 1;
        continue;
      }
      field += c; started = true; at++;
    }
    if (started || field !== '' || record.length) { record.push(field); records.push(record); }
    return records;
  }
  const csvField = (s) => (/[",\r\n]/.test(s) ? '"' + s.replace(/"/g, '""') + '"' : s);

  const table = parseCsv(data.sheet);
  const header = table[0];
  const rows = table.slice(1);
  const col = Object.fromEntries(header.map((name, k) => [name, k]));
  const storeKey = 'tiers-review:' + data.key;

  function load() {
    try {
      const s = JSON.parse(localStorage.getItem(storeKey) || 'null');
      if (s && typeof s.verdicts === 'object' && typeof s.notes === 'object') return s;
    } catch (e) { /* a damaged entry: start afresh */ }
    return { verdicts: {}, notes: {}, current: 0 };
  }
  const state = load();
  const idOf = (k) => rows[k][col.sample_id];
  for (let k = 0; k < rows.length; k++) {  // verdicts the sheet came with
    const id = idOf(k);
    if (state.verdicts[id] === undefined && rows[k][col.verdict]) state.verdicts[id] = rows[k][col.verdict];
    if (state.notes[id] === undefined && rows[k][col.note]) state.notes[id] = rows[k][col.note];
  }
  function store() {
    try { localStorage.setItem(storeKey, JSON.stringify(state)); } catch (e) { /* full or off */ }
  }

  const video = document.querySelector('.player video');
  const mediaStatus = document.querySelector('.media-status');
  const position = document.querySelector('.position');
  const details = document.querySelector('.clip dl');
  const note = document.querySelector('label.note textarea');
  const verdictButtons = [...document.querySelectorAll('.verdicts button')];
  const body = document.querySelector('.list tbody');
  const progressBar = document.querySelector('.progress .bar span');
  const progressText = document.querySelector('.progress p');

  const clock = (s) => {
    const t = Number(s);
    if (!Number.isFinite(t)) return s;
    const h = Math.floor(t / 3600), m = Math.floor((t % 3600) / 60), sec = t % 60;
    return `${String(h).padStart(2, '0')}:${String(m).padStart(2, '0')}:${sec.toFixed(3).padStart(6, '0')}`;
  };
  const cell = (text, cls) => {
    const td = document.createElement('td');
    td.textContent = text;
    if (cls) td.className = cls;
    return td;
  };

  const listRows = rows.map((r, k) => {
    const tr = document.createElement('tr');
    tr.tabIndex = 0;
    tr.dataset.index = k;
    tr.append(cell(r[col.sample_id], 'n'), cell(r[col.label]), cell(r[col.confidence], 'n'),
              cell(r[col.stratum]), cell(r[col.file]), cell(`${clock(r[col.start])}–${clock(r[col.end])}`),
              cell(''));
    tr.addEventListener('click', () => show(k, true));
    tr.addEventListener('keydown', (e) => { if (e.key === 'Enter') { e.preventDefault(); show(k, true); } });
    body.append(tr);
    return tr;
  });

  function drawVerdict(k) {
    const v = state.verdicts[idOf(k)] || '';
    const td = listRows[k].lastChild;
    td.textContent = v;
    td.className = v ? 'verdict-' + v : '';
  }
  function drawProgress() {
    const counts = { yes: 0, no: 0, unsure: 0 };
    for (let k = 0; k < rows.length; k++) {
      const v = state.verdicts[idOf(k)];
      if (v in counts) counts[v]++;
    }
    const done = counts.yes + counts.no + counts.unsure;
    progressBar.style.width = rows.length ? `${(100 * done) / rows.length}%` : '0';
    progressText.textContent = `${done} of ${rows.length} clips judged: ${counts.yes} yes, ` +
      `${counts.no} no, ${counts.unsure} unsure`;
    document.documentElement.dataset.judged = done;
  }

  let current = -1;
  function show(k, play) {
    if (!rows.length) return;
    k = Math.max(0, Math.min(rows.length - 1, k));
    if (current >= 0) listRows[current].classList.remove('current');
    current = k;
    state.current = k;
    store();
    const r = rows[k];
    listRows[k].classList.add('current');
    listRows[k].scrollIntoView({ block: 'nearest' });
    position.textContent = `Clip ${k + 1} of ${rows.length}`;
    details.replaceChildren();
    const fields = [['Label', r[col.label], 'label'], ['Confidence', r[col.confidence] || '–'],
                    ['Stratum', r[col.stratum]], ['File', r[col.file]], ['Tier', r[col.tier]],
                    ['Time', `${clock(r[col.start])} – ${clock(r[col.end])}`],
                    ['Clip', (data.media[k] || '').replace(/^.*#t=/, 'plays ').replace(',', ' to ') + ' s']];
    for (const [name, value, cls] of fields) {
      const dt = document.createElement('dt');
      dt.textContent = name;
      const dd = document.createElement('dd');
      dd.textContent = value;
      if (cls) dd.className = cls;
      details.append(dt, dd);
    }
    const v = state.verdicts[idOf(k)] || '';
    for (const b of verdictButtons) b.setAttribute('aria-pressed', String(b.dataset.verdict === v));
    note.value = state.notes[idOf(k)] || '';
    const src = data.media[k] || '';
    mediaStatus.textContent = '';
    if (!src || src.startsWith('#')) {
      video.removeAttribute('src');
      video.load();
      mediaStatus.textContent = 'This clip names no media: judge it from its times.';
    } else if (video.getAttribute('src') !== src) {
      video.src = src;
      video.load();
    }
    video.dataset.clip = k;
    if (play) playClip();
  }
  function playClip() {
    if (!video.getAttribute('src')) return;
    // The fragment's start again, then play: the browser stops at the fragment's end.
    const m = /#t=([\d.]+)(?:,([\d.]+))?/.exec(video.getAttribute('src'));
    if (m && video.readyState > 0) video.currentTime = Number(m[1]);
    const p = video.play();
    if (p) p.catch(() => { /* not allowed before a gesture, or no media: the status says */ });
  }
  video.addEventListener('error', () => {
    mediaStatus.textContent = `The media cannot be played from this page: ${video.getAttribute('src')}`;
  });

  function judge(v) {
    if (current < 0) return;
    state.verdicts[idOf(current)] = v;
    store();
    drawVerdict(current);
    drawProgress();
    for (const b of verdictButtons) b.setAttribute('aria-pressed', String(b.dataset.verdict === v));
    next();
  }
  function next() {
    for (let step = 1; step <= rows.length; step++) {
      const k = (current + step) % rows.length;
      if (!state.verdicts[idOf(k)]) return show(k, true);
    }
    show(current + 1, true);  // every clip judged: simply the next
  }
  function saveNote() {
    if (current < 0) return;
    if (note.value) state.notes[idOf(current)] = note.value;
    else delete state.notes[idOf(current)];
    store();
  }
  note.addEventListener('input', saveNote);

  function sheet() {
    const lines = [header.map(csvField).join(',')];
    rows.forEach((r, k) => {
      const out = r.slice();
      out[col.verdict] = state.verdicts[idOf(k)] || '';
      out[col.note] = state.notes[idOf(k)] || '';
      lines.push(out.map(csvField).join(','));
    });
    return lines.join('\n') + '\n';
  }
  function save() {
    const a = document.createElement('a');
    a.href = URL.createObjectURL(new Blob([sheet()], { type: 'text/csv' }));
    a.download = data.save_as || 'review.csv';
    document.body.append(a);
    a.click();
    a.remove();
    setTimeout(() => URL.revokeObjectURL(a.href), 10000);
  }
  window.tiersReview = { sheet };

  for (const b of verdictButtons) b.addEventListener('click', () => judge(b.dataset.verdict));
  const moves = { previous: () => show(current - 1, true), next, play: playClip, save };
  for (const b of document.querySelectorAll('.moves button'))
    b.addEventListener('click', () => moves[b.dataset.move]());

  document.addEventListener('keydown', (e) => {
    if (e.ctrlKey || e.metaKey || e.altKey) return;
    if (e.target === note) {
      if (e.key === 'Escape') note.blur();
      return;
    }
    const act = { y: () => judge('yes'), n: () => judge('no'), u: () => judge('unsure'),
                  j: next, ArrowRight: next, k: moves.previous, ArrowLeft: moves.previous,
                  ' ': playClip, r: playClip, s: save, e: () => note.focus() }[e.key];
    if (!act || (e.target instanceof HTMLElement && e.target.closest('video') && e.key === ' ')) return;
    e.preventDefault();
    act();
  });

  for (let k = 0; k < rows.length; k++) drawVerdict(k);
  drawProgress();
  show(Math.min(Number(state.current) || 0, Math.max(0, rows.length - 1)), false);
  document.documentElement.dataset.ready = 'yes';
})();
