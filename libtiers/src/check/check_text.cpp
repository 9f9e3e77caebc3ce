// Rules on text (Unicode, through ICU) and on caption cues: how much there is to read, and for
// how long.
#include <algorithm>
#include <cmath>
#include <cstdio>
#include <numeric>

#include "checker.hpp"
#include "detail/report.hpp"
#include "tiers/text.hpp"

namespace tiers::detail {
namespace {

std::vector<std::string_view> lines_of(std::string_view text) {
  std::vector<std::string_view> out;
  for (std::size_t from = 0;;) {
    const std::size_t nl = text.find('\n', from);
    out.push_back(text.substr(from, nl == std::string_view::npos ? nl : nl - from));
    if (nl == std::string_view::npos) return out;
    from = nl + 1;
  }
}

std::string code_point_name(std::string_view text, std::size_t at) {
  const auto c = static_cast<unsigned char>(text[at]);
  unsigned cp = c;
  if (c >= 0xC0 && at + 1 < text.size())  // the C1 controls are two bytes: U+0080–U+009F
    cp = ((c & 0x1Fu) << 6) | (static_cast<unsigned char>(text[at + 1]) & 0x3Fu);
  char buf[16];
  std::snprintf(buf, sizeof buf, "U+%04X", cp);
  return buf;
}

}  // namespace

void checker::check_text(std::size_t t) {
  const tier& tr = doc_.tiers[t];
  const bool nfc = on("text.nfc"), control = on("text.control"), space = on("text.whitespace"),
             empty = on("text.empty");
  case_counts letters;
  for (std::size_t a = 0; a < tr.annotations.size(); ++a) {
    const std::string& text = tr.annotations[a].text;
    const bool blank = std::all_of(text.begin(), text.end(), [&](char c) {
      return c == ' ' || c == '\t' || c == '\n' || c == '\r';
    });
    if (blank) {
      if (empty) emit("text.empty", t, a, text.empty() ? "has no text" : "has only white space");
      continue;
    }
    if (nfc && !is_nfc(text))
      emit("text.nfc", t, a, "text is not in Unicode Normalization Form C (NFC)");
    if (control) {
      const std::size_t at = find_control(text);
      if (at != std::string::npos)
        emit("text.control", t, a,
             "text holds the control character " + code_point_name(text, at) + " at character " +
                 std::to_string(count_graphemes(text.substr(0, at)) + 1));
    }
    if (space) {
      const std::vector<std::string_view> lines = lines_of(text);
      for (std::size_t k = 0; k < lines.size(); ++k) {
        const std::string_view l = lines[k];
        const bool leading = is_space_at(l, 0), trailing = is_space_before(l, l.size());
        if (!leading && !trailing) continue;
        const std::string which = lines.size() > 1 ? "line " + std::to_string(k + 1) : "text";
        emit("text.whitespace", t, a,
             which + (leading ? " starts" : " ends") + " with white space" +
                 (leading && trailing ? " and ends with it" : ""));
        break;
      }
    }
    const case_counts c = count_case(text);
    letters.upper += c.upper;
    letters.lower += c.lower;
  }
  const std::size_t total = letters.upper + letters.lower;
  const check_limits& l = profile_.limits;
  if (total >= l.caps_min_letters && on("text.all-caps")) {
    const double share = static_cast<double>(letters.upper) / static_cast<double>(total);
    if (share >= l.caps_share) {
      char pct[32];
      std::snprintf(pct, sizeof pct, "%.1f %%", 100 * share);
      if (problem* p = emit("text.all-caps", t, no_index,
                            "the text of tier " + quote_name(tr.name) + " is upper case (" + pct +
                                " of " + std::to_string(total) +
                                " letters): case was lost upstream; restore it before "
                                "language tools read it")) {
        p->value = share;
        p->limit = l.caps_share;
      }
    }
  }
}

namespace {

// Records the measured value and its bound on a problem that was reported (not off).
void limit(problem* p, double value, double bound) {
  if (!p) return;
  p->value = value;
  p->limit = bound;
}

// caption.cps and caption.wpm: how fast a cue must be read.
void reading_speed(checker& c, std::size_t t, std::size_t a,
                   const std::vector<std::string_view>& lines) {
  const annotation& cue = c.doc_.tiers[t].annotations[a];
  const check_limits& l = c.profile_.limits;
  const time_ns length = cue.end - cue.start;
  const double secs = static_cast<double>(length) / 1e9;
  if (c.on("caption.cps")) {
    std::size_t chars = 0;
    for (std::string_view line : lines)
      chars += count_graphemes(line);
    const double cps = static_cast<double>(chars) / secs;
    if (cps > l.max_cps)
      limit(c.emit("caption.cps", t, a,
                   number(cps) + " characters per second (" + std::to_string(chars) + " in " +
                       seconds(length) + "; at most " + number(l.max_cps) + ")"),
            cps, l.max_cps);
  }
  if (c.on("caption.wpm")) {
    const std::size_t words = word_tokens(cue.text).size();
    const double wpm = static_cast<double>(words) * 60.0 / secs;
    if (wpm > l.max_wpm)
      limit(c.emit("caption.wpm", t, a,
                   number(wpm) + " words per minute (" + std::to_string(words) + " in " +
                       seconds(length) + "; at most " + number(l.max_wpm) + ")"),
            wpm, l.max_wpm);
  }
}

// caption.min-duration and caption.max-duration: how long a cue is shown.
void display_time(checker& c, std::size_t t, std::size_t a) {
  const annotation& cue = c.doc_.tiers[t].annotations[a];
  const check_limits& l = c.profile_.limits;
  const time_ns length = cue.end - cue.start;
  const double secs = static_cast<double>(length) / 1e9;
  if (length < l.min_duration)
    limit(c.emit("caption.min-duration", t, a,
                 "shown for " + seconds(length) + " (at least " + seconds(l.min_duration) + ")"),
          secs, static_cast<double>(l.min_duration) / 1e9);
  if (length > l.max_duration)
    limit(c.emit("caption.max-duration", t, a,
                 "shown for " + seconds(length) + " (at most " + seconds(l.max_duration) + ")"),
          secs, static_cast<double>(l.max_duration) / 1e9);
}

// caption.lines and caption.line-length: the shape of a cue on screen.
void line_layout(checker& c, std::size_t t, std::size_t a,
                 const std::vector<std::string_view>& lines) {
  const check_limits& l = c.profile_.limits;
  if (lines.size() > l.max_lines)
    limit(c.emit("caption.lines", t, a,
                 std::to_string(lines.size()) + " lines (at most " + std::to_string(l.max_lines) +
                     ")"),
          static_cast<double>(lines.size()), static_cast<double>(l.max_lines));
  if (!c.on("caption.line-length")) return;
  std::size_t longest = 0, which = 0;
  for (std::size_t k = 0; k < lines.size(); ++k)
    if (const std::size_t n = count_graphemes(lines[k]); n > longest) {
      longest = n;
      which = k;
    }
  if (longest > l.max_line_length)
    limit(c.emit("caption.line-length", t, a,
                 (lines.size() > 1 ? "line " + std::to_string(which + 1) : std::string("line")) +
                     " has " + std::to_string(longest) + " characters (at most " +
                     std::to_string(l.max_line_length) + ")"),
          static_cast<double>(longest), static_cast<double>(l.max_line_length));
}

// caption.overlap and caption.gap: consecutive cues, in start-time order.
void cue_sequence(checker& c, std::size_t t) {
  const auto& as = c.doc_.tiers[t].annotations;
  const check_limits& l = c.profile_.limits;
  std::vector<std::size_t> order(as.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return as[a].start < as[b].start; });
  const std::string in_frames =
      l.min_gap.frames
          ? ", " + std::to_string(*l.min_gap.frames) + " frames at " +
                format_rational(c.doc_.media.frame_rate.value_or(l.frame_rate)) + " fps"
          : std::string();
  std::size_t reach = no_index;
  for (std::size_t a : order) {
    if (as[a].end < as[a].start) continue;
    if (reach != no_index) {
      const time_ns gap = as[a].start - as[reach].end;
      if (gap < 0)
        limit(c.emit("caption.overlap", t, a,
                     "overlaps the cue before it by " +
                         seconds(std::min(as[reach].end, as[a].end) - as[a].start)),
              static_cast<double>(-gap) / 1e9, 0);
      else if (gap < c.min_gap_)
        limit(c.emit("caption.gap", t, a,
                     "follows the cue before it after " + seconds(gap) + " (at least " +
                         seconds(c.min_gap_) + in_frames + ")"),
              static_cast<double>(gap) / 1e9, static_cast<double>(c.min_gap_) / 1e9);
    }
    if (reach == no_index || as[a].end > as[reach].end) reach = a;
  }
}

}  // namespace

void checker::check_captions(std::size_t t) {
  const auto& as = doc_.tiers[t].annotations;
  for (std::size_t a = 0; a < as.size(); ++a) {
    const std::vector<std::string_view> lines = lines_of(as[a].text);
    if (as[a].end > as[a].start) {
      reading_speed(*this, t, a, lines);
      display_time(*this, t, a);
    }
    line_layout(*this, t, a, lines);
  }
  cue_sequence(*this, t);
}

}  // namespace tiers::detail
