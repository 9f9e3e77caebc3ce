// The profile a check report was made with, as JSON and SARIF reports both record it.
#pragma once

#include "detail/json_text.hpp"
#include "tiers/profile.hpp"

namespace tiers::detail {

/// `{"name": …, "digest": …}`.
inline void write_profile_identity(byte_sink& out, const profile_identity& id) {
  out.write("{\"name\": ");
  write_json_string(out, id.name);
  out.write(", \"digest\": ");
  write_json_string(out, id.digest);
  out.put('}');
}

}  // namespace tiers::detail
