// Aligned plain-text tables for people: columns padded to the widest cell, numbers right.
#pragma once

#include <string>
#include <vector>

namespace tiers::cli {

class text_table {
 public:
  /// Column titles; a title starting with '>' is right-aligned (the '>' is not shown).
  explicit text_table(std::vector<std::string> titles);
  void add_row(std::vector<std::string> cells);
  std::string render() const;
  /// The same table as CSV (RFC 4180: a header of the titles, fields quoted where needed,
  /// CRLF line ends), with the cells as given, not escaped for a terminal.
  std::string render_csv() const;

 private:
  std::vector<std::string> titles_;
  std::vector<bool> right_;
  std::vector<std::vector<std::string>> rows_;  ///< as shown on a terminal
  std::vector<std::vector<std::string>> raw_;   ///< as given
};

}  // namespace tiers::cli
