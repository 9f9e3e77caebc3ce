// The HTML report: one self-contained page that draws each file's tiers as lanes on a time
// axis, with the problems a check found, the captions' lag over time and where two tiers agree.
#pragma once

#include <span>
#include <string>

#include "tiers/agree.hpp"
#include "tiers/check.hpp"
#include "tiers/model.hpp"
#include "tiers/sink.hpp"

namespace tiers {

/// One file of the report. Only `check` is required: without a document, the file's problems
/// are listed but nothing is drawn (a file that could not be read, or one past the drawing cap).
struct report_file {
  const file_report* check = nullptr;  ///< path, problems and lag statistics
  const document* doc = nullptr;       ///< the tiers drawn as lanes
  /// Two tiers compared as in `tiers agree`: a strip of agreement over time and the figures.
  const tier* reference = nullptr;
  const tier* candidate = nullptr;
};

struct html_report_options {
  std::string title = "tiers report";
  std::string profile;  ///< the profile's name, shown under the title; empty: the defaults
  time_ns max_late = 3 * ns_per_second;  ///< the lag plot's threshold lines (the profile's)
  time_ns max_early = 1'500'000'000;
  time_ns step = 10'000'000;     ///< the agreement grid's step
  std::int64_t step_frames = 0;  ///< a step in frames, at `rate` (time_grid)
  rational rate{};
  segment_options matching;  ///< how agreement matches segments
};

/// Writes the page: HTML with its style, script and data inline, needing no network. Text from
/// the files is escaped for HTML, and the data for the script element it sits in.
void write_html_report(std::span<const report_file> files, const html_report_options& options,
                       byte_sink& out);

/// A recording's page in a dataset's report, for the index page that links them.
struct report_index_entry {
  const file_report* check = nullptr;  ///< the recording's id (as path), problems and lag
  std::string page;                    ///< the page, relative to the index
};

/// Writes the index page of a dataset's report: the dataset's totals (recordings, those with
/// errors and warnings, problems by severity) and a row per recording with its problems and
/// captions' lag, linking its page. Self-contained like the report's pages.
void write_html_index(std::span<const report_index_entry> entries,
                      const html_report_options& options, byte_sink& out);

}  // namespace tiers
