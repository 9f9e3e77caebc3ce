// tiers.dataset and tiers.read_recording: a dataset description's recordings listed as
// `tiers dataset --json` lists them, and one recording read as every `--dataset` run reads it.
#include <pybind11/stl.h>

#include "binding.hpp"
#include "tiers/info.hpp"
#include "tiers/recordings.hpp"

namespace tiers::python {
namespace {

opened_dataset opened(const py::object& description, const reading_settings& settings) {
  result<opened_dataset> d = open_dataset(path_text(description), settings);
  if (!d.ok()) raise_errors(d.diagnostics);
  return std::move(d.value);
}

std::string listing_json(const py::object& description, unsigned jobs, const py::kwargs& reading) {
  const opened_dataset d = opened(description, settings_of(std::nullopt, reading));
  std::string text;
  {
    py::gil_scoped_release unlocked;
    // A recording that cannot be read is listed so ("read": false), as the command lists it.
    std::vector<std::optional<document_summary>> summaries(d.recordings.size());
    run_parallel(d.recordings.size(), jobs, [&](std::size_t k) {
      recording_read r = read_recording(d, d.recordings[k]);
      if (r.ok) summaries[k] = summarize(r.doc);
    });
    string_sink out(text);
    write_dataset_listing_json(d.description, d.recordings, summaries, d.file, out);
    out.flush();
  }
  return text;
}

document recording_document(const py::object& description, const std::string& id,
                            const py::kwargs& reading) {
  const opened_dataset d = opened(description, settings_of(std::nullopt, reading));
  for (const recording& r : d.recordings) {
    if (r.id != id) continue;
    std::vector<diagnostic> problems = lacking_sources(d, r);
    recording_read read;
    {
      py::gil_scoped_release unlocked;
      read = read_recording(d, r);
    }
    problems.insert(problems.end(), read.diagnostics.begin(), read.diagnostics.end());
    return take_document(read_result{{std::move(read.doc), std::move(problems)}, {}});
  }
  std::string ids;
  for (std::size_t k = 0; k < d.recordings.size() && k < 10; ++k)
    ids += (k ? ", " : "") + quote_name(d.recordings[k].id);
  raise("UsageError",
        d.file + " has no recording " + quote_name(id) + " (" + ids +
            (d.recordings.size() > 10 ? ", …" : "") + ")",
        {});
}

}  // namespace

void bind_dataset(py::module_& m) {
  m.def("_dataset_json", &listing_json, py::arg("description"), py::arg("jobs"),
        "tiers.dataset's JSON (see tiers.dataset)");
  m.def("_read_recording", &recording_document, py::arg("description"), py::arg("id"),
        "tiers.read_recording's document (see tiers.read_recording)");
}

}  // namespace tiers::python
