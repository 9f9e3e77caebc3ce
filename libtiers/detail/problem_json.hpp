// The members every JSON form of a check problem begins with: the check report's and the HTML
// report's data.
#pragma once

#include "detail/json_text.hpp"
#include "tiers/check.hpp"

namespace tiers::detail {

/// `"rule", "severity", "message"`, then `"tier"`, `"id"` and `"start"` when known, into the open
/// object.
inline void write_problem_head(json_writer& j, const problem& p) {
  j.string("rule", p.diag.code);
  j.string("severity", to_string(p.diag.level));
  j.string("message", p.diag.message);
  if (!p.tier.empty()) j.string("tier", p.tier);
  if (p.id) j.string("id", *p.id);
  if (p.start) j.seconds("start", *p.start);
}

}  // namespace tiers::detail
