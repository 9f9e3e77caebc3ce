// `tiers convert IN [-o OUT] [--from F] [--to F] [--tier NAME]... [--allow-loss]`.
#include "convert_command.hpp"

#include <algorithm>
#include <filesystem>
#include <memory>

#include "tiers/detail/report.hpp"
#include "tiers/io.hpp"
#include "tiers/voices.hpp"

namespace tiers::cli {

CLI::App* setup_convert(CLI::App& app, convert_options& o) {
  CLI::App* cmd = app.add_subcommand("convert", "Convert a tier file to another format");
  cmd->add_option("input", o.input.path, "Input file, or - for standard input")
      ->required()
      ->type_name("FILE");
  cmd->add_option("-o,--output", o.output, "Output file, or - for standard output (default)")
      ->type_name("FILE");
  cmd->add_option("--to", o.to,
                  "Output format (" + format_names() + "); default: by the extension of -o")
      ->type_name("FORMAT");
  cmd->add_option("--tier", o.tiers, "Convert only this tier (repeatable)")
      ->allow_extra_args(false)
      ->type_name("NAME");
  cmd->add_flag(
      "--allow-loss", o.allow_loss,
      "Convert even when the output format cannot carry everything; lists what is dropped");
  cmd->add_flag("--voices", o.voices,
                "Join the (selected) tiers into one tier of cues whose speaker is their tier's "
                "name; WebVTT writes them as voice spans");
  add_input_options(*cmd, o.input);
  return cmd;
}

namespace {

const format& output_format(const convert_options& o) {
  if (!o.to.empty()) return format_named(o.to);
  if (o.output.empty() || o.output == "-")
    throw usage_error("name the output format with --to when writing to standard output");
  if (const format* f = format_for_path(o.output)) return *f;
  throw usage_error("cannot tell the output format from '" + o.output + "'; name it with --to (" +
                    format_names() + ")");
}

void keep_tiers(document& doc, const std::vector<std::string>& names, const std::string& file) {
  if (names.empty()) return;
  for (const std::string& n : names)
    if (!find_tier(doc, n)) {
      std::string known;
      for (const tier& t : doc.tiers)
        known += (known.empty() ? "" : ", ") + detail::quote_name(t.name);
      diagnostic d;
      d.file = file;
      d.code = "convert.tier";
      d.message =
          "no tier " + detail::quote_name(n) + " (tiers: " + (known.empty() ? "none" : known) + ")";
      report(d);
      throw rejected();
    }
  std::erase_if(doc.tiers, [&](const tier& t) {
    return std::find(names.begin(), names.end(), t.name) == names.end();
  });
}

}  // namespace

int run_convert(const convert_options& o) {
  const format& to = output_format(o);  // usage errors first, before reading anything
  document doc = load_document(o.input);
  const std::string file = display_name(o.input.path);
  keep_tiers(doc, o.tiers, file);

  std::vector<std::string> losses;
  if (o.voices) {
    const std::string name = o.output.empty() || o.output == "-"
                                 ? std::string("voices")
                                 : std::filesystem::path(o.output).stem().string();
    doc = join_as_voices(doc, name, losses);
  }
  for (std::string& loss : find_losses(doc, to))
    losses.push_back(std::move(loss));
  // A one-tier format keeps no tier name: read back, the tier is named after the file.
  if (!to.carries.has(feature::several_tiers) && !doc.tiers.empty() && !o.output.empty() &&
      o.output != "-") {
    const std::string stem = std::filesystem::path(o.output).stem().string();
    if (doc.tiers.front().name != stem)
      losses.push_back("the tier name " + detail::quote_name(doc.tiers.front().name) + " (a " +
                       std::string(to.name) + " file names no tier; read back, it is named " +
                       detail::quote_name(stem) + " after the file)");
  }
  for (const std::string& loss : losses) {
    diagnostic d;
    d.file = file;
    d.level = o.allow_loss ? severity::warning : severity::error;
    d.code = "convert.loss";
    d.message = std::string(to.name) + (o.allow_loss ? " drops " : " cannot carry ") + loss;
    report(d);
  }
  if (!losses.empty() && !o.allow_loss) {
    std::fprintf(stderr, "tiers: note: nothing was written; --allow-loss converts anyway\n");
    return exit_rejected;
  }

  if (o.output.empty() || o.output == "-") {
    stdout_sink out;
    to.write(doc, out, {});
    out.flush();
  } else {
    atomic_file out(o.output);
    to.write(doc, out, {});
    out.commit();
  }
  return exit_ok;
}

}  // namespace tiers::cli
