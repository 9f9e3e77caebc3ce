// JSON data inside an HTML page's script element, for the self-contained pages (the report,
// the review page).
#pragma once

#include <string_view>

#include "tiers/sink.hpp"

namespace tiers::detail {

/// The data as the content of a script element: `<` is written as \u003c (valid in JSON
/// strings, the only place it can occur), so that no text can close the element early.
inline void write_script_data(byte_sink& out, std::string_view json) {
  std::size_t from = 0;
  for (std::size_t at = json.find('<'); at != std::string_view::npos; at = json.find('<', from)) {
    out.write(json.substr(from, at - from));
    out.write("\\u003c");
    from = at + 1;
  }
  out.write(json.substr(from));
}

}  // namespace tiers::detail
