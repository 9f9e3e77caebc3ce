// tiers.check: files checked as `tiers check` checks them, the report kept for its JSON and
// SARIF.
#include <pybind11/stl.h>

#include "binding.hpp"
#include "tiers/check.hpp"
#include "tiers/io.hpp"

namespace tiers::python {
namespace {

// A finished check: the reports, and what the JSON and SARIF renderings need of the run.
struct check_run {
  std::vector<file_report> reports;
  profile used;
  report_header header;

  std::string json() const {
    std::string text;
    string_sink out(text);
    write_check_json(reports, out, header);
    out.flush();
    return text;
  }
  std::string sarif() const {
    std::string text;
    string_sink out(text);
    write_check_sarif(reports, out, used, header);
    out.flush();
    return text;
  }
};

check_run check(const std::vector<py::object>& inputs, std::optional<std::string> profile_name,
                std::optional<std::string> captions, std::optional<std::string> words,
                unsigned jobs, const py::kwargs& reading) {
  const reading_settings settings = settings_of(std::nullopt, reading);
  check_run run;
  if (profile_name) {
    profile_result p = load_profile(*profile_name);
    if (!p.ok()) raise_errors(p.diagnostics);
    run.used = std::move(p.value);
    run.header.profile = identify(run.used);
  }
  check_context roles;
  roles.captions = captions;
  std::optional<words_file> words_doc;
  if (words) {
    std::vector<diagnostic> problems;
    words_doc = words_file_of(*words, settings, roles.words, problems);
    if (has_errors(problems)) raise_errors(problems);
    if (words_doc) {
      roles.words_doc = &words_doc->doc;
      roles.words_file = words_doc->path;
      roles.words = words_doc->tier;
    }
  }
  std::vector<std::string> paths;
  for (const py::object& p : inputs)
    paths.push_back(path_text(p));
  std::vector<std::string> files;
  for (input_file& f : expand_inputs(paths))
    files.push_back(std::move(f.path));
  if (files.empty()) raise("UsageError", "the folders named hold no tier files", {});
  py::gil_scoped_release unlocked;
  run.reports = check_files(files, settings, run.used, roles, jobs, true);
  return run;
}

}  // namespace

void bind_check(py::module_& m) {
  py::class_<check_run>(m, "_CheckRun", "A finished check (see tiers.check)")
      .def("json", &check_run::json, py::call_guard<py::gil_scoped_release>())
      .def("sarif", &check_run::sarif, py::call_guard<py::gil_scoped_release>());
  m.def("_check", &check, py::arg("inputs"), py::arg("profile"), py::arg("captions"),
        py::arg("words"), py::arg("jobs"), "tiers.check's run (see tiers.check)");
}

}  // namespace tiers::python
