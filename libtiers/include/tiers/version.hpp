// The library's version, and those of the libraries it runs with.
#pragma once

#include <string>
#include <string_view>

namespace tiers {

/// The version of libtiers and the tiers tool, e.g. "0.1.0".
std::string_view version();

/// The libraries libtiers runs with, e.g. "ICU 72.1, pugixml 1.13": ICU's as loaded
/// (u_getVersion), pugixml's as built (it offers no query at run time, and is linked in).
std::string dependency_versions();

}  // namespace tiers
