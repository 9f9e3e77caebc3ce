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
  cmd->add_option("--tier", o.tiers, "Convert only this tier (repeatable)")
      ->allow_extra_args(false)
      ->type_name("NAME");
  cmd->add_flag("--voices", o.voices,
                "Join the (selected) tiers into one tier of cues whose speaker is their tier's "
                "name; WebVTT writes them as voice spans");
  add_input_options(*cmd, o.input);
  add_output_options(*cmd, o.output, o.to, o.allow_loss,
                     "Output file, or - for standard output (the default)");
  return cmd;
}

namespace {

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
  const format& to = output_format(o.to, o.output);  // usage errors first, before reading
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
  write_output(doc, to, o.output, o.allow_loss, file, std::move(losses));
  return exit_ok;
}

}  // namespace tiers::cli
