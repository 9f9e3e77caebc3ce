// Fuzz target for signal tables (tiers derive): never a crash, every problem located, and what
// is read derives intervals inside the signal's time span.
#include <cstddef>
#include <cstdint>
#include <string_view>

#include "tiers/derive.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view in(reinterpret_cast<const char*>(data), size);
  tiers::signal_options options;
  options.rate = tiers::rational{30000, 1001};
  const auto format =
      size > 0 && data[0] % 2 ? tiers::signal_format::jsonl : tiers::signal_format::csv;
  const tiers::signal_result r = tiers::read_signal(in, format, options);
  for (const tiers::diagnostic& d : r.diagnostics)
    if (d.code.empty() || d.message.empty() || d.offset > size) __builtin_trap();
  if (!r.ok() || r.value.times.empty()) return 0;
  tiers::derive_options d;
  d.smooth = 3;
  d.bridge = 100'000'000;
  const tiers::document doc = tiers::derive_tiers(r.value, d);
  for (const tiers::tier& t : doc.tiers)
    for (const tiers::annotation& a : t.annotations)
      if (a.start < r.value.times.front() || a.end > r.value.ends.back() || a.end <= a.start)
        __builtin_trap();
  return 0;
}
