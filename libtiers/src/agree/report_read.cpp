// Dataset agreement reports read back (`tiers agree --combine`): each recording's confusion
// matrix, segment counts and deviations, from which the pooled figures are made anew.
#include <charconv>

#include "detail/json_tree.hpp"
#include "detail/report.hpp"
#include "tiers/agree.hpp"

namespace tiers {
namespace {

using detail::json_fields;
using detail::json_node;

class agreement_reader {
 public:
  explicit agreement_reader(std::vector<diagnostic>& problems) : problems_(problems) {}

  void pooled(const json_node* n, dataset_agreement& out) {
    if (!n) return;
    json_fields f(*n, "the pooled report", "report", problems_);
    origin(f.object("reference"), out.reference);
    origin(f.object("candidate"), out.candidate);
  }

  std::optional<recording_agreement> recording(const json_node& n) {
    json_fields f(n, "a recording", "report", problems_);
    recording_agreement r;
    if (f.require("id"))
      if (auto id = f.string("id")) r.id = *id;
    origin(f.object("reference"), r.report.reference);
    origin(f.object("candidate"), r.report.candidate);
    if (f.require("frames"))
      if (const json_node* frames = f.object("frames")) read_frames(*frames, r.report.frames);
    if (f.require("segments"))
      if (const json_node* s = f.object("segments"))
        read_segments(*s, r.report.matching, r.report.segments);
    return r;
  }

 private:
  void bad(const json_node& n, std::string message) {
    problems_.push_back(
        detail::make_diagnostic(severity::error, "report.value", n.offset, std::move(message)));
  }

  void origin(const json_node* n, tier_origin& o) {
    if (!n) return;
    json_fields f(*n, "an origin", "report", problems_);
    o.file = f.string("file").value_or("");
    o.tier = f.string("tier").value_or("");
  }

  time_ns seconds(const json_node* n) {
    if (!n) return 0;
    const parsed_time t = parse_seconds(n->text);
    if (n->kind != json_node::type::number || !t) bad(*n, "a time in seconds was expected");
    return t.value;
  }

  std::uint64_t count(const json_node& n) {
    std::uint64_t v = 0;
    const char* end = n.text.data() + n.text.size();
    if (n.kind != json_node::type::number || std::from_chars(n.text.data(), end, v).ptr != end)
      bad(n, "a count was expected");
    return v;
  }

  void read_frames(const json_node& n, frame_agreement& out) {
    json_fields f(n, "the frames", "report", problems_);
    out.grid.step = seconds(f.get("step"));
    out.grid.start = seconds(f.get("start"));
    out.grid.end = seconds(f.get("end"));
    if (const json_node* sf = f.get("step_frames"))
      out.grid.step_frames = static_cast<std::int64_t>(count(*sf));
    if (auto rate = f.string("frame_rate")) {
      if (auto r = parse_rational(*rate))
        out.grid.rate = *r;
      else
        bad(*f.get("frame_rate"), "a frame rate such as \"25\" or \"30000/1001\" was expected");
    }
    if (out.grid.step_frames > 0 && out.grid.rate.num == 0)
      bad(n, "a step in frames needs its 'frame_rate'");
    if (auto spans = f.string("spans")) {
      if (auto b = value_named(time_grid::basis_names, *spans))
        out.grid.spans = *b;
      else
        bad(*f.get("spans"), "'spans' is \"media\" or \"tiers\"");
    }
    const json_node* confusion = f.require("confusion") ? f.object("confusion") : nullptr;
    if (!confusion) return;
    json_fields c(*confusion, "the confusion matrix", "report", problems_);
    if (const json_node* labels = c.require("labels") ? c.array("labels") : nullptr)
      for (const json_node& l : labels->items) {
        if (l.kind != json_node::type::string) bad(l, "a label was expected");
        out.labels.push_back(l.text);
      }
    if (const json_node* counts = c.require("counts") ? c.array("counts") : nullptr)
      for (const json_node& row : counts->items) {
        out.confusion.emplace_back();
        for (const json_node& v : row.items)
          out.confusion.back().push_back(count(v));
        if (row.kind != json_node::type::array || row.items.size() != out.labels.size())
          bad(row, "each row of counts has a count per label");
      }
    if (out.confusion.size() != out.labels.size() || out.labels.empty() ||
        out.labels.back() != "none")
      bad(*confusion, "the matrix has a row per label, \"none\" last");
  }

  void read_segments(const json_node& n, segment_options& o, segment_agreement& out) {
    json_fields f(n, "the segments", "report", problems_);
    if (auto m = f.string("match"))
      if (auto by = value_named(segment_options::criterion_names, *m)) o.by = *by;
    if (const json_node* c = f.get("collar")) o.collar = seconds(c);
    if (auto v = f.number("min_overlap")) o.min_overlap = *v;
    if (auto v = f.boolean("same_label")) o.same_label = *v;
    if (const json_node* v = f.get("reference")) out.reference = count(*v);
    if (const json_node* v = f.get("candidate")) out.candidate = count(*v);
    const json_node* d = f.require("deviations") ? f.object("deviations") : nullptr;
    if (!d) return;
    json_fields dev(*d, "the deviations", "report", problems_);
    const json_node* on = dev.array("onset");
    const json_node* off = dev.array("offset");
    if (!on || !off || on->items.size() != off->items.size()) {
      bad(*d, "the deviations have an onset and an offset per match");
      return;
    }
    for (std::size_t k = 0; k < on->items.size(); ++k)
      out.matches.push_back({0, 0, seconds(&on->items[k]), seconds(&off->items[k])});
  }

  std::vector<diagnostic>& problems_;
};

}  // namespace

result<dataset_agreement> read_dataset_agreement(std::string_view text, const std::string& file) {
  result<dataset_agreement> r;
  const std::optional<json_node> root =
      detail::parse_json_object(text, r.diagnostics, 16, "an agreement report", "report");
  if (root) {
    json_fields f(*root, "the report", "report", r.diagnostics);
    agreement_reader reader(r.diagnostics);
    reader.pooled(f.require("pooled") ? f.object("pooled") : nullptr, r.value);  // made anew
    if (const json_node* list = f.require("recordings") ? f.array("recordings") : nullptr)
      for (const json_node& n : list->items)
        if (auto one = reader.recording(n)) r.value.recordings.push_back(std::move(*one));
    f.finish();
  }
  locate_all(text, r.diagnostics);
  for (diagnostic& d : r.diagnostics)
    d.file = file;
  for (recording_agreement& a :
       r.value.recordings) {  // every measure from the counts, as when made
    const time_grid grid = a.report.frames.grid;
    a.report.frames = pool_frames({a.report.frames});
    a.report.frames.grid = grid;
    a.report.segments = pool_segments({a.report.segments});
  }
  return r;
}

}  // namespace tiers
