// The one table of rules. Thresholds and their sources are in docs/rules.md and the profiles.
#include "tiers/rules.hpp"

#include <array>

namespace tiers {
namespace {

using enum rule_level;

constexpr std::array<rule_info, 81> catalogue{{
    // Times of single annotations and their order.
    {"time.range", "time", error, "a time beyond what the model holds (about ±292 years)"},
    {"time.negative", "time", error, "an annotation starts or ends before zero"},
    {"time.reversed", "time", error, "an annotation ends before it starts"},
    {"time.beyond-media", "time", warning, "an annotation ends after the media does"},
    {"time.order", "time", warning, "annotations are not in start-time order"},
    {"time.duplicate", "time", warning,
     "an annotation repeats another's start, end and text in the same tier"},
    {"time.zero-length", "time", warning, "an interval tier holds a zero-length annotation"},
    // Tiers as wholes.
    {"tier.duplicate-name", "tier", error, "two tiers have the same name"},
    {"tier.kind", "tier", error,
     "an instant tier holds intervals, or an interval tier holds only instants"},
    {"tier.overlap", "tier", error,
     "annotations of a tier overlap where the tier does not allow it (the default for "
     "interval tiers)"},
    {"tier.gap", "tier", error, "a tier declared contiguous leaves a gap"},
    // Parents, children and labels.
    {"structure.parent-tier", "structure", error,
     "a tier's parent tier does not exist, or is the tier itself or its own descendant"},
    {"structure.outside-parent", "structure", error,
     "a child annotation lies outside every annotation of its parent tier"},
    {"structure.partition", "structure", error,
     "the children of a parent annotation leave a gap or overlap where they must partition it"},
    {"structure.missing-parent", "structure", error,
     "an annotation refers to a parent annotation that does not exist, or to none"},
    {"structure.duplicate-id", "structure", error, "two annotations of a tier have the same id"},
    {"structure.vocabulary", "structure", error, "a label is not in the tier's vocabulary"},
    // Text.
    {"input.utf8", "text", error, "the file is not valid UTF-8 (the byte offset is given)"},
    {"text.nfc", "text", warning, "text is not in Unicode Normalization Form C"},
    {"text.control", "text", warning, "text holds a control character other than a line break"},
    {"text.whitespace", "text", warning, "a text line starts or ends with white space"},
    {"text.empty", "text", warning, "an annotation has no text"},
    {"text.all-caps", "text", warning,
     "a tier's text is entirely upper case: case was lost upstream"},
    // Caption tiers.
    {"caption.cps", "caption", warning, "a cue asks for more characters per second than allowed"},
    {"caption.wpm", "caption", off, "a cue asks for more words per minute than allowed"},
    {"caption.line-length", "caption", warning, "a cue line has more characters than allowed"},
    {"caption.lines", "caption", warning, "a cue has more lines than allowed"},
    {"caption.min-duration", "caption", warning, "a cue is shown too briefly"},
    {"caption.max-duration", "caption", warning, "a cue is shown too long"},
    {"caption.gap", "caption", warning, "the gap before a cue is shorter than allowed"},
    {"caption.overlap", "caption", warning, "cues overlap in time"},
    // Captions against word timings.
    {"lag.late", "lag", warning, "a cue appears too long after its words are spoken"},
    {"lag.early", "lag", warning, "a cue appears too long before its words are spoken"},
    {"lag.coverage", "lag", error,
     "too few caption words were found among the word timings: the pair is unreliable"},
    // A dataset: what a profile requires of every file, and what the files have in common.
    {"dataset.tier-missing", "dataset", error, "a required tier is missing"},
    {"dataset.tier-kind", "dataset", error, "a tier's kind differs from the profile's"},
    {"dataset.tier-parent", "dataset", error,
     "a tier's parent or relation differs from the profile's"},
    {"dataset.tier-vocabulary", "dataset", error,
     "a tier declares a vocabulary other than the profile's"},
    {"dataset.tier-unexpected", "dataset", off, "a tier the profile does not declare"},
    {"dataset.inconsistent", "dataset", warning,
     "a tier's presence, kind or vocabulary differs from most files of the dataset"},
    {"dataset.missing-source", "dataset", error,
     "a recording of a dataset description lacks a file of one of its sources"},
    // What the readers report (docs/cli.md lists them with the formats).
    {"io.open", "read", error, "a file could not be opened"},
    {"io.read", "read", error, "a file could not be read"},
    {"input.format", "read", error, "the format of a file could not be told"},
    {"input.encoding", "read", error, "the file is UTF-16 or UTF-32, not UTF-8"},
    {"input.kind", "read", error, "--kind instant, or a source's kind, for a tier that spans time"},
    {"input.rename", "read", error,
     "a source's rename gives two tiers one name (or names a tier the file lacks: a warning)"},
    {"dataset.clash", "read", error, "two files of one recording yield a tier of the same name"},
    {"dataset.media", "read", error,
     "the files of one recording name different media (or frame rates: a warning)"},
    {"dataset.metadata", "read", warning,
     "the files of one recording give one metadata key different values"},
    {"json.syntax", "read", error, "not well-formed JSON"},
    {"json.value", "read", error, "a JSON member has the wrong type or value"},
    {"json.member", "read", error, "an unknown JSON member, or a required one missing"},
    {"json.duplicate", "read", error, "a JSON member or key given twice"},
    {"csv.header", "read", error, "a table's header is missing, incomplete or repeats a column"},
    {"csv.quote", "read", error, "a quoted table field is left open or followed by text"},
    {"csv.fields", "read", error, "a table row has more or fewer fields than the header"},
    {"csv.time", "read", error, "a table time cell is empty, malformed or needs a frame rate"},
    {"csv.confidence", "read", error, "a table confidence is not a number from 0 to 1"},
    {"csv.unit", "read", warning,
     "a table time column whose name says milliseconds is read as seconds"},
    {"vtt.signature", "read", error, "not a WebVTT file"},
    {"vtt.timing", "read", warning, "a WebVTT cue with an invalid timing line is skipped"},
    {"vtt.block", "read", warning, "a WebVTT block browsers ignore"},
    {"vtt.setting", "read", warning, "a WebVTT cue setting that does not apply"},
    {"vtt.order", "read", warning, "WebVTT cues out of order"},
    {"vtt.empty", "read", warning, "a WebVTT cue that does not end after it starts"},
    {"vtt.id", "read", warning, "a repeated WebVTT cue identifier"},
    {"vtt.timestamp", "read", warning, "a WebVTT inline timestamp out of order"},
    {"ttml.xml", "read", error, "TTML that is not well-formed XML"},
    {"ttml.dtd", "read", error, "TTML with a document type declaration (refused)"},
    {"ttml.depth", "read", error, "TTML elements nested deeper than 1000 levels"},
    {"ttml.size", "read", error, "a TTML file over 1 GiB"},
    {"ttml.root", "read", error, "XML whose root is not TTML's tt"},
    {"ttml.namespace", "read", error, "TTML that binds tts, ttm or ttp to another namespace"},
    {"ttml.time", "read", error, "a TTML time expression TTML2 does not allow"},
    {"ttml.parameter", "read", error, "a TTML timing parameter TTML2 does not allow"},
    {"ttml.end", "read", warning, "a TTML p without an end, read as zero length"},
    {"ttml.structure", "read", warning, "a TTML p outside a div, not read"},
    {"tiers.signature", "read", error, "a .tiers file that does not start with 'tiers 1'"},
    {"tiers.version", "read", error, "a .tiers file of a newer version"},
    {"tiers.syntax", "read", error, "a line of a .tiers file that does not follow the grammar"},
}};

}  // namespace

std::string_view to_string(rule_level level) {
  switch (level) {
    case rule_level::off:
      return "off";
    case rule_level::note:
      return "note";
    case rule_level::warning:
      return "warning";
    case rule_level::error:
      return "error";
  }
  return "off";
}

std::optional<rule_level> parse_rule_level(std::string_view text) {
  for (rule_level l : {rule_level::off, rule_level::note, rule_level::warning, rule_level::error})
    if (to_string(l) == text) return l;
  return std::nullopt;
}

severity severity_of(rule_level level) {
  return level == rule_level::error     ? severity::error
         : level == rule_level::warning ? severity::warning
                                        : severity::note;
}

std::span<const rule_info> rules() {
  return catalogue;
}

const rule_info* find_rule(std::string_view id) {
  for (const rule_info& r : catalogue)
    if (r.id == id) return &r;
  return nullptr;
}

}  // namespace tiers
