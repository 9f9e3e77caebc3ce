// From per-frame detector scores to interval tiers: reading a signal table, and hysteresis
// thresholding with smoothing, bridging and a minimum duration.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/model.hpp"
#include "tiers/names.hpp"

namespace tiers {

/// Scores sampled over time: one row per frame (or per time), one column per score.
struct signal {
  std::vector<std::string> names;           ///< the score columns
  std::vector<time_ns> times;               ///< each row's start, increasing
  std::vector<time_ns> ends;                ///< each row's end: the next row's start, or one step
  std::vector<bool> after_gap;              ///< rows that follow missing rows
  std::vector<std::vector<double>> scores;  ///< [column][row]
  std::optional<rational> rate;  ///< the media's frame rate (given for frames; optional for times)
};

enum class signal_format : std::uint8_t { csv, tsv, jsonl };
inline constexpr enum_name<signal_format> signal_format_names[]{
    {signal_format::csv, "csv"}, {signal_format::tsv, "tsv"}, {signal_format::jsonl, "jsonl"}};
/// The signal format a path's extension names (.csv; .tsv or .tab; .jsonl or .ndjson, in any
/// case), if any.
std::optional<signal_format> signal_format_for_path(std::string_view path);

struct signal_options {
  std::optional<rational> rate;      ///< frames per second, for a `frame` column
  std::vector<std::string> columns;  ///< the score columns to read (default: all others)
};

/// Reads a table with a `frame` column (whole numbers; needs `rate`) or a `time` column
/// (seconds or clock time), and numeric score columns. Rows may come in any order; they are
/// sorted. A repeated frame or time, a non-numeric score or a bad time is an error located at
/// its cell; missing frames (a gap of more than one frame, or of more than 1.5 median steps
/// between times) are warnings, and no value is made up for them: `after_gap` marks the row
/// after each gap, and rows before a gap end after one step. Codes: `derive.*`, `csv.*`,
/// `json.*`.
using signal_result = result<signal>;
signal_result read_signal(std::string_view text, signal_format format,
                          const signal_options& options);

/// How scores become intervals.
struct derive_options {
  double on = 0.5;              ///< an interval starts where the score reaches this
  std::optional<double> off;    ///< and ends where it falls below this (default: `on`)
  std::size_t smooth = 1;       ///< median over this many rows first (odd; 1: none)
  time_ns bridge = 0;           ///< join intervals whose gap is shorter than this
  time_ns min_duration = 0;     ///< then drop intervals shorter than this
  bool max_confidence = false;  ///< confidence is the maximum score inside, not the mean
  /// The tiers' names and the intervals' text: `{score}` stands for the score column's name;
  /// empty: the column's name.
  std::string tier_name, label;
  tier_source source{source_kind::machine, std::nullopt, std::nullopt};
};

/// One interval tier per score column, named after it (or `tier_name`); each annotation's text
/// is the column's name (or `label`) and its confidence the mean (or maximum) raw score of the rows
/// inside it (when that is not in [0, 1], it is kept as the attribute `score` instead). Intervals
/// never span missing rows (nor are they bridged across them). The tiers record the options as
/// attributes (`derive:on`, …); the media's frame rate is the signal's.
document derive_tiers(const signal& s, const derive_options& options);

/// `pattern` with every `{score}` replaced by `score`; `score` itself when `pattern` is empty.
std::string derived_name(const std::string& pattern, const std::string& score);

/// How scores become tiers, as options give them (`tiers derive`, Python's tiers.derive);
/// durations as `0.5s`, `250ms` or `5f` (frames at the signal's rate).
struct derive_settings {
  std::string from;    ///< csv, tsv or jsonl; empty: by the path's extension (stdin: csv)
  std::string rate;    ///< frames per second of a `frame` column
  std::string scores;  ///< the score columns, comma-separated; empty: all
  double on = 0.5;
  std::optional<double> off;
  std::size_t smooth = 1;
  std::string min_duration = "0", bridge = "0";
  std::string confidence = "mean";  ///< or max
  std::string agent;                ///< the detector; empty: the file's stem, else "detector"
  std::string agent_version;
  std::string tier_name, label;  ///< `{score}` stands for the score column
};

/// The settings checked, for the signal at `path`: how to read it and how to derive its
/// tiers. The bridge and minimum duration stay as given until the signal's rate is known.
struct derive_request {
  signal_format format = signal_format::csv;
  signal_options reading;
  derive_options derive;
  std::string bridge, min_duration;
};
/// Throws usage_error on a bad value (an `off` above `on`, an even `smooth`, a format that
/// neither `from` nor the path tells).
derive_request derive_request_of(const derive_settings& settings, const std::string& path);

/// The tiers derived from the signal table `text`, read from `file` (its problems located
/// there): derive_tiers with the bridge and minimum duration at the signal's rate.
result<document> derive_signal(std::string_view text, const std::string& file,
                               const derive_request& request);

}  // namespace tiers
