// The format registry: what each format is called, how it is recognised, what it can carry,
// and reading and writing documents through it.
#pragma once

#include <cstdint>
#include <initializer_list>
#include <memory>
#include <optional>
#include <span>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "tiers/diagnostic.hpp"
#include "tiers/model.hpp"
#include "tiers/names.hpp"
#include "tiers/sink.hpp"

namespace tiers {

/// The parts of the model a format may or may not be able to carry. The list is the vocabulary
/// of loss reports: see `find_losses`.
enum class feature : std::uint8_t {
  several_tiers,          ///< more than one tier in a file
  empty_tiers,            ///< tiers without annotations
  instant_tiers,          ///< the instant kind, as distinct from zero-length intervals
  tier_sources,           ///< human/machine, agent, version
  tier_parents,           ///< parent tier and relation
  vocabularies,           ///< allowed labels
  tier_attributes,        ///< name/value pairs on a tier
  markup,                 ///< the original formatted text
  confidence,             ///< per-annotation confidence
  ids,                    ///< per-annotation identifiers
  parent_refs,            ///< an annotation's parent annotation id
  annotation_attributes,  ///< name/value pairs on an annotation
  media,                  ///< media uri and duration
  metadata,               ///< document metadata
  inline_words,           ///< child tiers `NAME.words` (relation within) written inside their
                          ///< parent's annotations (WebVTT cue timestamps, TTML timed spans);
                          ///< without several_tiers, the first tier's only
  frame_rate,             ///< the media frame rate
};
inline constexpr int feature_count = 16;

std::string_view to_string(feature f);

/// A set of features.
class feature_set {
 public:
  constexpr feature_set() = default;
  constexpr feature_set(std::initializer_list<feature> fs) {
    for (feature f : fs)
      bits_ |= bit(f);
  }
  static constexpr feature_set all() {
    feature_set s;
    s.bits_ = (1u << feature_count) - 1;
    return s;
  }
  constexpr bool has(feature f) const { return (bits_ & bit(f)) != 0; }

 private:
  static constexpr std::uint32_t bit(feature f) { return 1u << static_cast<unsigned>(f); }
  std::uint32_t bits_ = 0;
};

/// How time cells of tabular input are written when they are plain numbers. Cells with colons
/// are always clock time (`hh:mm:ss.fff`) or timecode (`hh:mm:ss:ff`, `hh:mm:ss;ff`).
enum class time_unit : std::uint8_t { seconds, milliseconds, frames };
inline constexpr enum_name<time_unit> time_unit_names[]{
    {time_unit::seconds, "s"}, {time_unit::milliseconds, "ms"}, {time_unit::frames, "frames"}};

/// The columns of a table, by role. Roles: tier, start, end, duration, text, markup,
/// confidence, id, parent. A role not named here is looked for under its own name; every other
/// column becomes an annotation attribute.
using column_map = std::vector<std::pair<std::string, std::string>>;

/// Parses `tier=Layer,start=Begin,end=End`; a malformed item, an unknown role or a role named
/// twice is an error (code `columns.map`).
result<column_map> parse_column_map(std::string_view text);

/// Options for reading. Formats ignore what does not apply to them.
struct read_options {
  std::string tier_name = "tier";  ///< tables without a tier column: the tier's name
  column_map columns;              ///< tables: where each role is found
  time_unit unit = time_unit::seconds;
  std::optional<rational> rate;  ///< frames and timecode: frames per second
  bool strict = false;           ///< formats with authoring rules (vtt): violations are errors
  /// Record where each tier and annotation is in the input (read_result::positions), for
  /// messages that point at them. Off by default: it costs memory per annotation.
  bool positions = false;
  /// Resource limits: a file beyond them is refused (`limit.text`, `limit.tiers`) rather than
  /// read, since nothing sound needs more and a corrupt file (a quote left open) or a hostile
  /// one can. Both can be raised (`--max-text-bytes`, `--max-tiers`).
  std::size_t max_text = 4u << 20;  ///< bytes of one annotation's text or markup (4 MiB)
  std::size_t max_tiers = 100'000;  ///< tiers in one document
};

/// Options for writing; the writer drops what the format cannot carry.
struct write_options {};

/// Where something is in the input: a byte offset, and the line and column `read_document`
/// computes from it (both 1-based; 0 when unknown).
struct source_position {
  std::size_t offset = no_offset;
  std::size_t line = 0;
  std::size_t column = 0;
};

/// Where each tier and each annotation of a document was read from, index for index: the line
/// that declares a tier (or its first row), and the line, row, element or object of each
/// annotation. Filled when read_options::positions is set.
struct source_map {
  std::vector<source_position> tiers;
  std::vector<std::vector<source_position>> annotations;  ///< [tier][annotation]

