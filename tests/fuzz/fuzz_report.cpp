// Fuzz target for check reports (tiers check --combine): never a crash, every problem located,
// and a report read, written and read again holds the same problems.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "tiers/check.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view in(reinterpret_cast<const char*>(data), size);
  const tiers::report_result r = tiers::read_check_report(in, "fuzz.json");
  for (const tiers::diagnostic& d : r.diagnostics)
    if (d.code.empty() || d.message.empty() || d.offset > size || d.line == 0) __builtin_trap();
  if (!r.ok()) return 0;
  std::string once;
  {
    tiers::string_sink out(once);
    tiers::write_check_json(r.value.files, out);
  }
  const tiers::report_result back = tiers::read_check_report(once, "again.json");
  if (!back.ok() || back.value.files.size() != r.value.files.size()) __builtin_trap();
  for (std::size_t k = 0; k < r.value.files.size(); ++k)
    if (back.value.files[k].problems.size() != r.value.files[k].problems.size()) __builtin_trap();
  return 0;
}
