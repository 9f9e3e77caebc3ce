// Reading a file as the user's options say: the options checked, the format chosen, the tiers
// given what the options tell of their source.
#include <filesystem>

#include "tiers/inputs.hpp"
#include "tiers/io.hpp"
#include "tiers/text.hpp"

namespace tiers {

std::string display_name(const std::string& path) {
  return path == "-" ? "<stdin>" : path;
}

const format& format_named(const std::string& name) {
  if (const format* f = find_format(name)) return *f;
  throw usage_error("unknown format '" + name + "' (formats: " + format_names() + ")");
}

rational parse_rate_setting(const std::string& text) {
  if (auto r = parse_rational(text)) return *r;
  throw usage_error("--rate: '" + text + "' is not a positive frame rate such as 25 or 30000/1001");
}

std::optional<dataset_source> tier_settings(const reading_settings& in) {
  if (in.source.empty() && in.kind.empty()) return std::nullopt;
  dataset_source s;
  if (!in.source.empty()) {
    s.source = parse_tier_source(in.source);
    if (!s.source)
      throw usage_error("--source: '" + in.source +
                        "' is not KIND[:AGENT[@VERSION]] with KIND human or machine, e.g. "
                        "machine:aligner@2.1");
  }
  if (!in.kind.empty()) {
    s.kind = parse_tier_kind(in.kind);
    if (!s.kind) throw usage_error("--kind: '" + in.kind + "' is neither interval nor instant");
  }
  return s;
}

std::vector<diagnostic> settle_tiers(document& doc, const reading_settings& in,
                                     const std::string& file) {
  const std::optional<dataset_source> s = tier_settings(in);
  return s ? apply_source(doc, *s, file) : std::vector<diagnostic>{};
}

const format* input_format(const reading_settings& in, const std::string& path,
                           std::string_view content, diagnostic& why) {
  if (!in.from.empty()) return &format_named(in.from);
  const format* f = choose_format(path == "-" ? "" : path, content, why, "--from");
  if (!f) why.file = display_name(path);
  return f;
}

read_options reading_options(const reading_settings& in, const std::string& path,
                             std::vector<diagnostic>* notes) {
  read_options options;
  if (!in.columns.empty()) {
    result<column_map> map = parse_column_map(in.columns);
    if (!map.ok()) throw usage_error("--columns: " + map.diagnostics.front().message);
    options.columns = std::move(map.value);
  }
  if (!in.rate.empty()) options.rate = parse_rate_setting(in.rate);
  options.strict = in.strict;
  options.max_text = in.max_text;
  options.max_tiers = in.max_tiers;
  if (!in.time_unit.empty()) {
    const auto unit = value_named(time_unit_names, in.time_unit);
    if (!unit)
      throw usage_error("--time-unit: '" + in.time_unit + "' is not " +
                        quoted_names(time_unit_names));
    options.unit = *unit;
  }
  if (!in.tier_name.empty()) {
    if (!is_utf8(in.tier_name)) throw usage_error("--tier-name: the name is not UTF-8");
    options.tier_name = in.tier_name;
  } else if (path != "-" && !path.empty()) {
    bool repaired = false;
    options.tier_name = name_from_path(path, &repaired);
    if (repaired && notes) {
      diagnostic d;
      d.file = display_name(path);
      d.level = severity::warning;
      d.code = "input.name";
      d.message = "the file's name is not UTF-8: its tier is named " +
                  tiers::quote_name(options.tier_name) + ", with U+FFFD for what is not";
      notes->push_back(std::move(d));
    }
  }
  if (!in.from.empty()) format_named(in.from);  // a usage error before any input is read
  tier_settings(in);
  return options;
}

read_result read_input_file(const std::string& path, const reading_settings& in, bool positions) {
  read_result r;
  read_options options = reading_options(in, path, &r.diagnostics);
  options.positions = positions;
  const std::string name = display_name(path);
  std::string content = read_input(path);
  diagnostic why;
  const format* fmt = input_format(in, path, content, why);
  if (!fmt) {
    r.diagnostics.push_back(std::move(why));
    return r;
  }
  read_result parsed = read_document(content, *fmt, options, name);
  content = std::string();  // the document holds copies: give the memory back first
  if (parsed.ok())
    for (diagnostic& d : settle_tiers(parsed.value, in, name))
      parsed.diagnostics.push_back(std::move(d));
  parsed.diagnostics.insert(parsed.diagnostics.begin(), r.diagnostics.begin(), r.diagnostics.end());
  return parsed;
}

std::optional<words_file> words_file_of(const std::string& spec, const reading_settings& in,
                                        std::optional<std::string>& tier,
                                        std::vector<diagnostic>& diagnostics) {
  std::error_code ec;
  std::string path = spec;
  std::optional<std::string> name;
  if (!std::filesystem::is_regular_file(path, ec)) {
    const std::size_t colon = spec.rfind(':');
    if (colon == std::string::npos || colon == 0 ||
        !std::filesystem::is_regular_file(spec.substr(0, colon), ec)) {
      tier = spec;
      return std::nullopt;
    }
    path = spec.substr(0, colon);
    name = spec.substr(colon + 1);
  }
  read_result r = read_input_file(path, in);
  const bool ok = r.ok();
  for (diagnostic& d : r.diagnostics)
    diagnostics.push_back(std::move(d));
  if (!ok) return std::nullopt;
  return words_file{path, name, std::move(r.value)};
}

}  // namespace tiers
