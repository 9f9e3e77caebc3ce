// Reading signal tables (CSV, TSV, JSON Lines) of per-frame or per-time scores, located.
#include <algorithm>
#include <charconv>
#include <cmath>
#include <limits>
#include <numeric>

#include "detail/json_tree.hpp"
#include "detail/paths.hpp"
#include "detail/report.hpp"
#include "formats/csv/table_scanner.hpp"
#include "tiers/derive.hpp"
#include "tiers/lag.hpp"

namespace tiers {
namespace {

using detail::make_diagnostic;
using detail::quote_name;

// A row's key and where it is; its scores go straight into one flat array, row after row, so
// that a row costs no allocation of its own.
struct raw_row {
  std::int64_t frame = 0;  // when rows are frames
  time_ns time = 0;
  std::size_t offset = 0;  // of the row
};

class signal_reader {
 public:
  signal_reader(std::string_view text, const signal_options& options, signal_result& out)
      : text_(text), options_(options), out_(out) {}

  void read_table(char delimiter);
  void read_lines();
  void finish();

 private:
  void error(std::string code, std::size_t offset, std::string message) {
    out_.diagnostics.push_back(
        make_diagnostic(severity::error, std::move(code), offset, std::move(message)));
  }
  // Chooses the key column and the score columns from the header names.
  bool header(const std::vector<std::string>& names, std::size_t offset);
  // The phases of finish; each returns false once the signal is refused.
  void order_rows();
  const raw_row& row(std::size_t k) const { return rows_[order_.empty() ? k : order_[k]]; }
  bool distinct_times();
  std::optional<time_ns> usual_step();
  void fill(time_ns step);
  bool set_ends(time_ns step);
  bool key(std::string_view text, std::size_t offset, raw_row& row);
  bool value(std::string_view text, std::size_t offset, const std::string& column, double& v);

