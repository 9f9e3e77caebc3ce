// The record and field splitter behind the CSV and TSV readers.
#include "table_scanner.hpp"

#include "detail/report.hpp"
#include "detail/swar.hpp"

namespace tiers::detail {

// Eight bytes at a time up to the delimiter or a line break; the rest byte by byte.
std::size_t table_scanner::field_end(std::size_t pos) const {
  const std::size_t n = in_.size();
  const auto delim = static_cast<unsigned char>(delim_);
  if constexpr (swar::fast)
    for (; pos + 8 <= n; pos += 8) {
      const std::uint64_t w = swar::load(in_.data() + pos);
      if (const std::uint64_t flags =
              swar::equal(w, delim) | swar::equal(w, '\n') | swar::equal(w, '\r'))
        return pos + swar::first_flag(flags);
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
