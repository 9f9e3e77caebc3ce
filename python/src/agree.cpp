// tiers.agree: a candidate tier against a reference, or several annotators' tiers, as
// `tiers agree --json` reports them.
#include <pybind11/stl.h>

#include "binding.hpp"
#include "tiers/agree.hpp"
#include "tiers/io.hpp"

namespace tiers::python {
namespace {

// A document given as a path (read with the reading options) or as a Document; `file` is
// what the report calls it (the path, else "").
struct input {
  std::string file;
  document read;
  const document* doc = nullptr;
};

void take(input& in, const py::object& given, const reading_settings& settings) {
  if (py::isinstance<document>(given)) {
    in.doc = &py::cast<const document&>(given);
    return;
  }
  in.file = path_text(given);
  read_result r = read_input_file(in.file, settings);
  in.read = take_document(std::move(r));
  in.doc = &in.read;
}

const tier& tier_in(const input& in, const std::optional<std::string>& name) {
  if (!name) {
    if (in.doc->tiers.size() == 1) return in.doc->tiers.front();
    raise("UsageError",
          (in.file.empty() ? std::string("the document") : in.file) + " has " +
              std::to_string(in.doc->tiers.size()) +
              " tiers: name one with tier=, ref_tier= or cand_tier= (" + tier_names(*in.doc) + ")",
          {});
  }
  if (const tier* t = find_tier(*in.doc, *name)) return *t;
  raise("UsageError",
        (in.file.empty() ? std::string("the document") : in.file) + " has no tier " +
            quote_name(*name) + " (" + tier_names(*in.doc) + ")",
        {});
}

template <class Write>
std::string written(Write&& write) {
  std::string text;
  string_sink out(text);
  write(out);
  out.flush();
  return text;
}

std::string agree_json(const py::object& reference, const py::object& candidate,
                       std::optional<std::string> tier_name, std::optional<std::string> ref_tier,
                       std::optional<std::string> cand_tier,
                       std::optional<std::vector<std::string>> several,
                       const comparison_settings& compare, double min_confidence,
                       const std::string& empty, const py::kwargs& reading) {
  const reading_settings settings = settings_of(std::nullopt, reading);
  check_comparison_settings(compare);
  if (!(min_confidence >= 0 && min_confidence <= 1))
    raise("UsageError", "min_confidence is from 0 to 1", {});
  input ref, cand;
  take(ref, reference, settings);
  if (several) {
    if (!candidate.is_none())
      raise("UsageError", "tiers= compares the tiers of one document: no candidate", {});
    const auto how = value_named(empty_frames_names, empty);
    if (!how) raise("UsageError", "empty is " + quoted_names(empty_frames_names), {});
    std::vector<const tier*> tiers;
    for (const std::string& name : *several)
      tiers.push_back(&tier_in(ref, name));
    if (tiers.size() < 2) raise("UsageError", "tiers= needs two tiers or more", {});
    py::gil_scoped_release unlocked;
    annotators_report r = compare_annotators(
        tiers, comparison_for(compare, {ref.doc}, tiers, settings.rate).grid, *how);
    r.file = ref.file;
    return written([&](byte_sink& out) { write_annotators_json(r, out); });
  }
  const bool one = candidate.is_none();
  if (!one) take(cand, candidate, settings);
  const input& c = one ? ref : cand;
  const std::optional<std::string> rn = ref_tier ? ref_tier : tier_name;
  const std::optional<std::string> cn = cand_tier ? cand_tier : tier_name;
  if (one && (!rn || !cn || *rn == *cn))
    raise("UsageError", "with one document, name two of its tiers: ref_tier=, cand_tier=", {});
  const tier& r = tier_in(ref, rn);
  const tier& whole = tier_in(c, cn);
  py::gil_scoped_release unlocked;
  const comparison_frame g = comparison_for(compare, {ref.doc, c.doc}, {&r, &whole}, settings.rate);
  agreement_report report =
      compare_tiers(r, at_least_confident(whole, min_confidence), g.grid, g.matching);
  report.reference.file = ref.file;
  report.candidate.file = c.file;
  return written([&](byte_sink& out) { write_agreement_json(report, out); });
}

}  // namespace

void bind_agree(py::module_& m) {
  m.def(
      "_agree_json",
      [](const py::object& reference, const py::object& candidate,
         std::optional<std::string> tier_name, std::optional<std::string> ref_tier,
         std::optional<std::string> cand_tier, std::optional<std::vector<std::string>> several,
         std::string step, std::string match, std::string collar, double min_overlap,
         bool any_label, double min_confidence, const std::string& empty,
         const py::kwargs& reading) {
        const comparison_settings compare{std::move(step), std::move(match), std::move(collar),
                                          min_overlap, any_label};
        return agree_json(reference, candidate, std::move(tier_name), std::move(ref_tier),
                          std::move(cand_tier), std::move(several), compare, min_confidence, empty,
                          reading);
      },
      py::arg("reference"), py::arg("candidate"), py::arg("tier"), py::arg("ref_tier"),
      py::arg("cand_tier"), py::arg("tiers"), py::arg("step"), py::arg("match"), py::arg("collar"),
      py::arg("min_overlap"), py::arg("any_label"), py::arg("min_confidence"), py::arg("empty"),
      "tiers.agree's JSON (see tiers.agree)");
}

}  // namespace tiers::python
