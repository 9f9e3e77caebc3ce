// A dataset's recordings as every `--dataset` run reads them (and Python's tiers.dataset): the
// description read and checked with each source's reading settings, its recordings found, and
// a recording's files read and joined.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <vector>

#include "tiers/dataset.hpp"
#include "tiers/format.hpp"
#include "tiers/inputs.hpp"

namespace tiers {

/// A description opened for a run.
struct opened_dataset {
  std::string file;  ///< the description, as named
  std::string root;  ///< its folder, from which its patterns start
  dataset_description description;
  std::vector<reading_settings> reading;  ///< per source: the run's settings, then its `read`
  std::vector<recording> recordings;      ///< sorted by id
  /// With a shard: each recording's place among all the description's, for combined reports.
  std::vector<std::size_t> places;
  /// A recording's file as messages name it: below the description's folder.
  std::string path_of(const std::string& relative) const;
};

/// Reads and checks the description (its reading settings too, `dataset.value` located at a
/// source's `read`) and finds its recordings; the problems are the result's. `base` holds the
/// run's own reading settings, which each source's `read`, `source` and `kind` override. With
/// `shard` (K/N), only that part of the recordings (by id) is kept. Throws usage_error when the
/// patterns find nothing or the shard is malformed; tiers::error when the file cannot be read.
result<opened_dataset> open_dataset(const std::string& path, const reading_settings& base,
                                    const std::string& shard = {});

/// The error (`dataset.missing-source`, naming the description) for source `k`, which the
/// recording lacks.
diagnostic lacking_source(const opened_dataset& d, const recording& r, std::size_t k);

/// That error for each source the recording lacks.
std::vector<diagnostic> lacking_sources(const opened_dataset& d, const recording& r);

/// A recording's files read, each with its source's settings, its tiers given what the source
/// says (signal sources left out: they are derive's); not joined. `ok` is false after an error in
/// any of them.
struct recording_parts {
  std::vector<merge_input> parts;
  source_map positions;  ///< with `positions`: the parts' tiers, in order
  std::vector<diagnostic> diagnostics;
  bool ok = false;
  /// The first tier of its first file of a caption format (WebVTT, TTML): the caption tier
  /// when nothing names one, as for a caption file checked alone.
  std::optional<std::string> caption_tier;
  bool instant_tiers = true;  ///< every file's format tells instant tiers from intervals
};
recording_parts read_parts(const opened_dataset& d, const recording& r, bool positions = false);

/// A recording read: its parts (read_parts) joined (join_recording), the parts themselves
/// moved into `doc`. `ok` is false after an error; `diagnostics` name the files they are about.
/// With `positions`, where each tier and annotation was read.
struct recording_read : recording_parts {
  document doc;
  std::vector<std::string> tier_files;  ///< each tier's file, as messages name it
};
recording_read read_recording(const opened_dataset& d, const recording& r, bool positions = false);

}  // namespace tiers