  /// The position of tier `t`, or of its annotation `a`; unknown when out of range.
  source_position of_tier(std::size_t t) const {
    return t < tiers.size() ? tiers[t] : source_position{};
  }
  source_position of_annotation(std::size_t t, std::size_t a) const {
    return t < annotations.size() && a < annotations[t].size() ? annotations[t][a]
                                                               : source_position{};
  }
};

/// What reading produced: the document and every diagnostic, located by byte offset.
/// When `diagnostics` holds an error, `value` is incomplete and must not be used.
struct read_result : result<document> {
  source_map positions;  ///< empty unless read_options::positions was set
};

/// Receives a document piece by piece, in reading order, instead of whole: first the
/// document's own fields, then each tier's own fields followed by its annotations one at a
/// time. A streaming reader (format::stream) hands each annotation over as it reads it and
/// keeps nothing of it, and a streaming writer (format::stream_writer) writes it at once, so
/// that converting needs memory for the input alone. What is passed is valid only during the
/// call. Each call returns false to stop the reading.
class document_handler {
 public:
  virtual ~document_handler() = default;
  /// The media and metadata; called once, first. `head.tiers` is not to be used (a
  /// streaming reader leaves it empty).
  virtual bool begin_document(const document& head) = 0;
  /// A tier's own fields; `head.annotations` is not to be used (a streaming reader leaves
  /// it empty).
  virtual bool begin_tier(const tier& head) = 0;
  virtual bool add(const annotation& a) = 0;
  virtual bool end_tier() = 0;
  /// Called once, last, when everything was handed over.
  virtual bool end_document() = 0;
};

/// Hands a whole document to `to` piece by piece, as a streaming reader would: how a writer
/// that streams writes a document, through the same code.
bool hand_over(const document& doc, document_handler& to);

/// How streaming a document went.
enum class stream_status : std::uint8_t {
  done,  ///< everything was handed over, or an error stopped the reading (see diagnostics)
  /// Not streamed: the input's order does not allow it (a tier's rows apart from one
  /// another, a tier's own fields after its annotations, the document's fields after its
  /// tiers), or it is not plain UTF-8, or it breaks a resource limit, which a document read
  /// locates. Discard what was handed over and read the document (read_document).
  not_streamed,
};

/// One registered format. Everything is plain data and function pointers, listed in one table.
struct format {
  std::string_view name;                         ///< as in --from/--to
  std::string_view title;                        ///< one line for people
  std::span<const std::string_view> extensions;  ///< with the dot, lower case
  feature_set carries;
  /// How sure it is that `head` (the first few KiB) is this format: 0 no, 1 maybe, 2 yes.
  int (*sniff)(std::string_view head);
  /// Reads the whole input. Throws nothing; problems go into the result.
  read_result (*read)(std::string_view input, const read_options& options);
  /// Writes the parts of `doc` the format carries. Throws tiers::error when the sink fails.
  void (*write)(const document& doc, byte_sink& out, const write_options& options);
  /// Losses beyond the feature list (e.g. values a table cannot tell from empty); may be null.
  void (*extra_losses)(const document& doc, std::vector<std::string>& losses);
  /// Attribute and metadata keys the format carries even without annotation_attributes or
  /// metadata: those starting with `own_prefix` (checked by extra_losses) and `own_keys`.
  std::string_view own_prefix = {};
  std::span<const std::string_view> own_keys = {};
  /// Invalid UTF-8 is replaced by U+FFFD with a warning, as the format's spec says, instead
  /// of rejecting the file.
  bool replaces_invalid_utf8 = false;
  /// The finest time the format holds, in steps per second (WebVTT: 1000). A writer rounds a
  /// time between steps to the nearest, and the loss report lists it; operations that make new
  /// times (retime) place them on this grid instead.
  rational time_grid{ns_per_second, 1};
  /// The format's one tier is caption cues (WebVTT): `check` judges it by the caption rules
  /// unless a profile or option names another caption tier.
  bool holds_captions = false;
  /// Reads the input handing it to `to` piece by piece, without a document, where its order
  /// allows (else not_streamed); `options.positions` is off (stream_document sees to it);
  /// problems go into `diagnostics`, and what the handler throws
  /// (a writer's tiers::error) passes through. Null when the format
  /// cannot stream (WebVTT and TTML keep what comes last in the file before their tiers).
  stream_status (*stream)(std::string_view input, const read_options& options, document_handler& to,
                          std::vector<diagnostic>& diagnostics) = nullptr;
  /// A handler that writes what it is handed byte for byte as `write` writes the whole
  /// document. Unlike `write`, it does not repair text that is not UTF-8: give it UTF-8, as
  /// stream_document does (it streams only UTF-8 input, of which readers make nothing else).
  /// Null when the writer needs the whole document (a table's header names every
  /// attribute; WebVTT orders its cues; TTML plans its speakers).
  std::unique_ptr<document_handler> (*stream_writer)(byte_sink& out) = nullptr;
};

/// Every format, in a fixed order.
std::span<const format> formats();
const format* find_format(std::string_view name);
/// The format whose extension `path` ends with (case-insensitively), or null.
const format* format_for_path(std::string_view path);
/// The formats whose sniffers recognise `head`, surest first.
std::vector<const format*> sniff_formats(std::string_view head);

/// The formats' names, as messages list them: `json, csv, tsv, …`.
std::string format_names();

/// The format to read a file with when none is named: its extension's, else the surest that
/// recognises `content` (`path` empty for a stream). Null when none fits, with `why`
/// (`input.format`, naming `path`) saying so and ending "name it with `how`" (`--from`).
const format* choose_format(std::string_view path, std::string_view content, diagnostic& why,
                            std::string_view how);

/// Reads `input` as `fmt`: checks that it is UTF-8, runs the reader and locates every
/// diagnostic (line, column, and `file` set to `file_name`).
read_result read_document(std::string_view input, const format& fmt, const read_options& options,
                          std::string_view file_name = {});

/// What streaming produced: how it went, and every diagnostic, located as read_document
/// locates them.
struct stream_result {
  stream_status status = stream_status::done;
  std::vector<diagnostic> diagnostics;
  /// Whether no diagnostic is an error (not_streamed is not one).
  bool ok() const;
};

/// Whether converting from `from` to `to` can stream: both formats stream, and `to` carries
/// everything `from` can hold, so that nothing can be lost and no loss report needs the
/// whole document (CSV, TSV, tiers text and JSON into JSON or tiers text).
bool streams_losslessly(const format& from, const format& to);

/// Reads `input` as `fmt` (which must stream), handing the document to `to` piece by piece,
/// with read_document's checks: UTF-8, resource limits (a breach is read again as a document
/// to locate it) and every diagnostic located. When an error is among the diagnostics, what
/// was handed over is incomplete and must be discarded.
stream_result stream_document(std::string_view input, const format& fmt,
                              const read_options& options, document_handler& to,
                              std::string_view file_name = {});

inline constexpr std::size_t no_tier = static_cast<std::size_t>(-1);

/// For a format that holds one tier plus its inline words (feature::inline_words): the index
/// of the tier it writes as the first tier's word timings — the first tier whose parent is the
/// first tier, with relation `within` — or no_tier.
std::size_t word_tier_index(const document& doc, const format& fmt);

/// Where a document is written, for the losses that depend on it.
struct output_context {
  std::string_view path;        ///< the output file; empty or "-" for a stream
  std::string_view given_name;  ///< the tier name reading gave the input (not its content's)
};

/// Everything in `doc` that `fmt` cannot carry, one line each (e.g. "confidence of 812
/// annotations in tier 'words'"). Empty when writing loses nothing. With the output's `path`,
/// also the name of the tier of a one-tier format: read back, that tier is named after the
/// file, so a name other than the file's stem (or the name reading gave it) is lost.
std::vector<std::string> find_losses(const document& doc, const format& fmt,
                                     const output_context& where = {});

}  // namespace tiers