  std::string_view text_;
  const signal_options& options_;
  signal_result& out_;
  bool frames_ = false;
  std::size_t key_column_ = 0;
  std::vector<std::size_t> score_columns_;
  std::vector<raw_row> rows_;
  std::vector<double> values_;      // rows_.size() × score columns, row by row
  std::vector<std::size_t> order_;  // the rows in time order; empty when they are already
};

bool signal_reader::header(const std::vector<std::string>& names, std::size_t offset) {
  auto find = [&](std::string_view n) {
    return static_cast<std::size_t>(std::find(names.begin(), names.end(), n) - names.begin());
  };
  const std::size_t frame = find("frame"), time = find("time");
  if (frame < names.size() && time < names.size()) {
    error("derive.header", offset, "both 'frame' and 'time' columns: keep one");
    return false;
  }
  if (frame == names.size() && time == names.size()) {
    error("derive.header", offset, "no 'frame' or 'time' column");
    return false;
  }
  frames_ = frame < names.size();
  key_column_ = frames_ ? frame : time;
  if (frames_ && !options_.rate) {
    error("derive.header", offset, "frame numbers need a frame rate (--rate)");
    return false;
  }
  // With times, --rate is still the media's frame rate (and the length of a single row).
  out_.value.rate = options_.rate;
  if (options_.columns.empty()) {
    for (std::size_t k = 0; k < names.size(); ++k)
      if (k != key_column_) {
        score_columns_.push_back(k);
        out_.value.names.push_back(names[k]);
      }
  } else {
    for (const std::string& c : options_.columns) {
      const std::size_t k = find(c);
      if (k == names.size() || k == key_column_) {
        error("derive.header", offset, "no score column " + quote_name(c));
        return false;
      }
      score_columns_.push_back(k);
      out_.value.names.push_back(c);
    }
  }
  if (score_columns_.empty()) {
    error("derive.header", offset, "no score columns beside " + quote_name(names[key_column_]));
    return false;
  }
  return true;
}

bool signal_reader::key(std::string_view text, std::size_t offset, raw_row& row) {
  if (frames_) {
    auto [p, ec] = std::from_chars(text.data(), text.data() + text.size(), row.frame);
    if (text.empty() || ec != std::errc{} || p != text.data() + text.size() || row.frame < 0) {
      error("derive.frame", offset,
            "frame " + quote_name(text) + " is not a whole number from 0 up");
      return false;
    }
    // The frame's end must be a time too: the interval it makes runs to the next frame.
    const parsed_time t = frame_time(row.frame, *options_.rate);
    if (!t || row.frame == std::numeric_limits<std::int64_t>::max() ||
        !frame_time(row.frame + 1, *options_.rate)) {
      error("time.range", offset, "frame " + std::string(text) + " is out of range");
      return false;
    }
    row.time = t.value;
    return true;
  }
  const parsed_time t =
      text.find(':') != std::string_view::npos ? parse_clock(text) : parse_seconds(text);
  if (!t) {
    error(detail::time_code(t.status, "derive.time"), offset,
          "time " + quote_name(text) + " " + std::string(describe(t.status)));
    return false;
  }
  row.time = t.value;
  return true;
}

bool signal_reader::value(std::string_view text, std::size_t offset, const std::string& column,
                          double& v) {
  while (!text.empty() && text.front() == ' ')
    text.remove_prefix(1);
  while (!text.empty() && text.back() == ' ')
    text.remove_suffix(1);
  auto [p, ec] = std::from_chars(text.data(), text.data() + text.size(), v);
  if (text.empty() || ec != std::errc{} || p != text.data() + text.size() || !std::isfinite(v)) {
    error("derive.score", offset,
          quote_name(column) + " score " + quote_name(text) +
              " is not a number (missing scores are not made up: leave out the row)");
    return false;
  }
  return true;
}

void signal_reader::read_table(char delimiter) {
  detail::table_scanner scanner(text_, delimiter, text_.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0);
  std::vector<detail::table_cell> cells;
  std::size_t offset = 0;
  if (!scanner.next(cells, offset)) {
    if (scanner.failed())
      out_.diagnostics.push_back(scanner.problem);
    else
      error("derive.header", 0, "the file is empty; a signal table needs a header row");
    return;
  }
  std::vector<std::string> names;
  for (const detail::table_cell& c : cells)
    names.emplace_back(c.text);
  if (!header(names, offset)) return;
  while (scanner.next(cells, offset)) {
    if (cells.size() != names.size()) {
      error("csv.fields", offset,
            "row has " + std::to_string(cells.size()) + " fields; the header has " +
                std::to_string(names.size()));
      return;
    }
    raw_row row;
    row.offset = offset;
    if (!key(cells[key_column_].text, cells[key_column_].offset, row)) return;
    for (std::size_t k = 0; k < score_columns_.size(); ++k) {
      const detail::table_cell& c = cells[score_columns_[k]];
      double v = 0;
      if (!value(c.text, c.offset, out_.value.names[k], v)) return;
      values_.push_back(v);
    }
    rows_.push_back(row);
  }
  if (scanner.failed()) out_.diagnostics.push_back(scanner.problem);
}

void signal_reader::read_lines() {
  std::vector<std::string> names;
  for (std::size_t at = text_.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0; at < text_.size();) {
    std::size_t end = text_.find('\n', at);
    if (end == std::string_view::npos) end = text_.size();
    const std::string_view line = text_.substr(at, end - at);
    const std::size_t line_start = at;
    at = end + 1;
    if (line.find_first_not_of(" \t\r") == std::string_view::npos) continue;
    std::vector<diagnostic> problems;
    const auto node = detail::parse_json_tree(line, problems, 4);
    for (diagnostic& d : problems) {
      d.offset += line_start;
      out_.diagnostics.push_back(std::move(d));
    }
    if (!node) return;
    if (node->kind != detail::json_node::type::object) {
      error("derive.row", line_start, "each line is one JSON object");
      return;
    }
    if (names.empty()) {
      names = node->keys;
      if (!header(names, line_start)) return;
    }
    raw_row row;
    row.offset = line_start;
    const detail::json_node* k = node->member(names[key_column_]);
    if (!k || k->kind != detail::json_node::type::number) {
      error("derive.row", line_start + (k ? k->offset : 0),
            "the line has no number " + quote_name(names[key_column_]));
      return;
    }
    if (!key(k->text, line_start + k->offset, row)) return;
    for (std::size_t s = 0; s < score_columns_.size(); ++s) {
      const std::string& column = names[score_columns_[s]];
      const detail::json_node* v = node->member(column);
      double x = 0;
      if (!v) {
        error("derive.score", line_start, "the line has no " + quote_name(column));
        return;
      }
      if (!value(v->kind == detail::json_node::type::number ? std::string_view(v->text)
                                                            : std::string_view(),
                 line_start + v->offset, column, x))
        return;
      values_.push_back(x);
    }
    rows_.push_back(row);
  }
  if (names.empty()) error("derive.header", 0, "the file has no lines");
}

// Rows in time order; a file already in order (the usual case) is not sorted again.
void signal_reader::order_rows() {
  if (std::is_sorted(rows_.begin(), rows_.end(),
                     [](const raw_row& a, const raw_row& b) { return a.time < b.time; }))
    return;
  order_.resize(rows_.size());
  std::iota(order_.begin(), order_.end(), std::size_t{0});
  std::stable_sort(order_.begin(), order_.end(),
                   [&](std::size_t a, std::size_t b) { return rows_[a].time < rows_[b].time; });
}

// derive.duplicate: one value per frame or time. time.range: differences between rows must be
// times themselves (a file from -200 to +200 years is not).
bool signal_reader::distinct_times() {
  for (std::size_t k = 1; k < rows_.size(); ++k) {
    const raw_row& p = row(k - 1);
    const raw_row& r = row(k);
    if (r.time != p.time) continue;
    const raw_row& later = r.offset > p.offset ? r : p;
    error(
        "derive.duplicate", later.offset,
        (frames_ ? "frame " + std::to_string(later.frame) : "time " + format_seconds(later.time)) +
            " appears twice (one value per " + (frames_ ? "frame" : "time") + ")");
    return false;
  }
  time_ns span = 0;
  if (!frames_ && rows_.size() > 1 &&
      __builtin_sub_overflow(row(rows_.size() - 1).time, row(0).time, &span)) {
    error("time.range", row(rows_.size() - 1).offset,
          "the rows span more time than can be held (about 292 years)");
    return false;
  }
  return true;
}

// The usual step between rows by time: the median difference; 0 for frames, which have theirs.
std::optional<time_ns> signal_reader::usual_step() {
  if (frames_ || rows_.empty()) return 0;
  if (rows_.size() > 1) {
    std::vector<time_ns> d;
    d.reserve(rows_.size() - 1);
    for (std::size_t k = 1; k < rows_.size(); ++k)
      d.push_back(row(k).time - row(k - 1).time);
    return quantile(d, 0.5);
  }
  // One row by time has no step to measure: it lasts a frame of --rate, else it cannot be read
  // as a span at all.
  if (!options_.rate) {
    error("derive.time", rows_.front().offset,
          "a single row by time has no length (nothing to measure a step from); give --rate "
          "to make it last one frame");
    return std::nullopt;
  }
  return std::max<time_ns>(1, frame_time(1, *options_.rate).value);
}

// Times and scores in time order; derive.missing where rows are missing.
void signal_reader::fill(time_ns step) {
  signal& s = out_.value;
  const std::size_t columns = s.names.size(), n = rows_.size();
  s.scores.assign(columns, std::vector<double>(n));
  s.times.resize(n);
  s.after_gap.assign(n, false);
  for (std::size_t k = 0; k < n; ++k) {
    const raw_row& r = row(k);
    if (k > 0) {
      const raw_row& p = row(k - 1);
      // A gap is more than one and a half steps (written so that it cannot overflow).
      const time_ns d = r.time - p.time;
      const bool gap = frames_ ? r.frame - p.frame > 1 : d > step && d - step > step / 2;
      if (gap) {
        s.after_gap[k] = true;
        out_.diagnostics.push_back(make_diagnostic(
            severity::warning, "derive.missing", r.offset,
            (frames_
                 ? "frames " + std::to_string(p.frame + 1) + " to " + std::to_string(r.frame - 1)
                 : "rows between " + format_seconds(p.time) + " s and " + format_seconds(r.time) +
                       " s") +
                " are missing: no interval spans them, and no score is made up"));
      }
    }
    s.times[k] = r.time;
    const std::size_t at = order_.empty() ? k : order_[k];
    for (std::size_t c = 0; c < columns; ++c)
      s.scores[c][k] = values_[at * columns + c];
  }
  std::vector<double>().swap(values_);
}

// Each row ends where the next begins, or a step (a frame) later before a gap and at the end.
bool signal_reader::set_ends(time_ns step) {
  signal& s = out_.value;
  const std::size_t n = rows_.size();
  s.ends.resize(n);
  for (std::size_t k = 0; k < n; ++k) {
    const bool last = k + 1 == n || s.after_gap[k + 1];
    if (frames_)
      s.ends[k] = frame_time(row(k).frame + 1, *options_.rate).value;
    else if (!last)
      s.ends[k] = s.times[k + 1];
    else if (__builtin_add_overflow(s.times[k], step, &s.ends[k])) {
      error("time.range", row(k).offset,
            "the row at " + format_seconds(s.times[k]) +
                " s ends a step later, beyond the times that can be held");
      return false;
    }
  }
  // Every interval and every distance between two of them must be a time as well.
  time_ns whole = 0;
  if (n > 0 && __builtin_sub_overflow(s.ends.back(), s.times.front(), &whole)) {
    error("time.range", row(n - 1).offset,
          "the rows span more time than can be held (about 292 years)");
    return false;
  }
  return true;
}

void signal_reader::finish() {
  if (!out_.ok()) return;
  order_rows();
  if (!distinct_times()) return;
  const std::optional<time_ns> step = usual_step();
  if (!step) return;
  fill(*step);
  set_ends(*step);
}

}  // namespace

signal_result read_signal(std::string_view text, signal_format format,
                          const signal_options& options) {
  signal_result out;
  signal_reader reader(text, options, out);
  if (format == signal_format::jsonl)
    reader.read_lines();
  else
    reader.read_table(format == signal_format::tsv ? '\t' : ',');
  reader.finish();
  return out;
}

std::optional<signal_format> signal_format_for_path(std::string_view path) {
  static constexpr std::string_view csv[]{".csv"}, tsv[]{".tsv", ".tab"},
      jsonl[]{".jsonl", ".ndjson"};
  if (detail::has_extension(path, csv)) return signal_format::csv;
  if (detail::has_extension(path, tsv)) return signal_format::tsv;
  if (detail::has_extension(path, jsonl)) return signal_format::jsonl;
  return std::nullopt;
}

}  // namespace tiers
