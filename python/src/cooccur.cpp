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
  // Documents given as such are counted as they are; paths (folders searched) are read on
  // threads, each named as the command line names it.
  std::vector<std::string> names, paths;
  std::vector<const document*> documents;
  for (std::size_t k = 0; k < given.size(); ++k) {
    if (py::isinstance<document>(given[k])) {
      names.push_back("document-" + std::to_string(k + 1));
      documents.push_back(&py::cast<const document&>(given[k]));
      continue;
    }
    for (input_file& f : expand_inputs({path_text(given[k])})) {
      names.push_back(display_name(f.path));
      paths.push_back(std::move(f.path));
      documents.push_back(nullptr);
    }
  }
  if (names.empty()) raise("UsageError", "cooccur: the inputs hold no file to count", {});
  const bool keep = settings.permutations > 0;
  std::vector<result<counted_document>> each(names.size());
  {
    py::gil_scoped_release unlocked;
    std::size_t next_path = 0;
    std::vector<std::size_t> path_of(names.size());
    for (std::size_t k = 0; k < names.size(); ++k)
      path_of[k] = documents[k] ? 0 : next_path++;
    run_parallel(names.size(), jobs, [&](std::size_t k) {
      if (documents[k]) {
        each[k] = count_document(*documents[k], names[k], settings, in.rate, keep);
        return;
      }
      try {
        read_result r = read_input_file(paths[path_of[k]], in);
        if (!r.ok()) {
          each[k].diagnostics = std::move(r.diagnostics);
          return;
        }
        each[k] = count_document(r.value, names[k], settings, in.rate, keep);
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
