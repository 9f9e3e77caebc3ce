// The one table of formats, and format look-up by name, extension and content.
#include <algorithm>
#include <array>
#include <cstdio>
#include <filesystem>
#include <optional>

#include "detail/limits.hpp"
#include "detail/paths.hpp"
#include "detail/report.hpp"
#include "detail/utf8.hpp"
#include "formats/csv/csv_format.hpp"
#include "formats/json/json_format.hpp"
#include "formats/tiers/tiers_format.hpp"
#include "formats/ttml/ttml_format.hpp"
#include "formats/vtt/vtt_format.hpp"
#include "tiers/format.hpp"

namespace tiers {
namespace {

constexpr std::array<std::string_view, 1> json_extensions{".json"};
constexpr std::array<std::string_view, 1> csv_extensions{".csv"};
constexpr std::array<std::string_view, 2> tsv_extensions{".tsv", ".tab"};
constexpr std::array<std::string_view, 1> vtt_extensions{".vtt"};
constexpr std::array<std::string_view, 1> tiers_extensions{".tiers"};
constexpr std::array<std::string_view, 3> ttml_extensions{".ttml", ".dfxp", ".xml"};
constexpr std::array<std::string_view, 1> ttml_keys{"speaker"};
// TTML holds every tier as a div, ids and markup, timed spans as word tiers, the frame rate,
// speakers as agents, and its styles, regions and attributes under `ttml:`.
constexpr feature_set ttml_features{feature::several_tiers, feature::markup, feature::ids,
                                    feature::inline_words, feature::frame_rate};
constexpr std::array<std::string_view, 1> vtt_keys{"speaker"};

// Tables keep one row per annotation with a tier column, so they hold several tiers, but no
// tier-level fields and no tier without rows.
constexpr feature_set table_features{feature::several_tiers, feature::markup,
                                     feature::confidence,    feature::ids,
                                     feature::parent_refs,   feature::annotation_attributes};

// WebVTT holds one tier of cues, their identifiers and text as written, cue timestamps as a
// child tier of words, voices as `speaker`, and its settings and blocks under `vtt:`.
constexpr feature_set vtt_features{feature::empty_tiers, feature::markup, feature::ids,
                                   feature::inline_words};

// Every writer is given valid UTF-8: a document holding other bytes (made by a program, not a
// reader) is written with U+FFFD in their place, which find_losses lists.
template <void (*write)(const document&, byte_sink&, const write_options&)>
void utf8_only(const document& doc, byte_sink& out, const write_options& options) {
  if (detail::document_is_utf8(doc))
    write(doc, out, options);
  else
    write(detail::with_utf8_repaired(doc), out, options);
}

// To add a format: write libtiers/formats/<name>/, then add one row here (see DEVELOPERS.md).
const std::array<format, 6> registry{{
    {.name = "json",
     .title = "tiers native JSON (lossless)",
     .extensions = json_extensions,
     .carries = feature_set::all(),
     .sniff = detail::sniff_json,
     .read = detail::read_json,
     .write = utf8_only<detail::write_json>,
     .extra_losses = nullptr,
     .stream = detail::stream_json,
     .stream_writer = detail::json_stream_writer},
    {.name = "csv",
     .title = "comma-separated values, one row per annotation (RFC 4180)",
     .extensions = csv_extensions,
     .carries = table_features,
     .sniff = detail::sniff_csv,
     .read = detail::read_csv,
     .write = utf8_only<detail::write_csv>,
     .extra_losses = detail::table_losses,
     .stream = detail::stream_csv},
    {.name = "tsv",
     .title = "tab-separated values, one row per annotation",
     .extensions = tsv_extensions,
     .carries = table_features,
     .sniff = detail::sniff_tsv,
     .read = detail::read_tsv,
     .write = utf8_only<detail::write_tsv>,
     .extra_losses = detail::table_losses,
     .stream = detail::stream_tsv},
    {.name = "vtt",
     .title = "W3C WebVTT captions",
     .extensions = vtt_extensions,
     .carries = vtt_features,
     .sniff = detail::sniff_vtt,
     .read = detail::read_vtt,
     .write = utf8_only<detail::write_vtt>,
     .extra_losses = detail::vtt_losses,
     .own_prefix = "vtt:",
     .own_keys = vtt_keys,
     .replaces_invalid_utf8 = true,
     .time_grid = {1000, 1},
     .holds_captions = true},
    {.name = "tiers",
     .title = "tiers plain text: one annotation per line (lossless)",
     .extensions = tiers_extensions,
     .carries = feature_set::all(),
     .sniff = detail::sniff_tiers_text,
     .read = detail::read_tiers_text,
     .write = utf8_only<detail::write_tiers_text>,
     .extra_losses = nullptr,
     .stream = detail::stream_tiers_text,
     .stream_writer = detail::tiers_text_stream_writer},
    {.name = "ttml",
     .title = "W3C TTML2, IMSC 1.1 Text Profile",
     .extensions = ttml_extensions,
     .carries = ttml_features,
     .sniff = detail::sniff_ttml,
     .read = detail::read_ttml,
     .write = utf8_only<detail::write_ttml>,
     .extra_losses = detail::ttml_losses,
     .own_prefix = "ttml:",
     .own_keys = ttml_keys},
}};

}  // namespace

std::span<const format> formats() {
  return registry;
}

const format* find_format(std::string_view name) {
  for (const format& f : registry)
    if (f.name == name) return &f;
  return nullptr;
}

const format* format_for_path(std::string_view path) {
  for (const format& f : registry)
    if (detail::has_extension(path, f.extensions)) return &f;
  return nullptr;
}

std::vector<const format*> sniff_formats(std::string_view head) {
  std::vector<std::pair<int, const format*>> scored;
  for (const format& f : registry)
    if (int score = f.sniff(head); score > 0) scored.emplace_back(score, &f);
  std::stable_sort(scored.begin(), scored.end(),
                   [](const auto& a, const auto& b) { return a.first > b.first; });
  std::vector<const format*> out;
  for (const auto& s : scored)
    out.push_back(s.second);
  return out;
}

std::string format_names() {
  std::string s;
  for (const format& f : registry)
    s += (s.empty() ? "" : ", ") + std::string(f.name);
  return s;
}

const format* choose_format(std::string_view path, std::string_view content, diagnostic& why,
                            std::string_view how) {
  if (!path.empty())
    if (const format* f = format_for_path(path)) return f;
  const auto sniffed = sniff_formats(content.substr(0, 4096));
  if (!sniffed.empty()) return sniffed.front();
  const std::string ext =
      path.empty() ? "" : std::filesystem::path(std::string(path)).extension().string();
  why.file = std::string(path);
  why.code = "input.format";
  why.message =
      std::string("cannot tell the format: ") +
      (ext.empty() ? "the name has no extension" : "no format uses the extension '" + ext + "'") +
      ", and the content looks like none of " + format_names() + "; name it with " +
      std::string(how);
  return nullptr;
}

namespace {

// Makes the source map match the document index for index (a reader may leave out what it
// cannot place), then computes every line and column in one pass.
void locate_positions(std::string_view text, const document& doc, source_map& map) {
  map.tiers.resize(doc.tiers.size());
  map.annotations.resize(doc.tiers.size());
  std::vector<source_position*> all;
  for (std::size_t t = 0; t < doc.tiers.size(); ++t) {
    map.annotations[t].resize(doc.tiers[t].annotations.size());
    all.push_back(&map.tiers[t]);
    for (source_position& p : map.annotations[t])
      all.push_back(&p);
  }
  std::erase_if(all, [](const source_position* p) { return p->offset == no_offset; });
  std::stable_sort(all.begin(), all.end(), [](const source_position* a, const source_position* b) {
    return a->offset < b->offset;
  });
  position_finder finder(text);
  for (source_position* p : all) {
    const text_position at = finder.at(p->offset);
    p->line = at.line;
    p->column = at.column;
  }
}

// The first annotation (tier index, annotation index) whose text or markup is longer than
// allowed, or the first tier beyond the allowed number.
struct limit_breach {
  std::size_t tier = no_tier, annotation = no_tier;
  std::string code, message;
};

std::optional<limit_breach> find_breach(const document& doc, const read_options& options) {
  if (doc.tiers.size() > options.max_tiers)
    return limit_breach{options.max_tiers, no_tier, "limit.tiers",
                        "the file has " + std::to_string(doc.tiers.size()) +
                            " tiers, more than the " + std::to_string(options.max_tiers) +
                            " allowed (--max-tiers)"};
  for (std::size_t t = 0; t < doc.tiers.size(); ++t)
    for (std::size_t a = 0; a < doc.tiers[t].annotations.size(); ++a) {
      const annotation& x = doc.tiers[t].annotations[a];
      const std::size_t size = detail::limited_text_size(x);
      if (size > options.max_text)
        return limit_breach{t, a, "limit.text",
                            "an annotation's text is " + std::to_string(size) +
                                " bytes, more than the " + std::to_string(options.max_text) +
                                " allowed (--max-text-bytes)"};
    }
  return std::nullopt;
}

}  // namespace

read_result read_document(std::string_view input, const format& fmt, const read_options& options,
                          std::string_view file_name) {
  read_result result;
  if (std::string_view wide = detail::wide_encoding(input); !wide.empty()) {
    result.diagnostics.push_back(detail::make_diagnostic(
        severity::error, "input.encoding", 0,
        "the file is " + std::string(wide) + ", not UTF-8; convert it to UTF-8 first"));
  } else if (std::size_t bad = detail::find_invalid_utf8(input);
             bad != std::string_view::npos && fmt.replaces_invalid_utf8) {
    // Decode as the format's specification says (WHATWG UTF-8 decode), then read the copy.
    std::size_t replaced = 0;
    const std::string repaired = detail::repair_utf8(input, replaced);
    result = read_document(repaired, fmt, options, file_name);
    result.diagnostics.insert(
        result.diagnostics.begin(),
        detail::make_diagnostic(
            severity::warning, "input.utf8", bad,
            "the file is not valid UTF-8: " +
                detail::plural(replaced, "invalid sequence", "invalid sequences") +
                " replaced by U+FFFD, as the format's specification says"));
    locate_all(repaired, result.diagnostics);  // positions were located by the inner call
    for (diagnostic& d : result.diagnostics)
      d.file = file_name;
    return result;
  } else if (bad != std::string_view::npos) {
    char hex[8];
    std::snprintf(hex, sizeof hex, "0x%02X", static_cast<unsigned char>(input[bad]));
    result.diagnostics.push_back(detail::make_diagnostic(severity::error, "input.utf8", bad,
                                                         "the file is not UTF-8: invalid byte " +
                                                             std::string(hex) + " at byte offset " +
                                                             std::to_string(bad)));
  } else {
    result = fmt.read(input, options);
    if (result.ok())
      if (auto breach = find_breach(result.value, options)) {
        // Read again with positions (only now, when they are needed) to say where it is.
        read_options located = options;
        located.positions = true;
        const read_result again = options.positions ? read_result{} : fmt.read(input, located);
        const source_map& map = options.positions ? result.positions : again.positions;
        const std::size_t offset =
            breach->annotation == no_tier
                ? (breach->tier < map.tiers.size() ? map.tiers[breach->tier].offset : 0)
                : (breach->tier < map.annotations.size() &&
                           breach->annotation < map.annotations[breach->tier].size()
                       ? map.annotations[breach->tier][breach->annotation].offset
                       : 0);
        result.diagnostics.push_back(
            detail::make_diagnostic(severity::error, breach->code, offset, breach->message));
      }
  }
  locate_all(input, result.diagnostics);
  if (options.positions) locate_positions(input, result.value, result.positions);
  for (diagnostic& d : result.diagnostics)
    d.file = file_name;
  return result;
}

result<column_map> parse_column_map(std::string_view text) {
  static constexpr std::array<std::string_view, 9> roles{
      "tier", "start", "end", "duration", "text", "markup", "confidence", "id", "parent"};
  result<column_map> out;
  auto fail = [&](std::string message) {
    out.diagnostics.push_back(
        detail::make_diagnostic(severity::error, "columns.map", no_offset, std::move(message)));
    return out;
  };
  while (!text.empty()) {
    const std::size_t comma = text.find(',');
    const std::string_view item = text.substr(0, comma);
    text = comma == std::string_view::npos ? std::string_view{} : text.substr(comma + 1);
    const std::size_t eq = item.find('=');
    if (eq == std::string_view::npos || eq == 0 || eq + 1 == item.size())
      return fail("expected ROLE=COLUMN, got '" + std::string(item) + "'");
    const std::string_view role = item.substr(0, eq);
    if (std::find(roles.begin(), roles.end(), role) == roles.end())
      return fail("unknown role '" + std::string(role) +
                  "' (roles: tier, start, end, duration, text, markup, confidence, id, parent)");
    for (const auto& [r, c] : out.value)
      if (r == role) return fail("role '" + std::string(role) + "' is mapped twice");
    out.value.emplace_back(std::string(role), std::string(item.substr(eq + 1)));
  }
  return out;
}

}  // namespace tiers
