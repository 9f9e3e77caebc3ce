// Checking files as a program is given them: each read as the user's options say, many at once.
#include "tiers/check.hpp"
#include "tiers/io.hpp"

namespace tiers {

file_report check_file(const std::string& path, const reading_settings& in, const profile& p,
                       const check_context& shared, std::optional<document>* keep) {
  const std::string name = display_name(path);
  try {
    std::string content = read_input(path);
    diagnostic why;
    const format* fmt = input_format(in, path, content, why);
    if (!fmt) return unreadable_file(name, {why});
    std::vector<diagnostic> notes;  // of the file's name: kept as problems of the file
    read_options options = reading_options(in, path, &notes);
    options.positions = true;
    read_result r = read_document(content, *fmt, options, name);
    r.diagnostics.insert(r.diagnostics.begin(), notes.begin(), notes.end());
    content = std::string();  // lines and columns are found: the file's bytes are not needed
    if (r.ok())
      for (diagnostic& d : settle_tiers(r.value, in, name))
        r.diagnostics.push_back(std::move(d));
    if (!r.ok()) return unreadable_file(name, r.diagnostics);
    check_context roles = shared;
    roles.instant_tiers = fmt->carries.has(feature::instant_tiers);
    if (!roles.captions && !p.captions && fmt->holds_captions && !r.value.tiers.empty())
      roles.captions = r.value.tiers.front().name;
    file_report report = check_document(r.value, r.positions, name, p, roles, r.diagnostics);
    if (keep) *keep = std::move(r.value);
    return report;
  } catch (const error& e) {
    diagnostic d = e.diag();
    d.file = name;
    return unreadable_file(name, {d});
  } catch (const usage_error&) {
    throw;  // the settings, not the file: every file would fail alike
  } catch (const std::exception& e) {
    diagnostic d;
    d.file = name;
    d.code = "io.read";
    d.message = std::string("could not be checked: ") + e.what();
    return unreadable_file(name, {d});
  }
}

std::vector<file_report> check_files(const std::vector<std::string>& files,
                                     const reading_settings& in, const profile& p,
                                     const check_context& roles, unsigned jobs, bool compare,
                                     std::atomic<std::size_t>* done) {
  reading_options(in, "");  // bad settings fail before any file is read
  std::vector<file_report> reports(files.size());
  run_parallel(
      files.size(), jobs, [&](std::size_t k) { reports[k] = check_file(files[k], in, p, roles); },
      done);
  if (compare) check_dataset(reports, p);
  return reports;
}

}  // namespace tiers
