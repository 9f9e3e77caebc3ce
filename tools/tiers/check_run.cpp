// The check run that `tiers check` and `tiers report` share.
#include "check_run.hpp"

#include <algorithm>
#include <unordered_map>

#include "batch.hpp"
#include "check_inputs.hpp"
#include "tiers/io.hpp"

namespace tiers::cli {
namespace {

// The files of several reports compared with one another anew: shards' files in the order of
// the whole run (by their index), other reports' in the order given. Every report must have
// been made with the profile the combining is given (or, without --profile, with none).
std::vector<file_report> combine_reports(const std::vector<std::string>& paths, const profile& p,
                                         bool with_profile) {
  std::vector<file_report> all;
  bool failed = false;
  const std::optional<profile_identity> wanted =
      with_profile ? std::optional<profile_identity>(identify(p)) : std::nullopt;
  // Each file once: a report given twice (or two reports of one shard) would count its
  // problems twice.
  std::unordered_map<std::string, std::string> reported_in;
  for (const std::string& path : paths) {
    const std::string text = read_input(path);
    report_result r = read_check_report(text, display_name(path));
    for (const file_report& f : r.value.files) {
      const auto [it, fresh] = reported_in.emplace(f.path, path);
      if (fresh) continue;
      diagnostic d;
      d.file = display_name(path);
      d.code = "report.repeated";
      d.message = "reports the file '" + f.path + "' that " + display_name(it->second) +
                  " reports already: combine each shard once";
      report(d);
      failed = true;
      break;
    }
    for (const diagnostic& d : r.diagnostics)
      report(d);
    failed = failed || !r.ok();
    const std::optional<profile_identity>& made = r.value.header.profile;
    if (r.ok() &&
        (made.has_value() != wanted.has_value() || (made && made->digest != wanted->digest))) {
      diagnostic d;
      d.file = display_name(path);
      d.code = "report.profile";
      d.message = !made     ? "was made without a profile; combine it without --profile"
                  : !wanted ? "was made with the profile '" + made->name + "' (" + made->digest +
                                  "); combine it with --profile " + made->name
                            : "was made with the profile '" + made->name + "' (" + made->digest +
                                  "), not with '" + wanted->name + "' (" + wanted->digest +
                                  "): its problems were judged otherwise";
      report(d);
      failed = true;
    }
    for (file_report& f : r.value.files)
      all.push_back(std::move(f));
  }
  if (failed) throw rejected();
  if (std::all_of(all.begin(), all.end(), [](const file_report& f) { return f.index; }))
    std::stable_sort(all.begin(), all.end(), [](const file_report& a, const file_report& b) {
      return *a.index < *b.index;
    });
  for (file_report& f : all)
    f.index.reset();  // the combined report is one whole run's
  check_dataset(all, p);
  return all;
}

}  // namespace

profile load_check_profile(const std::string& name) {
  if (name.empty()) return {};
  return take(load_profile(name));
}

check_run run_checks(const check_options& o, const profile& p, std::size_t keep_documents,
                     const report_stream* stream) {
  if (o.paths.empty() == o.dataset.empty())
    throw usage_error(o.dataset.empty() ? "name the files or folders to check, or --dataset"
                                        : "give either files and folders or --dataset, not both");
  if (!o.dataset.empty() && o.combine)
    throw usage_error("--combine joins reports, which are named as files: not with --dataset");
  reading_options(o.input, "");  // bad option values are usage errors before any work
  check_run run;
  if (!o.captions.empty()) run.roles.captions = o.captions;
  if (!o.words.empty()) {
    if (std::optional<words_file> w = words_file_of(o.words, o.input, run.roles.words)) {
      run.words = std::make_unique<words_file>(std::move(*w));
      run.roles.words_doc = &run.words->doc;
      run.roles.words_file = run.words->path;
      run.roles.words = run.words->tier;
    }
  }
  if (o.combine) {
    run.reports = combine_reports(o.paths, p, !o.profile.empty());
    return run;
  }
  if (!o.dataset.empty()) {
    const auto opened =
        std::make_shared<const opened_dataset>(open_dataset(o.dataset, o.input, o.shard));
    const opened_dataset& d = *opened;
    run.dataset = opened;
    std::vector<std::string> ids;
    for (const recording& r : d.recordings)
      ids.push_back(r.id);
    run.reports = check_files(ids, o, p, run.roles, o.shard.empty(), &run.documents, keep_documents,
                              stream, &d);
    for (std::size_t k = 0; k < d.places.size() && k < run.reports.size(); ++k)
      run.reports[k].index = d.places[k];
    return run;
  }
  std::vector<std::string> files;
  for (input_file& f : expand_inputs(o.paths))
    files.push_back(std::move(f.path));
  std::vector<std::size_t> places;  // with --shard: each file's place among all of them
  if (!o.shard.empty()) {
    places = shard_places(files, o.shard);
    std::vector<std::string> mine;
    for (std::size_t k : places)
      mine.push_back(std::move(files[k]));
    files = std::move(mine);
  }
  if (files.empty() && o.shard.empty()) throw usage_error("the folders named hold no tier files");
  run.reports =
      check_files(files, o, p, run.roles, o.shard.empty(), &run.documents, keep_documents, stream);
  for (std::size_t k = 0; k < places.size() && k < run.reports.size(); ++k)
    run.reports[k].index = places[k];
  return run;
}

}  // namespace tiers::cli
