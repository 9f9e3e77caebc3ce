// What a program built on libtiers does with the inputs it is given: reading options as the
// user spelt them, a file's format, the files of folders, durations, and work on many files at
// once. The command line and the Python package share it, so that both read a file alike.
#pragma once

#include <atomic>
#include <cstdint>
#include <functional>
#include <optional>
#include <stdexcept>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/dataset.hpp"
#include "tiers/format.hpp"
#include "tiers/model.hpp"

namespace tiers {

/// A value given for an option that is not one (an unknown format, a malformed rate): the
/// command line's exit status 2, Python's UsageError. The message names the option as the
/// command line spells it (`--rate: …`).
struct usage_error : std::runtime_error {
  using std::runtime_error::runtime_error;
};

/// How to read input files, as given by name: the command line's reading options (--from,
/// --columns, …), Python's keyword arguments. Empty means not given.
struct reading_settings {
  std::string from;  ///< the format's name; empty: by extension, else by content
  std::string columns;
  std::string tier_name;
  std::string time_unit = "s";
  std::string rate;
  bool strict = false;
  std::size_t max_text = read_options{}.max_text;
  std::size_t max_tiers = read_options{}.max_tiers;
  std::string source;  ///< KIND[:AGENT[@VERSION]]: who made the file's tiers
  std::string kind;    ///< interval|instant: what the file's tiers stand for
};

/// The reading options of `in` for the file `path` (a table or WebVTT tier is named after the
/// file's stem unless `tier_name` says otherwise); throws usage_error on bad values. A warning
/// about the file's name (not UTF-8) goes to `notes`, when given.
read_options reading_options(const reading_settings& in, const std::string& path,
                             std::vector<diagnostic>* notes = nullptr);

/// What `source` and `kind` say of every tier read (nothing when neither is given), as a
/// dataset's source says it; throws usage_error on a bad value.
std::optional<dataset_source> tier_settings(const reading_settings& in);

/// Gives the tiers of `doc` what `source` and `kind` say; the problems are returned, naming
/// `file`.
std::vector<diagnostic> settle_tiers(document& doc, const reading_settings& in,
                                     const std::string& file);

/// The registered format called `name`; throws usage_error listing the names otherwise.
const format& format_named(const std::string& name);

/// The format to read `path` with: `from`, else the extension, else the content. Null when
/// none fits, with `why` saying so.
const format* input_format(const reading_settings& in, const std::string& path,
                           std::string_view content, diagnostic& why);

/// The name diagnostics use for a path: `<stdin>` for `-`.
std::string display_name(const std::string& path);

/// A frame rate as given (`25`, `30000/1001`, `29.97` taken exactly); throws usage_error.
rational parse_rate_setting(const std::string& text);

/// The file at `path` read as `in` says: its format found, parsed (with `positions`, where each
/// tier and annotation stands), its tiers given `source` and `kind`. The diagnostics name the
/// file; an error among them means no document. Throws tiers::error when the file cannot be
/// read, usage_error on bad settings.
read_result read_input_file(const std::string& path, const reading_settings& in,
                            bool positions = false);

/// A word-timing tier in another file (`--words FILE[:TIER]` of check and retime).
struct words_file {
  std::string path;
  std::optional<std::string> tier;
  document doc;
};

/// Splits a words argument: a file that exists, or FILE:TIER with a file that exists, is a words
/// file, read with `in` (its problems in `diagnostics`; nothing when it has errors); anything
/// else names a tier of each checked document, set in `tier`.
std::optional<words_file> words_file_of(const std::string& spec, const reading_settings& in,
                                        std::optional<std::string>& tier,
                                        std::vector<diagnostic>& diagnostics);

/// A file to work on, and its path below the folder it was found in (its name, when it was
/// named itself), so that outputs can mirror the inputs' layout.
struct input_file {
  std::string path;
  std::string relative;
};

/// The files to work on, in a stable order: each argument as given; a folder's files (those
/// with a registered extension, hidden ones left out) sorted by path, recursively. A file named
/// twice is taken once.
std::vector<input_file> expand_inputs(const std::vector<std::string>& paths);

/// The places in `files` of shard `spec` ("K/N", K from 1 to N): the list sorted, every Nth
/// file from the Kth, so that N workers given 1/N … N/N share the files without overlap,
/// whatever order they were named in. Throws usage_error on a bad spec.
std::vector<std::size_t> shard_places(const std::vector<std::string>& files,
                                      const std::string& spec);

/// Calls `work(k)` for k in [0, count) on `jobs` threads (0: one per core), counting each
/// finished call in `done`, when given, for a progress display. When a call throws, no further
/// call starts, and the first exception is thrown again here once the calls running are done.
void run_parallel(std::size_t count, unsigned jobs, const std::function<void(std::size_t)>& work,
                  std::atomic<std::size_t>* done = nullptr);

/// What a duration option may be.
enum class duration_kind { length, positive, offset };

/// A duration option as given (`1.5s`, `250ms`, plain seconds, or `2f` frames): a `length`
/// is zero or more, a `positive` one more than zero, an `offset` may be negative (`-0.48s`).
/// Frames take their length from a frame rate known only once the document is read.
struct duration_arg {
  std::string option, text;
  duration_value value;
  bool negative = false;
  bool in_frames() const { return value.frames.has_value(); }
  /// Signed frames, for a step in frames; 0 when given in time.
  std::int64_t frames() const {
    return value.frames ? (negative ? -*value.frames : *value.frames) : 0;
  }
  /// The length in nanoseconds; frames at `rate`, rounded to the nearest nanosecond. Throws
  /// usage_error for frames without a rate.
  time_ns at(std::optional<rational> rate) const;
};

/// Checks a duration option; throws usage_error naming `option`.
duration_arg parse_duration_arg(const std::string& option, const std::string& text,
                                duration_kind kind = duration_kind::length);

/// parse_duration_arg(…).at(rate).
time_ns parse_duration_option(const std::string& option, const std::string& text,
                              duration_kind kind = duration_kind::length,
                              std::optional<rational> rate = std::nullopt);

/// The frame rate `Nf` durations count in: the document's, else `rate_setting`'s.
std::optional<rational> frame_rate_of(const document& doc, const std::string& rate_setting);

}  // namespace tiers
