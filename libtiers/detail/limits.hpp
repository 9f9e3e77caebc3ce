// What read_options' resource limits measure, for the check of a read document and a stream's.
#pragma once

#include <algorithm>
#include <cstddef>

#include "tiers/model.hpp"

namespace tiers::detail {

/// The bytes of an annotation that read_options::max_text bounds: its text or markup, the
/// longer.
inline std::size_t limited_text_size(const annotation& a) {
  return std::max(a.text.size(), a.markup ? a.markup->size() : 0);
}

}  // namespace tiers::detail
