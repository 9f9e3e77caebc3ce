// Writes CSV and TSV: one row per annotation, optional columns only when some annotation has
// a value for them, and what a table cannot hold reported by table_losses.
#include <algorithm>
#include <set>

#include "csv_format.hpp"
#include "detail/json_text.hpp"
#include "detail/report.hpp"
#include "tiers/table.hpp"

namespace tiers {

bool is_table_column(std::string_view name) {
  static constexpr std::string_view names[] = {"tier",   "start",      "end", "duration", "text",
                                               "markup", "confidence", "id",  "parent"};
  return std::find(std::begin(names), std::end(names), name) != std::end(names);
}

table_layout layout_of(const document& doc) {
  table_layout l;
  std::set<std::string, std::less<>> keys;
  for (const tier& t : doc.tiers)
    for (const annotation& a : t.annotations) {
      ++l.rows;
      l.markup |= a.markup.has_value();
      l.confidence |= a.confidence.has_value();
      l.id |= a.id.has_value();
      l.parent |= a.parent.has_value();
      for (const auto& kv : a.attributes)
        if (!is_table_column(kv.first)) keys.insert(kv.first);
    }
  l.attributes.assign(keys.begin(), keys.end());
  return l;
}

}  // namespace tiers

namespace tiers::detail {
namespace {

void write_table(const document& doc, byte_sink& out, char delimiter, std::string_view eol) {
  const table_layout layout = layout_of(doc);
  const bool any_markup = layout.markup, any_confidence = layout.confidence, any_id = layout.id,
             any_parent = layout.parent;
  const std::vector<std::string>& keys = layout.attributes;
  out.write("tier");
  auto column = [&](bool present, std::string_view name) {
    if (!present) return;
    out.put(delimiter);
    out.write(name);
  };
  column(true, "start");
  column(true, "end");
  column(true, "text");
  column(any_confidence, "confidence");
  column(any_id, "id");
  column(any_parent, "parent");
  column(any_markup, "markup");
  for (const std::string& k : keys) {
    out.put(delimiter);
    write_csv_field(out, k, delimiter);
  }
  out.write(eol);
  auto optional = [&](const optional_text& v) {
    out.put(delimiter);
    if (v) write_csv_field(out, *v, delimiter);
  };
  for (const tier& t : doc.tiers)
    for (const annotation& a : t.annotations) {
      write_csv_field(out, t.name, delimiter);
      out.put(delimiter);
      char buf[32];
      out.write(std::string_view(buf, format_seconds_to(a.start, buf)));
      out.put(delimiter);
      out.write(std::string_view(buf, format_seconds_to(a.end, buf)));
      out.put(delimiter);
      write_csv_field(out, a.text, delimiter);
      if (any_confidence) {
        out.put(delimiter);
        if (a.confidence) write_json_double(out, *a.confidence);
      }
      if (any_id) optional(a.id);
      if (any_parent) optional(a.parent);
      if (any_markup) optional(a.markup);
      for (const std::string& k : keys) {
        out.put(delimiter);
        if (auto it = a.attributes.find(k); it != a.attributes.end())
          write_csv_field(out, it->second, delimiter);
      }
      out.write(eol);
    }
}

}  // namespace

// RFC 4180 §2: records end with CRLF.
void write_csv(const document& doc, byte_sink& out, const write_options&) {
  write_table(doc, out, ',', "\r\n");
}

void write_tsv(const document& doc, byte_sink& out, const write_options&) {
  write_table(doc, out, '\t', "\n");
}

void table_losses(const document& doc, std::vector<std::string>& losses) {
  std::set<std::string_view> seen, repeated;
  for (const tier& t : doc.tiers) {
    if (!seen.insert(t.name).second) repeated.insert(t.name);
    std::size_t empty_values = 0, clashing = 0;
    for (const annotation& a : t.annotations) {
      auto empty = [](const optional_text& v) { return v && v->empty(); };
      bool has_empty = empty(a.markup) || empty(a.id) || empty(a.parent);
      bool clash = false;
      for (const auto& [k, v] : a.attributes) {
        has_empty |= v.empty();
        clash |= is_table_column(k);
      }
      empty_values += has_empty ? 1 : 0;
      clashing += clash ? 1 : 0;
    }
    if (empty_values > 0)
      losses.push_back("empty markup, ids or attribute values (read back as absent) of " +
                       plural(empty_values, "annotation", "annotations") + " in tier " +
                       quote_name(t.name));
    if (clashing > 0)
      losses.push_back("attributes named like a column (tier, start, end, ...) of " +
                       plural(clashing, "annotation", "annotations") + " in tier " +
                       quote_name(t.name));
  }
  for (std::string_view name : repeated)
    losses.push_back("the separation of the tiers named " + quote_name(name) +
                     " (read back as one tier)");
}

}  // namespace tiers::detail
