// Tables of annotations, one row each: CSV (RFC 4180) and TSV (docs/formats/csv.md).
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "tiers/format.hpp"

namespace tiers::detail {

int sniff_csv(std::string_view head);
int sniff_tsv(std::string_view head);
read_result read_csv(std::string_view input, const read_options& options);
read_result read_tsv(std::string_view input, const read_options& options);
/// Hands each row over as it is read when every tier's rows are together (else not_streamed).
stream_status stream_csv(std::string_view input, const read_options& options, document_handler& to,
                         std::vector<diagnostic>& diagnostics);
stream_status stream_tsv(std::string_view input, const read_options& options, document_handler& to,
                         std::vector<diagnostic>& diagnostics);
void write_csv(const document& doc, byte_sink& out, const write_options& options);
void write_tsv(const document& doc, byte_sink& out, const write_options& options);
/// What a table cannot tell apart: empty values from absent ones, attributes named like a
/// column, tiers with the same name.
void table_losses(const document& doc, std::vector<std::string>& losses);

}  // namespace tiers::detail
