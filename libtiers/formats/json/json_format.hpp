// The native JSON format: lossless for the whole model (docs/formats/json.md).
#pragma once

#include <string_view>

#include "tiers/format.hpp"

namespace tiers::detail {

int sniff_json(std::string_view head);
read_result read_json(std::string_view input, const read_options& options);
void write_json(const document& doc, byte_sink& out, const write_options& options);

}  // namespace tiers::detail
