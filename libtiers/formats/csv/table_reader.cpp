// Reads CSV and TSV tables into tiers: roles found by header name or by a column map, times in
// seconds, milliseconds, frames, clock time or timecode.
#include <algorithm>
#include <array>
#include <charconv>
#include <unordered_map>
#include <unordered_set>

#include "csv_format.hpp"
#include "detail/positions.hpp"
#include "detail/report.hpp"
#include "table_scanner.hpp"

namespace tiers::detail {
namespace {

enum role : std::size_t {
  r_tier,
  r_start,
  r_end,
  r_duration,
  r_text,
  r_markup,
  r_confidence,
  r_id,
  r_parent,
  role_count
};
constexpr std::array<std::string_view, role_count> role_names{
    "tier", "start", "end", "duration", "text", "markup", "confidence", "id", "parent"};
constexpr std::size_t absent = static_cast<std::size_t>(-1);

parsed_time parse_time_cell(std::string_view text, const read_options& options) {
  text = detail::trim_cell(text);
  std::size_t colons = 0;
  bool semicolon = false;
  for (char c : text) {
    colons += c == ':';
    semicolon = semicolon || c == ';';
  }
  if (semicolon || colons == 3) return parse_timecode(text, options.rate);
  if (colons > 0) return parse_clock(text);
  switch (options.unit) {
    case time_unit::milliseconds:
      return parse_milliseconds(text);
    case time_unit::frames:
      return parse_frames(text, options.rate);
    case time_unit::seconds:
      break;
  }
  return parse_seconds(text);
}

class table_reader {
 public:
  // With `stream`, rows are handed to it one by one instead of kept in `out`.
  table_reader(std::string_view input, char delimiter, const read_options& options,
               read_result& out, document_handler* stream = nullptr)
      : scanner_(input, delimiter, input.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0),
        options_(options),
        out_(out),
        positions_(options, out),
        stream_(stream) {}

  stream_status run() {
    std::size_t offset = 0;
    if (!scanner_.next(cells_, offset)) {
      if (scanner_.failed())
        fail(scanner_.problem);
      else
        fail(make_diagnostic(severity::error, "csv.header", 0,
                             "the file is empty; a table needs a header row"));
      return stream_status::done;
    }
    if (!read_header()) return stream_status::done;
    if (!stream_) count_rows();  // a stream keeps no rows: one pass
    if (stream_ && !stream_->begin_document(out_.value)) return stream_status::done;
    while (scanner_.next(cells_, offset))
      if (!read_row(offset)) return scattered_ ? stream_status::not_streamed : stream_status::done;
    if (scanner_.failed()) {
      fail(scanner_.problem);
      return stream_status::done;
    }
    if (stream_ && (streamed_ == absent || stream_->end_tier())) stream_->end_document();
    return stream_status::done;
  }

 private:
  void fail(diagnostic d) { out_.diagnostics.push_back(std::move(d)); }
  bool fail_at(std::string code, std::size_t offset, std::string message) {
    fail(make_diagnostic(severity::error, std::move(code), offset, std::move(message)));
    return false;
  }

  bool read_header() {
    header_.clear();
    std::unordered_set<std::string_view> names;  // a table may have thousands of columns
    for (const table_cell& c : cells_) {
      if (!names.emplace(c.text).second)
        return fail_at("csv.header", c.offset, "column " + quote_name(c.text) + " appears twice");
      header_.emplace_back(c.text);
    }
    columns_.fill(absent);
    std::array<std::string_view, role_count> wanted = role_names;
    std::array<bool, role_count> mapped{};
    for (const auto& [role_name, column] : options_.columns)
      for (std::size_t r = 0; r < role_count; ++r)
        if (role_names[r] == role_name) {
          wanted[r] = column;
          mapped[r] = true;
        }
    for (std::size_t r = 0; r < role_count; ++r) {
      for (std::size_t k = 0; k < header_.size(); ++k)
        if (header_[k] == wanted[r]) columns_[r] = k;
      if (mapped[r] && columns_[r] == absent)
        return fail_at("csv.header", 0,
                       "no column " + quote_name(wanted[r]) + " for role " +
                           quote_name(role_names[r]) + "; the header has " + header_list());
    }
    if (columns_[r_start] == absent)
      return fail_at("csv.header", 0,
                     "no 'start' column; the header has " + header_list() +
                         " (map other names with --columns start=NAME,...)");
    if (columns_[r_end] != absent && columns_[r_duration] != absent)
      return fail_at("csv.header", cells_[columns_[r_duration]].offset,
                     "both 'end' and 'duration' columns: keep one");
    kind_ = columns_[r_end] == absent && columns_[r_duration] == absent ? tier_kind::instant
                                                                        : tier_kind::interval;
    // A time column whose name says milliseconds, read as seconds, is off by a factor of a
    // thousand; the first row's value shows how (the warning waits for it).
    if (options_.unit == time_unit::seconds)
      for (std::size_t r : {r_start, r_end, r_duration})
        if (columns_[r] != absent && names_milliseconds(header_[columns_[r]])) {
          ms_column_ = columns_[r];
          ms_offset_ = cells_[columns_[r]].offset;
          break;
        }
    attribute_columns_.clear();
    for (std::size_t k = 0; k < header_.size(); ++k)
      if (std::find(columns_.begin(), columns_.end(), k) == columns_.end())
        attribute_columns_.push_back(k);
    return true;
  }

