// Splits delimited text into records and fields (RFC 4180 quoting), with byte offsets.
#pragma once

#include <array>
#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/diagnostic.hpp"

namespace tiers::detail {

/// A cell without the spaces and tabs around it (spreadsheets and hand-written tables pad).
inline std::string_view trim_cell(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t'))
    s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t'))
    s.remove_suffix(1);
  return s;
}

struct table_cell {
  std::string_view text;   ///< unquoted content; valid until the next call to `next`
  std::size_t offset = 0;  ///< of the cell's first byte (its opening quote, if quoted)
  std::string unescaped;   ///< backing store when the cell had doubled quotes
  bool owned = false;      ///< text lives in `unescaped`
};

/// Reads one record at a time. Quoted fields may hold delimiters, quotes (doubled) and line
/// breaks; CRLF, LF and CR end records; empty lines are skipped. A quote inside an unquoted
/// field is kept as it is, as most spreadsheet programs do.
class table_scanner {
 public:
  table_scanner(std::string_view input, char delimiter, std::size_t start = 0)
      : in_(input), delim_(delimiter), pos_(start) {
    for (unsigned char c : {static_cast<unsigned char>(delimiter), static_cast<unsigned char>('\n'),
                            static_cast<unsigned char>('\r')})
      ends_field_[c] = true;
  }

  /// Fills `cells` (resized to the record's field count) and returns true, or returns false at
  /// the end of input or on an error, which is then in `problem`.
  bool next(std::vector<table_cell>& cells, std::size_t& record_offset);
  bool failed() const { return !problem.message.empty(); }

  diagnostic problem;

 private:
  std::size_t field_end(std::size_t pos) const;  ///< of the unquoted field at `pos`

  std::string_view in_;
  char delim_;
  std::size_t pos_;
  std::array<bool, 256> ends_field_{};  ///< the delimiter and line breaks: one lookup a byte
};

}  // namespace tiers::detail
