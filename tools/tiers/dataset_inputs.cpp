// Opening a dataset description and reading its recordings, for every command's --dataset.
#include "dataset_inputs.hpp"

#include <algorithm>
#include <atomic>
#include <charconv>
#include <filesystem>

#include "batch.hpp"
#include "tiers/derive.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {
namespace {

namespace fs = std::filesystem;

diagnostic error_at(const std::string& file, std::string code, std::string message) {
  diagnostic d;
  d.file = file;
  d.code = std::move(code);
  d.message = std::move(message);
  return d;
}

std::size_t size_value(const std::string& name, const std::string& text) {
  std::size_t n = 0;
  const char* end = text.data() + text.size();
  if (std::from_chars(text.data(), end, n).ptr != end || n == 0 || text[0] == '+')
    throw usage_error(name + ": '" + text + "' is not a whole number of at least 1");
  return n;
}

// The command's reading options with a source's `read` over them. Throws usage_error on a
// value the command line would refuse, which the caller locates in the description.
input_options reading_of(const dataset_source& s, input_options in) {
  for (const auto& [name, value] : s.read) {
    if (name == "from") {
      in.from = value;
    } else if (name == "columns") {
      in.columns = value;
    } else if (name == "tier_name") {
      in.tier_name = value;
    } else if (name == "time_unit") {
      if (!value_named(time_unit_names, value))
        throw usage_error("time_unit: '" + value + "' is not one of " +
                          quoted_names(time_unit_names));
      in.time_unit = value;
    } else if (name == "rate") {
      in.rate = value;
    } else if (name == "strict") {
      if (value != "true" && value != "false")
        throw usage_error("strict: '" + value + "' is neither true nor false");
      in.strict = value == "true";
    } else if (name == "max_text_bytes") {
      in.max_text = size_value(name, value);
    } else if (name == "max_tiers") {
      in.max_tiers = size_value(name, value);
    }
  }
  reading_options(in, "");  // every other value's check, as the command line's
  return in;
}

}  // namespace

void add_dataset_options(CLI::App& cmd, std::string& dataset, std::string& dir, unsigned& jobs,
                         std::string& shard, const std::string& done) {
  cmd.add_option(
         "--dataset", dataset,
         "A dataset description: each recording (its files joined) " + done + " alike, into -d")
      ->type_name("FILE");
  cmd.add_option("-d,--output-dir", dir,
                 "With --dataset: write each recording here, as ID.EXT (needs --to)")
      ->type_name("DIR");
  cmd.add_option("--jobs", jobs, "With --dataset: recordings at once (default: one per core)")
      ->type_name("N");
  cmd.add_option("--shard", shard, "With --dataset: only part K of N of the recordings (by id)")
      ->type_name("K/N");
}

std::string opened_dataset::path_of(const std::string& relative) const {
  return root.empty() || root == "." ? relative : (fs::path(root) / relative).string();
}

opened_dataset open_dataset(const std::string& path, const input_options& base,
                            const std::string& shard) {
  opened_dataset d;
  d.file = display_name(path);
  const std::string text = read_input(path);
  d.description = take(read_dataset(text, d.file));
  d.root = fs::path(path).parent_path().string();
  // The command line's --source and --kind hold where a source says nothing of its own.
  const std::optional<dataset_source> given = tier_settings(base);
  std::vector<diagnostic> problems;
  for (dataset_source& s : d.description.sources) {
    if (given && !s.source) s.source = given->source;
    if (given && !s.kind) s.kind = given->kind;
    try {
      if (s.signal) {  // read by derive: only its own options apply
        for (const auto& [name, value] : s.read)
          if (name == "from" ? !value_named(signal_format_names, value) : name != "rate")
            throw usage_error("a signal source reads with 'from' (" +
                              quoted_names(signal_format_names) + ") and 'rate' only");
        d.reading.push_back(input_options{});
        continue;
      }
      input_options in = reading_of(s, base);
      if (in.tier_name.empty()) in.tier_name = tier_name_of(s.pattern);
      in.source.clear();
      in.kind.clear();
      d.reading.push_back(std::move(in));
    } catch (const usage_error& e) {
      // The command line's words for its options, as the description names them.
      std::string message = e.what();
      if (message.starts_with("--")) {
        message.erase(0, 2);
        for (std::size_t k = 0; k < message.size() && message[k] != ':'; ++k)
          if (message[k] == '-') message[k] = '_';
      }
      diagnostic p = error_at(d.file, "dataset.value", message);
      p.offset = s.read_offset;
      problems.push_back(std::move(p));
    }
  }
  locate_all(text, problems);
  report_all(std::move(problems));
  d.recordings = take(find_recordings(d.description, d.root, d.file, text));
  if (d.recordings.empty())
    throw usage_error(d.file + ": the dataset's patterns find no files (below '" +
                      (d.root.empty() ? std::string(".") : d.root) + "')");
  if (!shard.empty()) {
    std::vector<std::string> ids;
    for (const recording& r : d.recordings)
      ids.push_back(r.id);
    std::vector<recording> mine;
    d.places = shard_places(ids, shard);
    for (std::size_t k : d.places)
      mine.push_back(std::move(d.recordings[k]));
    d.recordings = std::move(mine);
  }
  return d;
}

diagnostic lacking_source(const opened_dataset& d, const recording& r, std::size_t k) {
  return error_at(d.file, "dataset.missing-source",
                  "the recording " + quote_name(r.id) + " has no file for " +
                      quote_name(d.description.sources[k].pattern));
}

