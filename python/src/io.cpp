// Reading and writing: tiers.read / loads and tiers.write / dumps, with the command line's
// reading options by name, its format choice, and its refusal to lose data.
#include <pybind11/stl.h>

#include "binding.hpp"
#include "tiers/dataset.hpp"
#include "tiers/format.hpp"
#include "tiers/inputs.hpp"
#include "tiers/io.hpp"
#include "tiers/model.hpp"
#include "tiers/sink.hpp"

namespace tiers::python {

std::string path_text(const py::handle& path) {
  return py::str(py::module_::import("os").attr("fspath")(path));
}

void raise(const char* kind, const std::string& message, const std::vector<diagnostic>& diagnostics,
           const std::vector<std::string>& losses) {
  py::object cls = py::module_::import("tiers.errors").attr(kind);
  py::object error = std::string(kind) == "LossError"
                         ? cls(message, py::cast(diagnostics), py::cast(losses))
                         : cls(message, py::cast(diagnostics));
  PyErr_SetObject(cls.ptr(), error.ptr());
  throw py::error_already_set();
}

std::string read_file(const std::string& path) {
  try {
    return read_input(path);
  } catch (const tiers::error& e) {
    raise("ReadError", format_diagnostic(e.diag()), {e.diag()});
  }
}

reading_settings settings_of(std::optional<std::string> format, const py::kwargs& options) {
  reading_settings r;
  if (format) r.from = *format;
  for (const auto& [key, value] : options) {
    const std::string k = py::str(key);
    auto text = [&]() -> std::string {
      if (py::isinstance<py::dict>(value) && k == "columns") {
        std::string joined;
        for (const auto& [role, column] : py::cast<py::dict>(value))
          joined += (joined.empty() ? "" : ",") + std::string(py::str(role)) + "=" +
                    std::string(py::str(column));
        return joined;
      }
      return py::str(value);
    };
    if (value.is_none()) continue;
    if (k == "columns")
      r.columns = text();
    else if (k == "tier_name")
      r.tier_name = text();
    else if (k == "time_unit")
      r.time_unit = text();
    else if (k == "rate")
      r.rate = text();
    else if (k == "source")
      r.source = text();
    else if (k == "kind")
      r.kind = text();
    else if (k == "strict")
      r.strict = value.cast<bool>();
    else if (k == "max_text")
      r.max_text = value.cast<std::size_t>();
    else if (k == "max_tiers")
      r.max_tiers = value.cast<std::size_t>();
    else
      raise("UsageError",
            "unknown reading option '" + k +
                "' (columns, tier_name, time_unit, rate, strict, max_text, max_tiers, source, "
                "kind)",
            {});
  }
  reading_options(r, "");  // a bad value fails here, before anything is read
  return r;
}

std::vector<named_input> inputs_of(const std::vector<py::object>& given) {
  std::vector<named_input> out;
  for (std::size_t k = 0; k < given.size(); ++k) {
    const py::object& g = given[k];
    if (py::isinstance<document>(g)) {
      const std::string name = "document-" + std::to_string(k + 1);
      out.push_back({name, name, &py::cast<const document&>(g)});
    } else if (py::isinstance<py::tuple>(g) && py::len(g) == 2 &&
               py::isinstance<document>(g[py::int_(1)])) {
      const std::string name = py::str(g[py::int_(0)]);
      out.push_back({name, name, &py::cast<const document&>(g[py::int_(1)])});
    } else {
      for (input_file& f : expand_inputs({path_text(g)}))
        out.push_back({display_name(f.path), std::move(f.path), nullptr});
    }
  }
  return out;
}

void raise_errors(const std::vector<diagnostic>& diagnostics) {
  const auto first = std::find_if(diagnostics.begin(), diagnostics.end(),
                                  [](const diagnostic& d) { return d.level == severity::error; });
  raise("ReadError", format_diagnostic(first == diagnostics.end() ? diagnostics.front() : *first),
        diagnostics);
}

document take_document(read_result&& result) {
  if (!result.ok()) raise_errors(result.diagnostics);
  // Warnings and notes as Python warnings, which a notebook shows once and a script can filter.
  py::object warn = py::module_::import("warnings").attr("warn");
  py::object category = py::module_::import("tiers.errors").attr("TiersWarning");
  for (const diagnostic& d : result.diagnostics)
    if (d.level == severity::warning) warn(format_diagnostic(d), category, 2);
  return std::move(result.value);
}

namespace {

[[noreturn]] void usage(const std::string& message) {
  raise("UsageError", message, {});
}

const format& format_named(const std::string& name) {
  if (const format* f = find_format(name)) return *f;
  usage("no format '" + name + "' (the formats: " + format_names() + ")");
}

// The document in `content`, read as the command line reads a file called `file` (bytes,
// without a name, make a tier called `tier` when the format names none).
document read_content(const std::string& content, const std::string& file,
                      const reading_settings& settings) {
  read_options options = reading_options(settings, file);
  if (file.empty() && settings.tier_name.empty()) options.tier_name = "tier";
  diagnostic why;
  const format* fmt = !settings.from.empty() ? &format_named(settings.from)
                                             : choose_format(file, content, why, "format=");
  if (!fmt) raise("ReadError", format_diagnostic(why), {why});
  read_result result;
  {
    py::gil_scoped_release unlocked;
    result = read_document(content, *fmt, options, file);
  }
  if (result.ok())
    for (diagnostic& d : settle_tiers(result.value, settings, file))
      result.diagnostics.push_back(std::move(d));
  return take_document(std::move(result));
}

document read(const py::object& input, std::optional<std::string> name, const py::kwargs& options) {
  const reading_settings r = settings_of(std::move(name), options);
  if (py::isinstance<py::bytes>(input) || py::isinstance<py::bytearray>(input))
    return read_content(py::bytes(input), "", r);
  const std::string path = path_text(input);
  return read_content(read_file(path), path, r);
}

document loads(const py::object& data, std::optional<std::string> name, const py::kwargs& options) {
  const reading_settings r = settings_of(std::move(name), options);
  const std::string content =
      py::isinstance<py::str>(data) ? data.cast<std::string>() : std::string(py::bytes(data));
  return read_content(content, "", r);
}

const format& output_format(const std::optional<std::string>& name, const std::string& path) {
  if (name) return format_named(*name);
  if (const format* f = format_for_path(path)) return *f;
  usage("cannot tell the output format from '" + path + "': name it with format=");
}

// The losses writing `doc` as `fmt` would cause: refused (LossError) unless `allow_loss`,
// which turns them into warnings.
void settle_losses(const document& doc, const format& fmt, const std::string& path,
                   bool allow_loss) {
  const std::vector<std::string> losses = find_losses(doc, fmt, {path, ""});
  if (losses.empty()) return;
  if (!allow_loss)
    raise("LossError",
          std::string(fmt.name) +
              " cannot carry everything of the document (allow_loss=True "
              "writes it without): " +
              losses.front() + (losses.size() > 1 ? ", …" : ""),
          {}, losses);
  py::object warn = py::module_::import("warnings").attr("warn");
  py::object category = py::module_::import("tiers.errors").attr("TiersWarning");
  for (const std::string& loss : losses)
    warn("left out: " + loss, category, 2);
}

void write(const document& doc, const py::object& path_like, std::optional<std::string> name,
           bool allow_loss) {
  const std::string path = path_text(path_like);
  const format& fmt = output_format(name, path);
  settle_losses(doc, fmt, path, allow_loss);
  try {
    py::gil_scoped_release unlocked;
    atomic_file out(path);
    fmt.write(doc, out, {});
    out.commit();
  } catch (const tiers::error& e) {
    raise("WriteError", format_diagnostic(e.diag()), {e.diag()});
  }
}

std::string dumps(const document& doc, const std::string& name, bool allow_loss) {
  const format& fmt = format_named(name);
  settle_losses(doc, fmt, "", allow_loss);
  std::string text;
  {
    py::gil_scoped_release unlocked;
    string_sink out(text);
    fmt.write(doc, out, {});
    out.flush();
  }
  return text;
}

constexpr const char* reading_doc =
    "Reading options, as the command line's without dashes: columns ('role=column,…' or a "
    "dict), tier_name, time_unit ('s', 'ms', 'frames'), rate ('25', '30000/1001'), strict, "
    "max_text, max_tiers, source ('machine:aligner@2.1'), kind ('interval', 'instant'). "
    "Raises tiers.ReadError with the located diagnostics; warnings become TiersWarning.";

}  // namespace

void bind_io(py::module_& m) {
  m.def("read", &read, py::arg("path_or_bytes"), py::arg("format") = py::none(),
        (std::string("read(path_or_bytes, format=None, **reading_options) -> Document\n\n"
                     "Reads a file (str or os.PathLike) or bytes. The format is `format`, else the "
                     "file's extension, else whichever format recognises the content. ") +
         reading_doc)
            .c_str());
  m.def("loads", &loads, py::arg("data"), py::arg("format") = py::none(),
        (std::string("loads(data, format=None, **reading_options) -> Document\n\n"
                     "Reads a document from text (str) or bytes. ") +
         reading_doc)
            .c_str());
  m.def("write", &write, py::arg("doc"), py::arg("path"), py::arg("format") = py::none(),
        py::arg("allow_loss") = false,
        "write(doc, path, format=None, allow_loss=False)\n\n"
        "Writes the document atomically (a failed write leaves no partial file). The format is "
        "`format`, else the path's extension. What the format cannot carry raises "
        "tiers.LossError listing it, unless allow_loss=True, which writes anyway and warns.");
  m.def("dumps", &dumps, py::arg("doc"), py::arg("format"), py::arg("allow_loss") = false,
        "dumps(doc, format, allow_loss=False) -> str\n\nThe document as text in `format`, "
        "exactly what `tiers convert --to FORMAT` writes.");
  m.def(
      "formats",
      [] {
        std::vector<std::string> names;
        for (const format& f : formats())
          names.emplace_back(f.name);
        return names;
      },
      "The formats' names, as format= takes them.");
}

}  // namespace tiers::python
