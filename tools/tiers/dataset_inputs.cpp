// Opening a dataset description and reading its recordings, for every command's --dataset.
#include "dataset_inputs.hpp"

#include <algorithm>
#include <atomic>
#include <filesystem>

#include "batch.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {
namespace {

namespace fs = std::filesystem;

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

opened_dataset open_dataset(const std::string& path, const input_options& base,
                            const std::string& shard) {
  return take(tiers::open_dataset(path, base, shard));
}

const format& per_recording_format(const char* command, bool named_input, const std::string& output,
                                   const std::string& dir, const std::string& to) {
  if (named_input || !output.empty() || dir.empty() || to.empty())
    throw usage_error(std::string(command) +
                      " --dataset writes a file per recording: give -d DIR and --to, and no "
                      "input or -o");
  return format_named(to);
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
          diagnostic failure;
          failure.file = d.file;
          failure.code = "io.read";
          failure.message = "the recording " + quote_name(r.id) + " failed: " + e.what();
          report(failure);
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
