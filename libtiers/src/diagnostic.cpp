// Formatting and locating diagnostics.
#include "tiers/diagnostic.hpp"

#include <cstring>

#include <algorithm>
#include <numeric>

namespace tiers {

std::string_view to_string(severity level) {
  switch (level) {
    case severity::note:
      return "note";
    case severity::warning:
      return "warning";
    case severity::error:
      return "error";
  }
  return "error";
}

std::string escape_controls(std::string_view text, bool keep_newlines) {
  static constexpr char hex[] = "0123456789abcdef";
  std::string s;
  s.reserve(text.size());
  for (std::size_t k = 0; k < text.size(); ++k) {
    const auto u = static_cast<unsigned char>(text[k]);
    if (u == '\n' && keep_newlines) {
      s += '\n';
    } else if (u < 0x20 || u == 0x7F) {
      s += u == '\n' ? "\\n" : u == '\r' ? "\\r" : u == '\t' ? "\\t" : "\\x";
      if (u != '\n' && u != '\r' && u != '\t') {
        s += hex[u >> 4];
        s += hex[u & 15];
      }
    } else if (u == 0xC2 && k + 1 < text.size() &&
               static_cast<unsigned char>(text[k + 1]) >= 0x80 &&
               static_cast<unsigned char>(text[k + 1]) <= 0x9F) {
      // C1 controls (U+0080 to U+009F) act on terminals too (U+009B opens a sequence).
      const auto c1 = static_cast<unsigned char>(text[++k]);
      s += "\\u00";
      s += hex[c1 >> 4];
      s += hex[c1 & 15];
    } else {
      s += text[k];
    }
  }
  return s;
}

std::string format_diagnostic(const diagnostic& d) {
  std::string s;
  if (!d.file.empty()) {
    // Messages quote input, and file names come from anywhere; a control character in one (a
    // line break, an escape sequence for the terminal) would break the one-line form or
    // worse, so it is shown escaped.
    s += escape_controls(d.file);
    if (d.line > 0) {
      s += ':' + std::to_string(d.line);
      if (d.column > 0) s += ':' + std::to_string(d.column);
    }
    s += ": ";
  }
  s += to_string(d.level);
  s += ": ";
  s += escape_controls(d.message);
  if (!d.code.empty()) s += " [" + d.code + "]";
  return s;
}

namespace {

bool is_continuation(char c) {
  return (static_cast<unsigned char>(c) & 0xC0) == 0x80;
}

}  // namespace

text_position position_finder::at(std::size_t offset) {
  offset = std::min(offset, text_.size());
  if (offset < done_) {
    done_ = 0;
    pos_ = {};
  }
  if (!carriage_returns_) carriage_returns_ = text_.find('\r') != std::string_view::npos ? 1 : 0;
  if (*carriage_returns_ == 0) {
    // Only LF ends lines: jump from one to the next (memchr reads a vector at a time), then
    // count the code points of the last line's part.
    const char* base = text_.data();
    while (const void* lf = std::memchr(base + done_, '\n', offset - done_)) {
      ++pos_.line;
      pos_.column = 1;
      done_ = static_cast<std::size_t>(static_cast<const char*>(lf) - base) + 1;
    }
    for (; done_ < offset; ++done_)
      pos_.column += !is_continuation(text_[done_]);
    return pos_;
  }
  for (; done_ < offset; ++done_) {
    const char c = text_[done_];
    if (c == '\n' || (c == '\r' && (done_ + 1 >= text_.size() || text_[done_ + 1] != '\n'))) {
      ++pos_.line;
      pos_.column = 1;
    } else if (c != '\r' && !is_continuation(c)) {
      ++pos_.column;
    }
  }
  return pos_;
}

text_position locate(std::string_view text, std::size_t offset) {
  return position_finder(text).at(offset);
}

void locate_all(std::string_view text, std::vector<diagnostic>& diagnostics) {
  std::vector<std::size_t> order(diagnostics.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return diagnostics[a].offset < diagnostics[b].offset;
  });
  position_finder finder(text);
  for (std::size_t k : order) {
    diagnostic& d = diagnostics[k];
    if (d.offset == no_offset) continue;
    const text_position pos = finder.at(d.offset);
    d.line = pos.line;
    d.column = pos.column;
  }
}

bool has_errors(const std::vector<diagnostic>& diagnostics) {
  return std::any_of(diagnostics.begin(), diagnostics.end(),
                     [](const diagnostic& d) { return d.level == severity::error; });
}

error::error(diagnostic d) : std::runtime_error(format_diagnostic(d)), diag_(std::move(d)) {}

}  // namespace tiers
