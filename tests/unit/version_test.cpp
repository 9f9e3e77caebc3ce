// The versions `tiers --version` reports: the library's and those of the libraries it runs with.
#include <catch2/catch.hpp>
#include <string>

#include <unicode/uvernum.h>

#include <pugixml.hpp>

#include "tiers/version.hpp"

using namespace tiers;

TEST_CASE("version: the libraries libtiers runs with are named with their versions", "[version]") {
  // The loaded ICU is the one built against on a system that packages it (Debian pins the
  // soname); pugixml is linked in, its version the header's (PUGIXML_VERSION, 1130 for 1.13).
  const std::string v = dependency_versions();
  CHECK(v.starts_with("ICU " U_ICU_VERSION ", "));
  CHECK(v.ends_with(", pugixml " + std::to_string(PUGIXML_VERSION / 1000) + "." +
                    std::to_string(PUGIXML_VERSION % 1000 / 10)));
}
