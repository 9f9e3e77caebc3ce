// Reads WebVTT by the W3C specification's parser algorithm (§6.1 "WebVTT parser algorithm"
// and "collect a WebVTT block"), from the input buffer, one line view at a time.
#include <algorithm>

#include "detail/positions.hpp"
#include "detail/report.hpp"
#include "detail/view_index.hpp"
#include "vtt_format.hpp"
#include "vtt_syntax.hpp"

namespace tiers::detail {
namespace {

using namespace vtt;

constexpr std::string_view replacement = "\xEF\xBF\xBD";

// Appends a line, with NUL replaced by U+FFFD (§6.1 step 1) when the file has any (`nuls`:
// the whole file was searched once, so that lines need not be).
void append_line(std::string& out, std::string_view line, bool nuls) {
  if (!nuls) {
    out.append(line);
    return;
  }
  for (std::size_t nul = line.find('\0'); nul != std::string_view::npos; nul = line.find('\0')) {
    out.append(line.substr(0, nul));
    out.append(replacement);
    line.remove_prefix(nul + 1);
  }
  out.append(line);
}

bool starts_block(std::string_view text, std::string_view word) {
  if (text.substr(0, word.size()) != word) return false;
  return text.size() == word.size() || text[word.size()] == ' ' || text[word.size()] == '\t' ||
         text[word.size()] == '\n';
}

class vtt_reader {
 public:
  vtt_reader(std::string_view input, const read_options& options, read_result& out)
      : lines_{input}, options_(options), out_(out) {}

  void run();

 private:
  enum class block_kind { none, cue, style, region };

  void note(severity level, std::string code, std::size_t offset, std::string message) {
    out_.diagnostics.push_back(make_diagnostic(level, std::move(code), offset, std::move(message)));
  }
  // An authoring-conformance violation: a warning, or an error with --strict.
  void authoring(std::string code, std::size_t offset, std::string message) {
    note(options_.strict ? severity::error : severity::warning, std::move(code), offset,
         std::move(message));
  }

  void collect_block(bool in_header);
  void reserve_cues(std::string_view in);
  void finish_cue(annotation& cue, std::string_view settings, std::size_t settings_offset,
                  std::size_t timing_offset, std::size_t text_offset);
  void keep_block(const std::string& raw, std::size_t offset);
  void add_words(const annotation& cue, const cue_text& parsed, std::size_t text_offset);

