// Rendering of text_table; widths count code points, not bytes, so names in any script align.
#include "text_table.hpp"

#include "tiers/diagnostic.hpp"
#include "tiers/sink.hpp"

#include <algorithm>

namespace tiers::cli {
namespace {

std::size_t display_width(const std::string& s) {
  return static_cast<std::size_t>(std::count_if(
      s.begin(), s.end(), [](char c) { return (static_cast<unsigned char>(c) & 0xC0) != 0x80; }));
}

// A column's name in CSV: the title as an identifier (`kept share` → `kept_share`).
std::string csv_title(std::string title) {
  std::replace(title.begin(), title.end(), ' ', '_');
  return title;
}

}  // namespace

text_table::text_table(std::vector<std::string> titles) {
  for (std::string& t : titles) {
    const bool right = !t.empty() && t[0] == '>';
    right_.push_back(right);
    titles_.push_back(right ? t.substr(1) : t);
  }
}

void text_table::add_row(std::vector<std::string> cells) {
  cells.resize(titles_.size());
  raw_.push_back(cells);
  // Cells hold names from files: escaped before they are measured, so columns still align.
  for (std::string& cell : cells)
    cell = escape_controls(cell);
  rows_.push_back(std::move(cells));
}

std::string text_table::render() const {
  std::vector<std::size_t> width(titles_.size());
  for (std::size_t c = 0; c < titles_.size(); ++c) {
    width[c] = display_width(titles_[c]);
    for (const auto& row : rows_)
      width[c] = std::max(width[c], display_width(row[c]));
  }
  std::string out;
  auto line = [&](const std::vector<std::string>& cells) {
    std::string l;
    for (std::size_t c = 0; c < cells.size(); ++c) {
      const std::string pad(width[c] - display_width(cells[c]), ' ');
      if (c > 0) l += "  ";
      l += right_[c] ? pad + cells[c] : cells[c] + pad;
    }
    while (!l.empty() && l.back() == ' ')
      l.pop_back();
    out += l + '\n';
  };
  line(titles_);
  for (const auto& row : rows_)
    line(row);
  return out;
}

std::string text_table::render_csv() const {
  std::string out;
  string_sink sink(out);
  auto line = [&](const std::vector<std::string>& cells) {
    for (std::size_t c = 0; c < cells.size(); ++c) {
      if (c > 0) sink.put(',');
      write_csv_field(sink, &cells == &titles_ ? csv_title(cells[c]) : cells[c]);
    }
    sink.write("\r\n");
  };
  line(titles_);
  for (const auto& row : raw_)
    line(row);
  sink.flush();
  return out;
}

}  // namespace tiers::cli
