// Agreement reports: the comparisons `tiers agree` makes, and their JSON (docs/agreement.md).
#include <cmath>
#include <cstdlib>

#include "detail/json_text.hpp"
#include "tiers/agree.hpp"

namespace tiers {

agreement_report compare_tiers(const tier& reference, const tier& candidate, const time_grid& grid,
                               const segment_options& matching) {
  agreement_report r;
  r.reference.tier = reference.name;
  r.candidate.tier = candidate.name;
  r.frames = compare_frames(reference, candidate, grid);
  r.matching = matching;
  r.segments = compare_segments(reference, candidate, matching);
  return r;
}

agreement_report pool_agreements(const std::vector<agreement_report>& parts) {
  agreement_report out;
  std::vector<frame_agreement> frames;
  std::vector<segment_agreement> segments;
  for (const agreement_report& r : parts) {
    frames.push_back(r.frames);
    segments.push_back(r.segments);
  }
  if (!parts.empty()) {
    out.reference.tier = parts.front().reference.tier;
    out.candidate.tier = parts.front().candidate.tier;
    out.matching = parts.front().matching;
  }
  out.frames = pool_frames(frames);
  out.segments = pool_segments(segments);
  return out;
}

annotators_report compare_annotators(const std::vector<const tier*>& tiers, const time_grid& grid,
                                     empty_frames empty) {
  annotators_report r;
  r.grid = grid;
  r.empty = empty;
  for (const tier* t : tiers)
    r.tiers.push_back(t->name);
  const framed_tiers f = frame_labels(tiers, grid);
  std::vector<double> numeric(f.labels.size());
  bool all_numeric = !f.labels.empty();
  for (std::size_t k = 0; k < f.labels.size(); ++k) {
    char* end = nullptr;
    numeric[k] = std::strtod(f.labels[k].c_str(), &end);
    all_numeric = all_numeric && !f.labels[k].empty() && *end == '\0' && std::isfinite(numeric[k]);
  }
  // One unit per stretch of frames that no coder's label changes in, weighted by its length.
  std::vector<std::vector<std::optional<double>>> nominal, interval;
  std::vector<std::uint64_t> weights;
  f.each_stretch([&](std::uint64_t from, std::uint64_t to, const std::vector<std::int32_t>& l) {
    std::size_t values = 0;
    auto& n = nominal.emplace_back();
    auto& i = interval.emplace_back();
    for (const std::int32_t v : l) {
      const bool given = v >= 0 || empty == empty_frames::label;
      n.push_back(given ? std::optional<double>(v) : std::nullopt);  // "none" is -1
      i.push_back(v >= 0 && all_numeric
                      ? std::optional<double>(numeric[static_cast<std::size_t>(v)])
                      : std::nullopt);
      values += given;
    }
    weights.push_back(to - from);
    if (values >= 2) r.pairable += to - from;
  });
  r.alpha = krippendorff_alpha(nominal, weights, alpha_metric::nominal);
  // "No label" has no place on a numeric scale: interval alpha only where it is missing.
  if (all_numeric && empty == empty_frames::missing)
    r.alpha_interval = krippendorff_alpha(interval, weights, alpha_metric::interval);
  for (std::size_t i = 0; i < tiers.size(); ++i)
    for (std::size_t j = i + 1; j < tiers.size(); ++j)
      r.pairwise.push_back(
          {tiers[i]->name, tiers[j]->name, compare_frames(*tiers[i], *tiers[j], grid).kappa});
  return r;
}

namespace {

using detail::json_writer;

void write_origin(json_writer& j, const tier_origin& o) {
  j.begin_object();
  j.string("file", o.file);
  j.string("tier", o.tier);
  j.end_object();
}

// The grid's members: its step (with the frames it counts, when given in frames), its span and
// what that span is.
void write_grid(json_writer& j, const time_grid& g) {
  j.seconds("step", g.step);
  if (g.step_frames > 0) {
    j.count("step_frames", static_cast<std::uint64_t>(g.step_frames));
    j.string("frame_rate", format_rational(g.rate));
  }
  j.seconds("start", g.start);
  j.seconds("end", g.end);
  j.string("spans", name_of(time_grid::basis_names, g.spans));
}

void write_frames(json_writer& j, const frame_agreement& f) {
  j.begin_object(true);
  write_grid(j, f.grid);
  j.count("count", f.grid.frames());
  j.number("observed", f.observed);
  j.number("expected", f.expected);
  j.number("kappa", f.kappa);
  j.number("precision", f.precision);
  j.number("recall", f.recall);
  j.number("f1", f.f1);
  j.key("labels").begin_array(true);
  for (const label_scores& l : f.scores) {
    j.begin_object();
    j.string("label", l.label);
    j.count("reference", l.reference);
    j.count("candidate", l.candidate);
    j.count("agreed", l.agreed);
    j.number("precision", l.precision);
    j.number("recall", l.recall);
    j.number("f1", l.f1);
    j.end_object();
  }
  j.end_array();
  j.key("confusion").begin_object();
  j.key("labels").string_array(f.labels);
  j.key("counts").begin_array();
  for (const auto& row : f.confusion) {
    j.begin_array();
    for (const std::uint64_t n : row)
      j.count(n);
    j.end_array();
  }
  j.end_array();
  j.end_object();
  j.end_object();
}

// With `deviations`, every match's |Δonset| and |Δoffset| too: what pooling recordings' reports
// written apart (agree --combine) needs for exact quantiles.
void write_segments(json_writer& j, const segment_options& o, const segment_agreement& s,
                    bool deviations) {
  j.begin_object();
  j.string("match", name_of(segment_options::criterion_names, o.by));
  if (o.by == segment_options::criterion::overlap)
    j.number("min_overlap", o.min_overlap);
  else
    j.seconds("collar", o.collar);
  j.boolean("same_label", o.same_label);
  j.count("reference", s.reference);
  j.count("candidate", s.candidate);
  j.count("matched", s.matches.size());
  j.number("precision", s.precision);
  j.number("recall", s.recall);
  j.number("f1", s.f1);
  for (auto [key, median, p90] : {std::tuple{"onset", s.onset_median, s.onset_p90},
                                  std::tuple{"offset", s.offset_median, s.offset_p90}}) {
    j.key(key);
    if (s.matches.empty()) {
      j.null();
      continue;
    }
    j.begin_object();
    j.seconds("median", median);
    j.seconds("p90", p90);
    j.end_object();
  }
  if (deviations) {
    j.key("deviations").begin_object();
    for (const bool onset : {true, false}) {
      j.key(onset ? "onset" : "offset").begin_array();
      for (const segment_match& m : s.matches)
        j.seconds(std::abs(onset ? m.onset : m.offset));
      j.end_array();
    }
    j.end_object();
  }
  j.end_object();
}

// One report's members; `id` first when it is a recording's of a dataset.
void write_agreement(json_writer& j, const agreement_report& r, const std::string* id = nullptr) {
  j.begin_object(true);
  if (id) j.string("id", *id);
  write_origin(j.key("reference"), r.reference);
  write_origin(j.key("candidate"), r.candidate);
  write_frames(j.key("frames"), r.frames);
  write_segments(j.key("segments"), r.matching, r.segments, id != nullptr);
  // The keys fixed by the command-line contract, at the top level.
  j.number("kappa", r.frames.kappa);
  j.number("precision", r.frames.precision);
  j.number("recall", r.frames.recall);
  j.number("f1", r.frames.f1);
  j.end_object();
}

}  // namespace

void write_agreement_json(const agreement_report& r, byte_sink& out) {
  json_writer j(out);
  write_agreement(j, r);
  out.put('\n');
}

void write_dataset_agreement_json(const agreement_report& pooled,
                                  const std::vector<recording_agreement>& recordings,
                                  byte_sink& out) {
  json_writer j(out);
  j.begin_object(true);
  write_agreement(j.key("pooled"), pooled);
  j.key("recordings").begin_array(true);
  for (const recording_agreement& r : recordings)
    write_agreement(j, r.report, &r.id);
  j.end_array();
  j.end_object();
  out.put('\n');
}

void write_annotators_json(const annotators_report& r, byte_sink& out) {
  json_writer j(out);
  j.begin_object(true);
  j.string("file", r.file);
  j.key("tiers").string_array(r.tiers);
  write_grid(j, r.grid);
  j.count("frames", r.grid.frames());
  j.string("empty", name_of(empty_frames_names, r.empty));
  j.count("pairable_frames", r.pairable);
  j.number("alpha", r.alpha);
  j.number("alpha_interval", r.alpha_interval.value_or(std::nan("")));
  j.key("pairwise").begin_array(true);
  for (const auto& p : r.pairwise) {
    j.begin_object();
    j.string("a", p.a);
    j.string("b", p.b);
    j.number("kappa", p.kappa);
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.put('\n');
}

void write_sweep_json(const threshold_sweep& s, const tier_origin& reference,
                      const tier_origin& candidate, byte_sink& out) {
  json_writer j(out);
  j.begin_object(true);
  write_origin(j.key("reference"), reference);
  write_origin(j.key("candidate"), candidate);
  j.count("candidates", s.candidates);
  j.count("unscored", s.unscored);
  j.maybe_number("target", s.target);
  j.key("thresholds").begin_object();
  j.maybe_number("frames", s.frames_threshold);
  j.maybe_number("segments", s.segments_threshold);
  j.end_object();
  j.key("points").begin_array(true);
  for (const sweep_point& p : s.points) {
    j.begin_object();
    j.number("threshold", p.threshold);
    j.count("kept", p.kept);
    j.number("kept_share", p.kept_share);
    j.number("precision", p.precision);
    j.number("recall", p.recall);
    j.number("f1", p.f1);
    j.number("kappa", p.kappa);
    j.number("segment_precision", p.segment_precision);
    j.number("segment_recall", p.segment_recall);
    j.number("segment_f1", p.segment_f1);
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.put('\n');
}

}  // namespace tiers
