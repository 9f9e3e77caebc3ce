// Merging: the tiers of several documents of one recording in one document, and a human and a
// machine tier combined into one, every annotation keeping its origin.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/model.hpp"
#include "tiers/names.hpp"

namespace tiers {

/// How a human and a machine tier become one.
enum class combine_strategy : std::uint8_t {
  human_first,   ///< every human annotation as it is; machine ones only where no human one is,
                 ///< trimmed at human boundaries (not dropped)
  union_,        ///< both: machine annotations give way only where a human one has their label
  intersection,  ///< human annotations, where a machine one has the same label
};
inline constexpr enum_name<combine_strategy> combine_strategy_names[]{
    {combine_strategy::human_first, "human-first"},
    {combine_strategy::union_, "union"},
    {combine_strategy::intersection, "intersection"}};

/// One combination: `human` and `machine` tiers into a new tier `into`.
struct combine_step {
  std::string into, human, machine;
  combine_strategy strategy = combine_strategy::human_first;
  double min_confidence = 0;  ///< machine annotations with a lower confidence are left out
  /// min_confidence is the machine tier's `precision_threshold` attribute, which `tiers
  /// estimate --target-precision P --annotate` writes (docs/review.md).
  bool confidence_from_estimate = false;
  time_ns min_duration = 0;           ///< trimmed pieces shorter than this are dropped
  std::optional<std::string> review;  ///< a tier marking every span where the sides disagree
  time_ns review_min = 0;  ///< disagreements shorter than this are left out of the review tier
};

/// A time correction before combining: a constant, or an offset estimated against a tier.
struct shift_step {
  std::string tier;
  std::optional<time_ns> by;
  std::optional<std::string> align_to;
  time_ns max_offset = 10 * ns_per_second;  ///< how far the estimate looks
};

/// What to do when two inputs have a tier of the same name.
enum class clash_rule : std::uint8_t {
  fail,           ///< stop, naming the tiers
  prefix_file,    ///< rename each clashing tier `STEM:NAME` after its file's stem
  prefix_source,  ///< rename each clashing tier `AGENT:NAME` (or `human:`/`machine:`; a tier
                  ///< without a source takes its file's stem)
};
inline constexpr enum_name<clash_rule> clash_rule_names[]{
    {clash_rule::fail, "fail"},
    {clash_rule::prefix_file, "prefix-file"},
    {clash_rule::prefix_source, "prefix-source"}};

/// A merge plan (schemas/merge-plan.schema.json): everything a merge does, so that it can be
/// repeated. Tier names in shifts and combinations are the names after clash renaming.
struct merge_plan {
  std::vector<std::string> inputs;  ///< files, relative to the plan's folder
  clash_rule clash = clash_rule::fail;
  std::vector<shift_step> shifts;
  std::vector<combine_step> combine;
};

/// Reads a plan; problems are located in `file` (codes `plan.value`, `plan.member`, `json.*`).
using plan_result = result<merge_plan>;
plan_result read_merge_plan(std::string_view text, const std::string& file);

/// The plan's inputs as paths to open, from the plan's folder (`plan_file`'s). A plan from
/// someone else must not pull in files outside the folder it describes, so every input must
/// lie inside that folder once every symbolic link on its way is followed (of the folder too):
/// an absolute path, `..`, or a link that leads out is a `plan.value` error naming the input,
/// and nothing is changed.
std::vector<diagnostic> place_plan_inputs(merge_plan& plan, const std::string& plan_file);

/// The plan as JSON, in the form read_merge_plan reads (one line, stable member order).
std::string plan_json(const merge_plan& plan);

/// An offset between two tiers of the same events: the median of the differences between each
/// annotation's start and the nearest start, within `max_offset`, of an annotation with the
/// same label in the reference (of any label when no label is shared); the spread is the
/// median absolute deviation of those differences.
struct offset_estimate {
  time_ns offset = 0;  ///< add this to the moving tier's times
  time_ns spread = 0;
  std::size_t pairs = 0;
  bool by_label = true;  ///< false when labels were ignored
};
std::optional<offset_estimate> estimate_offset(const tier& moving, const tier& reference,
                                               time_ns max_offset);

/// Combines two interval tiers (see combine_strategy). Every annotation of the result has the
/// attribute `origin` = `human` or `machine`; machine ones keep their confidence. A machine
/// annotation cut into several pieces gives each an id `ID.1`, `ID.2`, ….
struct combined_tiers {
  tier merged;
  std::optional<tier> review;       ///< when the step names one
  std::size_t machine_kept = 0;     ///< machine annotations kept whole
  std::size_t machine_trimmed = 0;  ///< machine pieces that were cut at human boundaries
  std::size_t machine_dropped =
      0;  ///< machine annotations of which nothing is left, for any reason
  // Why machine annotations, or pieces of them, were left out, each reason counted apart:
  std::size_t below_confidence = 0;  ///< annotations under min_confidence
  std::size_t covered = 0;           ///< annotations wholly replaced by the human side's
  std::size_t too_short = 0;         ///< pieces shorter than min_duration
  std::size_t review_short = 0;      ///< disagreements shorter than review_min, not in the review
};
combined_tiers combine_tiers(const tier& human, const tier& machine, const combine_step& step);

/// One input of a merge: a document, and the name of its file (for messages and prefixes).
struct merge_input {
  std::string file;
  document doc;
};

/// Merges the inputs as the plan says: media and metadata joined (different media are an
/// error), tiers renamed by the clash rule, shifts applied, combinations added after the input
/// tiers. The result's metadata records the inputs (`merge:inputs`), the plan (`merge:plan`)
/// and every shift (`merge:shift:TIER`). Notes (shifts, trimmed pieces) and errors are in
/// `diagnostics` (codes `merge.*`); with an error, the document must not be used.
using merge_result = result<document>;
merge_result merge_documents(std::vector<merge_input> inputs, const merge_plan& plan);

/// A merge as options give it (`tiers merge`, Python's tiers.merge): shorthand for a plan,
/// after the plan file's own steps. Durations as `0.5s`, `250ms` or `2f` (frames at the
/// inputs' rate).
struct merge_settings {
  std::string plan;                  ///< a plan file, whose inputs come first
  std::vector<std::string> paths;    ///< more inputs
  std::string clash;                 ///< fail, prefix-file or prefix-source
  std::vector<std::string> shifts;   ///< TIER=OFFSET
  std::vector<std::string> aligns;   ///< TIER=REFERENCE
  std::string max_offset;            ///< how far an alignment looks (default 10 s)
  std::string into, human, machine;  ///< a combination, all three or none
  std::string strategy, min_confidence, min_duration, review, review_min;
};

/// The plan the settings make: the plan file's (read, its inputs placed), then the settings'.
/// Durations in frames count at `*rate` (the inputs' rate); without `rate`, before the inputs
/// are read, they are only checked. The plan file's problems are the result's; a bad value
/// throws usage_error.
result<merge_plan> merge_plan_of(const merge_settings& settings,
                                 const std::optional<rational>* rate = nullptr);

/// Merges `inputs` as the settings say: the plan made again at the inputs' frame rate (the
/// first input's that has one, else `rate_setting`) when a duration counts frames.
merge_result merge_with(const merge_settings& settings, std::vector<merge_input> inputs,
                        const std::string& rate_setting = {});

}  // namespace tiers
