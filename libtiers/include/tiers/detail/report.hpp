// Building diagnostics inside readers: code, byte offset and message, located later.
#pragma once

#include <string>

#include "tiers/diagnostic.hpp"

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

/// Names in messages: 'captions'.
inline std::string quote_name(std::string_view name) {
  std::string s = "'";
  s += name;
  s += '\'';
  return s;
}

/// "1 annotation", "3 annotations".
inline std::string plural(std::size_t n, std::string_view one, std::string_view many) {
  return std::to_string(n) + " " + std::string(n == 1 ? one : many);
}

}  // namespace tiers::detail
