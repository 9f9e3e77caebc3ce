// Report output options and writing.
#include "table_output.hpp"

#include "cli_common.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {

report_format report_output::chosen(const char* command, const char* csv_is) const {
  if (json && !format.empty() && format != "json")
    throw usage_error(std::string(command) + ": --json and --format " + format + " disagree");
  if (json || format == "json") return report_format::json;
  if (format == "csv") {
    if (!csv_is)
      throw usage_error(std::string(command) + ": this report has no CSV form; use text or json");
    return report_format::csv;
  }
  return report_format::text;
}

void add_report_output(CLI::App& cmd, report_output& o, bool with_csv) {
  cmd.add_option("--format", o.format,
                 with_csv ? "Report as text (default), csv or json" : "Report as text or json")
      ->check(with_csv ? CLI::IsMember({"text", "csv", "json"}) : CLI::IsMember({"text", "json"}))
      ->type_name("FORMAT");
  cmd.add_flag("--json", o.json, "Short for --format json");
  cmd.add_option("-o,--output", o.output, "Write the report to FILE (default: standard output)")
      ->type_name("FILE");
}

void emit(const report_output& o, const std::string& content) {
  if (o.output.empty() || o.output == "-") {
    stdout_sink out;
    out.write(content);
    out.flush();
    return;
  }
  atomic_file out(o.output);
  out.write(content);
  out.commit();
}

}  // namespace tiers::cli
