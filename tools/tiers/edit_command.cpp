// `tiers edit IN -o OUT [--shift D] [--scale FROM:TO] [--snap RATE] [--cut A..B [--from-zero]]
// [--select T] [--drop T] [--rename OLD=NEW]`: each operation in the order given.
#include "edit_command.hpp"

#include <map>

#include "dataset_inputs.hpp"
#include "tiers/edit.hpp"

namespace tiers::cli {

void setup_edit(CLI::App& app, int& status) {
  auto options = std::make_shared<edit_options>();
  edit_options& o = *options;
  CLI::App* cmd = app.add_subcommand(
      "edit", "Shift, scale, snap and cut times, and select, drop or rename tiers, in order");
  cmd->add_option("input", o.input.path, "Input file, or - for standard input")->type_name("FILE");
  cmd->add_option("--shift", o.shifts,
                  "Add an offset to every time: 1.5s, -250ms, or video frames: -2f")
      ->allow_extra_args(false)
      ->type_name("OFFSET");
  cmd->add_option("--scale", o.scales,
                  "Material timed at one frame rate played at another: 25:24000/1001")
      ->allow_extra_args(false)
      ->type_name("FROM:TO");
  cmd->add_option("--snap", o.snaps, "Move every time to the nearest frame boundary at RATE")
      ->allow_extra_args(false)
      ->type_name("RATE");
  cmd->add_option("--cut", o.cuts,
                  "Keep what lies between two times (seconds or clock time): 60..90, "
                  "00:01:00..00:01:30")
      ->allow_extra_args(false)
      ->type_name("START..END");
  cmd->add_flag("--from-zero", o.from_zero, "A cut's start becomes zero");
  cmd->add_option("--select", o.selects, "Keep this tier (repeatable; the others go)")
      ->allow_extra_args(false)
      ->type_name("TIER");
  cmd->add_option("--drop", o.drops, "Remove this tier")
      ->allow_extra_args(false)
      ->type_name("TIER");
  cmd->add_option("--rename", o.renames, "Rename a tier")
      ->allow_extra_args(false)
      ->type_name("OLD=NEW");
  add_input_options(*cmd, o.input);
  o.command = cmd;
  add_output_options(*cmd, o.output, o.to, o.allow_loss,
                     "Output file, or - for standard output (with --to)");
  add_dataset_options(*cmd, o.dataset, o.output_dir, o.jobs, o.shard, "edited");
  cmd->callback([options, &status] { status = run_edit(*options); });
}

namespace {

// Applies the operations in the order given; false (the reasons printed) when one is refused.
bool edit_document(const edit_options& o, document& doc, const std::string& file) {
  std::map<const CLI::Option*, std::size_t> used;  // how many values of each option are done
  std::vector<std::string> selected;  // consecutive --select options make one selection
  // The library names the problem; the command adds the file and the option it came from.
  auto refused = [&](const std::string& name, std::vector<diagnostic> problems) {
    if (problems.empty()) return false;
    for (diagnostic& d : problems) {
      d.file = file;
      d.message = name + ": " + d.message;
      report(d);
    }
    return true;
  };
  auto flush_selection = [&]() {
    if (selected.empty()) return false;
    const bool bad = refused("--select", apply_edit(doc, {"select", selected}));
    selected.clear();
    return bad;
  };
  for (const CLI::Option* opt : o.command->parse_order()) {
    const std::string name = opt->get_name();
    const std::size_t k = used[opt]++;
    if (name == "--select") {
      selected.push_back(o.selects[k]);
      continue;
    }
    if (flush_selection()) return false;
    const std::vector<std::string>* values = name == "--shift"    ? &o.shifts
                                             : name == "--scale"  ? &o.scales
                                             : name == "--snap"   ? &o.snaps
                                             : name == "--cut"    ? &o.cuts
                                             : name == "--drop"   ? &o.drops
                                             : name == "--rename" ? &o.renames
                                                                  : nullptr;
    if (!values) continue;  // not an operation
    const std::string& value = (*values)[k];
    if (name == "--snap") parse_rate_option(value);  // for its warning about a likely slip
    const edit_step step{name.substr(2), {value}};
    if (refused(name, apply_edit(doc, step, o.input.rate, o.from_zero))) return false;
  }
  return !flush_selection();
}

}  // namespace

int run_edit(const edit_options& o) {
  if (!o.dataset.empty()) {
    const format& to =
        per_recording_format("edit", !o.input.path.empty(), o.output, o.output_dir, o.to);
    const opened_dataset d = open_dataset(o.dataset, o.input, o.shard);
    return for_each_output(d, o.output_dir, to, o.jobs, "editing",
                           [&](const recording& r, const std::string& output) {
                             document doc = load_recording(d, r);
                             if (!edit_document(o, doc, r.id)) throw rejected();
                             write_output(doc, to, output, o.allow_loss, r.id);
                           });
  }
  if (o.input.path.empty()) throw usage_error("edit: name the input, or --dataset");
  if (o.output.empty()) throw usage_error("edit: name the output with -o");
  if (!o.output_dir.empty() || o.jobs || !o.shard.empty())
    throw usage_error("edit: -d, --jobs and --shard go with --dataset");
  const format& to = output_format(o.to, o.output);
  std::string given_name;
  document doc = load_document(o.input, &given_name);
  if (!edit_document(o, doc, display_name(o.input.path))) return exit_rejected;
  write_output(doc, to, o.output, o.allow_loss, display_name(o.input.path), {}, given_name);
  return exit_ok;
}

}  // namespace tiers::cli
