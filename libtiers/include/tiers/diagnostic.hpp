// Diagnostics: located problems found while reading, converting or checking, and the error type.
#pragma once

#include <cstddef>
#include <cstdint>
#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

namespace tiers {

enum class severity : std::uint8_t { note, warning, error };

std::string_view to_string(severity level);

/// Marks an unknown byte offset.
inline constexpr std::size_t no_offset = static_cast<std::size_t>(-1);

/// One problem, as a value. Readers fill in `code`, `message` and `offset`; line and column are
/// computed once, from the offset, by `locate_all` (at the edge, not while parsing).
struct diagnostic {
  severity level = severity::error;
  std::string code;                ///< stable rule id, e.g. `csv.quote`
  std::string message;             ///< short, lower case, no trailing full stop
  std::string file;                ///< as the user named it; empty when unknown
  std::size_t offset = no_offset;  ///< byte offset into the input
  std::size_t line = 0;            ///< 1-based; 0 when unknown
  std::size_t column = 0;          ///< 1-based, in code points; 0 when unknown
};

/// `text` for a terminal: C0 controls (but line breaks when `keep_newlines`), DEL and C1
/// controls written as `\n`, `\t`, `\x1b`, `\u009b`, so that a name or message from a file
/// cannot move the cursor, retitle the window or fake a line. For text meant for people only:
/// JSON and converted files keep every character exactly.
std::string escape_controls(std::string_view text, bool keep_newlines = false);

/// A name as messages quote it: 'captions'.
inline std::string quote_name(std::string_view name) {
  std::string s = "'";
  s += name;
  s += '\'';
  return s;
}

/// `FILE:LINE:COLUMN: error: MESSAGE [code]`, leaving out the parts that are unknown; the file
/// and message with escape_controls.
std::string format_diagnostic(const diagnostic& d);

/// Line and column (both 1-based, columns in code points) of a byte offset. LF, CR and CRLF
/// each end a line.
struct text_position {
  std::size_t line = 1;
  std::size_t column = 1;
};
text_position locate(std::string_view text, std::size_t offset);

/// Locates many offsets in one pass over `text` when they come in increasing order (a smaller
/// offset than the one before starts again from the top: correct, only slower).
class position_finder {
 public:
  explicit position_finder(std::string_view text) : text_(text) {}
  text_position at(std::size_t offset);

 private:
  std::string_view text_;
  std::size_t done_ = 0;                 ///< bytes walked so far
  text_position pos_;                    ///< of byte done_
  std::optional<int> carriage_returns_;  ///< whether the text has a CR, once looked for
};

/// Fills in line and column of every diagnostic that has an offset, in one pass over `text`.
void locate_all(std::string_view text, std::vector<diagnostic>& diagnostics);

bool has_errors(const std::vector<diagnostic>& diagnostics);

/// What an operation that can fail on its input produced: the value and every diagnostic
/// (notes, warnings, errors), in the order found. When `diagnostics` holds an error, `value` is
/// incomplete and must not be used.
template <class T>
struct result {
  T value{};
  std::vector<diagnostic> diagnostics;
  bool ok() const { return !has_errors(diagnostics); }
};

/// The one exception type of libtiers, carrying a diagnostic (I/O failures, bad arguments).
class error : public std::runtime_error {
 public:
  explicit error(diagnostic d);
  const diagnostic& diag() const { return diag_; }

 private:
  diagnostic diag_;
};

}  // namespace tiers
