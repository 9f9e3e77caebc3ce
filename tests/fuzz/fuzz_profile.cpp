// Fuzz target for check profiles: never a crash, and every problem located inside the input.
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "tiers/profile.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view in(reinterpret_cast<const char*>(data), size);
  const tiers::profile_result r = tiers::read_profile(in, "fuzz.json");
  for (const tiers::diagnostic& d : r.diagnostics)
    if (d.code.empty() || d.message.empty() ||
        (d.file == "fuzz.json" && (d.offset > size || d.line == 0)))
      __builtin_trap();
  return 0;
}