  // Rows per tier, counted before reading them: each tier's annotations are then allocated
  // once, at their final size, instead of growing and moving every annotation made so far —
  // faster, and a lower peak of memory. A problem stops the count; the reading reports it.
  void count_rows() {
    table_scanner counter = scanner_;
    std::vector<table_cell> cells;
    std::size_t offset = 0;
    std::string last;
    std::size_t* count = nullptr;
    while (counter.next(cells, offset) && cells.size() == header_.size()) {
      const std::string_view name = columns_[r_tier] == absent
                                        ? std::string_view(options_.tier_name)
                                        : cells[columns_[r_tier]].text;
      if (!count || name != last) {
        last = name;
        count = &expected_rows_[last];
      }
      ++*count;
    }
  }

  std::string header_list() const {
    std::string s;
    for (std::size_t k = 0; k < header_.size(); ++k)
      s += (k ? ", " : "") + quote_name(header_[k]);
    return s;
  }

  // The index of the tier called `name`, made on its first row (which is where it is said to
  // be, for messages about the tier).
  std::size_t tier_for(std::string_view name, std::size_t row_offset) {
    if (last_tier_ != absent && out_.value.tiers[last_tier_].name == name) return last_tier_;
    auto it = tier_index_.find(std::string(name));
    if (it == tier_index_.end()) {
      it = tier_index_.emplace(std::string(name), out_.value.tiers.size()).first;
      tier& t = out_.value.tiers.emplace_back();
      t.name = name;
      t.kind = kind_;
      if (auto e = expected_rows_.find(t.name); e != expected_rows_.end() && !stream_)
        t.annotations.reserve(e->second);
      positions_.tier(row_offset);
    }
    last_tier_ = it->second;
    return last_tier_;
  }

  bool time_cell(std::size_t role, time_ns& value) {
    const table_cell& c = cells_[columns_[role]];
    const parsed_time t = parse_time_cell(c.text, options_);
    if (!t) {
      if (detail::trim_cell(c.text).empty())
        return fail_at("csv.time", c.offset, "empty " + std::string(role_names[role]) + " time");
      return fail_at(time_code(t.status, "csv.time"), c.offset,
                     std::string(role_names[role]) + " " + quote_name(c.text) + " " +
                         std::string(describe(t.status)));
    }
    value = t.value;
    return true;
  }

  // An optional text cell: empty means absent.
  const table_cell* optional_cell(std::size_t role) const {
    if (columns_[role] == absent || cells_[columns_[role]].text.empty()) return nullptr;
    return &cells_[columns_[role]];
  }

  bool read_row(std::size_t offset) {
    if (cells_.size() != header_.size())
      return fail_at("csv.fields", offset,
                     "row has " + std::to_string(cells_.size()) + " fields; the header has " +
                         std::to_string(header_.size()));
    const std::string_view name = columns_[r_tier] == absent ? std::string_view(options_.tier_name)
                                                             : cells_[columns_[r_tier]].text;
    if (ms_column_ != absent) warn_milliseconds();
    annotation a;
    if (!time_cell(r_start, a.start)) return false;
    a.end = a.start;
    if (columns_[r_end] != absent && !time_cell(r_end, a.end)) return false;
    if (columns_[r_duration] != absent) {
      time_ns d = 0;
      if (!time_cell(r_duration, d)) return false;
      if (__builtin_add_overflow(a.start, d, &a.end))
        return fail_at("time.range", cells_[columns_[r_duration]].offset,
                       "start + duration is out of range");
    }
    if (columns_[r_text] != absent) a.text = cells_[columns_[r_text]].text;
    if (auto c = optional_cell(r_markup)) a.markup = std::string(c->text);
    if (auto c = optional_cell(r_id)) a.id = std::string(c->text);
    if (auto c = optional_cell(r_parent)) a.parent = std::string(c->text);
    if (auto c = optional_cell(r_confidence)) {
      const std::string_view v = detail::trim_cell(c->text);
      double conf = 0;
      auto [p, ec] = std::from_chars(v.data(), v.data() + v.size(), conf);
      if (ec != std::errc{} || p != v.data() + v.size() || !(conf >= 0.0 && conf <= 1.0))
        return fail_at("csv.confidence", c->offset,
                       "confidence " + quote_name(c->text) + " is not a number from 0 to 1");
      a.confidence = conf;
    }
    for (std::size_t k : attribute_columns_)
      if (!cells_[k].text.empty()) a.attributes.emplace(header_[k], cells_[k].text);
    const std::size_t index = tier_for(name, offset);
    if (stream_) return hand_over(index, a);
    out_.value.tiers[index].annotations.push_back(std::move(a));
    positions_.annotation(index, offset);
    return true;
  }

