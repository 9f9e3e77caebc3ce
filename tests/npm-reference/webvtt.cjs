// Parses WebVTT files with the npm package webvtt-parser 2.2.0 (the W3C validator's parser)
// and prints what it found, one JSON object per line: {path, cues: [{id, start, end, text,
// settings}], errors: [message, ...]}, where settings are the cue's computed positioning. Test-only: tests/scripts/vtt_differential.py compares it with tiers.
"use strict";
const fs = require("fs");
const { WebVTTParser } = require("webvtt-parser");

const parser = new WebVTTParser();
for (const path of process.argv.slice(2)) {
  // The package takes a string: decode as UTF-8 with replacement, as the specification says.
  const input = new TextDecoder("utf-8").decode(fs.readFileSync(path));
  const tree = parser.parse(input, "metadata");
  const cues = tree.cues.map((c) => ({
    id: c.id, start: c.startTime, end: c.endTime, text: c.text,
    settings: [c.direction, c.snapToLines, c.linePosition, c.lineAlign, c.textPosition,
               c.positionAlign, c.size, c.alignment],
  }));
  process.stdout.write(JSON.stringify({path, cues, errors: tree.errors.map((e) => e.message)}) + "\n");
}
