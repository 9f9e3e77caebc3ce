// WebVTT (W3C WebVTT, https://www.w3.org/TR/webvtt1/): one caption tier, its inline word
// timings as a child tier, and the file's styles, regions and comments (docs/formats/vtt.md).
#pragma once

#include <string>
#include <string_view>
#include <vector>

#include "tiers/format.hpp"

namespace tiers::detail {

int sniff_vtt(std::string_view head);
read_result read_vtt(std::string_view input, const read_options& options);
void write_vtt(const document& doc, byte_sink& out, const write_options& options);
/// What WebVTT cannot hold beyond the feature list: times finer than a millisecond, cues that
/// end before they start, repeated ids, texts with blank lines, word timings that do not fit.
void vtt_losses(const document& doc, std::vector<std::string>& losses);

}  // namespace tiers::detail
