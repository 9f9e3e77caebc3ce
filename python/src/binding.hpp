// The pieces of the `_tiers` extension module, each binding one part of libtiers.
#pragma once

#include <pybind11/pybind11.h>

#include <string>
#include <vector>

#include "tiers/diagnostic.hpp"

namespace tiers::python {

namespace py = pybind11;

void bind_model(py::module_& m);   ///< Document, Tier, Annotation and their parts
void bind_io(py::module_& m);      ///< read, write, loads, dumps, formats
void bind_tables(py::module_& m);  ///< to_pandas, from_pandas
void bind_review(py::module_& m);  ///< estimate

/// Raises `tiers.errors.KIND(message, diagnostics)` (with `losses` for LossError) as the
/// pending Python exception and throws error_already_set.
[[noreturn]] void raise(const char* kind, const std::string& message,
                        const std::vector<diagnostic>& diagnostics,
                        const std::vector<std::string>& losses = {});

/// A path argument: str or os.PathLike, as text.
std::string path_text(const py::handle& path);

/// The whole file at `path`; ReadError (io.open, io.read) when it cannot be read.
std::string read_file(const std::string& path);

}  // namespace tiers::python