  line_reader lines_;
  const read_options& options_;
  read_result& out_;
  std::vector<annotation> cues_, words_;
  std::vector<std::size_t> cue_offsets_, word_offsets_;  // timing line, cue text
  bool seen_cue_ = false;
  bool nuls_ = false;  // the file holds a NUL somewhere
  std::vector<std::string> regions_;
  std::string prelude_, pending_notes_, header_;
  time_ns last_start_ = 0;
  // Views of the cues' ids: an annotation's id lives on the heap, so the views stay valid while
  // the cues move.
  view_index ids_;
};

void vtt_reader::run() {
  std::string_view in = lines_.in;
  std::size_t& pos = lines_.pos;
  if (in.substr(0, 3) == "\xEF\xBB\xBF") pos = 3;
  // Signature (§6.1 steps 4–6): "WEBVTT", then the end, a space, a tab or a line break.
  const std::string_view rest = in.substr(pos);
  if (rest.substr(0, 6) != "WEBVTT" || (rest.size() > 6 && rest[6] != ' ' && rest[6] != '\t' &&
                                        rest[6] != '\n' && rest[6] != '\r')) {
    std::size_t bad = pos;
    while (bad < in.size() && bad - pos < 6 && in[bad] == "WEBVTT"[bad - pos])
      ++bad;
    note(severity::error, "vtt.signature", bad,
         "not a WebVTT file: it must start with 'WEBVTT' followed by a space, a tab or a line "
         "break");
    return;
  }
  // The parser replaces NUL by U+FFFD (§6.1 step 1): a change to the text, so it is said.
  const std::size_t nul = in.find('\0', pos);
  nuls_ = nul != std::string_view::npos;
  if (nuls_)
    note(severity::warning, "input.utf8", nul,
         detail::plural(static_cast<std::size_t>(std::count(in.begin(), in.end(), '\0')),
                        "NUL character", "NUL characters") +
             " replaced by U+FFFD, as the WebVTT parser does (WebVTT §6.1)");
  reserve_cues(in);
  bool ended = false;
  const std::string_view first = lines_.next(ended);
  append_line(header_, first.substr(6), nuls_);
  if (ended && !lines_.at_end()) {
    if (in[pos] != '\n' && in[pos] != '\r') {
      collect_block(true);
    } else {
      lines_.next(ended);
    }
  }
  while (!lines_.at_end()) {
    // Skip empty lines between blocks.
    while (!lines_.at_end() && (in[pos] == '\n' || in[pos] == '\r'))
      lines_.next(ended);
    if (lines_.at_end()) break;
    collect_block(false);
  }
  if (!header_.empty()) out_.value.metadata.emplace("vtt:header", header_);
  if (!prelude_.empty()) out_.value.metadata.emplace("vtt:prelude", prelude_);
  if (!pending_notes_.empty()) out_.value.metadata.emplace("vtt:trailer", pending_notes_);
  tier& t = out_.value.tiers.emplace_back();
  t.name = options_.tier_name;
  t.annotations = std::move(cues_);
  // The cue tier is the file, whose signature says so; the words are where their cues' text is.
  position_recorder positions(options_, out_);
  positions.tier(in.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0);
  for (std::size_t offset : cue_offsets_)
    positions.annotation(0, offset);
  if (!words_.empty()) {
    tier& w = out_.value.tiers.emplace_back();
    w.name = words_tier_name(options_.tier_name);
    w.parent = parent_link{options_.tier_name, relation::within};
    w.annotations = std::move(words_);
    positions.tier(word_offsets_.front());
    for (std::size_t offset : word_offsets_)
      positions.annotation(1, offset);
  }
}

// Every cue has a line with "-->", so their count bounds the cues: the cues are then allocated
// once instead of growing (moving every cue made so far, and a peak of one and a half times
// their size), and so are their ids' index and offsets.
void vtt_reader::reserve_cues(std::string_view in) {
  std::size_t arrows = 0;
  for (std::size_t at = in.find("-->"); at != std::string_view::npos; at = in.find("-->", at + 3))
    ++arrows;
  cues_.reserve(arrows);
  cue_offsets_.reserve(arrows);
  ids_ = view_index(arrows);
}

// "Collect a WebVTT block" (W3C WebVTT §6.1) step by step: the line loop with its seen-cue,
// seen-arrow and buffer states as the specification keeps them; kept whole to be read against it.
void vtt_reader::collect_block(bool in_header) {
  std::size_t line_count = 0;
  std::size_t previous = lines_.pos;
  const std::size_t block_offset = lines_.pos;
  std::string buffer, raw;
  bool seen_arrow = false;
  std::optional<annotation> cue;
  block_kind kind = block_kind::none;
  std::size_t timing_offset = 0, text_offset = 0, settings_offset = 0;
  std::string_view settings;
  bool skipped = false;
  for (;;) {
    const std::size_t line_offset = lines_.pos;
    bool ended = false;
    const std::string_view line = lines_.next(ended);
    ++line_count;
    if (line.find("-->") != std::string_view::npos) {
      if (!in_header && (line_count == 1 || (line_count == 2 && !seen_arrow))) {
        seen_arrow = true;
        previous = lines_.pos;
        // Collect the timings (§6.3); the settings are parsed once the cue is complete.
        annotation a;
        if (!buffer.empty()) {
          a.id = buffer;
          ids_.prefetch(buffer);  // checked once the cue's text is read
        }
        std::size_t p = 0;
        auto skip = [&] {
          while (p < line.size() && is_space(line[p]))
            ++p;
        };
        // `bad` ends at the start of the part that fails, for the warning's column.
        std::size_t bad = 0;
        bool too_large = false;
        skip();
        bad = p;
        const auto start = collect_timestamp(line, p, &too_large);
        skip();
        if (start) bad = p;
        const bool arrow = start && line.substr(p, 3) == "-->";
        if (arrow) p += 3;
        skip();
        if (arrow) bad = p;
        const auto end = arrow ? collect_timestamp(line, p, &too_large) : std::nullopt;
        if (start && end) {
          a.start = *start;
          a.end = *end;
          settings = line.substr(p);
          settings_offset = line_offset + p;
          timing_offset = line_offset;
          text_offset = lines_.pos;
          cue = std::move(a);
          kind = block_kind::cue;
          buffer.clear();
          seen_cue_ = true;
        } else if (too_large) {
          // The parser would keep this cue; the model cannot hold its time, so stop.
          note(severity::error, "time.range", line_offset + bad,
               "timestamp " + std::string(describe(time_status::out_of_range)));
          cue.reset();
          kind = block_kind::none;
          skipped = true;
        } else {
          note(severity::warning, "vtt.timing", line_offset + bad,
               "cue skipped, as a browser skips it: its timing line is not "
               "'start --> end' with valid timestamps");
          cue.reset();
          kind = block_kind::none;
          skipped = true;
        }
      } else {
        lines_.pos = previous;
        break;
      }
    } else if (line.empty()) {
      break;
    } else {
      if (!in_header && line_count == 2) {
        const auto only_space = [](std::string_view s) {
          return std::all_of(s.begin(), s.end(), is_space);
        };
        if (!seen_cue_ && buffer.rfind("STYLE", 0) == 0 &&
            only_space(std::string_view(buffer).substr(5))) {
          kind = block_kind::style;
          buffer.clear();
        } else if (!seen_cue_ && buffer.rfind("REGION", 0) == 0 &&
                   only_space(std::string_view(buffer).substr(6))) {
          kind = block_kind::region;
          buffer.clear();
        }
      }
      if (!buffer.empty()) buffer += '\n';
      append_line(buffer, line, nuls_);
      previous = lines_.pos;
    }
    if (kind != block_kind::cue) {
      if (!raw.empty()) raw += '\n';
      append_line(raw, line, nuls_);
    }
    if (!ended) break;
  }
  if (in_header) {
    header_ += '\n';
    header_ += raw;
    return;
  }
  if (kind == block_kind::cue) {
    cue->text = std::move(buffer);
    finish_cue(*cue, settings, settings_offset, timing_offset, text_offset);
    return;
  }
  if (skipped) return;  // warned about already; its text goes with it
  if (kind == block_kind::region) {
    if (auto id = region_identifier(buffer)) regions_.push_back(*id);
  }
  if (kind == block_kind::style || kind == block_kind::region) {
    if (!prelude_.empty()) prelude_ += "\n\n";
    prelude_ += raw;
    return;
  }
  keep_block(raw, block_offset);
}

// Blocks that are neither cues, styles nor regions: NOTE comments are kept beside the cue
// that follows them; anything else is ignored by browsers, and by us with a warning.
void vtt_reader::keep_block(const std::string& raw, std::size_t offset) {
  if (raw.empty()) return;  // a block that was only a skipped cue
  if (starts_block(raw, "NOTE")) {
    std::string& into = seen_cue_ ? pending_notes_ : prelude_;
    if (!into.empty()) into += "\n\n";
    into += raw;
    return;
  }
  std::string what = "block ignored, as a browser ignores it: ";
  if (seen_cue_ && (starts_block(raw, "STYLE") || starts_block(raw, "REGION")))
    what += "STYLE and REGION blocks count only before the first cue";
  else
    what += "it is not a cue, a NOTE, a STYLE or a REGION block";
  note(severity::warning, "vtt.block", offset, what);
}

void vtt_reader::finish_cue(annotation& cue, std::string_view settings, std::size_t settings_offset,
                            std::size_t timing_offset, std::size_t text_offset) {
  const settings_result parsed = parse_settings(settings, regions_);
  for (const auto& [at, reason] : parsed.rejected)
    note(severity::warning, "vtt.setting", settings_offset + at,
         reason + "; dropped, as the specification says");
  for (std::string_view name : parsed.repeated)
    authoring("vtt.setting", settings_offset,
              "cue setting '" + std::string(name) + "' given more than once; the last one counts");
  for (const setting& s : parsed.accepted)
    cue.attributes.emplace("vtt:" + std::string(s.name), std::string(s.value));

  // Authoring rules of §4.1 ("WebVTT cue timings"): the parser keeps such cues regardless.
  if (!cues_.empty() && cue.start < last_start_)
    authoring("vtt.order", timing_offset, "cue starts before the cue before it");
  if (cue.end <= cue.start)
    authoring("vtt.empty", timing_offset, "cue does not end after it starts");
  last_start_ = cue.start;
  if (cue.id) {
    if (!ids_.emplace(*cue.id, cues_.size()).second)
      authoring("vtt.id", timing_offset,
                "cue identifier " + quote_name(*cue.id) + " is not unique");
  }

  cue_text parsed_text = parse_cue_text(cue.text);
  if (!parsed_text.stamps.empty()) add_words(cue, parsed_text, text_offset);
  if (parsed_text.plain != cue.text) {
    cue.markup = std::move(cue.text);
    cue.text = std::move(parsed_text.plain);
  }
  if (parsed_text.voice) cue.attributes.emplace("speaker", *parsed_text.voice);
  if (!pending_notes_.empty()) {
    cue.attributes.emplace("vtt:note", std::move(pending_notes_));
    pending_notes_.clear();
  }
  cues_.push_back(std::move(cue));
  cue_offsets_.push_back(timing_offset);
}

// Inline timestamps (§4.2.2 "WebVTT cue timestamp") become word timings: each timestamp starts
// a piece of the plain text that lasts until the next timestamp or the end of the cue; the
// text before the first timestamp starts with the cue.
void vtt_reader::add_words(const annotation& cue, const cue_text& parsed, std::size_t text_offset) {
  const std::vector<cue_text::stamp>& stamps = parsed.stamps;
  time_ns previous = cue.start;
  for (const cue_text::stamp& s : stamps) {
    if (s.time <= previous || s.time >= cue.end) {
      authoring("vtt.timestamp", text_offset,
                "inline timestamp " + format_timestamp(std::max<time_ns>(s.time, 0)) +
                    " is not after the one before it and before the cue's end");
      break;
    }
    previous = s.time;
  }
  for (annotation& w : timed_words(parsed, cue.start, cue.end)) {
    words_.push_back(std::move(w));
    word_offsets_.push_back(text_offset);
  }
}

}  // namespace

int sniff_vtt(std::string_view head) {
  if (head.substr(0, 3) == "\xEF\xBB\xBF") head.remove_prefix(3);
  if (head.substr(0, 6) != "WEBVTT") return 0;
  return head.size() == 6 || head[6] == ' ' || head[6] == '\t' || head[6] == '\n' || head[6] == '\r'
             ? 2
             : 0;
}

read_result read_vtt(std::string_view input, const read_options& options) {
  read_result out;
  vtt_reader(input, options, out).run();
  return out;
}

}  // namespace tiers::detail
