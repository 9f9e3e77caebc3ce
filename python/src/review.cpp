// tiers.sample and tiers.estimate: a review sample drawn, and its precision estimated, as
// `tiers sample` and `tiers estimate --json` do.
#include <pybind11/stl.h>

#include "binding.hpp"
#include "tiers/io.hpp"
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

// tiers.sample: the sheet's CSV (or the plan's JSON) and the strata, as `tiers sample` makes
// them from the documents at `given` (paths, folders searched, or Documents).
py::tuple sample(const std::vector<py::object>& given, const sample_settings& settings, bool plan,
                 double margin, double level, double review_rate, const std::string& sheet_folder,
                 unsigned jobs, const py::kwargs& reading) {
  const reading_settings in = settings_of(std::nullopt, reading);
  check_level("level", level);
  if (!(margin > 0 && margin <= 0.5)) raise("UsageError", "margin is above 0, at most 0.5", {});
  if (!(review_rate > 0)) raise("UsageError", "review_rate is above 0", {});
  if (!plan && settings.n == 0)
    raise("UsageError", "sample: say how many to draw with n=, or ask for plan=True", {});
  sample_options_of(settings);  // bad settings fail before anything is read
  const std::vector<named_input> inputs = inputs_of(given);
  if (inputs.empty()) raise("UsageError", "sample: the inputs hold no file to read", {});
  std::vector<result<std::optional<sampler>>> each(inputs.size());
  std::vector<char> media(inputs.size(), 0);
  {
    py::gil_scoped_release unlocked;
    run_parallel(inputs.size(), jobs, [&](std::size_t k) {
      const named_input& input = inputs[k];
      auto add = [&](const document& doc) {
        result<sampler> r =
            sample_document(doc, input.name, input.path, settings, sheet_folder, ".", in.rate);
        each[k].diagnostics = std::move(r.diagnostics);
        each[k].value.emplace(std::move(r.value));
        media[k] = !doc.media.uri.value_or("").empty();
      };
      if (input.doc) return add(*input.doc);
      try {
        read_result r = read_input_file(input.path, in);
        if (r.ok()) add(r.value);
        each[k].diagnostics.insert(each[k].diagnostics.begin(), r.diagnostics.begin(),
                                   r.diagnostics.end());
      } catch (const error& e) {
        each[k].diagnostics = {e.diag()};
      }
    });
  }
  std::vector<diagnostic> problems;
  for (const result<std::optional<sampler>>& r : each)
    problems.insert(problems.end(), r.diagnostics.begin(), r.diagnostics.end());
  // A sample of part of the input would misstate every weight: nothing is drawn.
  if (has_errors(problems)) raise_errors(problems);
  sampler all(sample_options_of(settings));
  std::size_t without_media = 0;
  for (std::size_t k = 0; k < each.size(); ++k) {
    all.add(std::move(*each[k].value));
    if (!media[k]) ++without_media;
  }
  std::string text;
  string_sink out(text);
  if (plan) {
    write_sample_plan_json(plan_sample(all.strata(), margin, level, review_rate), out);
    out.flush();
    return py::make_tuple(text, py::none());
  }
  const std::vector<sample_row> rows = all.draw();
  write_review_sheet(rows, out);
  out.flush();
  py::list strata;
  for (const stratum_count& c : all.strata()) {
    py::dict row;
    row["stratum"] = c.name;
    row["annotations"] = c.size;
    row["drawn"] = c.drawn;
    strata.append(row);
  }
  problems = sample_warnings(all.strata(), without_media);
  py::object warn = py::module_::import("warnings").attr("warn");
  py::object category = py::module_::import("tiers.errors").attr("TiersWarning");
  for (const diagnostic& d : problems)
    warn(format_diagnostic(d), category, 3);
  return py::make_tuple(text, strata);
}

}  // namespace

void bind_review(py::module_& m) {
  m.def("_estimate_json", &estimate_json, py::arg("paths"), py::arg("level"),
        py::arg("target_precision"), "tiers.estimate's JSON (see tiers.estimate)");
  m.def(
      "_sample",
      [](const std::vector<py::object>& inputs, std::string tier, std::uint64_t n,
         std::uint64_t seed, std::string strata, std::string by, std::string allocation,
         std::string context, bool plan, double margin, double level, double review_rate,
         const std::string& sheet_folder, unsigned jobs, const py::kwargs& reading) {
        sample_settings s;
        s.tier = std::move(tier);
        s.n = n;
        s.seed = seed;
        s.strata = std::move(strata);
        s.by = std::move(by);
        s.allocation = std::move(allocation);
        s.context = std::move(context);
        return sample(inputs, s, plan, margin, level, review_rate, sheet_folder, jobs, reading);
      },
      py::arg("inputs"), py::arg("tier"), py::arg("n"), py::arg("seed"), py::arg("strata"),
      py::arg("by"), py::arg("allocation"), py::arg("context"), py::arg("plan"), py::arg("margin"),
      py::arg("level"), py::arg("review_rate"), py::arg("sheet_folder"), py::arg("jobs"),
      "tiers.sample's sheet or plan (see tiers.sample)");
}

}  // namespace tiers::python
