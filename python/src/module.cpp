// `tiers._tiers`: libtiers for Python. The package `tiers` (python/tiers/) re-exports it.
#include "binding.hpp"
#include "tiers/version.hpp"

PYBIND11_MODULE(_tiers, m) {
  m.doc() =
      "libtiers for Python: the exact model of time-aligned annotation tiers, its readers "
      "and writers, and tables as pandas DataFrames. Import the package `tiers`.";
  m.attr("__version__") = std::string(tiers::version());
  tiers::python::bind_model(m);
  tiers::python::bind_io(m);
  tiers::python::bind_tables(m);
  tiers::python::bind_review(m);
}
