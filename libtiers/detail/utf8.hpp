// UTF-8 validation, repair and encoding, shared by the readers.
#pragma once

#include <cstddef>
#include <cstdint>
#include <functional>
#include <string>
#include <string_view>

namespace tiers::detail {

/// Offset of the first byte that does not start a valid UTF-8 sequence (RFC 3629: no overlong
/// forms, no surrogates, nothing above U+10FFFF), or npos when the text is valid.
std::size_t find_invalid_utf8(std::string_view text);

/// When `text` starts like UTF-16 or UTF-32 (a byte order mark, or a NUL in the first two
/// bytes), the name of that encoding; else empty.
std::string_view wide_encoding(std::string_view text);

/// `text` with every maximal invalid subsequence replaced by U+FFFD (WHATWG Encoding, "UTF-8
/// decode"); `replaced` counts them.
std::string repair_utf8(std::string_view text, std::size_t& replaced);

/// Appends code point `cp` (at most U+10FFFF, not a surrogate) as UTF-8.
void append_utf8(std::string& out, char32_t cp);

}  // namespace tiers::detail

namespace tiers {
struct document;
namespace detail {

/// Calls `f` on every string of `doc`: names, texts, markup, ids, attribute keys and values,
/// metadata, media uri, vocabularies, sources.
void visit_strings(const document& doc, const std::function<void(std::string_view)>& f);

/// Whether every string of `doc` (names, texts, markup, ids, attributes, metadata) is UTF-8.
bool document_is_utf8(const document& doc);

/// A copy of `doc` with every invalid sequence replaced by U+FFFD: what a writer is given when
/// the document holds bytes that are not UTF-8 (find_losses lists it).
document with_utf8_repaired(const document& doc);

}  // namespace detail
}  // namespace tiers
