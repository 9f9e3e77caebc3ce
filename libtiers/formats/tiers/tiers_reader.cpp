// Reads the plain-text tier format line by line; a bad line is reported with its line and
// column and skipped, so that one run shows every problem.
#include <string.h>  // memmem

#include <algorithm>
#include <charconv>
#include <cmath>

#include "detail/positions.hpp"
#include "detail/report.hpp"
#include "detail/swar.hpp"
#include "tiers_format.hpp"
#include "tiers_syntax.hpp"

namespace tiers::detail {
namespace {

using text_format::item;

class text_reader {
 public:
  // With `stream`, annotations are handed to it one by one instead of kept in `out`.
  text_reader(std::string_view input, const read_options& options, read_result& out,
              document_handler* stream = nullptr)
      : in_(input), out_(out), positions_(options, out), stream_(stream) {}

  stream_status run() {
    std::size_t pos = in_.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0;
    while (pos < in_.size() && !stopped_) {
      std::size_t end = in_.find('\n', pos);
      if (end == std::string_view::npos) end = in_.size();
      std::string_view line = in_.substr(pos, end - pos);
      if (!line.empty() && line.back() == '\r') line.remove_suffix(1);  // CRLF files
      std::size_t indent = 0;
      while (indent < line.size() && (line[indent] == ' ' || line[indent] == '\t'))
        ++indent;
      line_start_ = pos + indent;
      line = line.substr(indent);
      if (!line.empty() && line[0] != '#') read_line(line);
      pos = end + 1;
    }
    if (!seen_signature_ && !stopped_)
      fail(0, "tiers.signature", "not a tiers text file: it must start with the line 'tiers 1'");
    for (tier& t : out_.value.tiers)
      if (t.annotations.capacity() / 2 > t.annotations.size()) t.annotations.shrink_to_fit();
    if (stream_ && !stopped_ && streamable(state::ended)) stream_->end_document();
    return out_of_order_ ? stream_status::not_streamed : stream_status::done;
  }

 private:
  void fail(std::size_t at, std::string code, std::string message) {
    out_.diagnostics.push_back(
        make_diagnostic(severity::error, std::move(code), at, std::move(message)));
    failed_ = true;
  }
  void bad(const item& it, std::string message) {
    fail(line_start_ + it.offset, "tiers.syntax", std::move(message));
  }

  void read_line(std::string_view line) {
    std::string problem;
    std::optional<std::string> text;
    if (const std::size_t at = text_format::split_line(line, items_, text, problem);
        at != std::string_view::npos) {
      fail(line_start_ + at, "tiers.syntax", problem);
      return;
    }
    if (items_.empty()) {
      fail(line_start_, "tiers.syntax", "a line cannot start with the text: times come first");
      return;
    }
    const item& head = items_[0];
    if (!seen_signature_) {
      if (head.key != "tiers" || head.value || head.attribute) {
        fail(line_start_, "tiers.signature",
             "not a tiers text file: it must start with the line 'tiers 1'");
        stopped_ = true;
        return;
      }
      if (items_.size() != 2 || items_[1].value || items_[1].key != "1" || text) {
        fail(line_start_ + (items_.size() > 1 ? items_[1].offset : 0), "tiers.version",
             items_.size() > 1 && !items_[1].value && items_[1].key > "1" &&
                     items_[1].key.size() >= 1
                 ? "version " + items_[1].key + " is newer than this build reads (1)"
                 : "the first line must be 'tiers 1'");
        stopped_ = true;
        return;
      }
      seen_signature_ = true;
      return;
    }
    if (!head.value && !head.attribute && !head.key.empty() &&
        (std::isdigit(static_cast<unsigned char>(head.key[0])) || head.key[0] == '-')) {
      read_annotation(text);
      return;
    }
    if (text) {
      fail(line_start_, "tiers.syntax", "only annotation lines have a text after '|'");
      return;
    }
    if (head.value || head.attribute) return bad(head, "a line starts with a keyword or a time");
    const std::string& k = head.key;
    if (stream_ && !failed_ &&
        !streamable(k == "media" || k == "meta" ? state::document
                    : k == "tier"               ? state::tier
                                                : state::tier_fields))
      return;
    if (k == "media") return read_media();
    if (k == "meta") return read_pair(out_.value.metadata);
    if (k == "tier") return read_tier();
    if (!current_) return bad(head, "'" + k + "' before any 'tier' line");
    if (k == "source") return read_source();
    if (k == "parent") return read_parent();
    if (k == "vocabulary") return read_vocabulary();
    if (k == "attr") return read_pair(current_->attributes);
    bad(head, "unknown keyword '" + k +
                  "' (keywords: media, meta, tier, source, parent, vocabulary, attr)");
  }

