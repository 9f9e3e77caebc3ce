// A document as one table, one row per annotation: the columns the CSV and TSV writers write,
// which other table views (the Python package's DataFrames) share.
#pragma once

#include <string>
#include <vector>

#include "tiers/model.hpp"

namespace tiers {

/// The columns of a document's table: always tier, start, end and text; then confidence, id,
/// parent and markup when some annotation has one; then each attribute name some annotation
/// has (sorted), but for names a column already has.
struct table_layout {
  std::size_t rows = 0;
  bool confidence = false, id = false, parent = false, markup = false;
  std::vector<std::string> attributes;
};
table_layout layout_of(const document& doc);

/// Whether `name` is a column of its own in tables (tier, start, end, duration, text, markup,
/// confidence, id, parent): an attribute of that name cannot be written as a column.
bool is_table_column(std::string_view name);

}  // namespace tiers
