// `tiers convert IN [-o OUT] [--from F] [--to F] [--tier NAME]... [--allow-loss]`, and
// `tiers convert IN... -d DIR --to F [--jobs N] [--shard K/N] [--resume]` for many files.
#include "convert_command.hpp"

#include "batch.hpp"
#include "dataset_inputs.hpp"

#include <sys/stat.h>

#include <algorithm>
#include <filesystem>
#include <map>
#include <memory>
#include <numeric>
#include <unordered_set>

#include "tiers/edit.hpp"
#include "tiers/io.hpp"
#include "tiers/voices.hpp"

namespace tiers::cli {

void setup_convert(CLI::App& app, int& status) {
  auto options = std::make_shared<convert_options>();
  convert_options& o = *options;
  CLI::App* cmd = app.add_subcommand("convert", "Convert a tier file to another format");
  cmd->add_option("inputs", o.inputs,
                  "Input file, or - for standard input; with -d, files and folders (searched "
                  "recursively)")
      ->type_name("FILE");
  cmd->add_option("--dataset", o.dataset,
                  "A dataset description: with -d, write one file per recording, its sources' "
                  "tiers joined")
      ->type_name("FILE");
  cmd->add_option("-d,--output-dir", o.output_dir,
                  "Convert many files into this folder, keeping their layout below the folders "
                  "named (needs --to)")
      ->type_name("DIR");
  cmd->add_option("--jobs", o.jobs, "With -d: files converted at once (default: one per core)")
      ->type_name("N");
  cmd->add_option("--shard", o.shard, "With -d: convert only part K of N of the (sorted) files")
      ->type_name("K/N");
  cmd->add_flag("--resume", o.resume,
                "With -d: skip files whose output is already there and newer than the input "
                "(outputs are written whole or not at all, so one that exists is complete)");
  cmd->add_flag("--in-place", o.in_place,
                "With -d: let an output replace its own input, only where the conversion loses "
                "nothing (no loss, and no warning from reading: a skipped cue counts)");
  cmd->add_option("--tier", o.tiers, "Convert only this tier (repeatable)")
      ->allow_extra_args(false)
      ->type_name("NAME");
  cmd->add_flag("--voices", o.voices,
                "Join the (selected) tiers into one tier of cues whose speaker is their tier's "
                "name; WebVTT writes them as voice spans");
  add_input_options(*cmd, o.input);
  add_output_options(*cmd, o.output, o.to, o.allow_loss,
                     "Output file, or - for standard output (the default)");
  cmd->callback([options, &status] { status = run_convert(*options); });
}

namespace {

// One conversion; throws rejected (reasons printed) or tiers::error. `replaces_input`: the
// output is the input itself, which only a lossless conversion may replace.
void convert_one(const convert_options& o, const input_options& in, const format& to,
                 const std::string& output, bool replaces_input = false) {
  std::string given_name;
  bool warned = false;
  const std::string file = display_name(in.path);
  loaded_input input = load_input(in);
  if (o.tiers.empty() && !o.voices && !replaces_input && stream_output(input, to, output, file))
    return;
  document doc = parse_input(in, std::move(input), &given_name, &warned);
  if (replaces_input && warned) {
    diagnostic d;
    d.file = file;
    d.code = "convert.loss";
    d.message =
        "--in-place: reading it gave warnings (above), so its conversion is not "
        "lossless; the file is left as it was";
    report_all({d});
  }
  if (!o.tiers.empty()) report_all(select_tiers(doc, o.tiers), file);
  std::vector<std::string> losses;
  if (o.voices) {
    const std::string name =
        output.empty() || output == "-" ? std::string("voices") : name_from_path(output);
    doc = join_as_voices(doc, name, losses);
  }
  // In place, a loss is refused even with --allow-loss: the original would be gone with it.
  write_output(doc, to, output, o.allow_loss && !replaces_input, file, std::move(losses),
               given_name);
}

using file_identity = std::pair<dev_t, ino_t>;

// Every input of the run (all shards'), by identity: an output must never replace one, or what
// its reader skipped or could not apply would be gone with the original.
std::map<file_identity, std::string> identities(const std::vector<input_file>& files) {
  std::map<file_identity, std::string> inputs;
  for (const input_file& f : files) {
    struct stat st {};
    if (::stat(f.path.c_str(), &st) == 0)
      inputs.emplace(file_identity{st.st_dev, st.st_ino}, f.path);
  }
  return inputs;
}

// Every output path, decided (and checked for clashes) before anything is written.
std::vector<std::string> output_paths(const std::vector<input_file>& files, const format& to,
                                      const std::string& dir) {
  namespace fs = std::filesystem;
  std::vector<std::string> outputs;
  for (const input_file& f : files) {
    if (f.path == "-") throw usage_error("convert -d reads files, not standard input");
    fs::path out = fs::path(dir) / f.relative;
    out.replace_extension(std::string(to.extensions.front()));
    outputs.push_back(out.string());
  }
  // Clashes are neighbours once sorted (stable: the earlier input is named first).
  std::vector<std::size_t> by_output(outputs.size());
  std::iota(by_output.begin(), by_output.end(), std::size_t{0});
  std::stable_sort(by_output.begin(), by_output.end(),
                   [&](std::size_t a, std::size_t b) { return outputs[a] < outputs[b]; });
  for (std::size_t k = 1; k < by_output.size(); ++k) {
    const std::size_t i = by_output[k - 1], j = by_output[k];
    if (outputs[i] == outputs[j])
      throw usage_error("convert -d: " + files[std::min(i, j)].path + " and " +
                        files[std::max(i, j)].path + " would both be written to " + outputs[i]);
  }
  return outputs;
}

// Which outputs replace their own input (only with --in-place); replacing any other input is
// refused before anything is written.
std::vector<char> replaced_inputs(const std::vector<input_file>& files,
                                  const std::vector<std::string>& outputs,
                                  const std::map<file_identity, std::string>& inputs,
                                  bool in_place) {
  std::vector<char> replaces(outputs.size(), 0);
  for (std::size_t k = 0; k < outputs.size(); ++k) {
    struct stat st {};
    if (::stat(outputs[k].c_str(), &st) != 0) continue;
    const auto it = inputs.find({st.st_dev, st.st_ino});
    if (it == inputs.end()) continue;
    // Only its own input, and only when asked: another input's original would be gone.
    if (!in_place || it->second != files[k].path)
      throw usage_error("convert -d: " + outputs[k] + " would replace the input " + it->second +
                        "; write to another folder" +
                        (it->second == files[k].path ? " or give --in-place" : "") +
                        " (nothing was written)");
    replaces[k] = 1;
  }
  return replaces;
}

// One file of a batch: whatever goes wrong fails that file alone, said on standard error.
bool convert_in_batch(const convert_options& o, const input_file& file, const format& to,
                      const std::string& output, bool replaces_input) {
  namespace fs = std::filesystem;
  std::error_code ec;
  if (o.resume && fs::exists(output, ec) &&
      fs::last_write_time(output, ec) >= fs::last_write_time(file.path, ec))
    return true;
  input_options in = o.input;
  in.path = file.path;
  try {
    fs::create_directories(fs::path(output).parent_path(), ec);
    convert_one(o, in, to, output, replaces_input);
    return true;
  } catch (const rejected&) {
  } catch (const error& e) {
    report(e.diag());
  } catch (const std::exception& e) {  // out of memory, above all: that file fails alone
    diagnostic d;
    d.file = display_name(file.path);
    d.code = "io.read";
    d.message = std::string("could not be converted: ") + e.what();
    report(d);
  }
  return false;
}

int convert_many(const convert_options& o) {
  if (o.to.empty()) throw usage_error("convert -d: name the output format with --to");
  const format& to = format_named(o.to);
  if (!o.output.empty()) throw usage_error("convert: give either -o or -d, not both");
  std::vector<input_file> files = expand_inputs(o.inputs);
  const std::map<file_identity, std::string> inputs = identities(files);
  if (!o.shard.empty()) {
    std::vector<std::string> paths;
    for (const input_file& f : files)
      paths.push_back(f.path);
    const std::vector<std::string> picked = shard_of(paths, o.shard);
    const std::unordered_set<std::string> mine(picked.begin(), picked.end());
    std::erase_if(files, [&](const input_file& f) { return !mine.count(f.path); });
  }
  const std::vector<std::string> outputs = output_paths(files, to, o.output_dir);
  if (o.in_place && o.resume)
    throw usage_error("convert: --in-place and --resume do not go together");
  const std::vector<char> replaces = replaced_inputs(files, outputs, inputs, o.in_place);
  std::vector<char> failed(files.size(), 0);
  run_parallel(
      files.size(), o.jobs,
      [&](std::size_t k) {
        failed[k] = !convert_in_batch(o, files[k], to, outputs[k], replaces[k] != 0);
      },
      "converting");
  const auto n = static_cast<std::size_t>(std::count(failed.begin(), failed.end(), 1));
  if (n > 0)
    std::fprintf(stderr, "tiers: %zu of %zu files not converted (see above)\n", n, files.size());
  return n > 0 ? exit_rejected : exit_ok;
}

// Each recording of a dataset into one file, OUT/ID.EXT: its files joined into one document.
int convert_dataset(const convert_options& o) {
  namespace fs = std::filesystem;
  const format& to =
      per_recording_format("convert", !o.inputs.empty(), o.output, o.output_dir, o.to);
  if (o.in_place || o.voices || !o.tiers.empty())
    throw usage_error("convert --dataset: --in-place, --tier and --voices are for files");
  const opened_dataset d = open_dataset(o.dataset, o.input, o.shard);
  return for_each_output(
      d, o.output_dir, to, o.jobs, "converting",
      [&](const recording& r, const std::string& output) {
        std::error_code ec;
        if (o.resume && fs::exists(output, ec)) {
          const auto written = fs::last_write_time(output, ec);
          const bool newer = std::all_of(r.files.begin(), r.files.end(), [&](const std::string& f) {
            return f.empty() || fs::last_write_time(d.path_of(f), ec) <= written;
          });
          if (newer && r.complete()) return;
        }
        const document doc = load_recording(d, r);
        write_output(doc, to, output, o.allow_loss, r.id);
      });
}

}  // namespace

int run_convert(const convert_options& o) {
  if (!o.dataset.empty()) return convert_dataset(o);
  if (o.inputs.empty()) throw usage_error("convert: name the input, or --dataset");
  if (!o.output_dir.empty() || o.inputs.size() > 1) {
    if (o.output_dir.empty())
      throw usage_error("convert: several inputs need an output folder (-d)");
    return convert_many(o);
  }
  if (!o.shard.empty() || o.resume || o.jobs)
    throw usage_error("convert: --jobs, --shard and --resume go with -d");
  const format& to = output_format(o.to, o.output);  // usage errors first, before reading
  input_options in = o.input;
  in.path = o.inputs.front();
  convert_one(o, in, to, o.output);
  return exit_ok;
}

}  // namespace tiers::cli
