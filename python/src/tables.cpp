// Documents as pandas DataFrames and back: one row per annotation, the CSV writer's columns,
// the column arrays built here (numpy), not row by row in Python.
#include <pybind11/numpy.h>
#include <pybind11/stl.h>

#include <map>
#include <optional>
#include <unordered_map>

#include "binding.hpp"
#include "tiers/format.hpp"
#include "tiers/model.hpp"
#include "tiers/table.hpp"
#include "tiers/time.hpp"

namespace tiers::python {
namespace {

// A numpy array of Python objects, filled slot by slot without a Python call per row. Texts
// that repeat (labels, words) become one str object shared by their rows: fewer allocations,
// and a DataFrame of a million annotations holds a few thousand distinct labels once.
class object_column {
 public:
  explicit object_column(std::size_t n)
      : array_(py::dtype("object"), std::vector<py::ssize_t>{static_cast<py::ssize_t>(n)}),
        slots_(static_cast<PyObject**>(array_.mutable_data())) {}
  object_column(const object_column&) = delete;
  object_column& operator=(const object_column&) = delete;
  object_column(object_column&& o) noexcept
      : array_(std::move(o.array_)), slots_(o.slots_), shared_(std::move(o.shared_)) {
    o.shared_.clear();  // its references are this one's now
  }
  object_column& operator=(object_column&&) = delete;
  ~object_column() {
    for (auto& [text, object] : shared_)
      Py_DECREF(object);
  }

  void set(std::size_t row, std::string_view text) {
    PyObject* object = nullptr;
    if (text.size() <= 40) {
      auto [it, fresh] = shared_.try_emplace(text, nullptr);
      if (fresh) it->second = make(text);
      object = it->second;
      Py_INCREF(object);
    } else {
      object = make(text);
    }
    put(row, object);
  }
  void set(std::size_t row, const optional_text& text) {
    if (text) return set(row, std::string_view(*text));
    none(row);
  }
  void none(std::size_t row) {
    Py_INCREF(Py_None);
    put(row, Py_None);
  }
  py::array& array() { return array_; }

 private:
  static PyObject* make(std::string_view text) {
    PyObject* o = PyUnicode_FromStringAndSize(text.data(), static_cast<py::ssize_t>(text.size()));
    if (!o) throw py::error_already_set();
    return o;
  }
  void put(std::size_t row, PyObject* owned) {
    PyObject* old = slots_[row];
    slots_[row] = owned;
    Py_XDECREF(old);
  }

  py::array array_;
  PyObject** slots_;
  std::unordered_map<std::string_view, PyObject*> shared_;  ///< views into the document
};

py::object to_pandas(const document& doc) {
  const table_layout layout = layout_of(doc);
  const std::size_t n = layout.rows;
  const std::vector<std::string>& keys = layout.attributes;
  py::array_t<std::int32_t> codes(static_cast<py::ssize_t>(n));
  py::array_t<double> start(static_cast<py::ssize_t>(n)), end(static_cast<py::ssize_t>(n)),
      confidence(static_cast<py::ssize_t>(n));
  py::array_t<std::int64_t> start_ns(static_cast<py::ssize_t>(n)),
      end_ns(static_cast<py::ssize_t>(n));
  object_column text(n);
  std::optional<object_column> markup, id, parent;
  if (layout.markup) markup.emplace(n);
  if (layout.id) id.emplace(n);
  if (layout.parent) parent.emplace(n);
  std::vector<object_column> extra;
  extra.reserve(keys.size());
  for (std::size_t k = 0; k < keys.size(); ++k)
    extra.emplace_back(n);
  // Tier names can repeat (the model allows it until checked): categories are unique names.
  py::list categories;
  std::vector<std::int32_t> code_of(doc.tiers.size());
  {
    std::map<std::string_view, std::int32_t> first;
    for (std::size_t ti = 0; ti < doc.tiers.size(); ++ti) {
      const auto [it, fresh] =
          first.try_emplace(doc.tiers[ti].name, static_cast<std::int32_t>(first.size()));
      if (fresh) categories.append(doc.tiers[ti].name);
      code_of[ti] = it->second;
    }
  }
  auto* c = codes.mutable_data();
  auto *s = start.mutable_data(), *e = end.mutable_data(), *p = confidence.mutable_data();
  auto *sn = start_ns.mutable_data(), *en = end_ns.mutable_data();
  constexpr double per_second = static_cast<double>(ns_per_second);
  std::size_t row = 0;
  for (std::size_t ti = 0; ti < doc.tiers.size(); ++ti)
    for (const annotation& a : doc.tiers[ti].annotations) {
      c[row] = code_of[ti];
      s[row] = static_cast<double>(a.start) / per_second;
      e[row] = static_cast<double>(a.end) / per_second;
      sn[row] = a.start;
      en[row] = a.end;
      p[row] = a.confidence.value_or(std::numeric_limits<double>::quiet_NaN());
      text.set(row, std::string_view(a.text));
      if (markup) markup->set(row, a.markup);
      if (id) id->set(row, a.id);
      if (parent) parent->set(row, a.parent);
      for (std::size_t k = 0; k < keys.size(); ++k) {
        const auto it = a.attributes.find(keys[k]);
        if (it == a.attributes.end())
          extra[k].none(row);
        else
          extra[k].set(row, std::string_view(it->second));
      }
      ++row;
    }
  py::module_ pandas = py::module_::import("pandas");
  py::dict columns;
  columns["tier"] = pandas.attr("Categorical").attr("from_codes")(codes, categories);
  columns["start"] = start;
  columns["end"] = end;
  columns["text"] = text.array();
  if (layout.confidence) columns["confidence"] = confidence;
  if (id) columns["id"] = id->array();
  if (parent) columns["parent"] = parent->array();
  if (markup) columns["markup"] = markup->array();
  for (std::size_t k = 0; k < keys.size(); ++k)
    columns[py::str(keys[k])] = extra[k].array();
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
