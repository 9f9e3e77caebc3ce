// The project's own plain-text tier format: one annotation per line, lossless for the whole
// model, made for text editors and version control (docs/formats/tiers.md).
#pragma once

#include <string_view>

#include "tiers/format.hpp"

namespace tiers::detail {

int sniff_tiers_text(std::string_view head);
read_result read_tiers_text(std::string_view input, const read_options& options);
/// Hands each line over as it is read when media and metadata come before the tiers and each
/// tier's own lines before its annotations, as the writer writes them (else not_streamed).
stream_status stream_tiers_text(std::string_view input, const read_options& options,
                                document_handler& to, std::vector<diagnostic>& diagnostics);
void write_tiers_text(const document& doc, byte_sink& out, const write_options& options);
std::unique_ptr<document_handler> tiers_text_stream_writer(byte_sink& out);

}  // namespace tiers::detail
