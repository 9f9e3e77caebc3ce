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

file_report check_one(const std::string& path, const check_options& o, const profile& p,
                      const check_context& shared, std::optional<document>* keep) {
  const std::string name = display_name(path);
  auto unreadable = [&](diagnostic d) {
    d.file = name;
    return unreadable_file(name, {d});
  };
  std::string content;
  try {
    content = read_input(path);
  } catch (const error& e) {
    return unreadable(e.diag());
  }
  diagnostic why;
  const format* fmt = input_format(o.input, path, content, why);
  if (!fmt) return unreadable(why);
  read_options options = reading_options(o.input, path);
  options.positions = true;
  read_result r = read_document(content, *fmt, options, name);
  content = std::string();  // lines and columns are found: the file's bytes are not needed
  if (!r.ok()) return unreadable_file(name, r.diagnostics);
  check_context roles = shared;
  roles.instant_tiers = fmt->carries.has(feature::instant_tiers);
  if (!roles.captions && !p.captions && fmt->holds_captions && !r.value.tiers.empty())
    roles.captions = r.value.tiers.front().name;
  file_report report = check_document(r.value, r.positions, name, p, roles, r.diagnostics);
  if (keep) *keep = std::move(r.value);
  return report;
}

}  // namespace

std::vector<file_report> check_files(const std::vector<std::string>& files, const check_options& o,
                                     const profile& p, const check_context& roles,
                                     bool whole_dataset, std::vector<std::optional<document>>* docs,
                                     std::size_t keep, const report_stream* stream) {
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
          results[k] = check_one(files[k], o, p, roles, docs && k < keep ? &(*docs)[k] : nullptr);
        } catch (const std::exception& e) {  // out of memory, above all: that file fails alone
          diagnostic d;
          d.file = display_name(files[k]);
          d.code = "io.read";
          d.message = std::string("could not be checked: ") + e.what();
          results[k] = unreadable_file(d.file, {d});
        }
        if (stream) pass_on(k);
      },
      "checking");
  std::vector<file_report> reports = std::move(results);
  if (whole_dataset) check_dataset(reports, p);
  return reports;
}

}  // namespace tiers::cli
