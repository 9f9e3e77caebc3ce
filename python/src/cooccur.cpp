// tiers.cooccur: which labels of one tier go with which of another over many documents, as
// `tiers cooccur --json` reports it.
#include <pybind11/stl.h>

#include "binding.hpp"
#include "tiers/cooccur.hpp"
#include "tiers/io.hpp"

namespace tiers::python {
namespace {

std::string cooccur_json(const std::vector<py::object>& given, const cooccur_settings& settings,
                         unsigned jobs, const py::kwargs& reading) {
  const reading_settings in = settings_of(std::nullopt, reading);
  const cooccur_options options = cooccur_options_of(settings);
  const std::vector<named_input> inputs = inputs_of(given);
  if (inputs.empty()) raise("UsageError", "cooccur: the inputs hold no file to count", {});
  const bool keep = settings.permutations > 0;
  std::vector<result<counted_document>> each(inputs.size());
  {
    py::gil_scoped_release unlocked;
    run_parallel(inputs.size(), jobs, [&](std::size_t k) {
      const named_input& input = inputs[k];
      if (input.doc) {
        each[k] = count_document(*input.doc, input.name, settings, in.rate, keep);
        return;
      }
      try {
        read_result r = read_input_file(input.path, in);
        if (!r.ok()) {
          each[k].diagnostics = std::move(r.diagnostics);
          return;
        }
        each[k] = count_document(r.value, input.name, settings, in.rate, keep);
      } catch (const error& e) {
        each[k].diagnostics = {e.diag()};
      }
    });
  }
  std::vector<diagnostic> problems;
  std::vector<counted_document> counted;
  for (result<counted_document>& r : each) {
    problems.insert(problems.end(), r.diagnostics.begin(), r.diagnostics.end());
    if (r.ok()) counted.push_back(std::move(r.value));
  }
  if (has_errors(problems)) raise_errors(problems);
  std::string text;
  {
    py::gil_scoped_release unlocked;
    cooccur_counts all;
    std::vector<cooccur_recording> recordings;
    const std::vector<pair_statistics> table = cooccur_run(counted, settings, all, recordings);
    string_sink out(text);
    write_cooccur_json(table, all.n(), settings.a, settings.b, options, out);
    out.flush();
  }
  return text;
}

}  // namespace

void bind_cooccur(py::module_& m) {
  m.def(
      "_cooccur_json",
      [](const std::vector<py::object>& inputs, std::string a, std::string b, std::string relation,
         std::string window, bool fold_case, std::uint64_t min_count, std::string b_labels,
         std::string sort, std::uint32_t permutations, std::uint64_t seed, unsigned jobs,
         const py::kwargs& reading) {
        cooccur_settings s;
        s.a = std::move(a);
        s.b = std::move(b);
        s.relation = std::move(relation);
        s.window = std::move(window);
        s.fold_case = fold_case;
        s.min_count = min_count;
        s.b_labels = std::move(b_labels);
        s.sort = std::move(sort);
        s.permutations = permutations;
        s.seed = seed;
        return cooccur_json(inputs, s, jobs, reading);
      },
      py::arg("inputs"), py::arg("a"), py::arg("b"), py::arg("relation"), py::arg("window"),
      py::arg("fold_case"), py::arg("min_count"), py::arg("b_labels"), py::arg("sort"),
      py::arg("permutations"), py::arg("seed"), py::arg("jobs"),
      "tiers.cooccur's JSON (see tiers.cooccur)");
}

}  // namespace tiers::python
