// Reads the native JSON format with the JSON scanner's events, straight into the model: no DOM,
// times taken exactly from the number's text, every problem located by byte offset.
#include <charconv>
#include <cmath>
#include <cstdint>
#include <iterator>
#include <limits>

#include "detail/json_scan.hpp"
#include "detail/positions.hpp"
#include "detail/report.hpp"
#include "json_format.hpp"

namespace tiers::detail {
namespace {

// Where the parser is in the document. Every object and array has one; anything else is an
// error at once, so the nesting depth stays bounded by the shape of the format.
enum class ctx : std::uint8_t {
  top,
  root,
  media,
  metadata,
  tiers,
  tier,
  source,
  parent,
  vocabulary,
  tier_attributes,
  annotations,
  annotation,
  annotation_attributes,
};

std::string_view ctx_name(ctx c) {
  switch (c) {
    case ctx::top:
      return "document";
    case ctx::root:
      return "document";
    case ctx::media:
      return "media";
    case ctx::metadata:
      return "metadata";
    case ctx::tiers:
      return "tiers";
    case ctx::tier:
      return "tier";
    case ctx::source:
      return "source";
    case ctx::parent:
      return "parent";
    case ctx::vocabulary:
      return "vocabulary";
    case ctx::tier_attributes:
    case ctx::annotation_attributes:
      return "attributes";
    case ctx::annotations:
      return "annotations";
    case ctx::annotation:
      return "annotation";
  }
  return "document";
}

// The members each object may have; their index is their bit in `frame::seen`.
std::span<const std::string_view> members_of(ctx c) {
  static constexpr std::string_view root[] = {"format", "version", "media", "metadata", "tiers"};
  static constexpr std::string_view media[] = {"uri", "duration", "frame_rate"};
  static constexpr std::string_view tier[] = {"name",       "kind",       "source",     "parent",
                                              "vocabulary", "attributes", "annotations"};
  static constexpr std::string_view source[] = {"kind", "agent", "version"};
  static constexpr std::string_view parent[] = {"tier", "relation"};
  static constexpr std::string_view annotation[] = {"start",      "end", "text",   "markup",
                                                    "confidence", "id",  "parent", "attributes"};
  switch (c) {
    case ctx::root:
      return root;
    case ctx::media:
      return media;
    case ctx::tier:
      return tier;
    case ctx::source:
      return source;
    case ctx::parent:
      return parent;
    case ctx::annotation:
      return annotation;
    default:
      return {};
  }
}

enum member : int {
  // root
  m_format = 0,
  m_version,
  m_media,
  m_metadata,
  m_tiers,
  // media
  m_uri = 0,
  m_duration,
  m_frame_rate,
  // tier
  t_name = 0,
  t_kind,
  t_source,
  t_parent,
  t_vocabulary,
  t_attributes,
  t_annotations,
  // source
  s_kind = 0,
  s_agent,
  s_version,
  // parent
  p_tier = 0,
  p_relation,
  // annotation
  a_start = 0,
  a_end,
  a_text,
  a_markup,
  a_confidence,
  a_id,
  a_parent,
  a_attributes,
};

struct frame {
  ctx where;
  std::size_t offset;      // of the opening bracket
  std::uint32_t seen = 0;  // members already given
};

// A scalar SAX event, with the number's own text where the parser kept it.
struct scalar {
  enum kind_t : std::uint8_t { null, boolean, integer, floating, string } kind;
  std::string_view text;  // strings and floats
  std::int64_t i = 0;
  bool u_overflow = false;  // an unsigned integer above int64
  bool b = false;
};

class handler final {
 public:
  // With `stream`, each annotation is handed to it once read, instead of kept in `out`.
  handler(const read_options& options, read_result& out, document_handler* stream = nullptr)
      : out_(out), positions_(options, out), stream_(stream) {}