  // Streaming: a row of the tier being handed over, or the first of the next one.
  bool hand_over(std::size_t index, const annotation& a) {
    if (index != streamed_) {
      // A tier met again after another: its rows are apart, and would make two tiers of one
      // name in a stream.
      if (index + 1 != out_.value.tiers.size()) {
        scattered_ = true;
        return false;
      }
      if (streamed_ != absent && !stream_->end_tier()) return false;
      streamed_ = index;
      if (!stream_->begin_tier(out_.value.tiers[index])) return false;
    }
    return stream_->add(a);
  }

  table_scanner scanner_;
  const read_options& options_;
  read_result& out_;
  position_recorder positions_;
  // Once, at the first row: the column that looks like milliseconds and what its value means.
  void warn_milliseconds() {
    const std::string_view cell = detail::trim_cell(cells_[ms_column_].text);
    const parsed_time as_ms = parse_milliseconds(cell);
    const bool plain = as_ms && cell.find(':') == std::string_view::npos;
    const std::string value =
        plain ? " (its first value, " + std::string(cell) + ", as " + std::string(cell) + " s)"
              : "";
    const std::string meant = plain ? " (" + format_seconds(as_ms.value) + " s)" : "";
    out_.diagnostics.push_back(
        make_diagnostic(severity::warning, "csv.unit", ms_offset_,
                        "column " + quote_name(header_[ms_column_]) + " is read in seconds" +
                            value + ", but its name says milliseconds" + meant +
                            "; give --time-unit ms if it holds milliseconds"));
    ms_column_ = absent;
  }

  // `*_ms`, `*_msec`, `*millis*` (as in `millisecond`), in any case.
  static bool names_milliseconds(std::string_view name) {
    std::string lower(name);
    for (char& c : lower)
      c = static_cast<char>(c >= 'A' && c <= 'Z' ? c - 'A' + 'a' : c);
    auto ends = [&](std::string_view suffix) {
      return lower.size() >= suffix.size() &&
             lower.compare(lower.size() - suffix.size(), suffix.size(), suffix) == 0;
    };
    return ends("_ms") || ends("_msec") || ends("-ms") || ends("_msecs") ||
           lower.find("millis") != std::string::npos;
  }

  std::size_t ms_column_ = absent, ms_offset_ = 0;
  std::vector<table_cell> cells_;
  std::vector<std::string> header_;
  std::array<std::size_t, role_count> columns_{};
  std::vector<std::size_t> attribute_columns_;
  tier_kind kind_ = tier_kind::interval;
  std::unordered_map<std::string, std::size_t> tier_index_;
  std::unordered_map<std::string, std::size_t> expected_rows_;  // tier name -> rows, counted
  std::size_t last_tier_ = absent;
  document_handler* stream_;
  bool scattered_ = false;         // streaming met a tier's rows apart
  std::size_t streamed_ = absent;  // the tier being handed over
};

read_result read_table(std::string_view input, char delimiter, const read_options& options) {
  read_result out;
  table_reader(input, delimiter, options, out).run();
  return out;
}

stream_status stream_table(std::string_view input, char delimiter, const read_options& options,
                           document_handler& to, std::vector<diagnostic>& diagnostics) {
  read_result out;
  const stream_status status = table_reader(input, delimiter, options, out, &to).run();
  diagnostics = std::move(out.diagnostics);
  return status;
}

// 2 when the first line names a start column, 1 when it at least has the delimiter.
int sniff_table(std::string_view head, char delimiter) {
  if (head.substr(0, 3) == "\xEF\xBB\xBF") head.remove_prefix(3);
  const std::string_view line = head.substr(0, head.find_first_of("\r\n"));
  if (line.find(delimiter) == std::string_view::npos) return 0;
  table_scanner scanner(line, delimiter);
  std::vector<table_cell> cells;
  std::size_t offset = 0;
  if (!scanner.next(cells, offset)) return 0;
  for (const table_cell& c : cells)
    if (c.text == "start") return 2;
  return 1;
}

}  // namespace

read_result read_csv(std::string_view input, const read_options& options) {
  return read_table(input, ',', options);
}
read_result read_tsv(std::string_view input, const read_options& options) {
  return read_table(input, '\t', options);
}
stream_status stream_csv(std::string_view input, const read_options& options, document_handler& to,
                         std::vector<diagnostic>& diagnostics) {
  return stream_table(input, ',', options, to, diagnostics);
}
stream_status stream_tsv(std::string_view input, const read_options& options, document_handler& to,
                         std::vector<diagnostic>& diagnostics) {
  return stream_table(input, '\t', options, to, diagnostics);
}
int sniff_csv(std::string_view head) {
  return sniff_table(head, ',');
}
int sniff_tsv(std::string_view head) {
  return sniff_table(head, '\t');
}

}  // namespace tiers::detail