  std::optional<time_ns> time_of(const item& it) {
    std::string_view s = it.key;
    const bool negative = !s.empty() && s[0] == '-';
    if (negative) s.remove_prefix(1);
    const parsed_time t = s.find(':') != std::string_view::npos ? parse_clock(s) : parse_seconds(s);
    if (!t || (negative && s.empty())) {
      const time_status status = t ? time_status::syntax : t.status;
      fail(line_start_ + it.offset, time_code(status, "tiers.syntax"),
           "time '" + it.key + "' " + std::string(describe(status)));
      return std::nullopt;
    }
    return negative ? -t.value : t.value;
  }

  void read_media() {
    media_info& m = out_.value.media;
    // A field given again would replace the first without a word.
    if (seen_media_) return bad(items_[0], "a second 'media' line: one line gives every field");
    seen_media_ = true;
    for (std::size_t k = 1; k < items_.size(); ++k) {
      const item& it = items_[k];
      if (!it.value || it.attribute) return bad(it, "media takes uri=…, duration=… and rate=…");
      const bool again = (it.key == "uri" && m.uri) || (it.key == "duration" && m.duration) ||
                         (it.key == "rate" && m.frame_rate);
      if (again) return bad(it, it.key + " is given twice");
      if (it.key == "uri") {
        m.uri = *it.value;
      } else if (it.key == "duration") {
        item t = it;
        t.key = *it.value;
        auto d = time_of(t);
        if (!d) return;
        m.duration = *d;
      } else if (it.key == "rate") {
        auto r = parse_rational(*it.value);
        if (!r)
          return bad(
              it, "rate '" + *it.value + "' is not a positive rational such as 25 or 30000/1001");
        m.frame_rate = *r;
      } else {
        return bad(it, "unknown media field '" + it.key + "' (fields: uri, duration, rate)");
      }
    }
  }

  void read_pair(attribute_map& into) {
    if (items_.size() != 2 || !items_[1].value || items_[1].attribute)
      return bad(items_[0], "'" + items_[0].key + "' takes one key=value");
    if (!into.emplace(items_[1].key, *items_[1].value).second)
      bad(items_[1], "key '" + items_[1].key + "' is given twice");
  }

  void read_tier() {
    if (items_.size() < 2 || items_.size() > 3 || items_[1].value || items_[1].attribute)
      return bad(items_[0], "expected 'tier NAME [interval|instant]'");
    tier& t = out_.value.tiers.emplace_back();
    positions_.tier(line_start_);
    current_ = &t;
    if (!stream_) t.annotations.reserve(lines_to_next_tier());
    t.name = items_[1].key;
    if (items_.size() == 3) {
      auto kind = parse_tier_kind(items_[2].key);
      if (!kind || items_[2].value) return bad(items_[2], "a tier's kind is interval or instant");
      t.kind = *kind;
    }
  }

  // The lines from this one to the next that starts with 'tier' (as the writer writes it):
  // a bound of this tier's annotations, so that they are allocated once instead of growing
  // and moving. Counting runs at memchr's speed; a file whose tier lines are indented only
  // reserves too much, which run() gives back.
  std::size_t lines_to_next_tier() const {
    const char* from = in_.data() + line_start_;
    const char* end = in_.data() + in_.size();
    for (const char* at = from;;) {
      const void* hit = memmem(at, static_cast<std::size_t>(end - at), "\ntier", 5);
      const char* next = hit ? static_cast<const char*>(hit) : end;
      if (!hit || (next + 5 < end && (next[5] == ' ' || next[5] == '\t'))) {
        return swar::count({from, static_cast<std::size_t>(next - from)}, '\n');
      }
      at = next + 5;
    }
  }

  void read_source() {
    if (current_->source) return bad(items_[0], "the tier has a source already");
    auto kind =
        items_.size() > 1 && !items_[1].value ? parse_source_kind(items_[1].key) : std::nullopt;
    if (!kind) return bad(items_[0], "expected 'source human|machine [agent=…] [version=…]'");
    tier_source s{*kind, std::nullopt, std::nullopt};
    for (std::size_t k = 2; k < items_.size(); ++k) {
      const item& it = items_[k];
      if (!it.value || it.attribute || (it.key != "agent" && it.key != "version"))
        return bad(it, "a source takes agent=… and version=…");
      std::optional<std::string>& field = it.key == "agent" ? s.agent : s.version;
      if (field) return bad(it, it.key + " is given twice");
      field = *it.value;
    }
    current_->source = std::move(s);
  }

  void read_parent() {
    if (current_->parent) return bad(items_[0], "the tier has a parent already");
    if (items_.size() < 2 || items_.size() > 3 || items_[1].value || items_[1].attribute)
      return bad(items_[0], "expected 'parent TIER [within|partition|refers]'");
    parent_link p{items_[1].key, relation::within};
    if (items_.size() == 3) {
      auto rel = items_[2].value ? std::nullopt : parse_relation(items_[2].key);
      if (!rel) return bad(items_[2], "a relation is within, partition or refers");
      p.rel = *rel;
    }
    current_->parent = std::move(p);
  }

