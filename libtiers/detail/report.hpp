// Building diagnostics inside readers: code, byte offset and message, located later.
#pragma once

#include <string>

#include "tiers/diagnostic.hpp"
#include "tiers/model.hpp"
#include "tiers/time.hpp"

namespace tiers::detail {

inline diagnostic make_diagnostic(severity level, std::string code, std::size_t offset,
                                  std::string message) {
  diagnostic d;
  d.level = level;
  d.code = std::move(code);
  d.offset = offset;
  d.message = std::move(message);
  return d;
}

/// The code of a time a reader cannot take: `time.range` for one beyond what the model holds
/// (the same rule in every format, as `tiers check` lists it), else the format's own code.
inline std::string time_code(time_status status, std::string_view format_code) {
  return std::string(status == time_status::out_of_range ? "time.range" : format_code);
}

using tiers::quote_name;

/// "an interval tier", "an instant tier": a tier kind with its article, for messages.
inline std::string kind_tier(tier_kind kind) {
  return std::string("an ") + std::string(to_string(kind)) + " tier";
}

/// "1 annotation", "3 annotations".
inline std::string plural(std::size_t n, std::string_view one, std::string_view many) {
  return std::to_string(n) + " " + std::string(n == 1 ? one : many);
}

}  // namespace tiers::detail
