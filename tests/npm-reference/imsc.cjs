// Reads TTML documents with the npm package imsc 1.1.5 (the IMSC reference implementation)
// and prints, one JSON object per line, what it sees: {path, errors, events, shown}, where
// events are its media time events and shown[i] lists the texts of the p elements presented
// from events[i] on. Test-only: tests/scripts/ttml_reference.py compares it with tiers.
"use strict";
const fs = require("fs");
// doc.js and isd.js are the model and the ISD generator; main.js would also load the HTML
// renderer, which needs a browser.
const imscDoc = require("imsc/src/main/js/doc.js");
const imscIsd = require("imsc/src/main/js/isd.js");

function texts(node, out) {
  if (node.kind === "p") {
    let text = "";
    const walk = (n) => {
      if (n.kind === "br") text += "\n";
      else if (typeof n.text === "string") text += n.text;
      for (const c of n.contents || []) walk(c);
    };
    walk(node);
    out.push(text);
    return;
  }
  for (const c of node.contents || []) texts(c, out);
}

for (const path of process.argv.slice(2)) {
  const errors = [];
  const report = (kind) => (msg) => errors.push(kind + ": " + msg);
  const handler = {info: () => {}, warn: () => {}, error: report("error"), fatal: report("fatal")};
  let events = [], shown = [];
  try {
    const doc = imscDoc.fromXML(fs.readFileSync(path, "utf8"), handler);
    if (doc) {
      events = doc.getMediaTimeEvents();
      shown = events.map((t) => {
        const out = [];
        texts(imscIsd.generateISD(doc, t, handler), out);
        return out;
      });
    }
  } catch (e) {
    errors.push("exception: " + e.message);
  }
  process.stdout.write(JSON.stringify({path, errors, events, shown}) + "\n");
}
