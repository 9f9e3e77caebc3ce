// Fuzz target for review sheets (tiers estimate's input): never a crash, every problem located,
// a sheet read, written and read again writes the same, and its estimate stays within [0, 1].
#include <cmath>
#include <cstddef>
#include <cstdint>
#include <string>
#include <string_view>

#include "tiers/review.hpp"

namespace {

std::string written(const std::vector<tiers::sample_row>& rows) {
  std::string out;
  tiers::string_sink sink(out);
  tiers::write_review_sheet(rows, sink);
  sink.flush();
  return out;
}

bool proportion(double v) {
  return std::isnan(v) || (v >= 0 && v <= 1);
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view in(reinterpret_cast<const char*>(data), size);
  const auto r = tiers::read_review_sheet(in, "fuzz.csv");
  for (const tiers::diagnostic& d : r.diagnostics)
    if (d.code.empty() || d.message.empty() || d.offset > size || d.line == 0) __builtin_trap();
  if (!r.ok()) return 0;
  const std::string once = written(r.value);
  const auto back = tiers::read_review_sheet(once, "again.csv");
  if (!back.ok() || written(back.value) != once) __builtin_trap();
  tiers::estimate_options o;
  o.target_precision = 0.8;
  const tiers::precision_estimate e = tiers::estimate_precision(r.value, o);
  const tiers::population_estimate& a = e.overall;
  if (!proportion(a.precision) || !proportion(a.interval.low) || !proportion(a.interval.high))
    __builtin_trap();
  for (const tiers::precision_row& s : e.strata)
    if (!proportion(s.wilson.low) || !proportion(s.wilson.high) ||
        !proportion(s.clopper_pearson.low) || !proportion(s.clopper_pearson.high))
      __builtin_trap();
  return 0;
}
