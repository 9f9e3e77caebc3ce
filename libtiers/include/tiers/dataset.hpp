// Datasets: a corpus described by rules (schemas/dataset.schema.json) — which files of which
// folders belong to which recording, how to read each kind of file, and what its tiers are —
// and the recordings found by those rules, each joined into one document.
#pragma once

#include <optional>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/info.hpp"
#include "tiers/merge.hpp"
#include "tiers/model.hpp"

namespace tiers {

/// One kind of file of a dataset, with what its tiers are.
struct dataset_source {
  /// A path relative to the description's folder: `{id}` (once) names the recording; `*`
  /// stands for any characters but `/`, a segment `**` for any number of folders.
  std::string pattern;
  /// Reading options by the name of the command line's option without its dashes, dashes as
  /// underscores (`time_unit` for `--time-unit`), with their values as text. The names are
  /// those of dataset_reading_names; the values are checked by whoever reads the files.
  std::vector<std::pair<std::string, std::string>> read;
  /// Tier names to give the file's tiers: old name (or `*`, every tier) → new name.
  std::vector<std::pair<std::string, std::string>> rename;
  std::optional<tier_source> source;  ///< who made the file's tiers
  std::optional<tier_kind> kind;      ///< what the file's tiers stand for in time
  /// `"kind": "signal"`: the files are per-frame score tables (a detector's), which `derive`
  /// turns into tiers; the other commands leave them out.
  bool signal = false;
  std::size_t offset = no_offset;  ///< where the source is in the description
  std::size_t read_offset = no_offset;
};

/// The names a source's `read` may use.
inline constexpr std::string_view dataset_reading_names[]{
    "from", "columns", "tier_name", "time_unit", "rate", "strict", "max_text_bytes", "max_tiers"};

/// A whole corpus by rules (`"format": "tiers-dataset"`, `"version": 1`).
struct dataset_description {
  std::vector<dataset_source> sources;
};

/// Reads a description; problems are located in `file` (codes `dataset.value`,
/// `dataset.member`, `json.*`): a pattern without `{id}`, or one that leaves the description's
/// folder (absolute, or with `..`), a reading option of no known name, and two sources with
/// one pattern are errors.
using dataset_result = result<dataset_description>;
dataset_result read_dataset(std::string_view text, const std::string& file);

/// The description as JSON, in the form read_dataset reads: a source a line.
std::string dataset_json(const dataset_description& d);

/// `KIND[:AGENT[@VERSION]]` (`machine:aligner@2.1`, `human:coder-a`, `human`), as the command
/// line's --source gives a tier's source; nothing when KIND is neither human nor machine or a
/// part is empty.
std::optional<tier_source> parse_tier_source(std::string_view text);

/// The name a source's files give a tier that would be named after its file (WebVTT, a table
/// without a tier column), so that it is one name in every recording: the pattern's file name
/// without its extension and {id} (and the dots, dashes and underscores around it), else its
/// folder's name — `coding/{id}.gestures.csv` gives `gestures`, `captions/{id}.vtt` gives
/// `captions`, and so does `captions/**/{id}.vtt`. Empty when neither holds a name without
/// wildcards.
std::string tier_name_of(std::string_view pattern);

/// One recording of a dataset: its id and, source by source, the file it has (a path below
/// the description's folder, `/` between folders), empty where it lacks that source.
struct recording {
  std::string id;
  std::vector<std::string> files;
  bool complete() const;
};

/// Whether `path` (relative, `/` between folders) fits `pattern`; the id it gives when so.
/// `{id}` takes as few characters as it can, and never `/`.
std::optional<std::string> match_pattern(std::string_view pattern, std::string_view path);

/// The recordings the description finds below `root` (the description's folder), sorted by
/// id: every file that fits a source's pattern (hidden files and folders left out; links to
/// folders not followed). Two files of one source for one recording are an error
/// (`dataset.ambiguous`) naming both, located at the source in `file`, the description; so is
/// a file that fits but is a link leading outside `root` once every link is followed
/// (`dataset.outside`), as for a merge plan's inputs.
result<std::vector<recording>> find_recordings(const dataset_description& d,
                                               const std::string& root, const std::string& file,
                                               std::string_view description_text = {});

/// Gives the tiers of a document read from one of the source's files what the source says:
/// names (parent links follow), source and kind. A tier made an instant tier while one of its
/// annotations spans time, and two tiers renamed alike, are errors (`input.kind`,
/// `input.rename`); a rename of a tier the file lacks is a warning. Diagnostics name `file`.
std::vector<diagnostic> apply_source(document& doc, const dataset_source& s,
                                     const std::string& file);

/// The union of a recording's files (each a merge_input: its name and document): their tiers in
/// order, media and metadata joined. Two parts yielding one tier name (`dataset.clash`), or naming
/// different media (`dataset.media`), are errors naming both files; metadata the parts give
/// differently keeps the first part's value, with a warning (`dataset.metadata`). `tier_files`,
/// when given, gets each tier's file.
result<document> join_recording(std::vector<merge_input> parts,
                                std::vector<std::string>* tier_files = nullptr);

/// What `tiers dataset --json` lists (docs/dataset.md): the sources with how many recordings
/// have each, and every recording with its files (null where it lacks one), the patterns it
/// lacks and, when it could be read (`summaries`, index for index), its tiers, annotations and
/// duration. `path` names the description.
void write_dataset_listing_json(const dataset_description& d,
                                const std::vector<recording>& recordings,
                                const std::vector<std::optional<document_summary>>& summaries,
                                std::string_view path, byte_sink& out);

/// `{"recordings": [{"id": ID, "report": REPORT}, …]}` from each recording's id and its
/// report, which is JSON text already (a command's report of one document).
std::string reports_by_recording_json(
    const std::vector<std::pair<std::string, std::string>>& reports);

}  // namespace tiers
