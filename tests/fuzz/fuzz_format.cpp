// Fuzz target for one format's reader (TIERS_FUZZ_FORMAT): never a crash, every diagnostic
// located and worded; and what the reader accepts and the format can carry whole, its writer
// writes and its reader reads back to the same document.
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "tiers/tiers.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view in(reinterpret_cast<const char*>(data), size);
  const tiers::format& fmt = *tiers::find_format(TIERS_FUZZ_FORMAT);
  tiers::read_options options;
  options.positions = true;
  options.tier_name = "fuzz";
  options.rate = tiers::rational{25, 1};
  const tiers::read_result r = tiers::read_document(in, fmt, options, "fuzz");
  for (const tiers::diagnostic& d : r.diagnostics)
    if (d.code.empty() || d.message.empty() || (d.offset != tiers::no_offset && d.line == 0))
      __builtin_trap();  // every problem says what and where
  if (!r.ok()) return 0;
  if (!tiers::find_losses(r.doc, fmt).empty()) return 0;  // said, not silent
  std::string written;
  {
    tiers::string_sink out(written);
    fmt.write(r.doc, out, {});
  }
  tiers::read_options again = options;
  again.positions = false;
  const tiers::read_result back = tiers::read_document(written, fmt, again, "written");
  if (!back.ok() || !(back.doc == r.doc)) __builtin_trap();  // a round trip that changed it
  return 0;
}
