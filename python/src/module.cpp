// `tiers._tiers`: libtiers for Python. The package `tiers` (python/tiers/) re-exports it.
#include "binding.hpp"
#include "tiers/version.hpp"

namespace {

// The library's messages name options as the command line spells them (`--tier-name: …`);
// Python's keyword arguments are spelt `tier_name`.
std::string python_spelling(const std::string& message) {
  std::string out;
  for (std::size_t k = 0; k < message.size(); ++k) {
    const bool option = message.compare(k, 2, "--") == 0 && k + 2 < message.size() &&
                        message[k + 2] >= 'a' && message[k + 2] <= 'z' &&
                        (k == 0 || message[k - 1] == ' ' || message[k - 1] == '(');
    if (!option) {
      out += message[k];
      continue;
    }
    for (k += 2;
         k < message.size() && ((message[k] >= 'a' && message[k] <= 'z') || message[k] == '-'); ++k)
      out += message[k] == '-' ? '_' : message[k];
    --k;
  }
  return out;
}

}  // namespace

PYBIND11_MODULE(_tiers, m) {
  namespace py = tiers::python::py;
  m.doc() =
      "libtiers for Python: the exact model of time-aligned annotation tiers, its readers "
      "and writers, and tables as pandas DataFrames. Import the package `tiers`.";
  m.attr("__version__") = std::string(tiers::version());
  tiers::python::bind_model(m);
  tiers::python::bind_io(m);
  tiers::python::bind_tables(m);
  tiers::python::bind_review(m);
  tiers::python::bind_check(m);
  tiers::python::bind_agree(m);
  tiers::python::bind_documents(m);
  tiers::python::bind_cooccur(m);
  tiers::python::bind_dataset(m);
  // Bad option values the library finds (an unknown format, a malformed duration) are
  // UsageErrors; a file it cannot open is a ReadError.
  py::register_exception_translator([](std::exception_ptr p) {
    try {
      if (p) std::rethrow_exception(p);
    } catch (const tiers::usage_error& e) {
      tiers::python::raise("UsageError", python_spelling(e.what()), {});
    } catch (const tiers::error& e) {
      tiers::python::raise("ReadError", tiers::format_diagnostic(e.diag()), {e.diag()});
    }
  });
}