  bool on_null(std::size_t at) {
    at_ = at;
    return on_scalar({scalar::null, {}});
  }
  bool on_bool(bool v, std::size_t at) {
    at_ = at;
    scalar s{scalar::boolean, {}};
    s.b = v;
    return on_scalar(s);
  }
  bool on_number(std::string_view text, std::size_t at) {
    at_ = at;
    bool integral = true;
    for (char c : text)
      integral = integral && c != '.' && c != 'e' && c != 'E';
    scalar s{integral ? scalar::integer : scalar::floating, text};
    if (integral) {
      const auto [p, ec] = std::from_chars(text.data(), text.data() + text.size(), s.i);
      // Out of range: a positive one is too large for anything; a negative one is below any
      // time too, and nothing else is negative.
      if (ec != std::errc{}) s.u_overflow = true;
      (void)p;
    }
    // The double is read only where one is wanted (a confidence): times are read exactly from
    // the text instead.
    return on_scalar(s);
  }
  bool on_string(std::string& v, std::size_t at) {
    at_ = at;
    string_value_ = std::move(v);
    return on_scalar({scalar::string, string_value_});
  }
  bool on_start_object(std::size_t at);
  bool on_key(std::string& k, std::size_t at);
  bool on_end_object(std::size_t at);
  bool on_start_array(std::size_t at);
  bool on_end_array(std::size_t at);

  /// Text that is not JSON at all.
  void syntax_error(const json_scan_error& e) {
    fail_at("json.syntax", e.offset, "invalid JSON: " + e.message);
  }

  bool failed() const { return failed_; }
  bool out_of_order() const { return out_of_order_; }

 private:
  // Offset of the value the scanner reported last.
  std::size_t here() const { return at_; }

  bool fail_at(std::string code, std::size_t offset, std::string message) {
    if (!failed_)
      out_.diagnostics.push_back(
          make_diagnostic(severity::error, std::move(code), offset, std::move(message)));
    failed_ = true;
    return false;
  }
  bool fail_here(std::string code, std::string message) {
    return fail_at(std::move(code), here(), std::move(message));
  }
  // A problem with the value of the current member, located at its key.
  bool fail_member(std::string message) {
    return fail_at("json.value", key_offset_, quote_name(key_) + " " + message);
  }

  ctx top() const { return stack_.back().where; }
  bool in_object() const {
    switch (top()) {
      case ctx::tiers:
      case ctx::vocabulary:
      case ctx::annotations:
      case ctx::top:
        return false;
      default:
        return true;
    }
  }

  bool on_scalar(const scalar& v);
  bool root_scalar(const scalar& v);
  bool tier_scalar(const scalar& v);
  bool annotation_scalar(const scalar& v);
  bool finish_object(const frame& f);

  std::optional<time_ns> time_value(const scalar& v) {
    parsed_time t;
    if (v.kind == scalar::integer) {
      if (v.u_overflow) {
        t.status = time_status::out_of_range;
      } else if (v.i > std::numeric_limits<time_ns>::max() / ns_per_second ||
                 v.i < std::numeric_limits<time_ns>::min() / ns_per_second) {
        t.status = time_status::out_of_range;
      } else {
        t = {v.i * ns_per_second, time_status::ok};
      }
    } else if (v.kind == scalar::floating) {
      t = parse_seconds(v.text);
    } else {
      fail_member("must be a number of seconds");
      return std::nullopt;
    }
    if (!t) {
      fail_at(time_code(t.status, "json.value"), key_offset_,
              quote_name(key_) + " " + std::string(describe(t.status)));
      return std::nullopt;
    }
    return t.value;
  }

  std::optional<std::string> string_of(const scalar& v) {
    if (v.kind != scalar::string) {
      fail_member("must be a string");
      return std::nullopt;
    }
    // The scanner's string is handed on, not copied: one allocation per long text, not two.
    if (v.text.data() == string_value_.data()) return std::move(string_value_);
    return std::string(v.text);
  }

  tier& current_tier() { return out_.value.tiers.back(); }
  annotation& current_annotation() { return current_tier().annotations.back(); }

  std::size_t at_ = 0;
  read_result& out_;
  position_recorder positions_;
  std::vector<frame> stack_{{ctx::top, 0}};
  std::string key_;
  std::size_t key_offset_ = 0;
  int member_ = -1;  // index of key_ among members_of(top()), or -1
  std::string string_value_;
  bool failed_ = false;
  bool version_ok_ = false;
  std::size_t missing_end_ = no_offset;  // first annotation of the current tier without "end"

