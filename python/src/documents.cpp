// The operations that make a document: tiers.retime, tiers.edit, tiers.derive and tiers.merge,
// each as the command of its name does it, over the library's settings.
#include <pybind11/stl.h>

#include "binding.hpp"
#include "tiers/derive.hpp"
#include "tiers/edit.hpp"
#include "tiers/io.hpp"
#include "tiers/merge.hpp"
#include "tiers/profile.hpp"
#include "tiers/retime.hpp"

namespace tiers::python {
namespace {

// A document given as a Document (copied: the operations leave it as it was) or as a path,
// read with the reading options; `file` is what diagnostics call it.
struct given_document {
  std::string file;
  document doc;
};

given_document document_of(const py::object& given, const reading_settings& settings) {
  if (py::isinstance<document>(given)) return {"", py::cast<const document&>(given)};
  const std::string path = path_text(given);
  return {path, take_document(read_input_file(path, settings))};
}

profile profile_of(const std::optional<std::string>& name) {
  if (!name) return {};
  profile_result p = load_profile(*name);
  if (!p.ok()) raise_errors(p.diagnostics);
  return std::move(p.value);
}

// Warnings as TiersWarning; an error raises `kind` with every diagnostic.
void settle(const std::vector<diagnostic>& diagnostics, const char* kind) {
  for (const diagnostic& d : diagnostics)
    if (d.level == severity::error) raise(kind, format_diagnostic(d), diagnostics);
  py::object warn = py::module_::import("warnings").attr("warn");
  py::object category = py::module_::import("tiers.errors").attr("TiersWarning");
  for (const diagnostic& d : diagnostics)
    if (d.level == severity::warning) warn(format_diagnostic(d), category, 3);
}

// tiers.retime's document and JSON report.
std::pair<document, std::string> retime(const py::object& given, const py::object& words,
                                        const retime_settings& settings,
                                        const std::optional<std::string>& profile_name,
                                        const std::optional<std::string>& to,
                                        const py::kwargs& reading) {
  const reading_settings in = settings_of(std::nullopt, reading);
  given_document d = document_of(given, in);
  const profile p = profile_of(profile_name);
  retime_words w;
  std::optional<words_file> other;
  std::optional<document> words_doc;
  if (py::isinstance<document>(words)) {
    words_doc = py::cast<const document&>(words);
    w.doc = &*words_doc;
  } else if (!words.is_none()) {
    std::vector<diagnostic> problems;
    other = words_file_of(py::str(words), in, w.tier, problems);
    if (has_errors(problems)) raise_errors(problems);
    if (other) {
      w.doc = &other->doc;
      w.file = other->path;
      w.tier = other->tier;
    }
  }
  const format* out = to ? find_format(*to) : nullptr;
  if (to && !out) raise("UsageError", "no format '" + *to + "' (" + format_names() + ")", {});
  result<retimed> r = out ? retime_document(d.doc, d.file, p, settings, w, out->time_grid,
                                            out->carries.has(feature::metadata))
                          : retime_document(d.doc, d.file, p, settings, w);
  settle(r.diagnostics, "UsageError");
  return {std::move(d.doc), retime_report_json(r.value.result, r.value.before)};
}

// tiers.edit: the steps applied in order to a copy; EditError names the step refused.
document edit(const py::object& given, const std::vector<std::pair<std::string, py::object>>& steps,
              bool from_zero, const py::kwargs& reading) {
  const reading_settings in = settings_of(std::nullopt, reading);
  given_document d = document_of(given, in);
  for (const auto& [operation, value] : steps) {
    edit_step step{operation, {}};
    if (py::isinstance<py::str>(value))
      step.values.push_back(value.cast<std::string>());
    else
      for (const py::handle v : value)
        step.values.push_back(py::str(v));
    std::vector<diagnostic> problems = apply_edit(d.doc, step, in.rate, from_zero);
    for (diagnostic& p : problems) {
      p.file = d.file;
      p.message = operation + ": " + p.message;
    }
    settle(problems, "EditError");
  }
  return std::move(d.doc);
}

// tiers.derive: the tiers of a signal table.
document derive(const py::object& path_like, const derive_settings& settings) {
  const std::string path = path_text(path_like);
  const derive_request request = derive_request_of(settings, path);
  const std::string text = read_file(path);
  result<document> r;
  {
    py::gil_scoped_release unlocked;
    r = derive_signal(text, path, request);
  }
  settle(r.diagnostics, "ReadError");
  return std::move(r.value);
}

// tiers.merge: the plan file's inputs, then the given ones (paths, Documents, or (name,
// Document) pairs), merged as the settings say.
document merge(const std::vector<py::object>& given, merge_settings settings,
               const py::kwargs& reading) {
  const reading_settings in = settings_of(std::nullopt, reading);
  result<merge_plan> plan = merge_plan_of(settings);
  if (!plan.ok()) raise_errors(plan.diagnostics);
  std::vector<merge_input> inputs;
  std::vector<diagnostic> problems;
  auto read = [&](const std::string& path) {
    read_result r = read_input_file(path, in);
    const bool ok = r.ok();
    problems.insert(problems.end(), r.diagnostics.begin(), r.diagnostics.end());
    if (ok) inputs.push_back({display_name(path), std::move(r.value)});
  };
  for (const std::string& path : plan.value.inputs)
    read(path);
  for (std::size_t k = 0; k < given.size(); ++k) {
    const py::object& g = given[k];
    if (py::isinstance<document>(g)) {
      settings.paths.push_back("input-" + std::to_string(k + 1));
      inputs.push_back({settings.paths.back(), py::cast<const document&>(g)});
    } else if (py::isinstance<py::tuple>(g) && py::len(g) == 2) {
      settings.paths.push_back(py::str(g[py::int_(0)]));
      inputs.push_back({settings.paths.back(), py::cast<const document&>(g[py::int_(1)])});
    } else {
      settings.paths.push_back(path_text(g));
      read(settings.paths.back());
    }
  }
  if (has_errors(problems)) raise_errors(problems);
  if (inputs.empty()) raise("UsageError", "merge: name the documents to merge", {});
  merge_result merged;
  {
    py::gil_scoped_release unlocked;
    merged = merge_with(settings, std::move(inputs), in.rate);
  }
  problems.insert(problems.end(), merged.diagnostics.begin(), merged.diagnostics.end());
  settle(problems, "MergeError");
  return std::move(merged.value);
}

}  // namespace

void bind_documents(py::module_& m) {
  m.def(
      "_retime",
      [](const py::object& doc, const py::object& words, std::string captions, std::string lead_in,
         std::string hold, std::optional<std::string> min_gap,
         std::optional<std::string> min_duration, std::optional<double> max_cps,
         std::optional<std::string> profile, std::optional<std::string> to,
         const py::kwargs& reading) {
        retime_settings s;
        s.captions = std::move(captions);
        s.lead_in = std::move(lead_in);
        s.hold = std::move(hold);
        s.min_gap = min_gap.value_or("");
        s.min_duration = min_duration.value_or("");
        s.max_cps = max_cps;
        if (reading.contains("rate") && !reading["rate"].is_none())
          s.rate = py::str(reading["rate"]);
        return retime(doc, words, s, profile, to, reading);
      },
      py::arg("doc"), py::arg("words"), py::arg("captions"), py::arg("lead_in"), py::arg("hold"),
      py::arg("min_gap"), py::arg("min_duration"), py::arg("max_cps"), py::arg("profile"),
      py::arg("to"), "tiers.retime's document and report (see tiers.retime)");
  m.def("_edit", &edit, py::arg("doc"), py::arg("steps"), py::arg("from_zero"),
        "tiers.edit's document (see tiers.edit)");
  m.def(
      "_derive",
      [](const py::object& path, std::string from, std::string rate, std::string scores, double on,
         std::optional<double> off, std::size_t smooth, std::string min_duration,
         std::string bridge, std::string confidence, std::string agent, std::string agent_version,
         std::string tier_name, std::string label) {
        derive_settings s;
        s.from = std::move(from);
        s.rate = std::move(rate);
        s.scores = std::move(scores);
        s.on = on;
        s.off = off;
        s.smooth = smooth;
        s.min_duration = std::move(min_duration);
        s.bridge = std::move(bridge);
        s.confidence = std::move(confidence);
        s.agent = std::move(agent);
        s.agent_version = std::move(agent_version);
        s.tier_name = std::move(tier_name);
        s.label = std::move(label);
        return derive(path, s);
      },
      py::arg("path"), py::arg("from_"), py::arg("rate"), py::arg("scores"), py::arg("on"),
      py::arg("off"), py::arg("smooth"), py::arg("min_duration"), py::arg("bridge"),
      py::arg("confidence"), py::arg("agent"), py::arg("agent_version"), py::arg("tier_name"),
      py::arg("label"), "tiers.derive's document (see tiers.derive)");
  m.def(
      "_merge",
      [](const std::vector<py::object>& inputs, std::string plan, std::string clash,
         std::vector<std::string> shifts, std::vector<std::string> aligns, std::string max_offset,
         std::string into, std::string human, std::string machine, std::string strategy,
         std::string min_confidence, std::string min_duration, std::string review,
         std::string review_min, const py::kwargs& reading) {
        merge_settings s;
        s.plan = std::move(plan);
        s.clash = std::move(clash);
        s.shifts = std::move(shifts);
        s.aligns = std::move(aligns);
        s.max_offset = std::move(max_offset);
        s.into = std::move(into);
        s.human = std::move(human);
        s.machine = std::move(machine);
        s.strategy = std::move(strategy);
        s.min_confidence = std::move(min_confidence);
        s.min_duration = std::move(min_duration);
        s.review = std::move(review);
        s.review_min = std::move(review_min);
        return merge(inputs, std::move(s), reading);
      },
      py::arg("inputs"), py::arg("plan"), py::arg("clash"), py::arg("shifts"), py::arg("aligns"),
      py::arg("max_offset"), py::arg("into"), py::arg("human"), py::arg("machine"),
      py::arg("strategy"), py::arg("min_confidence"), py::arg("min_duration"), py::arg("review"),
      py::arg("review_min"), "tiers.merge's document (see tiers.merge)");
}

}  // namespace tiers::python
