// The pieces of the `_tiers` extension module, each binding one part of libtiers.
#pragma once

#include <pybind11/pybind11.h>

#include <optional>
#include <string>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/format.hpp"
#include "tiers/inputs.hpp"
#include "tiers/model.hpp"

namespace tiers::python {

namespace py = pybind11;

void bind_model(py::module_& m);      ///< Document, Tier, Annotation and their parts
void bind_io(py::module_& m);         ///< read, write, loads, dumps, formats
void bind_tables(py::module_& m);     ///< to_pandas, from_pandas
void bind_review(py::module_& m);     ///< estimate
void bind_check(py::module_& m);      ///< check
void bind_agree(py::module_& m);      ///< agree
void bind_documents(py::module_& m);  ///< retime, edit, derive, merge
void bind_cooccur(py::module_& m);    ///< cooccur
void bind_dataset(py::module_& m);    ///< dataset, read_recording

/// Raises `tiers.errors.KIND(message, diagnostics)` (with `losses` for LossError) as the
/// pending Python exception and throws error_already_set.
[[noreturn]] void raise(const char* kind, const std::string& message,
                        const std::vector<diagnostic>& diagnostics,
                        const std::vector<std::string>& losses = {});

/// A path argument: str or os.PathLike, as text.
std::string path_text(const py::handle& path);

/// The command line's reading options from keyword arguments (`tier_name=` for
/// --tier-name, …) and `format` (--from); UsageError on an unknown one or a bad value.
reading_settings settings_of(std::optional<std::string> format, const py::kwargs& options);

/// ReadError naming the first error of `diagnostics` and carrying them all.
[[noreturn]] void raise_errors(const std::vector<diagnostic>& diagnostics);

/// The document read, its warnings issued as TiersWarning; ReadError with every diagnostic
/// when it has errors.
document take_document(read_result&& result);

/// One input of an operation over many documents: a file (`doc` null; folders are expanded
/// into their files) or a Document given as such or as a (name, Document) pair. `name` is what
/// reports and seeds call it: the path as the command line names it, the pair's name, else
/// `document-K` (K counting the arguments from 1).
struct named_input {
  std::string name, path;
  const document* doc = nullptr;
};
std::vector<named_input> inputs_of(const std::vector<py::object>& given);

/// The whole file at `path`; ReadError (io.open, io.read) when it cannot be read.
std::string read_file(const std::string& path);

}  // namespace tiers::python
