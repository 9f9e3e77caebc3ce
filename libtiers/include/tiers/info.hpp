// Summaries of a document: what `tiers info` reports.
#pragma once

#include <cstddef>
#include <cstdint>
#include <map>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/model.hpp"
#include "tiers/sink.hpp"

namespace tiers {

struct tier_summary {
  std::string name;
  tier_kind kind = tier_kind::interval;
  std::optional<tier_source> source;
  std::size_t annotations = 0;
  std::optional<time_ns> start;    ///< earliest start, when there are annotations
  std::optional<time_ns> end;      ///< latest end
  time_ns annotated = 0;           ///< length of the union of all intervals (overlaps once)
  std::optional<double> coverage;  ///< annotated / reference length, when that is positive
};

struct document_summary {
  media_info media;
  std::optional<time_ns> start;  ///< over all tiers
  std::optional<time_ns> end;
  /// What coverage is relative to: the media duration, else the span of all tiers.
  time_ns reference = 0;
  bool reference_is_media = false;
  std::vector<tier_summary> tiers;
};

document_summary summarize(const document& doc);

/// How long a recording is: its media's duration, else the latest end of its tiers (a
/// recording starts at zero); zero when neither is known.
time_ns duration_of(const document_summary& s);

/// The summary as one JSON object (docs/cli.md, "info"): times in exact seconds, coverage as a
/// fraction. `path` names the file it describes.
void write_summary_json(const document_summary& summary, std::string_view path, byte_sink& out);

/// One tier name over the recordings of a dataset.
struct tier_inventory {
  std::string name;
  std::size_t recordings = 0;   ///< that have a tier of this name
  std::size_t annotations = 0;  ///< over all of them
  time_ns length = 0;           ///< the durations (duration_of) of those recordings, summed
  time_ns annotated = 0;        ///< the tier's annotated time, summed
  std::size_t human = 0, machine = 0, unmarked = 0;  ///< recordings by the tier's source
  std::size_t instant = 0;                           ///< recordings where it is an instant tier
};

/// What a dataset holds, tier name by tier name, in the order the names were first met.
struct dataset_inventory {
  std::size_t recordings = 0;
  time_ns length = 0;  ///< every recording's duration (duration_of), summed
  std::vector<tier_inventory> tiers;
  /// Counts one more recording.
  void add(const document_summary& recording);
};

/// The inventory as one JSON object (docs/dataset.md): times in exact seconds.
void write_inventory_json(const dataset_inventory& inventory, std::string_view path,
                          byte_sink& out);

/// One label of one tier over every document added: the first table of a corpus paper.
struct label_statistics {
  std::string tier, label;
  std::string source;  ///< the tier's source kind (`human`, `machine`), empty when unmarked
  std::uint64_t count = 0;
  time_ns total = 0;  ///< the annotations' durations summed (instants count 0)
  double mean = 0;    ///< mean duration, seconds
  double median = 0;  ///< median duration, seconds (the mean of the middle two for an even count)
  std::optional<double> share;            ///< of the tier's summed durations; none when those are 0
  std::optional<double> mean_confidence;  ///< over the annotations that carry a confidence
  std::uint64_t with_confidence = 0;
};

/// Label statistics gathered document by document, tier by tier name and source kind (in the
/// order they are first met: a human and a machine tier of one name stay apart) and label by
/// label (most frequent first, then by label).
class label_tally {
 public:
  void add(const document& doc);
  void add(const label_tally& other);  ///< another tally's counts, as if its documents were added
  std::size_t documents() const { return documents_; }
  std::vector<label_statistics> table() const;

 private:
  struct label_data {
    std::vector<time_ns> durations;
    double confidence_sum = 0;
    std::uint64_t with_confidence = 0;
  };
  struct tier_data {
    std::string name, source;
    std::vector<std::string> order;  ///< labels as first met
    std::map<std::string, label_data> labels;
  };
  std::vector<tier_data> tiers_;
  std::map<std::string, std::size_t> index_;
  std::size_t documents_ = 0;
  tier_data& tier_named(const std::string& name, const std::string& source);
};

/// The table as JSON (docs/cli.md, "info --labels"): `{"documents", "labels": [{"tier", "source",
/// "label", "count", "total", "mean", "median", "share", "mean_confidence"}]}`, times in seconds.
void write_labels_json(const std::vector<label_statistics>& table, std::size_t documents,
                       byte_sink& out);

}  // namespace tiers
