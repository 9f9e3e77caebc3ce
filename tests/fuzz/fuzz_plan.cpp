// Fuzz target for merge plans: never a crash, every problem located, and a plan read, written
// back and read again is the same plan.
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "tiers/merge.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view in(reinterpret_cast<const char*>(data), size);
  const tiers::plan_result r = tiers::read_merge_plan(in, "fuzz.json");
  for (const tiers::diagnostic& d : r.diagnostics)
    if (d.code.empty() || d.message.empty() || d.offset > size || d.line == 0) __builtin_trap();
  if (!r.ok()) return 0;
  const std::string once = tiers::plan_json(r.value);
  const tiers::plan_result back = tiers::read_merge_plan(once, "again.json");
  if (!back.ok() || tiers::plan_json(back.value) != once) __builtin_trap();
  return 0;
}
