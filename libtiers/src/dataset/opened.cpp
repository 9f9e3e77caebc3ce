// A dataset's recordings read as the description says.
#include "tiers/recordings.hpp"

#include <charconv>
#include <filesystem>

#include "tiers/derive.hpp"
#include "tiers/io.hpp"

namespace tiers {
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

// The run's reading settings with a source's `read` over them. Throws usage_error on a
// value the command line would refuse, which the caller locates in the description.
reading_settings reading_of(const dataset_source& s, reading_settings in) {
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

std::string opened_dataset::path_of(const std::string& relative) const {
  return root.empty() || root == "." ? relative : (fs::path(root) / relative).string();
}

result<opened_dataset> open_dataset(const std::string& path, const reading_settings& base,
                                    const std::string& shard) {
  result<opened_dataset> out;
  opened_dataset& d = out.value;
  d.file = display_name(path);
  const std::string text = read_input(path);
  result<dataset_description> description = read_dataset(text, d.file);
  out.diagnostics = std::move(description.diagnostics);
  if (!out.ok()) return out;
  d.description = std::move(description.value);
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
        d.reading.push_back(reading_settings{});
        continue;
      }
      reading_settings in = reading_of(s, base);
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
  out.diagnostics.insert(out.diagnostics.end(), problems.begin(), problems.end());
  if (!out.ok()) return out;
  result<std::vector<recording>> found = find_recordings(d.description, d.root, d.file, text);
  out.diagnostics.insert(out.diagnostics.end(), found.diagnostics.begin(), found.diagnostics.end());
  if (!out.ok()) return out;
  d.recordings = std::move(found.value);
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
  return out;
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

}  // namespace tiers
