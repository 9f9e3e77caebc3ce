// Loading input for every subcommand: format choice (--from, extension, content), options,
// and diagnostics on standard error.
#include "cli_common.hpp"

#include <algorithm>
#include <charconv>
#include <cstdio>
#include <filesystem>
#include <memory>
#include <mutex>
#include <numeric>

#include "tiers/io.hpp"
#include "tiers/text.hpp"

namespace tiers::cli {

CLI::Validator positive_size() {
  // Checked on the text: read into a size, "-1" would wrap to the largest size and switch the
  // limit off, and 0 would refuse every file.
  return CLI::Validator(
      [](std::string& text) -> std::string {
        const bool digits =
            !text.empty() && text.find_first_not_of("0123456789") == std::string::npos;
        if (!digits || text.find_first_not_of('0') == std::string::npos)
          return "'" + text + "' is not a whole number of at least 1";
        return {};
      },
      "N >= 1");
}

void add_input_options(CLI::App& cmd, input_options& in) {
  cmd.add_option("--from", in.from,
                 "Input format (" + format_names() + "); default: by extension, else by content")
      ->type_name("FORMAT");
  cmd.add_option("--columns", in.columns,
                 "Tables: where each role is, e.g. tier=Layer,start=Begin,end=End,text=Value")
      ->type_name("ROLE=COLUMN,...");
  cmd.add_option(
         "--tier-name", in.tier_name,
         "Tables without a tier column, and WebVTT: the tier's name (default: the file's stem)")
      ->type_name("NAME");
  cmd.add_option("--time-unit", in.time_unit,
                 "Tables: unit of plain-number times: s, ms or frames (default s; clock time and "
                 "timecode are recognised by their colons)")
      ->check(one_of(time_unit_names))
      ->type_name("UNIT");
  cmd.add_flag("--strict", in.strict,
               "WebVTT: authoring-rule violations (cue order, empty cues, timestamps, repeated "
               "ids) are errors, not warnings");
  cmd.add_option("--max-text-bytes", in.max_text,
                 "Refuse a file with an annotation text longer than this (default 4194304)")
      ->check(positive_size())
      ->type_name("N");
  cmd.add_option("--max-tiers", in.max_tiers,
                 "Refuse a file with more tiers than this (default 100000)")
      ->check(positive_size())
      ->type_name("N");
  cmd.add_option("--rate", in.rate,
                 "Frames per second for frame numbers and timecode: 25, 30000/1001")
      ->type_name("RATE");
  cmd.add_option("--source", in.source,
                 "Who made the tiers read (formats without a field for it: tables, WebVTT): "
                 "human or machine, with the agent and its version, e.g. machine:aligner@2.1")
      ->type_name("KIND[:AGENT[@VERSION]]");
  cmd.add_option("--kind", in.kind,
                 "What the tiers read stand for: interval, or instant (every annotation must be "
                 "a point in time)")
      ->check(CLI::IsMember({"interval", "instant"}))
      ->type_name("KIND");
}

void add_output_options(CLI::App& cmd, std::string& output, std::string& to, bool& allow_loss,
                        const char* output_help) {
  CLI::Option* o = cmd.add_option("-o,--output", output,
                                  output_help ? output_help
                                              : "Output file, or - for standard output (with --to)")
                       ->type_name("FILE");
  if (!output_help) o->required();
  cmd.add_option("--to", to,
                 "Output format (" + format_names() + "); default: by the extension of -o")
      ->type_name("FORMAT");
  cmd.add_flag("--allow-loss", allow_loss,
               "Write even when the output format cannot carry everything; lists what is dropped");
}

std::vector<std::string> shard_of(std::vector<std::string> files, const std::string& spec) {
  std::vector<std::string> out;
  for (std::size_t k : shard_places(files, spec))
    out.push_back(std::move(files[k]));
  return out;
}

void report(const diagnostic& d) {
  // Whole lines, even from many threads at once.
  static std::mutex lines;
  const std::string text = format_diagnostic(d) + "\n";
  const std::lock_guard<std::mutex> lock(lines);
  std::fputs(text.c_str(), stderr);
}

void report_all(std::vector<diagnostic> diagnostics, std::string_view file) {
  for (diagnostic& d : diagnostics) {
    if (d.file.empty()) d.file = file;
    report(d);
  }
  if (has_errors(diagnostics)) throw rejected();
}

rational parse_rate_option(const std::string& text) {
  const rational r = parse_rate_setting(text);
  // Taken exactly, as the option says; but a likely slip is named, once a run.
  static std::once_flag noted;
  if (const auto ntsc = ntsc_rate_abbreviated(text))
    std::call_once(noted, [&] {
      std::fprintf(stderr,
                   "tiers: warning: --rate %s is taken exactly, as %s frames a second; NTSC "
                   "video runs at %s: give --rate %s if that is meant\n",
                   text.c_str(), format_rational(r).c_str(), format_rational(*ntsc).c_str(),
                   format_rational(*ntsc).c_str());
    });
  return r;
}

read_options reading_options(const input_options& in, const std::string& path) {
  std::vector<diagnostic> notes;
  read_options options = tiers::reading_options(in, path, &notes);
  if (!in.rate.empty()) parse_rate_option(in.rate);  // for its warning
  for (const diagnostic& d : notes)
    report(d);
  return options;
}

const format& output_format(const std::string& to, const std::string& output) {
  if (!to.empty()) return format_named(to);
  if (output.empty() || output == "-")
    throw usage_error("name the output format with --to when writing to standard output");
  if (const format* f = format_for_path(output)) return *f;
  throw usage_error("cannot tell the output format from '" + output + "'; name it with --to (" +
                    format_names() + ")");
}

void write_output(const document& doc, const format& to, const std::string& output, bool allow_loss,
                  const std::string& file, std::vector<std::string> losses,
                  const std::string& given_name) {
  for (std::string& loss : find_losses(doc, to, {output, given_name}))
    losses.push_back(std::move(loss));
  for (const std::string& loss : losses) {
    diagnostic d;
    d.file = file;
    d.level = allow_loss ? severity::warning : severity::error;
    d.code = "convert.loss";
    d.message = std::string(to.name) + (allow_loss ? " drops " : " cannot carry ") + loss;
    report(d);
  }
  if (!losses.empty() && !allow_loss) {
    std::fprintf(stderr, "tiers: note: nothing was written; --allow-loss converts anyway\n");
    throw rejected();
  }
  if (output.empty() || output == "-") {
    stdout_sink out;
    to.write(doc, out, {});
    out.flush();
  } else {
    atomic_file out(output);
    to.write(doc, out, {});
    out.commit();
  }
}

std::optional<words_file> words_file_of(const std::string& spec, const input_options& reading,
                                        std::optional<std::string>& tier) {
  std::vector<diagnostic> problems;
  std::optional<words_file> w = tiers::words_file_of(spec, reading, tier, problems);
  report_all(std::move(problems));
  return w;
}

loaded_input load_input(const input_options& in) {
  loaded_input input;
  input.options = reading_options(in, in.path);
  input.settled = tier_settings(in).has_value();
  input.content = read_input(in.path);
  diagnostic why;
  input.fmt = input_format(in, in.path, input.content, why);
  if (!input.fmt) report_all({why});
  return input;
}

document parse_input(const input_options& in, loaded_input&& input, std::string* given_name,
                     bool* warned) {
  read_result result =
      read_document(input.content, *input.fmt, input.options, display_name(in.path));
  input.content = std::string();  // the document holds copies: give the memory back first
  if (warned)
    *warned = std::any_of(result.diagnostics.begin(), result.diagnostics.end(),
                          [](const diagnostic& d) { return d.level == severity::warning; });
  if (result.ok())
    for (diagnostic& d : settle_tiers(result.value, in, display_name(in.path)))
      result.diagnostics.push_back(std::move(d));
  document doc = take(std::move(result));
  if (given_name && !input.fmt->carries.has(feature::several_tiers) && !doc.tiers.empty() &&
      doc.tiers.front().name == input.options.tier_name)
    *given_name = input.options.tier_name;
  return doc;
}

document load_document(const input_options& in, std::string* given_name, bool* warned) {
  return parse_input(in, load_input(in), given_name, warned);
}

bool stream_output(const loaded_input& input, const format& to, const std::string& output,
                   const std::string& file) {
  // Standard output, a pipe or a device would keep what was written before an error: they get
  // the whole document once it is read, as every output does without streaming.
  if (output.empty() || output == "-" || input.settled || !streams_losslessly(*input.fmt, to) ||
      atomic_file::writes_directly(output))
    return false;
  atomic_file out(output);
  const std::unique_ptr<document_handler> writer = to.stream_writer(out);
  stream_result r = stream_document(input.content, *input.fmt, input.options, *writer, file);
  if (r.status == stream_status::not_streamed) return false;  // the temporary goes with `out`
  report_all(std::move(r.diagnostics));
  out.commit();
  return true;
}

}  // namespace tiers::cli
