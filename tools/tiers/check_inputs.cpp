// Expanding the inputs of `tiers check` and checking them on a pool of threads.
#include "check_inputs.hpp"

#include "batch.hpp"

#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cstdio>
#include <filesystem>
#include <mutex>
#include <thread>

#include "tiers/io.hpp"

namespace tiers::cli {

namespace fs = std::filesystem;

namespace {

// A recording checked as one document. Its report is named by the recording's id; a problem
// located at a line names the file of its tier, and each source the recording lacks is a
// problem of its own.
file_report check_recording(const opened_dataset& d, const recording& rec, const profile& p,
                            const check_context& shared, std::optional<document>* keep) {
  recording_read r = read_recording(d, rec, true);
  std::vector<diagnostic> lacking = lacking_sources(d, rec);
  file_report report;
  if (!r.ok) {
    for (diagnostic& x : r.diagnostics)
      lacking.push_back(std::move(x));
    report = unreadable_file(rec.id, lacking);
  } else {
    check_context roles = shared;
    roles.instant_tiers = r.instant_tiers;
    if (!roles.captions && !p.captions) roles.captions = r.caption_tier;
    report = check_document(r.doc, r.positions, rec.id, p, roles, r.diagnostics);
    for (problem& x : report.problems)
      if (x.diag.file == rec.id && x.diag.line != 0 && !x.tier.empty())
        for (std::size_t t = 0; t < r.doc.tiers.size() && t < r.tier_files.size(); ++t)
          if (r.doc.tiers[t].name == x.tier) {
            x.diag.file = r.tier_files[t];
            break;
          }
    std::vector<problem> missing;
    const rule_level level = p.level("dataset.missing-source");
    for (diagnostic& x : lacking) {
      if (level == rule_level::off) break;
      x.level = severity_of(level);
      problem& m = missing.emplace_back();
      m.diag = std::move(x);
    }
    report.problems.insert(report.problems.begin(), std::make_move_iterator(missing.begin()),
                           std::make_move_iterator(missing.end()));
  }
  if (keep && r.ok) *keep = std::move(r.doc);
  return report;
}

}  // namespace

std::vector<file_report> check_files(const std::vector<std::string>& files, const check_options& o,
                                     const profile& p, const check_context& roles,
                                     bool whole_dataset, std::vector<std::optional<document>>* docs,
                                     std::size_t keep, const report_stream* stream,
                                     const opened_dataset* dataset) {
  std::vector<file_report> results(files.size());
  if (docs) docs->assign(files.size(), std::nullopt);
  // Rendered texts wait here until every file before them is written.
  std::mutex order;
  std::vector<std::optional<std::string>> rendered(stream ? files.size() : 0);
  std::size_t written = 0;
  auto pass_on = [&](std::size_t k) {
    std::string text = stream->render(k, results[k]);
    const std::lock_guard<std::mutex> lock(order);
    rendered[k] = std::move(text);
    for (; written < rendered.size() && rendered[written]; ++written) {
      stream->write(*rendered[written]);
      rendered[written].reset();
    }
  };
  run_parallel(
      files.size(), o.jobs,
      [&](std::size_t k) {
        try {
          std::optional<document>* kept = docs && k < keep ? &(*docs)[k] : nullptr;
          results[k] = dataset ? check_recording(*dataset, dataset->recordings[k], p, roles, kept)
                               : check_file(files[k], o.input, p, roles, kept);
        } catch (const std::exception& e) {  // out of memory, above all: that file fails alone
          diagnostic d;
          d.file = display_name(files[k]);
          d.code = "io.read";
          d.message = std::string("could not be checked: ") + e.what();
          results[k] = unreadable_file(d.file, {d});
        }
        if (stream) pass_on(k);
      },
      "checking", dataset ? "recordings" : "files");
  std::vector<file_report> reports = std::move(results);
  if (whole_dataset) check_dataset(reports, p);
  return reports;
}

}  // namespace tiers::cli