std::vector<diagnostic> lacking_sources(const opened_dataset& d, const recording& r) {
  std::vector<diagnostic> out;
  for (std::size_t k = 0; k < r.files.size(); ++k)
    if (r.files[k].empty()) out.push_back(lacking_source(d, r, k));
  return out;
}

const format& per_recording_format(const char* command, bool named_input, const std::string& output,
                                   const std::string& dir, const std::string& to) {
  if (named_input || !output.empty() || dir.empty() || to.empty())
    throw usage_error(std::string(command) +
                      " --dataset writes a file per recording: give -d DIR and --to, and no "
                      "input or -o");
  return format_named(to);
}

recording_parts read_parts(const opened_dataset& d, const recording& r, bool positions) {
  recording_parts out;
  std::vector<merge_input>& parts = out.parts;
  bool failed = false;
  for (std::size_t k = 0; k < r.files.size(); ++k) {
    if (r.files[k].empty() || d.description.sources[k].signal) continue;
    const std::string path = d.path_of(r.files[k]);
    const std::string name = display_name(path);
    try {
      std::string content = read_input(path);
      diagnostic why;
      const format* fmt = input_format(d.reading[k], path, content, why);
      if (!fmt) {
        out.diagnostics.push_back(why);
        failed = true;
        continue;
      }
      read_options options = reading_options(d.reading[k], path);
      options.positions = positions;
      read_result read = read_document(content, *fmt, options, name);
      content = std::string();
      if (read.ok())
        for (diagnostic& p : apply_source(read.value, d.description.sources[k], name))
          read.diagnostics.push_back(std::move(p));
      for (diagnostic& p : read.diagnostics)
        out.diagnostics.push_back(std::move(p));
      if (!read.ok()) {
        failed = true;
        continue;
      }
      if (fmt->holds_captions && !read.value.tiers.empty() && !out.caption_tier)
        out.caption_tier = read.value.tiers.front().name;
      out.instant_tiers = out.instant_tiers && fmt->carries.has(feature::instant_tiers);
      for (source_position& p : read.positions.tiers)
        out.positions.tiers.push_back(p);
      for (auto& a : read.positions.annotations)
        out.positions.annotations.push_back(std::move(a));
      parts.push_back({name, std::move(read.value)});
    } catch (const error& e) {
      diagnostic p = e.diag();
      if (p.file.empty()) p.file = name;
      out.diagnostics.push_back(std::move(p));
      failed = true;
    }
  }
  out.ok = !failed;
  return out;
}

recording_read read_recording(const opened_dataset& d, const recording& r, bool positions) {
  recording_read out;
  static_cast<recording_parts&>(out) = read_parts(d, r, positions);
  if (!out.ok) return out;
  result<document> joined = join_recording(std::move(out.parts), &out.tier_files);
  for (diagnostic& p : joined.diagnostics)
    out.diagnostics.push_back(std::move(p));
  out.ok = joined.ok();
  out.doc = std::move(joined.value);
  return out;
}

document load_recording(const opened_dataset& d, const recording& r,
                        std::vector<std::string>* tier_files) {
  std::vector<diagnostic> all = lacking_sources(d, r);
  recording_read read = read_recording(d, r);
  for (diagnostic& p : read.diagnostics)
    all.push_back(std::move(p));
  report_all(std::move(all));
  if (tier_files) *tier_files = std::move(read.tier_files);
  return std::move(read.doc);
}

std::vector<std::optional<document_summary>> summarize_recordings(const opened_dataset& d,
                                                                  unsigned jobs) {
  std::vector<std::optional<document_summary>> out(d.recordings.size());
  run_parallel(
      d.recordings.size(), jobs,
      [&](std::size_t k) {
        recording_read r = read_recording(d, d.recordings[k]);
        for (const diagnostic& p : r.diagnostics)
          if (p.level == severity::error) report(p);
        if (r.ok) out[k] = summarize(r.doc);
      },
      "reading", "recordings");
  return out;
}

int for_each_recording(const opened_dataset& d, unsigned jobs, const char* verb,
                       const std::function<void(const recording&)>& work) {
  std::atomic<std::size_t> failed{0};
  run_parallel(
      d.recordings.size(), jobs,
      [&](std::size_t k) {
        const recording& r = d.recordings[k];
        try {
          work(r);
          return;
        } catch (const rejected&) {
        } catch (const error& e) {
          report(e.diag());
        } catch (const std::exception& e) {  // out of memory, above all: that one fails alone
          report(error_at(d.file, "io.read",
                          "the recording " + quote_name(r.id) + " failed: " + e.what()));
        }
        ++failed;
      },
      verb, "recordings");
  if (failed > 0)
    std::fprintf(stderr, "tiers: %zu of %zu recordings failed (see above)\n", failed.load(),
                 d.recordings.size());
  return failed > 0 ? exit_rejected : exit_ok;
}

int for_each_output(const opened_dataset& d, const std::string& dir, const format& to,
                    unsigned jobs, const char* verb,
                    const std::function<void(const recording&, const std::string&)>& work) {
  std::error_code ec;
  fs::create_directories(dir, ec);
  return for_each_recording(d, jobs, verb, [&](const recording& r) {
    work(r, (fs::path(dir) / (r.id + std::string(to.extensions.front()))).string());
  });
}

}  // namespace tiers::cli
