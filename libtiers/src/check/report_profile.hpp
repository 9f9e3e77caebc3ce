// The profile a check report was made with, as JSON and SARIF reports both record it.
#pragma once

#include "detail/json_text.hpp"
#include "tiers/profile.hpp"

namespace tiers::detail {

/// `{"name": …, "digest": …}`.
inline void write_profile_identity(json_writer& j, const profile_identity& id) {
  j.begin_object();
  j.string("name", id.name);
  j.string("digest", id.digest);
  j.end_object();
}

}  // namespace tiers::detail
