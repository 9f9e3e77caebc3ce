// Streaming: a document handed over piece by piece, and reading with read_document's checks
// without keeping the document.
#include "detail/limits.hpp"
#include "detail/utf8.hpp"
#include "tiers/format.hpp"

namespace tiers {
namespace {

// Passes everything on while the input stays within read_options' limits; stops the reading at
// the first tier or text beyond them, which read_document then locates.
class limit_guard final : public document_handler {
 public:
  limit_guard(document_handler& to, const read_options& options) : to_(to), options_(options) {}
  bool breached = false;

  bool begin_document(const document& head) override { return to_.begin_document(head); }
  bool begin_tier(const tier& head) override {
    if (++tiers_ > options_.max_tiers) return stop();
    return to_.begin_tier(head);
  }
  bool add(const annotation& a) override {
    if (detail::limited_text_size(a) > options_.max_text) return stop();
    return to_.add(a);
  }
  bool end_tier() override { return to_.end_tier(); }
  bool end_document() override { return to_.end_document(); }

 private:
  bool stop() {
    breached = true;
    return false;
  }
  document_handler& to_;
  const read_options& options_;
  std::size_t tiers_ = 0;
};

}  // namespace

bool hand_over(const document& doc, document_handler& to) {
  if (!to.begin_document(doc)) return false;
  for (const tier& t : doc.tiers) {
    if (!to.begin_tier(t)) return false;
    for (const annotation& a : t.annotations)
      if (!to.add(a)) return false;
    if (!to.end_tier()) return false;
  }
  return to.end_document();
}

bool stream_result::ok() const {
  return !has_errors(diagnostics);
}

bool streams_losslessly(const format& from, const format& to) {
  if (!from.stream || !to.stream_writer || to.extra_losses) return false;
  for (int f = 0; f < feature_count; ++f)
    if (from.carries.has(static_cast<feature>(f)) && !to.carries.has(static_cast<feature>(f)))
      return false;
  return to.carries.has(feature::several_tiers);
}

stream_result stream_document(std::string_view input, const format& fmt,
                              const read_options& options, document_handler& to,
                              std::string_view file_name) {
  stream_result result;
  // What is not plain UTF-8 is refused or repaired, and described, by read_document.
  if (!fmt.stream || !detail::wide_encoding(input).empty() ||
      detail::find_invalid_utf8(input) != std::string_view::npos) {
    result.status = stream_status::not_streamed;
    return result;
  }
  // Positions would be kept for every annotation handed over: a stream keeps nothing.
  read_options streaming = options;
  streaming.positions = false;
  limit_guard guard(to, options);
  result.status = fmt.stream(input, streaming, guard, result.diagnostics);
  if (guard.breached) result.status = stream_status::not_streamed;
  locate_all(input, result.diagnostics);
  for (diagnostic& d : result.diagnostics)
    d.file = file_name;
  return result;
}

}  // namespace tiers
