// The output options of commands that print a report: `--format text|csv|json` (`--json` its
// shorthand) and `-o FILE`, and writing the report whole or not at all.
#pragma once

#include <CLI/CLI.hpp>
#include <string>

#include "tiers/sink.hpp"

namespace tiers::cli {

enum class report_format { text, csv, json };

struct report_output {
  std::string format;  ///< empty: text, unless --json
  bool json = false;
  std::string output;  ///< empty or "-": standard output
  /// The format asked for; throws usage_error when --json and --format disagree, or when csv
  /// is asked of a report that has no table form (`csv_is` says what does).
  report_format chosen(const char* command, const char* csv_is = nullptr) const;
};

/// Adds --format text|csv|json (or text|json without `with_csv`), --json and -o/--output.
void add_report_output(CLI::App& cmd, report_output& o, bool with_csv = true);

/// Writes `content` to standard output, or to the file `o.output` (atomically).
void emit(const report_output& o, const std::string& content);

/// What `write(sink)` puts out, as a string.
template <class F>
std::string written(F&& write) {
  std::string text;
  {
    string_sink out(text);
    write(static_cast<byte_sink&>(out));
    out.flush();
  }
  return text;
}

}  // namespace tiers::cli
