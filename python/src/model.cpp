// Document, Tier, Annotation and their parts, bound to the C++ model itself: a tier or an
// annotation reached from a document is a view into it, so that editing it edits the document.
#include <pybind11/stl.h>
#include <pybind11/stl_bind.h>

#include <sstream>

#include "binding.hpp"
#include "tiers/model.hpp"
#include "tiers/time.hpp"

PYBIND11_MAKE_OPAQUE(std::vector<tiers::tier>);
PYBIND11_MAKE_OPAQUE(std::vector<tiers::annotation>);

namespace tiers::python {
namespace {

// Seconds given as a Python number, to the nanosecond: through the number's shortest decimal
// form (repr), so that 1.1 is 1_100_000_000 ns exactly, as the readers take "1.1".
time_ns seconds_arg(const py::handle& value, const char* what) {
  if (py::isinstance<py::int_>(value)) {
    const auto whole = value.cast<std::int64_t>();
    time_ns ns = 0;
    if (__builtin_mul_overflow(whole, ns_per_second, &ns))
      throw py::value_error(std::string(what) + " is out of range");
    return ns;
  }
  const std::string text = py::repr(py::float_(py::reinterpret_borrow<py::object>(value)));
  const parsed_time t = parse_seconds(text);
  if (!t)
    throw py::value_error(std::string(what) + ": " + text + " " + std::string(describe(t.status)));
  return t.value;
}

double seconds(time_ns t) {
  return static_cast<double>(t) / static_cast<double>(ns_per_second);
}

std::optional<std::string> text_of(const optional_text& t) {
  return t.to_optional();
}

template <class E>
E enum_arg(std::optional<E> (*parse)(std::string_view), const std::string& text, const char* what,
           const char* allowed) {
  if (auto v = parse(text)) return *v;
  throw py::value_error(std::string(what) + " '" + text + "' is not " + allowed);
}

std::string annotation_repr(const annotation& a) {
  std::string s = "Annotation(" + format_seconds(a.start) + ", " + format_seconds(a.end) + ", " +
                  std::string(py::repr(py::str(a.text)));
  if (a.confidence) s += ", confidence=" + std::string(py::repr(py::float_(*a.confidence)));
  if (a.id) s += ", id=" + std::string(py::repr(py::str(*a.id)));
  return s + ")";
}

std::string source_text(const tier_source& s) {
  std::string out(to_string(s.kind));
  if (s.agent) out += " " + *s.agent;
  if (s.version) out += " " + *s.version;
  return out;
}

void bind_attributes(py::module_& m) {
  py::class_<attribute_map>(m, "Attributes",
                            "Name/value pairs of text (a tier's, an annotation's, the "
                            "document's metadata), ordered by name; behaves as a dict of str")
      .def(py::init<>())
      .def("__len__", &attribute_map::size)
      .def("__contains__",
           [](const attribute_map& a, const std::string& k) { return a.count(k) > 0; })
      .def("__getitem__",
           [](const attribute_map& a, const std::string& k) {
             const auto it = a.find(k);
             if (it == a.end()) throw py::key_error(k);
             return it->second;
           })
      .def("__setitem__",
           [](attribute_map& a, const std::string& k, const std::string& v) { a[k] = v; })
      .def("__delitem__",
           [](attribute_map& a, const std::string& k) {
             if (!a.erase(k)) throw py::key_error(k);
           })
      .def("__iter__",
           [](const attribute_map& a) {
             py::list keys;
             for (const auto& [k, v] : a)
               keys.append(k);
             return py::iter(keys);
           })
      .def(
          "get",
          [](const attribute_map& a, const std::string& k, py::object fallback) -> py::object {
            const auto it = a.find(k);
            return it == a.end() ? fallback : py::str(it->second);
          },
          py::arg("key"), py::arg("default") = py::none())
      .def("keys",
           [](const attribute_map& a) {
             py::list out;
             for (const auto& [k, v] : a)
               out.append(k);
             return out;
           })
      .def("items",
           [](const attribute_map& a) {
             py::list out;
             for (const auto& [k, v] : a)
               out.append(py::make_tuple(k, v));
             return out;
           })
      .def("to_dict",
           [](const attribute_map& a) {
             py::dict out;
             for (const auto& [k, v] : a)
               out[py::str(k)] = v;
             return out;
           })
      .def("__eq__",
           [](const attribute_map& a, const py::object& other) {
             if (py::isinstance<attribute_map>(other))
               return a == other.cast<const attribute_map&>();
             py::dict mine;
             for (const auto& [k, v] : a)
               mine[py::str(k)] = v;
             return mine.equal(other);
           })
      .def("__repr__", [](const attribute_map& a) {
        py::dict d;
        for (const auto& [k, v] : a)
          d[py::str(k)] = v;
        return "Attributes(" + std::string(py::repr(d)) + ")";
      });
}

// Fills `to` from a dict, an Attributes or None.
void assign(attribute_map& to, const py::handle& from) {
  if (from.is_none()) {
    to.clear();
    return;
  }
  if (py::isinstance<attribute_map>(from)) {
    to = from.cast<const attribute_map&>();
    return;
  }
  attribute_map fresh;
  for (const auto& [k, v] : py::cast<py::dict>(from))
    fresh[py::cast<std::string>(k)] = py::cast<std::string>(v);
  to = std::move(fresh);
}

}  // namespace

void bind_model(py::module_& m) {
  py::class_<diagnostic>(m, "Diagnostic",
                         "One located problem: file, line, column, severity, "
                         "code (the rule) and message")
      .def_property_readonly("severity",
                             [](const diagnostic& d) { return std::string(to_string(d.level)); })
      .def_readonly("code", &diagnostic::code)
      .def_readonly("message", &diagnostic::message)
      .def_readonly("file", &diagnostic::file)
      .def_readonly("line", &diagnostic::line, "1-based; 0 when unknown")
      .def_readonly("column", &diagnostic::column, "1-based, in code points; 0 when unknown")
      .def_property_readonly("offset",
                             [](const diagnostic& d) -> std::optional<std::size_t> {
                               if (d.offset == no_offset) return std::nullopt;
                               return d.offset;
                             })
      .def("__str__", &format_diagnostic)
      .def("__repr__", [](const diagnostic& d) {
        return "Diagnostic(" + std::string(py::repr(py::str(format_diagnostic(d)))) + ")";
      });

  bind_attributes(m);

  py::class_<tier_source>(m, "Source",
                          "Who made a tier: kind 'human' or 'machine', the agent "
                          "(annotator or program) and its version")
      .def(py::init([](const std::string& kind, std::optional<std::string> agent,
                       std::optional<std::string> version) {
             return tier_source{enum_arg(&parse_source_kind, kind, "kind", "'human' or 'machine'"),
                                std::move(agent), std::move(version)};
           }),
           py::arg("kind") = "human", py::arg("agent") = py::none(),
           py::arg("version") = py::none())
      .def_property(
          "kind", [](const tier_source& s) { return std::string(to_string(s.kind)); },
          [](tier_source& s, const std::string& k) {
            s.kind = enum_arg(&parse_source_kind, k, "kind", "'human' or 'machine'");
          })
      .def_readwrite("agent", &tier_source::agent)
      .def_readwrite("version", &tier_source::version)
      .def("__eq__", [](const tier_source& a, const tier_source& b) { return a == b; })
      .def("__repr__", [](const tier_source& s) {
        return "Source(" + std::string(py::repr(py::str(to_string(s.kind)))) +
               (s.agent ? ", agent=" + std::string(py::repr(py::str(*s.agent))) : "") +
               (s.version ? ", version=" + std::string(py::repr(py::str(*s.version))) : "") + ")";
      });

  py::class_<parent_link>(m, "ParentLink",
                          "A child tier's link to its parent tier: the parent's name and the "
                          "relation 'within', 'partition' or 'refers'")
      .def(py::init([](std::string tier_name, const std::string& rel) {
             return parent_link{
                 std::move(tier_name),
                 enum_arg(&parse_relation, rel, "relation", "'within', 'partition' or 'refers'")};
           }),
           py::arg("tier"), py::arg("relation") = "within")
      .def_readwrite("tier", &parent_link::tier)
      .def_property(
          "relation", [](const parent_link& p) { return std::string(to_string(p.rel)); },
          [](parent_link& p, const std::string& r) {
            p.rel = enum_arg(&parse_relation, r, "relation", "'within', 'partition' or 'refers'");
          })
      .def("__eq__", [](const parent_link& a, const parent_link& b) { return a == b; })
      .def("__repr__", [](const parent_link& p) {
        return "ParentLink(" + std::string(py::repr(py::str(p.tier))) + ", " +
               std::string(py::repr(py::str(to_string(p.rel)))) + ")";
      });

  py::class_<media_info>(m, "Media",
                         "The recording the tiers describe: its URI, duration and "
                         "frame rate, each None when unknown")
      .def(py::init<>())
      .def_readwrite("uri", &media_info::uri)
      .def_property(
          "duration",
          [](const media_info& mi) -> std::optional<double> {
            if (!mi.duration) return std::nullopt;
            return seconds(*mi.duration);
          },
          [](media_info& mi, const py::object& v) {
            mi.duration =
                v.is_none() ? std::nullopt : std::optional<time_ns>(seconds_arg(v, "duration"));
          },
          "Seconds (float), or None")
      .def_readwrite("duration_ns", &media_info::duration, "Nanoseconds (int), or None")
      .def_property(
          "frame_rate",
          [](const media_info& mi) -> std::optional<std::string> {
            if (!mi.frame_rate) return std::nullopt;
            return format_rational(*mi.frame_rate);
          },
          [](media_info& mi, const py::object& v) {
            if (v.is_none()) {
              mi.frame_rate = std::nullopt;
              return;
            }
            const std::string text = py::str(v);
            const std::optional<rational> r = parse_rational(text);
            if (!r)
              throw py::value_error("frame_rate '" + text + "' is not a rate: 25, 30000/1001");
            mi.frame_rate = r;
          },
          "Frames a second as exact text ('25', '30000/1001'), or None")
      .def("__eq__", [](const media_info& a, const media_info& b) { return a == b; })
      .def("__repr__", [](const media_info& mi) {
        std::string s = "Media(";
        if (mi.uri) s += "uri=" + std::string(py::repr(py::str(*mi.uri)));
        if (mi.duration)
          s += std::string(mi.uri ? ", " : "") + "duration=" + format_seconds(*mi.duration);
        if (mi.frame_rate)
          s += std::string(mi.uri || mi.duration ? ", " : "") + "frame_rate='" +
               format_rational(*mi.frame_rate) + "'";
        return s + ")";
      });

  py::class_<annotation>(m, "Annotation",
                         "One labelled span or instant. `start` and `end` are float seconds "
                         "for convenience; `start_ns` and `end_ns` are the exact times")
      .def(py::init([](const py::object& start, const py::object& end, std::string text,
                       std::optional<double> confidence, std::optional<std::string> id,
                       std::optional<std::string> markup, std::optional<std::string> parent,
                       const py::object& attributes) {
             annotation a;
             a.start = seconds_arg(start, "start");
             a.end = end.is_none() ? a.start : seconds_arg(end, "end");
             a.text = std::move(text);
             if (confidence && !(*confidence >= 0 && *confidence <= 1))
               throw py::value_error("confidence is a number from 0 to 1");
             a.confidence = confidence;
             a.id = id;
             a.markup = markup;
             a.parent = parent;
             assign(a.attributes, attributes);
             return a;
           }),
           py::arg("start"), py::arg("end") = py::none(), py::arg("text") = "", py::kw_only(),
           py::arg("confidence") = py::none(), py::arg("id") = py::none(),
           py::arg("markup") = py::none(), py::arg("parent") = py::none(),
           py::arg("attributes") = py::none(),
           "Annotation(start, end=None, text='', *, confidence=None, id=None, markup=None, "
           "parent=None, attributes=None): times in seconds (an int or float, taken to the "
           "nanosecond through its decimal form); end None makes an instant")
      .def_property(
          "start", [](const annotation& a) { return seconds(a.start); },
          [](annotation& a, const py::object& v) { a.start = seconds_arg(v, "start"); })
      .def_property(
          "end", [](const annotation& a) { return seconds(a.end); },
          [](annotation& a, const py::object& v) { a.end = seconds_arg(v, "end"); })
      .def_readwrite("start_ns", &annotation::start)
      .def_readwrite("end_ns", &annotation::end)
      .def_readwrite("text", &annotation::text)
      .def_property(
          "confidence", [](const annotation& a) { return a.confidence; },
          [](annotation& a, std::optional<double> c) {
            if (c && !(*c >= 0 && *c <= 1))
              throw py::value_error("confidence is a number from 0 to 1");
            a.confidence = c;
          })
      .def_property(
          "markup", [](const annotation& a) { return text_of(a.markup); },
          [](annotation& a, std::optional<std::string> v) { a.markup = v; })
      .def_property(
          "id", [](const annotation& a) { return text_of(a.id); },
          [](annotation& a, std::optional<std::string> v) { a.id = v; })
      .def_property(
          "parent", [](const annotation& a) { return text_of(a.parent); },
          [](annotation& a, std::optional<std::string> v) { a.parent = v; })
      .def_property(
          "attributes", [](annotation& a) -> attribute_map& { return a.attributes; },
          [](annotation& a, const py::object& v) { assign(a.attributes, v); },
          py::return_value_policy::reference_internal)
      .def_property_readonly("duration",
                             [](const annotation& a) { return seconds(a.end - a.start); })
      .def("__eq__", [](const annotation& a, const annotation& b) { return a == b; })
      .def("__repr__", &annotation_repr);

  py::bind_vector<std::vector<annotation>>(m, "AnnotationList",
                                           "A tier's annotations, in the tier's order");

  py::class_<tier>(m, "Tier", "A named layer of annotations of one kind")
      .def(py::init([](std::string name, const std::string& kind, const py::object& annotations,
                       std::optional<tier_source> source, std::optional<parent_link> parent,
                       std::optional<std::vector<std::string>> vocabulary,
                       const py::object& attributes) {
             tier t;
             t.name = std::move(name);
             t.kind = enum_arg(&parse_tier_kind, kind, "kind", "'interval' or 'instant'");
             if (!annotations.is_none())
               for (const py::handle a : annotations)
                 t.annotations.push_back(a.cast<annotation>());
             t.source = std::move(source);
             t.parent = std::move(parent);
             t.vocabulary = std::move(vocabulary);
             assign(t.attributes, attributes);
             return t;
           }),
           py::arg("name"), py::arg("kind") = "interval", py::arg("annotations") = py::none(),
           py::kw_only(), py::arg("source") = py::none(), py::arg("parent") = py::none(),
           py::arg("vocabulary") = py::none(), py::arg("attributes") = py::none())
      .def_readwrite("name", &tier::name)
      .def_property(
          "kind", [](const tier& t) { return std::string(to_string(t.kind)); },
          [](tier& t, const std::string& k) {
            t.kind = enum_arg(&parse_tier_kind, k, "kind", "'interval' or 'instant'");
          })
      .def_property(
          "source", [](tier& t) -> tier_source* { return t.source ? &*t.source : nullptr; },
          [](tier& t, std::optional<tier_source> s) { t.source = std::move(s); },
          py::return_value_policy::reference_internal, "Source, or None when unknown")
      .def_property(
          "parent", [](tier& t) -> parent_link* { return t.parent ? &*t.parent : nullptr; },
          [](tier& t, std::optional<parent_link> p) { t.parent = std::move(p); },
          py::return_value_policy::reference_internal, "ParentLink, or None")
      .def_readwrite("vocabulary", &tier::vocabulary, "The allowed labels (a list), or None")
      .def_property(
          "attributes", [](tier& t) -> attribute_map& { return t.attributes; },
          [](tier& t, const py::object& v) { assign(t.attributes, v); },
          py::return_value_policy::reference_internal)
      .def_property(
          "annotations", [](tier& t) -> std::vector<annotation>& { return t.annotations; },
          [](tier& t, const py::object& v) {
            std::vector<annotation> fresh;
            for (const py::handle a : v)
              fresh.push_back(a.cast<annotation>());
            t.annotations = std::move(fresh);
          },
          py::return_value_policy::reference_internal)
      .def("__len__", [](const tier& t) { return t.annotations.size(); })
      .def(
          "__iter__",
          [](tier& t) { return py::make_iterator(t.annotations.begin(), t.annotations.end()); },
          py::keep_alive<0, 1>())
      .def(
          "__getitem__",
          [](tier& t, std::ptrdiff_t k) -> annotation& {
            const auto n = static_cast<std::ptrdiff_t>(t.annotations.size());
            if (k < 0) k += n;
            if (k < 0 || k >= n) throw py::index_error("annotation index out of range");
            return t.annotations[static_cast<std::size_t>(k)];
          },
          py::return_value_policy::reference_internal)
      .def("__eq__", [](const tier& a, const tier& b) { return a == b; })
      .def("__repr__", [](const tier& t) {
        std::string s = "Tier(" + std::string(py::repr(py::str(t.name))) + ", " +
                        std::string(to_string(t.kind)) + ", " +
                        std::to_string(t.annotations.size()) + " annotations";
        if (t.source) s += ", " + source_text(*t.source);
        if (t.parent) s += ", child of " + std::string(py::repr(py::str(t.parent->tier)));
        return s + ")";
      });

  py::bind_vector<std::vector<tier>>(m, "TierList", "A document's tiers, in order");

  py::class_<document>(m, "Document",
                       "A set of tiers over one recording: media, metadata and tiers. "
                       "doc['words'] is the tier of that name")
      .def(py::init([](const py::object& tiers_list, std::optional<media_info> media,
                       const py::object& metadata) {
             document d;
             if (!tiers_list.is_none())
               for (const py::handle t : tiers_list)
                 d.tiers.push_back(t.cast<tier>());
             if (media) d.media = *media;
             assign(d.metadata, metadata);
             return d;
           }),
           py::arg("tiers") = py::none(), py::kw_only(), py::arg("media") = py::none(),
           py::arg("metadata") = py::none())
      .def_property(
          "media", [](document& d) -> media_info& { return d.media; },
          [](document& d, const media_info& mi) { d.media = mi; },
          py::return_value_policy::reference_internal)
      .def_property(
          "metadata", [](document& d) -> attribute_map& { return d.metadata; },
          [](document& d, const py::object& v) { assign(d.metadata, v); },
          py::return_value_policy::reference_internal)
      .def_property(
          "tiers", [](document& d) -> std::vector<tier>& { return d.tiers; },
          [](document& d, const py::object& v) {
            std::vector<tier> fresh;
            for (const py::handle t : v)
              fresh.push_back(t.cast<tier>());
            d.tiers = std::move(fresh);
          },
          py::return_value_policy::reference_internal)
      .def(
          "__getitem__",
          [](document& d, const std::string& name) -> tier& {
            if (tier* t = find_tier(d, name)) return *t;
            throw py::key_error("no tier '" + name + "' (its tiers: " + tier_names(d) + ")");
          },
          py::return_value_policy::reference_internal)
      .def("__contains__",
           [](const document& d, const std::string& name) { return find_tier(d, name) != nullptr; })
      .def("__len__", [](const document& d) { return d.tiers.size(); })
      .def(
          "__iter__", [](document& d) { return py::make_iterator(d.tiers.begin(), d.tiers.end()); },
          py::keep_alive<0, 1>())
      .def("__eq__", [](const document& a, const document& b) { return a == b; })
      .def("__repr__", [](const document& d) {
        std::size_t n = 0;
        for (const tier& t : d.tiers)
          n += t.annotations.size();
        std::string s = "Document(" + std::to_string(d.tiers.size()) + " tiers: " + tier_names(d) +
                        "; " + std::to_string(n) + " annotations";
        if (d.media.uri) s += "; media " + std::string(py::repr(py::str(*d.media.uri)));
        return s + ")";
      });
}

}  // namespace tiers::python
