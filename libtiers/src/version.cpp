// The library's version, set by CMake from project(), and its dependencies' versions.
#include "tiers/version.hpp"

#include <unicode/uversion.h>

#include <pugixml.hpp>

namespace tiers {

std::string_view version() {
  return TIERS_VERSION;
}

std::string dependency_versions() {
  UVersionInfo icu;
  u_getVersion(icu);
  char icu_text[U_MAX_VERSION_STRING_LENGTH] = {};
  u_versionToString(icu, icu_text);
  // PUGIXML_VERSION is major × 1000 + minor × 10 (1130 for 1.13).
  return "ICU " + std::string(icu_text) + ", pugixml " + std::to_string(PUGIXML_VERSION / 1000) +
         "." + std::to_string(PUGIXML_VERSION % 1000 / 10);
}

}  // namespace tiers
