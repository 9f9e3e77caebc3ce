// W3C TTML2 / IMSC 1.1 Text Profile: one tier per div, one annotation per p, timed spans as a
// child word tier (docs/formats/ttml.md).
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/format.hpp"

namespace tiers::detail {

int sniff_ttml(std::string_view head);
read_result read_ttml(std::string_view input, const read_options& options);
void write_ttml(const document& doc, byte_sink& out, const write_options& options);
void ttml_losses(const document& doc, std::vector<std::string>& losses);

namespace ttml {
inline constexpr std::string_view ns_tt = "http://www.w3.org/ns/ttml";
inline constexpr std::string_view ns_ttp = "http://www.w3.org/ns/ttml#parameter";
inline constexpr std::string_view ns_tts = "http://www.w3.org/ns/ttml#styling";
inline constexpr std::string_view ns_ttm = "http://www.w3.org/ns/ttml#metadata";
inline constexpr std::size_t max_depth = 1000;                  ///< deeper input is refused
inline constexpr std::size_t max_bytes = std::size_t{1} << 30;  ///< larger input is refused
/// xml:id of the head metadata block in which the writer defines agents for speakers.
inline constexpr std::string_view speakers_block = "tiers-speakers";
/// Text with runs of XML white space collapsed to one space and none around line breaks or at
/// the ends, as xml:space="default" presents it.
std::string collapse_space(std::string_view text);

/// A character XML 1.0 does not allow (§2.2, production [2] Char), and where.
struct forbidden {
  std::size_t offset;
  std::string message;
};
/// The first such character: raw (a C0 control but tab, LF and CR; U+FFFE; U+FFFF) anywhere,
/// and with `references`, by a character reference outside comments, CDATA sections and
/// processing instructions (markup; a plain value has its '&' escaped instead).
std::optional<forbidden> first_forbidden(std::string_view in, bool references = true);
/// The next id of an IDREFS value (white-space separated), taken off `refs`; empty at the end.
std::string_view next_idref(std::string_view& refs);
}  // namespace ttml

}  // namespace tiers::detail
