// What the HTML report's script draws, as the JSON it reads from the page (docs/report.md).
#pragma once

#include <cstdint>
#include <optional>
#include <span>
#include <vector>

#include "tiers/agree.hpp"
#include "tiers/html_report.hpp"

namespace tiers::detail {

/// Two tiers compared for the report: the figures of `tiers agree`, and the stretches of time
/// where the two agree, differ, or only one has a label.
struct agreement_view {
  enum class verdict : std::uint8_t { agree, differ, only_reference, only_candidate };
  struct stretch {
    time_ns start, end;
    verdict what;
  };
  agreement_report figures;
  std::vector<stretch> stretches;
};

/// The report's grid reaches from the earlier of zero and the first annotation to the later of
/// the media's end and the last annotation of the two tiers.
agreement_view compare_for_report(const document& doc, const tier& reference, const tier& candidate,
                                  const html_report_options& options);

/// Writes `{"files": [...]}`: per file its span, tiers (annotations sorted by start, each
/// `[start, end, text, confidence]`, text cut to a label's length), problems, lag points and
/// agreement stretches. `agreements` is index for index with `files`.
void write_report_data(std::span<const report_file> files,
                       std::span<const std::optional<agreement_view>> agreements,
                       const html_report_options& options, byte_sink& out);

}  // namespace tiers::detail
