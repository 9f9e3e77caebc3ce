// tiers.estimate: a reviewed sample's precision, as `tiers estimate --json` reports it.
#include <pybind11/stl.h>

#include "binding.hpp"
#include "tiers/review.hpp"

namespace tiers::python {
namespace {

// The estimate's JSON for the sheets at `paths` (the parts of one sample), or ReadError with
// the located problems.
std::string estimate_json(const std::vector<py::object>& paths, double level,
                          std::optional<double> target) {
  if (!(level > 0 && level < 1)) raise("UsageError", "level is between 0 and 1 (0.95)", {});
  if (target && !(*target >= 0 && *target <= 1))
    raise("UsageError", "target_precision is between 0 and 1", {});
  std::vector<review_part> parts;
  for (const py::object& p : paths) {
    const std::string file = path_text(p);
    result<std::vector<sample_row>> rows = read_review_sheet(read_file(file), file);
    if (!rows.ok()) raise_errors(rows.diagnostics);
    parts.push_back({file, std::move(rows.value)});
  }
  result<std::vector<sample_row>> rows = join_review_sheets(std::move(parts));
  if (!rows.ok()) raise_errors(rows.diagnostics);
  estimate_options o;
  o.level = level;
  o.target_precision = target;
  std::string json;
  {
    py::gil_scoped_release unlocked;
    const precision_estimate e = estimate_precision(rows.value, o);
    string_sink out(json);
    write_estimate_json(e, out);
    out.flush();
  }
  return json;
}

}  // namespace

void bind_review(py::module_& m) {
  m.def("_estimate_json", &estimate_json, py::arg("paths"), py::arg("level"),
        py::arg("target_precision"), "tiers.estimate's JSON (see tiers.estimate)");
}

}  // namespace tiers::python
