// Writes conforming WebVTT: one plan, shared with the loss report, decides for every cue what
// is written and what cannot be, so that the writer never drops anything the report omits.
#include <algorithm>
#include <functional>
#include <map>
#include <numeric>
#include <tuple>
#include <unordered_set>

#include "detail/report.hpp"
#include "vtt_format.hpp"
#include "vtt_syntax.hpp"

namespace tiers::detail {
namespace {

using namespace vtt;

constexpr time_ns ms = 1'000'000;

bool has_blank_line(std::string_view s) {
  return s.empty()
             ? false
             : s.front() == '\n' || s.back() == '\n' || s.find("\n\n") != std::string_view::npos;
}

bool starts_with_word(std::string_view text, std::string_view word) {
  return text.substr(0, word.size()) == word &&
         (text.size() == word.size() || text[word.size()] == ' ' || text[word.size()] == '\t' ||
          text[word.size()] == '\n');
}

// Blocks of comments, separated by one blank line, each a NOTE without "-->" (§4.1).
bool valid_notes(std::string_view notes) {
  if (notes.find("-->") != std::string_view::npos || notes.find('\r') != std::string_view::npos ||
      notes.find('\0') != std::string_view::npos)
    return false;
  std::size_t begin = 0;
  for (;;) {
    const std::size_t end = notes.find("\n\n", begin);
    const std::string_view block = notes.substr(begin, end - begin);
    if (!starts_with_word(block, "NOTE") || block.empty() || block.back() == '\n') return false;
    if (end == std::string_view::npos) return true;
    begin = end + 2;
  }
}

// What the plan holds for one cue.
struct planned_cue {
  std::string id;  // empty: no identifier line
  std::string timing;
  std::string body;
  std::string notes;
};

struct vtt_plan {
  std::string header;  // after "WEBVTT", possibly with header lines
  std::string prelude, trailer;
  std::vector<planned_cue> cues;
  std::map<std::string, std::size_t> problems;  // reason → how many annotations
  std::vector<std::string> other;               // losses that are not counted per annotation
};

// Cue text with inline timestamps before each word that starts after the cue, when the
// words spell the text in order; empty when they do not.
std::optional<std::string> karaoke(const annotation& cue,
                                   const std::vector<const annotation*>& words) {
  std::string out;
  std::size_t pos = 0;
  const std::string_view text = cue.text;
  for (const annotation* w : words) {
    std::size_t skip = pos;
    while (skip < text.size() && is_space(text[skip]))
      ++skip;
    append_cue_text(out, text.substr(pos, skip - pos));
    if (w->text.empty() || text.substr(skip, w->text.size()) != w->text) return std::nullopt;
    if (w->start != cue.start) out += "<" + format_timestamp(w->start) + ">";
    append_cue_text(out, w->text);
    pos = skip + w->text.size();
  }
  if (text.substr(pos).find_first_not_of(" \t\n\f\r") != std::string_view::npos)
    return std::nullopt;
  append_cue_text(out, text.substr(pos));
  return out;
}

// The cue's markup with its timestamp tags rewritten to `words`' times, when the markup spells
// exactly those words (same texts, in order) and only its timestamps disagree with them — as
// after the cue and its words were re-timed. Empty when that is not so.
// `spelled` is timed_words(parsed, cue.start, cue.end), which the caller has at hand.
std::optional<std::string> restamped(std::string_view markup, const cue_text& parsed,
                                     const std::vector<annotation>& spelled, const annotation& cue,
                                     const std::vector<const annotation*>& words) {
  if (spelled.size() != words.size() || parsed.stamps.empty()) return std::nullopt;
  for (std::size_t k = 0; k < words.size(); ++k)
    if (spelled[k].text != words[k]->text) return std::nullopt;
  // Each timestamp starts a piece of the text; a piece with words starts at its word's start,
  // an empty one at the end of the word before it.
  std::vector<time_ns> stamps;
  std::size_t next = 0;  // the word the next non-empty piece holds
  const std::string_view plain = parsed.plain;
  auto has_words = [&](std::size_t from, std::size_t to) {
    return plain.substr(from, to - from).find_first_not_of(" \t\n\f\r") != std::string_view::npos;
  };
  if (has_words(0, parsed.stamps.front().at)) ++next;
  for (std::size_t j = 0; j < parsed.stamps.size(); ++j) {
    const std::size_t end = j + 1 < parsed.stamps.size() ? parsed.stamps[j + 1].at : plain.size();
    if (has_words(parsed.stamps[j].at, end))
      stamps.push_back(words[next++]->start);
    else
      stamps.push_back(next ? words[next - 1]->end : cue.start);
  }
  // Rewrite the tags in place: each '<' followed by a digit opens a timestamp tag (§4.2.2).
  std::string out;
  std::size_t from = 0, j = 0;
  for (std::size_t at = markup.find('<'); at != std::string_view::npos;
       at = markup.find('<', at + 1)) {
    if (at + 1 >= markup.size() || markup[at + 1] < '0' || markup[at + 1] > '9') continue;
    const std::size_t close = markup.find('>', at);
    if (close == std::string_view::npos || j == stamps.size()) return std::nullopt;
    out.append(markup.substr(from, at + 1 - from));
    out += format_timestamp(stamps[j++]);
    from = close;
    at = close;
  }
  if (j != stamps.size()) return std::nullopt;
  out.append(markup.substr(from));
  // Only a result that reads back as exactly these words, inside the cue, will do.
  const cue_text again = parse_cue_text(out);
  const std::vector<annotation> check = timed_words(again, cue.start, cue.end);
  if (again.plain != parsed.plain || again.voice != parsed.voice || check.size() != words.size())
    return std::nullopt;
  for (std::size_t k = 0; k < words.size(); ++k)
    if (check[k].start != words[k]->start || check[k].end != words[k]->end ||
        words[k]->start % ms != 0 || words[k]->end % ms != 0)
      return std::nullopt;
  for (const cue_text::stamp& t : again.stamps)
    if (t.time <= cue.start || t.time >= cue.end) return std::nullopt;
  return out;
}

// The cue text for a cue written from its plain text: escaped, its speaker as a voice span,
// its words as inline timestamps when they spell the text; blank lines removed.
std::string text_body(const annotation& a, const std::vector<const annotation*>& words,
                      const std::function<void(const std::string&)>& problem) {
  if (has_blank_line(a.text) || a.text.find('\r') != std::string::npos ||
      a.text.find('\0') != std::string::npos)
    problem("text with blank lines, carriage returns or NUL, which WebVTT cannot hold");
  std::optional<std::string> timed;
  if (!words.empty()) {
    timed = karaoke(a, words);
    bool ends_ok = timed.has_value();
    for (std::size_t w = 0; ends_ok && w < words.size(); ++w) {
      const time_ns next = w + 1 < words.size() ? words[w + 1]->start : a.end;
      const time_ns start = words[w]->start;
      const time_ns previous = w == 0 ? a.start : words[w - 1]->start;
      ends_ok = words[w]->end == next && start % ms == 0 &&
                (w == 0 ? start >= a.start : start > previous);
    }
    if (!timed)
      problem("word timings that do not spell their cue's text");
    else if (!ends_ok)
      problem("word timings that karaoke timestamps cannot hold (they mark starts only)");
  }
  std::string body;
  if (timed)
    body = std::move(*timed);
  else
    append_cue_text(body, a.text);
  if (auto speaker = a.attributes.find("speaker"); speaker != a.attributes.end()) {
    // The tokenizer trims and collapses white space in a voice's name (§6.4).
    std::string collapsed;
    for (char ch : speaker->second)
      if (!is_space(ch) || (!collapsed.empty() && collapsed.back() != ' '))
        collapsed += is_space(ch) ? ' ' : ch;
    if (collapsed != speaker->second || speaker->second.empty())
      problem("speakers with white space WebVTT collapses");
    std::string name;
    append_escaped(name, speaker->second);
    // A name ending in "--" would make the line hold "-->", which ends cue text; the space
    // before '>' keeps them apart and is trimmed away again on reading.
    if (name.ends_with('-')) name += ' ';
    body = "<v " + name + ">" + body;
  }
  // A blank line would end the cue early: keep the lines that have text.
  std::string compact;
  for (char ch : body) {
    if (ch == '\r') ch = '\n';
    if (ch == '\0') {
      compact += "\xEF\xBF\xBD";
      continue;
    }
    if (ch == '\n' && (compact.empty() || compact.back() == '\n')) continue;
    compact += ch;
  }
  while (!compact.empty() && compact.back() == '\n')
    compact.pop_back();
  return compact;
}

// The header, the prelude (styles, regions, comments) and the trailer, when they would read
// back as themselves; returns the regions the prelude defines, which cue settings may name.
std::vector<std::string> plan_blocks(const document& doc, vtt_plan& p) {
  auto meta = [&](std::string_view key) -> const std::string* {
    auto it = doc.metadata.find(key);
    return it == doc.metadata.end() ? nullptr : &it->second;
  };
  for (const auto& [key, value] : doc.metadata)
    if (key.rfind("vtt:", 0) == 0 && key != "vtt:header" && key != "vtt:prelude" &&
        key != "vtt:trailer")
      p.other.push_back("document metadata " + quote_name(key) +
                        " (not a WebVTT header, prelude or trailer)");
  if (const std::string* h = meta("vtt:header")) {
    // The rest of the signature line, then optionally header lines (no blank line among them).
    const std::string_view first = std::string_view(*h).substr(0, h->find('\n'));
    const std::string_view lines =
        h->size() > first.size() ? std::string_view(*h).substr(first.size() + 1) : "";
    const bool ok = (first.empty() || first[0] == ' ' || first[0] == '\t') &&
                    h->find("-->") == std::string::npos && h->find('\r') == std::string::npos &&
                    h->find('\0') == std::string::npos &&
                    (h->size() == first.size() || (!lines.empty() && !has_blank_line(lines)));
    if (ok)
      p.header = *h;
    else
      p.other.push_back("the WebVTT header text (it would not read back as a header)");
  }
  std::vector<std::string> regions;
  if (const std::string* pre = meta("vtt:prelude")) {
    bool ok = pre->find('\r') == std::string::npos && pre->find('\0') == std::string::npos &&
              pre->find("-->") == std::string::npos && !pre->empty() && pre->back() != '\n' &&
              pre->front() != '\n';
    for (std::size_t begin = 0; ok;) {
      const std::size_t end = pre->find("\n\n", begin);
      const std::string_view block = std::string_view(*pre).substr(begin, end - begin);
      const bool style = block.rfind("STYLE", 0) == 0, region = block.rfind("REGION", 0) == 0;
      ok = !block.empty() && block.front() != '\n' &&
           (style || region || starts_with_word(block, "NOTE"));
      if (ok && region) {
        const std::size_t nl = block.find('\n');
        if (nl != std::string_view::npos)
          if (auto id = region_identifier(block.substr(nl + 1))) regions.push_back(*id);
      }
      if (end == std::string_view::npos) break;
      begin = end + 2;
    }
    if (ok)
      p.prelude = *pre;
    else
      p.other.push_back("the WebVTT styles, regions and comments before the cues (malformed)");
  }
  if (const std::string* trailer = meta("vtt:trailer")) {
    if (valid_notes(*trailer))
      p.trailer = *trailer;
    else
      p.other.push_back("the WebVTT comments after the cues (malformed)");
  }
  return regions;
}

// The cues' indices in start-time order: WebVTT's authoring rules want cues so (§4.1), and the
// file keeps no other order.
std::vector<std::size_t> start_order(const tier& cues, vtt_plan& p) {
  std::vector<std::size_t> order(cues.annotations.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return cues.annotations[a].start < cues.annotations[b].start;
  });
  if (!std::is_sorted(order.begin(), order.end()))
    ++p.problems["the order of cues that are not in start-time order (written sorted)"];
  return order;
}

// Each cue's markup, where it can be written: markup is written as it is when it still spells
// the cue's text and speaker. Its timestamps are the word tier's times in WebVTT: where the two
// disagree but the markup spells exactly the words inside its cue (a re-timed cue), the words'
// times are written into it (`rewritten`).
std::vector<std::optional<cue_text>> plan_markup(const tier& cues, const tier* words,
                                                 std::vector<std::string>& rewritten, vtt_plan& p) {
  const std::size_t n = cues.annotations.size();
  std::vector<std::optional<cue_text>> markup(n);
  rewritten.assign(n, {});
  std::vector<const annotation*> by_start;
  if (words) {
    for (const annotation& w : words->annotations)
      by_start.push_back(&w);
    std::stable_sort(by_start.begin(), by_start.end(),
                     [](const annotation* x, const annotation* y) { return x->start < y->start; });
  }
  auto words_inside = [&](const annotation& c) {
    std::vector<const annotation*> in;
    auto it = std::lower_bound(by_start.begin(), by_start.end(), c.start,
                               [](const annotation* w, time_ns t) { return w->start < t; });
    for (; it != by_start.end() && (*it)->start < c.end; ++it)
      if ((*it)->end <= c.end) in.push_back(*it);
    return in;
  };
  for (std::size_t k = 0; k < n; ++k) {
    const annotation& a = cues.annotations[k];
    if (!a.markup) continue;
    cue_text parsed = parse_cue_text(*a.markup);
    if (words && !parsed.stamps.empty()) {
      const std::vector<const annotation*> in = words_inside(a);
      const std::vector<annotation> spelled = timed_words(parsed, a.start, a.end);
      const bool agree =
          spelled.size() == in.size() && std::equal(spelled.begin(), spelled.end(), in.begin(),
                                                    [](const annotation& x, const annotation* y) {
                                                      return x.start == y->start &&
                                                             x.end == y->end && x.text == y->text;
                                                    });
      if (!agree)
        if (auto again = restamped(*a.markup, parsed, spelled, a, in)) {
          rewritten[k] = std::move(*again);
          parsed = parse_cue_text(rewritten[k]);
        }
    }
    const auto speaker = a.attributes.find("speaker");
    const bool ok =
        !has_blank_line(*a.markup) && a.markup->find('\r') == std::string::npos &&
        a.markup->find('\0') == std::string::npos && a.markup->find("-->") == std::string::npos &&
        parsed.plain == a.text &&
        (speaker == a.attributes.end() ? !parsed.voice : parsed.voice == speaker->second);
    // Inline timestamps must lie strictly inside their cue (§4.2.2); a cue moved since its
    // markup was written has stale ones, and the markup cannot be written as it is.
    const bool inside =
        std::all_of(parsed.stamps.begin(), parsed.stamps.end(),
                    [&](const cue_text::stamp& s) { return s.time > a.start && s.time < a.end; });
    if (ok && inside)
      markup[k] = std::move(parsed);
    else if (ok)
      ++p.problems["markup whose inline timestamps lie outside its cue"];
    else
      ++p.problems["markup that no longer matches the text or speaker"];
  }
  return markup;
}

// Words go to cues in two passes: first those that a cue's own markup yields, exactly as the
// reader derives them; then, for cues written from their text, the remaining words inside the
// latest cue that starts at or before them. What is left has no cue to go in.
std::vector<std::vector<const annotation*>> assign_words(
    const tier& cues, const tier& words, const std::vector<std::size_t>& order,
    const std::vector<std::optional<cue_text>>& markup, vtt_plan& p) {
  const std::size_t n = cues.annotations.size();
  std::vector<std::vector<const annotation*>> words_in(n);
  using word_key = std::tuple<time_ns, time_ns, std::string_view>;
  std::multimap<word_key, const annotation*> pool;
  for (const annotation& w : words.annotations) {
    pool.emplace(word_key{w.start, w.end, w.text}, &w);
    if (w.id || w.markup || w.parent || !w.attributes.empty())
      ++p.problems["ids, markup or attributes of word timings"];
  }
  for (std::size_t k = 0; k < n; ++k) {
    if (!markup[k]) continue;
    const annotation& c = cues.annotations[k];
    for (const annotation& d : timed_words(*markup[k], c.start, c.end))
      if (auto it = pool.find(word_key{d.start, d.end, d.text}); it != pool.end()) {
        words_in[k].push_back(it->second);
        pool.erase(it);
      }
  }
  std::vector<time_ns> starts;
  for (std::size_t k : order)
    starts.push_back(cues.annotations[k].start);
  for (const auto& [key, w] : pool) {
    const auto after = std::upper_bound(starts.begin(), starts.end(), w->start);
    const std::size_t k = after == starts.begin()
                              ? no_tier
                              : order[static_cast<std::size_t>(after - starts.begin()) - 1];
    if (k != no_tier && !markup[k] && w->end <= cues.annotations[k].end)
      words_in[k].push_back(w);
    else
      ++p.problems["word timings outside every cue, or unlike their cue's own timestamps"];
  }
  if (words.name != words_tier_name(cues.name))
    p.other.push_back("the name of the word tier " + quote_name(words.name) + " (read back as " +
                      quote_name(words_tier_name(cues.name)) + ")");
  return words_in;
}

// A cue's identifier, timing line with its settings, and comments; the body is the caller's.
planned_cue plan_cue(const annotation& a, std::unordered_set<std::string_view>& ids,
                     const std::vector<std::string>& regions, vtt_plan& p) {
  auto problem = [&](const std::string& reason) { ++p.problems[reason]; };
  planned_cue c;
  if (a.start % ms != 0 || a.end % ms != 0)
    problem("times finer than a millisecond (written to the nearest millisecond)");
  if (a.start < 0 || a.end < 0) problem("negative times");
  // A cue that ends before it starts breaks an authoring rule, but parsers keep it, and so
  // does the writer: it is data, and `tiers check` reports it.
  c.timing = format_timestamp(std::max<time_ns>(a.start, 0)) + " --> " +
             format_timestamp(std::max<time_ns>(a.end, 0));
  if (a.id) {
    const bool ok = !a.id->empty() && a.id->find_first_of("\r\n") == std::string::npos &&
                    a.id->find("-->") == std::string::npos && a.id->find('\0') == std::string::npos;
    const bool repeated = ids.count(*a.id) != 0;
    if (!ok)
      problem("ids that WebVTT cannot hold (empty, or with a line break or '-->')");
    else if (repeated)
      problem("repeated ids (WebVTT identifiers are unique)");
    else
      c.id = *a.id, ids.insert(*a.id);
  }
  // Settings, in a fixed order that keeps a region (§6.3).
  std::string settings;
  for (std::string_view name : setting_names)
    if (auto it = a.attributes.find("vtt:" + std::string(name)); it != a.attributes.end())
      settings += " " + std::string(name) + ":" + it->second;
  const settings_result parsed = parse_settings(settings, regions);
  if (!parsed.rejected.empty()) problem("cue settings that WebVTT would drop");
  for (const setting& s : parsed.accepted)
    c.timing += " " + std::string(s.name) + ":" + std::string(s.value);
  for (const auto& [key, value] : a.attributes) {
    if (key.rfind("vtt:", 0) != 0) continue;
    const std::string_view name = std::string_view(key).substr(4);
    if (name != "note" && std::find(std::begin(setting_names), std::end(setting_names), name) ==
                              std::end(setting_names))
      problem("attributes " + quote_name(key) + " (not a WebVTT cue setting)");
  }
  if (auto it = a.attributes.find("vtt:note"); it != a.attributes.end()) {
    // Comments before the first cue belong to the file's prelude when read back.
    if (!valid_notes(it->second))
      problem("malformed comments before cues");
    else if (p.cues.empty())
      problem("comments attached to the first cue (read back as the file's prelude)");
    else
      c.notes = it->second;
  }
  return c;
}

// What is written and what is lost, decided once for both the writer and the loss report.
vtt_plan plan(const document& doc) {
  vtt_plan p;
  const std::vector<std::string> regions = plan_blocks(doc, p);
  if (doc.tiers.empty()) return p;
  const format* vtt_format = find_format("vtt");
  const std::size_t words_index = vtt_format ? word_tier_index(doc, *vtt_format) : no_tier;
  const tier& cues = doc.tiers.front();
  const tier* words = words_index == no_tier ? nullptr : &doc.tiers[words_index];
  const std::vector<std::size_t> order = start_order(cues, p);
  std::vector<std::string> rewritten;
  const std::vector<std::optional<cue_text>> markup = plan_markup(cues, words, rewritten, p);
  const std::vector<std::vector<const annotation*>> words_in =
      words ? assign_words(cues, *words, order, markup, p)
            : std::vector<std::vector<const annotation*>>(cues.annotations.size());
  std::unordered_set<std::string_view> ids;
  auto problem = [&](const std::string& reason) { ++p.problems[reason]; };
  for (std::size_t k : order) {
    const annotation& a = cues.annotations[k];
    planned_cue c = plan_cue(a, ids, regions, p);
    c.body = !markup[k]             ? text_body(a, words_in[k], problem)
             : rewritten[k].empty() ? *a.markup
                                    : rewritten[k];
    p.cues.push_back(std::move(c));
  }
  return p;
}

}  // namespace

void write_vtt(const document& doc, byte_sink& out, const write_options&) {
  const vtt_plan p = plan(doc);
  out.write("WEBVTT");
  out.write(p.header);
  out.write("\n");
  auto block = [&](std::string_view text) {
    out.write("\n");
    out.write(text);
    out.write("\n");
  };
  if (!p.prelude.empty()) block(p.prelude);
  for (const planned_cue& c : p.cues) {
    if (!c.notes.empty()) block(c.notes);
    out.write("\n");
    if (!c.id.empty()) {
      out.write(c.id);
      out.write("\n");
    }
    out.write(c.timing);
    out.write("\n");
    if (!c.body.empty()) {
      out.write(c.body);
      out.write("\n");
    }
  }
  if (!p.trailer.empty()) block(p.trailer);
}

void vtt_losses(const document& doc, std::vector<std::string>& losses) {
  const vtt_plan p = plan(doc);
  const std::string where = doc.tiers.empty() ? "" : " in tier " + quote_name(doc.tiers[0].name);
  for (const auto& [reason, n] : p.problems)
    losses.push_back(reason + " (" + plural(n, "annotation", "annotations") + where + ")");
  losses.insert(losses.end(), p.other.begin(), p.other.end());
}

}  // namespace tiers::detail
