// Documents as pandas DataFrames and back: one row per annotation, the CSV writer's columns,
// the column arrays built here (numpy), not row by row in Python.
#include <pybind11/numpy.h>
#include <pybind11/stl.h>

#include <map>

#include "binding.hpp"
#include "tiers/format.hpp"
#include "tiers/model.hpp"
#include "tiers/table.hpp"
#include "tiers/time.hpp"

namespace tiers::python {
namespace {

py::object to_pandas(const document& doc) {
  const table_layout layout = layout_of(doc);
  const std::size_t n = layout.rows;
  const bool any_markup = layout.markup, any_confidence = layout.confidence, any_id = layout.id,
             any_parent = layout.parent;
  const std::vector<std::string>& keys = layout.attributes;
  py::array_t<std::int32_t> codes(static_cast<py::ssize_t>(n));
  py::array_t<double> start(static_cast<py::ssize_t>(n)), end(static_cast<py::ssize_t>(n)),
      confidence(static_cast<py::ssize_t>(n));
  py::array_t<std::int64_t> start_ns(static_cast<py::ssize_t>(n)),
      end_ns(static_cast<py::ssize_t>(n));
  py::list text(n), markup(n), id(n), parent(n);
  std::vector<py::list> extra;
  for (std::size_t k = 0; k < keys.size(); ++k)
    extra.emplace_back(n);
  auto* c = codes.mutable_data();
  auto *s = start.mutable_data(), *e = end.mutable_data(), *p = confidence.mutable_data();
  auto *sn = start_ns.mutable_data(), *en = end_ns.mutable_data();
  constexpr double per_second = static_cast<double>(ns_per_second);
  std::size_t row = 0;
  auto optional = [](const optional_text& v) -> py::object {
    return v ? py::object(py::str(*v)) : py::object(py::none());
  };
  for (std::size_t ti = 0; ti < doc.tiers.size(); ++ti)
    for (const annotation& a : doc.tiers[ti].annotations) {
      c[row] = static_cast<std::int32_t>(ti);
      s[row] = static_cast<double>(a.start) / per_second;
      e[row] = static_cast<double>(a.end) / per_second;
      sn[row] = a.start;
      en[row] = a.end;
      p[row] = a.confidence.value_or(std::numeric_limits<double>::quiet_NaN());
      text[row] = py::str(a.text);
      if (any_markup) markup[row] = optional(a.markup);
      if (any_id) id[row] = optional(a.id);
      if (any_parent) parent[row] = optional(a.parent);
      std::size_t k = 0;
      for (const std::string& key : keys) {
        const auto it = a.attributes.find(key);
        extra[k++][row] =
            it == a.attributes.end() ? py::object(py::none()) : py::object(py::str(it->second));
      }
      ++row;
    }
  py::module_ pandas = py::module_::import("pandas");
  // Tier names can repeat (the model allows it until checked): categories are unique names.
  py::dict columns;
  py::object categorical = pandas.attr("Categorical");
  py::list unique_names;
  std::map<std::string, std::int32_t> first;
  for (std::size_t ti = 0; ti < doc.tiers.size(); ++ti)
    if (first.emplace(doc.tiers[ti].name, static_cast<std::int32_t>(first.size())).second)
      unique_names.append(doc.tiers[ti].name);
  for (std::size_t r = 0; r < n; ++r)
    c[r] = first.at(doc.tiers[static_cast<std::size_t>(c[r])].name);
  columns["tier"] = categorical.attr("from_codes")(codes, unique_names);
  columns["start"] = start;
  columns["end"] = end;
  columns["text"] = text;
  if (any_confidence) columns["confidence"] = confidence;
  if (any_id) columns["id"] = id;
  if (any_parent) columns["parent"] = parent;
  if (any_markup) columns["markup"] = markup;
  std::size_t k = 0;
  for (const std::string& key : keys)
    columns[py::str(key)] = extra[k++];
  columns["start_ns"] = start_ns;
  columns["end_ns"] = end_ns;
  return pandas.attr("DataFrame")(columns);
}

// Exact decimal seconds of nanosecond times, as the CSV writer writes them.
py::list seconds_text(
    const py::array_t<std::int64_t, py::array::c_style | py::array::forcecast>& ns) {
  const auto view = ns.unchecked<1>();
  py::list out(static_cast<std::size_t>(view.shape(0)));
  char buf[32];
  for (py::ssize_t k = 0; k < view.shape(0); ++k)
    out[static_cast<std::size_t>(k)] = py::str(buf, format_seconds_to(view(k), buf));
  return out;
}

}  // namespace

void bind_tables(py::module_& m) {
  m.def("_seconds_text", &seconds_text, "Exact decimal seconds of int64 nanoseconds (from_pandas)");
  py::object document_class = m.attr("Document");
  document_class.attr("to_pandas") = py::cpp_function(
      &to_pandas, py::name("to_pandas"), py::is_method(document_class),
      py::sibling(py::getattr(document_class, "to_pandas", py::none())),
      "to_pandas() -> pandas.DataFrame\n\n"
      "One row per annotation, in the document's order, with the CSV writer's columns: tier "
      "(categorical), start, end (float seconds), text, then confidence, id, parent and markup "
      "when any annotation has one, then each attribute; then start_ns and end_ns, the exact "
      "times (int64 nanoseconds).");
}

}  // namespace tiers::python
