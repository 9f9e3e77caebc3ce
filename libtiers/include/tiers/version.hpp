// The library's version.
#pragma once

#include <string_view>

namespace tiers {

/// The version of libtiers and the tiers tool, e.g. "0.1.0".
std::string_view version();

}  // namespace tiers