  // Streaming: the document's fields are handed over when its tiers begin, a tier's when its
  // annotations begin; a member after that would come too late.
  bool late(bool handed) {
    if (handed) out_of_order_ = true;
    return !handed;
  }
  document_handler* stream_;
  bool document_handed_ = false, tier_handed_ = false, out_of_order_ = false;
};

bool handler::on_key(std::string& k, std::size_t at) {
  key_ = std::move(k);
  at_ = key_offset_ = at;
  frame& f = stack_.back();
  const auto names = members_of(f.where);
  member_ = -1;
  if (names.empty()) {
    // Free-form maps (metadata, attributes): keys are data; duplicates are still ambiguous.
    const attribute_map& map = f.where == ctx::metadata          ? out_.value.metadata
                               : f.where == ctx::tier_attributes ? current_tier().attributes
                                                                 : current_annotation().attributes;
    if (map.count(key_) != 0)
      return fail_at("json.duplicate", key_offset_, "duplicate key " + quote_name(key_));
    return true;
  }
  for (std::size_t k2 = 0; k2 < names.size() && member_ < 0; ++k2)
    if (names[k2] == key_) member_ = static_cast<int>(k2);
  if (member_ < 0)
    return fail_at("json.member", key_offset_,
                   "unknown member " + quote_name(key_) + " in " + std::string(ctx_name(f.where)));
  const std::uint32_t bit = 1u << member_;
  if (f.seen & bit)
    return fail_at("json.duplicate", key_offset_, "duplicate member " + quote_name(key_));
  f.seen |= bit;
  if (stream_ && f.where == ctx::root && (member_ == m_media || member_ == m_metadata))
    return late(document_handed_);
  if (stream_ && f.where == ctx::tier) return late(tier_handed_);
  return true;
}

bool handler::on_start_object(std::size_t at) {
  const std::size_t offset = at_ = at;
  ctx next = ctx::top;
  switch (top()) {
    case ctx::top:
      next = ctx::root;
      break;
    case ctx::root:
      if (member_ == m_media) next = ctx::media;
      if (member_ == m_metadata) next = ctx::metadata;
      break;
    case ctx::tiers:
      next = ctx::tier;
      out_.value.tiers.emplace_back();
      positions_.tier(offset);
      missing_end_ = no_offset;
      break;
    case ctx::tier:
      if (member_ == t_source) {
        next = ctx::source;
        current_tier().source.emplace();
      }
      if (member_ == t_parent) {
        next = ctx::parent;
        current_tier().parent.emplace();
      }
      if (member_ == t_attributes) next = ctx::tier_attributes;
      break;
    case ctx::annotations:
      next = ctx::annotation;
      current_tier().annotations.emplace_back();
      positions_.annotation(out_.value.tiers.size() - 1, offset);
      break;
    case ctx::annotation:
      if (member_ == a_attributes) next = ctx::annotation_attributes;
      break;
    default:
      break;
  }
  if (next == ctx::top) {
    if (top() == ctx::vocabulary)
      return fail_here("json.value", "vocabulary labels must be strings");
    if (top() == ctx::metadata || top() == ctx::tier_attributes ||
        top() == ctx::annotation_attributes)
      return fail_member("must be a string (attribute and metadata values are strings)");
    return fail_member("must not be an object");
  }
  stack_.push_back({next, offset});
  return true;
}

bool handler::on_end_object(std::size_t at) {
  at_ = at;
  const frame f = stack_.back();
  stack_.pop_back();
  return finish_object(f);
}

bool handler::on_start_array(std::size_t at) {
  const std::size_t offset = at_ = at;
  ctx next = ctx::top;
  if (top() == ctx::root && member_ == m_tiers) next = ctx::tiers;
  if (top() == ctx::tier && member_ == t_vocabulary) {
    next = ctx::vocabulary;
    current_tier().vocabulary.emplace();
  }
  if (top() == ctx::tier && member_ == t_annotations) next = ctx::annotations;
  if (stream_ && next == ctx::tiers) {
    document_handed_ = true;
    if (!stream_->begin_document(out_.value)) return false;
  }
  if (stream_ && next == ctx::annotations) {
    if (!(stack_.back().seen & (1u << t_name))) return late(true);  // named later, or never
    tier_handed_ = true;
    if (!stream_->begin_tier(current_tier())) return false;
  }
  if (next == ctx::top) {
    if (top() == ctx::top) return fail_here("json.value", "a tiers document is a JSON object");
    if (!in_object())
      return fail_here("json.value", "unexpected array in " + std::string(ctx_name(top())));
    if (top() == ctx::metadata || top() == ctx::tier_attributes ||
        top() == ctx::annotation_attributes)
      return fail_member("must be a string (attribute and metadata values are strings)");
    return fail_member("must not be an array");
  }
  stack_.push_back({next, offset});
  return true;
}

bool handler::on_end_array(std::size_t at) {
  at_ = at;
  stack_.pop_back();
  return true;
}

bool handler::on_scalar(const scalar& v) {
  switch (top()) {
    case ctx::top:
      return fail_here("json.value", "a tiers document is a JSON object");
    case ctx::root:
    case ctx::media:
      return root_scalar(v);
    case ctx::metadata:
    case ctx::tier_attributes:
    case ctx::annotation_attributes: {
      if (v.kind != scalar::string)
        return fail_member("must be a string (attribute and metadata values are strings)");
      attribute_map& map = top() == ctx::metadata          ? out_.value.metadata
                           : top() == ctx::tier_attributes ? current_tier().attributes
                                                           : current_annotation().attributes;
      map.emplace(key_, std::string(v.text));
      return true;
    }
    case ctx::tiers:
      return fail_here("json.value", "each tier must be an object");
    case ctx::annotations:
      return fail_here("json.value", "each annotation must be an object");
    case ctx::vocabulary:
      if (v.kind != scalar::string)
        return fail_here("json.value", "vocabulary labels must be strings");
      current_tier().vocabulary->emplace_back(v.text);
      return true;
    case ctx::tier:
    case ctx::source:
    case ctx::parent:
      return tier_scalar(v);
    case ctx::annotation:
      return annotation_scalar(v);
  }
  return true;
}

bool handler::root_scalar(const scalar& v) {
  if (top() == ctx::media) {
    media_info& m = out_.value.media;
    if (member_ == m_uri) {
      auto s = string_of(v);
      if (!s) return false;
      m.uri = std::move(*s);
    } else if (member_ == m_duration) {
      auto t = time_value(v);
      if (!t) return false;
      m.duration = *t;
    } else {
      std::optional<rational> r;
      if (v.kind == scalar::string) r = parse_rational(v.text);
      if (v.kind == scalar::integer && v.i > 0) r = parse_rational(std::to_string(v.i));
      if (!r) return fail_member("must be a positive rational such as \"25\" or \"30000/1001\"");
      m.frame_rate = *r;
    }
    return true;
  }
  if (member_ == m_format) {
    if (v.kind != scalar::string || v.text != "tiers")
      return fail_member("must be \"tiers\": this is not a tiers JSON document");
    return true;
  }
  if (member_ == m_version) {
    if (v.kind != scalar::integer || v.u_overflow || v.i < 1)
      return fail_member("must be a positive whole number");
    if (v.i > 1)
      return fail_member("is " + std::to_string(v.i) + ", newer than this build reads (1)");
    version_ok_ = true;
    return true;
  }
  return fail_member(member_ == m_tiers ? "must be an array" : "must be an object");
}

bool handler::tier_scalar(const scalar& v) {
  tier& t = current_tier();
  if (top() == ctx::source) {
    auto s = string_of(v);
    if (!s) return false;
    if (member_ == s_kind) {
      auto k = parse_source_kind(*s);
      if (!k) return fail_member("must be \"human\" or \"machine\"");
      t.source->kind = *k;
    } else {
      (member_ == s_agent ? t.source->agent : t.source->version) = std::move(*s);
    }
    return true;
  }
  if (top() == ctx::parent) {
    auto s = string_of(v);
    if (!s) return false;
    if (member_ == p_tier) {
      t.parent->tier = std::move(*s);
    } else {
      auto r = parse_relation(*s);
      if (!r) return fail_member("must be \"within\", \"partition\" or \"refers\"");
      t.parent->rel = *r;
    }
    return true;
  }
  if (member_ == t_name) {
    auto s = string_of(v);
    if (!s) return false;
    t.name = std::move(*s);
    return true;
  }
  if (member_ == t_kind) {
    auto s = string_of(v);
    if (!s) return false;
    auto k = parse_tier_kind(*s);
    if (!k) return fail_member("must be \"interval\" or \"instant\"");
    t.kind = *k;
    return true;
  }
  return fail_member(member_ == t_vocabulary || member_ == t_annotations ? "must be an array"
                                                                         : "must be an object");
}

bool handler::annotation_scalar(const scalar& v) {
  annotation& a = current_annotation();
  switch (member_) {
    case a_start:
    case a_end: {
      auto t = time_value(v);
      if (!t) return false;
      (member_ == a_start ? a.start : a.end) = *t;
      return true;
    }
    case a_confidence: {
      if (v.kind != scalar::integer && v.kind != scalar::floating)
        return fail_member("must be a number from 0 to 1");
      double c = static_cast<double>(v.i);
      if (v.kind == scalar::floating)
        std::from_chars(v.text.data(), v.text.data() + v.text.size(), c);
      if (v.u_overflow || !(c >= 0.0 && c <= 1.0))
        return fail_member("must be a number from 0 to 1");
      a.confidence = c;
      return true;
    }
    case a_attributes:
      return fail_member("must be an object");
    default: {
      auto s = string_of(v);
      if (!s) return false;
      if (member_ == a_text) a.text = std::move(*s);
      if (member_ == a_markup) a.markup = std::move(*s);
      if (member_ == a_id) a.id = std::move(*s);
      if (member_ == a_parent) a.parent = std::move(*s);
      return true;
    }
  }
}

bool handler::finish_object(const frame& f) {
  auto missing = [&](std::string_view what) {
    return fail_at("json.member", f.offset,
                   std::string(ctx_name(f.where)) + " has no " + quote_name(what));
  };
  switch (f.where) {
    case ctx::root:
      if (!(f.seen & (1u << m_format))) return missing("format");
      if (!version_ok_) return missing("version");
      if (stream_ && !document_handed_ && !stream_->begin_document(out_.value)) return false;
      return !stream_ || stream_->end_document();
    case ctx::tier:
      if (!(f.seen & (1u << t_name))) return missing("name");
      if (missing_end_ != no_offset && current_tier().kind == tier_kind::interval)
        return fail_at("json.member", missing_end_,
                       "annotation has no 'end' (only annotations of instant tiers may omit it)");
      if (!stream_) return true;
      if (!tier_handed_ && !stream_->begin_tier(current_tier())) return false;
      tier_handed_ = false;
      return stream_->end_tier();
    case ctx::source:
      if (!(f.seen & (1u << s_kind))) return missing("kind");
      return true;
    case ctx::parent:
      if (!(f.seen & (1u << p_tier))) return missing("tier");
      return true;
    case ctx::annotation: {
      if (!(f.seen & (1u << a_start))) return missing("start");
      if (!(f.seen & (1u << a_end))) {
        annotation& a = current_annotation();
        a.end = a.start;
        if (missing_end_ == no_offset) missing_end_ = f.offset;
      }
      if (!stream_) return true;
      const bool go = stream_->add(current_annotation());
      current_tier().annotations.pop_back();
      return go;
    }
    default:
      return true;
  }
}

}  // namespace

int sniff_json(std::string_view head) {
  if (head.substr(0, 3) == "\xEF\xBB\xBF") head.remove_prefix(3);
  const std::size_t first = head.find_first_not_of(" \t\r\n");
  if (first == std::string_view::npos || head[first] != '{') return 0;
  return head.find("\"tiers\"") != std::string_view::npos ? 2 : 1;
}

read_result read_json(std::string_view input, const read_options& options) {
  read_result out;
  handler h(options, out);
  if (auto e = scan_json(input, h)) h.syntax_error(*e);
  return out;
}

stream_status stream_json(std::string_view input, const read_options& options, document_handler& to,
                          std::vector<diagnostic>& diagnostics) {
  read_result out;
  handler h(options, out, &to);
  if (auto e = scan_json(input, h)) h.syntax_error(*e);
  diagnostics = std::move(out.diagnostics);
  return h.out_of_order() ? stream_status::not_streamed : stream_status::done;
}

}  // namespace tiers::detail
