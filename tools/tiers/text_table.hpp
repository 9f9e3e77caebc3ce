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

 private:
  std::vector<std::string> titles_;
  std::vector<bool> right_;
  std::vector<std::vector<std::string>> rows_;
};

}  // namespace tiers::cli
