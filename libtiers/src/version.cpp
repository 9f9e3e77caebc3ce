// The library's version, set by CMake from project().
#include "tiers/version.hpp"

namespace tiers {

std::string_view version() {
  return TIERS_VERSION;
}

}  // namespace tiers
