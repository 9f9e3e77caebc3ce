// The native JSON format: lossless for the whole model (docs/formats/json.md).
#pragma once

#include <string_view>

#include "tiers/format.hpp"

namespace tiers::detail {

int sniff_json(std::string_view head);
read_result read_json(std::string_view input, const read_options& options);
/// Hands each annotation over as it is read when media and metadata come before the tiers and
/// each tier's own members before its annotations, as the writer writes them (else
/// not_streamed).
stream_status stream_json(std::string_view input, const read_options& options, document_handler& to,
                          std::vector<diagnostic>& diagnostics);
void write_json(const document& doc, byte_sink& out, const write_options& options);
std::unique_ptr<document_handler> json_stream_writer(byte_sink& out);

}  // namespace tiers::detail
