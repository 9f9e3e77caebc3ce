// The review sheet: written by `tiers sample`, filled in by a reviewer (in a spreadsheet or on
// the review page), read back by `tiers estimate`.
#include <fmt/format.h>

#include <array>
#include <charconv>
#include <cmath>
#include <map>
#include <tuple>

#include "formats/csv/table_scanner.hpp"
#include "tiers/review.hpp"

namespace tiers {
namespace {

constexpr std::array<std::string_view, 13> columns{
    "sample_id", "file",         "tier",   "start", "end",     "label", "confidence",
    "stratum",   "stratum_size", "weight", "link",  "verdict", "note"};

enum column : std::size_t {
  c_id,
  c_file,
  c_tier,
  c_start,
  c_end,
  c_label,
  c_confidence,
  c_stratum,
  c_size,
  c_weight,
  c_link,
  c_verdict,
  c_note
};

std::optional<double> number(std::string_view text) {
  double v = 0;
  const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
  if (ec != std::errc() || end != text.data() + text.size() || !std::isfinite(v))
    return std::nullopt;
  return v;
}

std::optional<std::uint64_t> whole(std::string_view text) {
  std::uint64_t v = 0;
  const auto [end, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
  if (ec != std::errc() || end != text.data() + text.size() || text.empty()) return std::nullopt;
  return v;
}

std::string ascii_lower(std::string_view s) {
  std::string out(s);
  for (char& c : out)
    if (c >= 'A' && c <= 'Z') c = static_cast<char>(c - 'A' + 'a');
  return out;
}

}  // namespace

void write_review_sheet(const std::vector<sample_row>& rows, byte_sink& out) {
  for (std::size_t k = 0; k < columns.size(); ++k) {
    if (k > 0) out.write(",");
    out.write(columns[k]);
  }
  out.write("\n");
  for (const sample_row& r : rows) {
    const std::string fields[] = {std::to_string(r.sample_id),
                                  r.file,
                                  r.tier,
                                  format_seconds(r.start),
                                  format_seconds(r.end),
                                  r.label,
                                  r.confidence ? fmt::format("{}", *r.confidence) : "",
                                  r.stratum,
                                  std::to_string(r.stratum_size),
                                  fmt::format("{}", r.weight),
                                  r.link,
                                  r.verdict,
                                  r.note};
    for (std::size_t k = 0; k < columns.size(); ++k) {
      if (k > 0) out.write(",");
      write_csv_field(out, fields[k]);
    }
    out.write("\n");
  }
}

std::optional<verdict> parse_verdict(std::string_view text) {
  const std::string v = ascii_lower(detail::trim_cell(text));
  if (v.empty()) return verdict::none;
  if (v == "yes" || v == "y" || v == "1" || v == "true") return verdict::yes;
  if (v == "no" || v == "n" || v == "0" || v == "false") return verdict::no;
  if (v == "unsure") return verdict::unsure;
  return std::nullopt;
}

result<std::vector<sample_row>> read_review_sheet(std::string_view text, const std::string& file) {
  result<std::vector<sample_row>> out;
  auto problem = [&](std::size_t offset, std::string message) {
    diagnostic d;
    d.code = "review.sheet";
    d.file = file;
    d.offset = offset;
    d.message = std::move(message);
    out.diagnostics.push_back(std::move(d));
  };
  if (text.starts_with("\xEF\xBB\xBF")) text.remove_prefix(3);  // a spreadsheet's BOM
  detail::table_scanner scan(text, ',');
  std::vector<detail::table_cell> cells;
  std::size_t offset = 0;
  if (!scan.next(cells, offset)) {
    if (scan.failed())
      out.diagnostics.push_back(scan.problem);
    else
      problem(0, "the sheet is empty: it needs a header with stratum, stratum_size and verdict");
    for (diagnostic& d : out.diagnostics)
      d.file = file;
    locate_all(text, out.diagnostics);
    return out;
  }
  std::array<std::size_t, columns.size()> at;
  at.fill(static_cast<std::size_t>(-1));
  const std::size_t header_fields = cells.size();
  for (std::size_t k = 0; k < cells.size(); ++k) {
    const std::string name = ascii_lower(detail::trim_cell(cells[k].text));
    for (std::size_t c = 0; c < columns.size(); ++c)
      if (name == columns[c]) {
        if (at[c] != static_cast<std::size_t>(-1))
          problem(cells[k].offset, "the column " + quote_name(name) + " appears twice");
        at[c] = k;
      }
  }
  for (std::size_t c : {c_stratum, c_size, c_verdict})
    if (at[c] == static_cast<std::size_t>(-1))
      problem(offset, "the header lacks the column " + quote_name(columns[c]) +
                          " (a sheet written by tiers sample has it)");
  if (has_errors(out.diagnostics)) {
    locate_all(text, out.diagnostics);
    return out;
  }
  std::map<std::string, std::pair<std::uint64_t, std::size_t>> sizes;  // stratum → N_h, where
  while (scan.next(cells, offset)) {
    if (cells.size() != header_fields) {
      problem(offset,
              fmt::format("this row has {} fields, the header {}", cells.size(), header_fields));
      continue;
    }
    auto cell = [&](column c) -> std::string_view {
      return at[c] == static_cast<std::size_t>(-1) ? std::string_view() : cells[at[c]].text;
    };
    auto where = [&](column c) { return cells[at[c]].offset; };
    sample_row r;
    r.sample_id = whole(detail::trim_cell(cell(c_id))).value_or(out.value.size() + 1);
    r.file = cell(c_file);
    r.tier = cell(c_tier);
    r.label = cell(c_label);
    r.stratum = cell(c_stratum);
    r.link = cell(c_link);
    r.note = cell(c_note);
    r.verdict = detail::trim_cell(cell(c_verdict));
    for (column c : {c_start, c_end}) {
      const std::string_view v = detail::trim_cell(cell(c));
      if (v.empty()) continue;
      const parsed_time t = parse_seconds(v);
      if (!t)
        problem(where(c), "'" + std::string(v) + "' is not a time in seconds");
      else
        (c == c_start ? r.start : r.end) = t.value;
    }
    if (const std::string_view v = detail::trim_cell(cell(c_confidence)); !v.empty()) {
      r.confidence = number(v);
      if (!r.confidence || *r.confidence < 0 || *r.confidence > 1)
        problem(where(c_confidence), "'" + std::string(v) + "' is not a confidence from 0 to 1");
    }
    const std::optional<std::uint64_t> size = whole(detail::trim_cell(cell(c_size)));
    if (!size || *size == 0) {
      problem(where(c_size), "'" + std::string(cell(c_size)) +
                                 "' is not a stratum size (a whole number of annotations)");
    } else {
      r.stratum_size = *size;
      const auto [it, fresh] = sizes.emplace(r.stratum, std::pair(*size, where(c_size)));
      if (!fresh && it->second.first != *size)
        problem(where(c_size),
                fmt::format("the stratum {} has size {} here but {} above: a sheet's strata "
                            "keep one size",
                            quote_name(r.stratum), *size, it->second.first));
    }
    if (!parse_verdict(r.verdict))
      problem(where(c_verdict), "'" + r.verdict +
                                    "' is not a verdict: yes, no (also y/n, 1/0, true/false) "
                                    "or unsure, or empty when not reviewed");
    out.value.push_back(std::move(r));
  }
  if (scan.failed()) {
    diagnostic d = scan.problem;
    d.file = file;
    out.diagnostics.push_back(std::move(d));
  }
  // More rows of a stratum than it has annotations: the sizes cannot be right.
  std::map<std::string, std::uint64_t> rows_of;
  for (const sample_row& r : out.value)
    ++rows_of[r.stratum];
  for (const auto& [name, n] : rows_of)
    if (const auto it = sizes.find(name); it != sizes.end() && n > it->second.first)
      problem(it->second.second,
              fmt::format("the stratum {} has {} rows but size {}: its size counts every "
                          "annotation of the stratum, sampled or not",
                          quote_name(name), n, it->second.first));
  locate_all(text, out.diagnostics);
  return out;
}

result<std::vector<sample_row>> join_review_sheets(std::vector<review_part> parts) {
  result<std::vector<sample_row>> out;
  std::map<std::string, std::pair<std::uint64_t, std::string>> sizes;  // stratum → N_h, file
  std::map<std::tuple<std::string, std::string, time_ns, time_ns>, std::string> seen;
  auto problem = [&](const std::string& file, std::string message) {
    diagnostic d;
    d.file = file;
    d.code = "review.sheet";
    d.message = std::move(message);
    out.diagnostics.push_back(std::move(d));
  };
  for (review_part& part : parts)
    for (sample_row& r : part.rows) {
      const auto [size, fresh] = sizes.try_emplace(r.stratum, r.stratum_size, part.file);
      if (!fresh && size->second.first != r.stratum_size && size->second.second != part.file)
        problem(part.file, fmt::format("the stratum {} has size {} here but {} in {}: the parts "
                                       "of one sample agree on their strata",
                                       quote_name(r.stratum), r.stratum_size, size->second.first,
                                       size->second.second));
      if (!r.file.empty() || r.start != 0 || r.end != 0) {
        const auto [where, first] =
            seen.try_emplace(std::tuple(r.file, r.tier, r.start, r.end), part.file);
        if (!first)
          problem(part.file,
                  fmt::format("sample {} ({} at {} s) is in {} already: an annotation "
                              "is reviewed once",
                              r.sample_id, r.file, format_seconds(r.start), where->second));
      }
      out.value.push_back(std::move(r));
    }
  return out;
}

}  // namespace tiers