  void read_vocabulary() {
    if (current_->vocabulary) return bad(items_[0], "the tier has a vocabulary already");
    std::vector<std::string> labels;
    for (std::size_t k = 1; k < items_.size(); ++k) {
      if (items_[k].value || items_[k].attribute)
        return bad(items_[k], "labels are words or quoted strings");
      labels.push_back(items_[k].key);
    }
    current_->vocabulary = std::move(labels);
  }

  void read_annotation(std::optional<std::string>& text) {
    if (!current_) return bad(items_[0], "an annotation before any 'tier' line");
    annotation a;
    auto start = time_of(items_[0]);
    if (!start) return;
    a.start = a.end = *start;
    std::size_t k = 1;
    if (k < items_.size() && !items_[k].value && !items_[k].attribute) {
      auto end = time_of(items_[k]);
      if (!end) return;
      a.end = *end;
      ++k;
    }
    for (; k < items_.size(); ++k) {
      const item& it = items_[k];
      if (!it.value) return bad(it, "expected key=value or @attribute=value here");
      if (it.attribute) {
        if (!a.attributes.emplace(it.key, *it.value).second)
          return bad(it, "attribute '" + it.key + "' is given twice");
        continue;
      }
      optional_text* field = it.key == "id"       ? &a.id
                             : it.key == "parent" ? &a.parent
                             : it.key == "markup" ? &a.markup
                                                  : nullptr;
      if (field) {
        if (*field) return bad(it, it.key + " is given twice");
        *field = *it.value;
      } else if (it.key == "conf") {
        if (a.confidence) return bad(it, "conf is given twice");
        double c = 0;
        const std::string& v = *it.value;
        auto [p, ec] = std::from_chars(v.data(), v.data() + v.size(), c);
        if (ec != std::errc{} || p != v.data() + v.size() || !(c >= 0.0 && c <= 1.0))
          return bad(it, "conf '" + v + "' is not a number from 0 to 1");
        a.confidence = c;
      } else {
        return bad(it,
                   "unknown field '" + it.key + "' (fields: id, parent, conf, markup, @attribute)");
      }
    }
    if (text) a.text = std::move(*text);
    if (stream_) {
      if (streamable(state::annotations) && !stream_->add(a)) stopped_ = true;
      return;
    }
    current_->annotations.push_back(std::move(a));
    positions_.annotation(out_.value.tiers.size() - 1, line_start_);
  }

  // Streaming: where in the document a line belongs, in the order the writer writes it.
  enum class state { document, tier, tier_fields, annotations, ended };

  // Moves the stream on to `next` for the line about to be read, handing over what is
  // complete (the document's fields at its first tier, a tier's fields at its first
  // annotation); false when the line is not where the stream can take it, which stops the
  // reading (out of order, or the handler said stop).
  bool streamable(state next) {
    // After an error nothing more is handed over (what was is discarded), but reading goes on
    // to find every problem, as it does for a document.
    if (out_of_order_ || stopped_ || failed_) return false;
    if ((next == state::document && at_ != state::document) ||
        (next == state::tier_fields && at_ != state::tier)) {
      out_of_order_ = stopped_ = true;
      return false;
    }
    if (next == state::tier_fields || (next == at_ && next != state::tier)) return true;
    bool ok = true;
    if (at_ == state::document) ok = stream_->begin_document(out_.value);
    if (ok && at_ == state::tier) ok = stream_->begin_tier(*current_);  // its fields are complete
    if (ok && at_ != state::document && next != state::annotations) ok = stream_->end_tier();
    at_ = next;
    if (!ok) stopped_ = true;
    return ok;
  }

  std::string_view in_;
  read_result& out_;
  position_recorder positions_;
  std::vector<item> items_;
  std::size_t line_start_ = 0;
  bool seen_signature_ = false;
  bool stopped_ = false;
  tier* current_ = nullptr;
  document_handler* stream_;
  state at_ = state::document;
  bool out_of_order_ = false;
  bool failed_ = false;  // an error was found
  bool seen_media_ = false;
};

}  // namespace

int sniff_tiers_text(std::string_view head) {
  if (head.substr(0, 3) == "\xEF\xBB\xBF") head.remove_prefix(3);
  // Comments may come first; the first other line is the signature.
  while (!head.empty() && head[0] == '#') {
    const std::size_t nl = head.find('\n');
    head = nl == std::string_view::npos ? std::string_view{} : head.substr(nl + 1);
  }
  return head.substr(0, 6) == "tiers " ? 2 : 0;
}

read_result read_tiers_text(std::string_view input, const read_options& options) {
  read_result out;
  text_reader(input, options, out).run();
  return out;
}

stream_status stream_tiers_text(std::string_view input, const read_options& options,
                                document_handler& to, std::vector<diagnostic>& diagnostics) {
  read_result out;
  const stream_status status = text_reader(input, options, out, &to).run();
  diagnostics = std::move(out.diagnostics);
  return status;
}

}  // namespace tiers::detail
