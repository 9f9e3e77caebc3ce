// The project's own plain-text tier format: one annotation per line, lossless for the whole
// model, made for text editors and version control (docs/formats/tiers.md).
#pragma once

#include <string_view>

#include "tiers/format.hpp"

namespace tiers::detail {

int sniff_tiers_text(std::string_view head);
read_result read_tiers_text(std::string_view input, const read_options& options);
void write_tiers_text(const document& doc, byte_sink& out, const write_options& options);

}  // namespace tiers::detail
