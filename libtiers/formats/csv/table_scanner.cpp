// The record and field splitter behind the CSV and TSV readers.
#include "table_scanner.hpp"

#include <bit>
#include <cstdint>
#include <cstring>

#include "detail/report.hpp"

namespace tiers::detail {

// Eight bytes at a time, a byte b flagged when b ^ delimiter, b ^ LF or b ^ CR is zero (the
// classic test for a zero byte: a borrow may flag bytes after the first true one, never before,
// so the lowest flag is exact); the rest byte by byte.
std::size_t table_scanner::field_end(std::size_t pos) const {
  constexpr std::uint64_t ones = 0x0101010101010101ULL, highs = 0x8080808080808080ULL;
  const std::size_t n = in_.size();
  const std::uint64_t delim = ones * static_cast<unsigned char>(delim_);
  if constexpr (std::endian::native == std::endian::little)
    for (; pos + 8 <= n; pos += 8) {
      std::uint64_t w;
      std::memcpy(&w, in_.data() + pos, 8);
      const std::uint64_t d = w ^ delim, lf = w ^ (ones * '\n'), cr = w ^ (ones * '\r');
      const std::uint64_t flags =
          (((d - ones) & ~d) | ((lf - ones) & ~lf) | ((cr - ones) & ~cr)) & highs;
      if (flags) return pos + static_cast<std::size_t>(std::countr_zero(flags)) / 8;
    }
  while (pos < n && !ends_field_[static_cast<unsigned char>(in_[pos])])
    ++pos;
  return pos;
}

bool table_scanner::next(std::vector<table_cell>& cells, std::size_t& record_offset) {
  const std::size_t n = in_.size();
  while (pos_ < n && (in_[pos_] == '\n' || in_[pos_] == '\r'))
    ++pos_;  // empty lines
  if (pos_ >= n) return false;
  record_offset = pos_;
  std::size_t count = 0;
  for (;;) {
    if (count == cells.size()) cells.emplace_back();
    table_cell& cell = cells[count++];
    cell.offset = pos_;
    cell.owned = false;
    if (pos_ < n && in_[pos_] == '"') {
      const std::size_t open = pos_++;
      std::size_t begin = pos_;
      bool escaped = false;
      for (;;) {
        const std::size_t q = in_.find('"', pos_);
        if (q == std::string_view::npos) {
          problem = make_diagnostic(severity::error, "csv.quote", open,
                                    "quoted field is not closed before the end of the file");
          return false;
        }
        if (q + 1 < n && in_[q + 1] == '"') {
          if (!escaped) cell.unescaped.clear();
          escaped = true;
          cell.unescaped.append(in_.substr(begin, q + 1 - begin));
          pos_ = begin = q + 2;
          continue;
        }
        if (escaped) {
          cell.unescaped.append(in_.substr(begin, q - begin));
          cell.owned = true;
        } else {
          cell.text = in_.substr(begin, q - begin);
        }
        pos_ = q + 1;
        break;
      }
      if (pos_ < n && in_[pos_] != delim_ && in_[pos_] != '\n' && in_[pos_] != '\r') {
        problem = make_diagnostic(severity::error, "csv.quote", pos_,
                                  "unexpected text after a closing quote (a quote inside a "
                                  "quoted field is written twice: \"\")");
        return false;
      }
    } else {
      const std::size_t begin = pos_;
      pos_ = field_end(pos_);
      cell.text = in_.substr(begin, pos_ - begin);
    }
    if (pos_ < n && in_[pos_] == delim_) {
      ++pos_;
      continue;
    }
    if (pos_ < n && in_[pos_] == '\r') {
      ++pos_;
      if (pos_ < n && in_[pos_] == '\n') ++pos_;
    } else if (pos_ < n) {
      ++pos_;  // '\n'
    }
    break;
  }
  cells.resize(count);
  // Growing `cells` may have moved the strings behind unescaped cells: point at them again.
  for (table_cell& c : cells)
    if (c.owned) c.text = c.unescaped;
  return true;
}

}  // namespace tiers::detail
