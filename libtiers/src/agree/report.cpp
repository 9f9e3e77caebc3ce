// Agreement reports: the comparisons `tiers agree` makes, and their JSON (docs/agreement.md).
#include <cmath>
#include <cstdlib>

#include "detail/json_text.hpp"
#include "tiers/agree.hpp"

namespace tiers {

using detail::json_members;
using detail::write_json_string;

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

annotators_report compare_annotators(const std::vector<const tier*>& tiers, const time_grid& grid) {
  annotators_report r;
  r.grid = grid;
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
      const bool given = v >= 0;
      n.push_back(given ? std::optional<double>(v) : std::nullopt);
      i.push_back(given && all_numeric ? std::optional<double>(numeric[static_cast<std::size_t>(v)])
                                       : std::nullopt);
      values += given;
    }
    weights.push_back(to - from);
    if (values >= 2) r.pairable += to - from;
  });
  r.alpha = krippendorff_alpha(nominal, weights, alpha_metric::nominal);
  if (all_numeric) r.alpha_interval = krippendorff_alpha(interval, weights, alpha_metric::interval);
  for (std::size_t i = 0; i < tiers.size(); ++i)
    for (std::size_t j = i + 1; j < tiers.size(); ++j)
      r.pairwise.push_back(
          {tiers[i]->name, tiers[j]->name, compare_frames(*tiers[i], *tiers[j], grid).kappa});
  return r;
}

namespace {

void write_origin(byte_sink& out, const tier_origin& o) {
  out.put('{');
  json_members m(out);
  m.string("file", o.file);
  m.string("tier", o.tier);
  out.put('}');
}

void write_frames(byte_sink& out, const frame_agreement& f) {
  out.put('{');
  json_members m(out);
  m.seconds("step", f.grid.step);
  m.seconds("start", f.grid.start);
  m.seconds("end", f.grid.end);
  m.count("count", f.grid.frames());
  m.number("observed", f.observed);
  m.number("expected", f.expected);
  m.number("kappa", f.kappa);
  m.number("precision", f.precision);
  m.number("recall", f.recall);
  m.number("f1", f.f1);
  m.key("labels").put('[');
  for (std::size_t k = 0; k < f.scores.size(); ++k) {
    const label_scores& l = f.scores[k];
    out.write(k ? ",\n   {" : "\n   {");
    json_members lm(out);
    lm.string("label", l.label);
    lm.count("reference", l.reference);
    lm.count("candidate", l.candidate);
    lm.count("agreed", l.agreed);
    lm.number("precision", l.precision);
    lm.number("recall", l.recall);
    lm.number("f1", l.f1);
    out.put('}');
  }
  out.write("],\n  ");
  json_members rest(out);
  rest.key("confusion").write("{\"labels\": [");
  for (std::size_t k = 0; k < f.labels.size(); ++k) {
    if (k) out.write(", ");
    write_json_string(out, f.labels[k]);
  }
  out.write("], \"counts\": [");
  for (std::size_t i = 0; i < f.confusion.size(); ++i) {
    out.write(i ? ", [" : "[");
    for (std::size_t j = 0; j < f.confusion[i].size(); ++j)
      out.write((j ? ", " : "") + std::to_string(f.confusion[i][j]));
    out.put(']');
  }
  out.write("]}}");
}

void write_segments(byte_sink& out, const segment_options& o, const segment_agreement& s) {
  out.put('{');
  json_members m(out);
  const bool by_overlap = o.by == segment_options::criterion::overlap;
  m.string("match", name_of(segment_options::criterion_names, o.by));
  if (by_overlap)
    m.number("min_overlap", o.min_overlap);
  else
    m.seconds("collar", o.collar);
  m.key("same_label").write(o.same_label ? "true" : "false");
  m.count("reference", s.reference);
  m.count("candidate", s.candidate);
  m.count("matched", s.matches.size());
  m.number("precision", s.precision);
  m.number("recall", s.recall);
  m.number("f1", s.f1);
  for (auto [key, median, p90] : {std::tuple{"onset", s.onset_median, s.onset_p90},
                                  std::tuple{"offset", s.offset_median, s.offset_p90}}) {
    byte_sink& v = m.key(key);
    if (s.matches.empty()) {
      v.write("null");
      continue;
    }
    v.put('{');
    json_members d(v);
    d.seconds("median", median);
    d.seconds("p90", p90);
    v.put('}');
  }
  out.put('}');
}

}  // namespace

void write_agreement_json(const agreement_report& r, byte_sink& out) {
  out.put('{');
  json_members m(out);
  write_origin(m.key("reference"), r.reference);
  write_origin(m.key("candidate"), r.candidate);
  out.write("\n ");
  write_frames(m.key("frames"), r.frames);
  out.write("\n ");
  write_segments(m.key("segments"), r.matching, r.segments);
  // The keys fixed by the command-line contract, at the top level.
  out.write("\n ");
  m.number("kappa", r.frames.kappa);
  m.number("precision", r.frames.precision);
  m.number("recall", r.frames.recall);
  m.number("f1", r.frames.f1);
  out.write("}\n");
}

void write_annotators_json(const annotators_report& r, byte_sink& out) {
  out.put('{');
  json_members m(out);
  m.string("file", r.file);
  m.key("tiers").put('[');
  for (std::size_t k = 0; k < r.tiers.size(); ++k) {
    if (k) out.write(", ");
    write_json_string(out, r.tiers[k]);
  }
  out.put(']');
  m.seconds("step", r.grid.step);
  m.count("frames", r.grid.frames());
  m.count("pairable_frames", r.pairable);
  m.number("alpha", r.alpha);
  m.number("alpha_interval", r.alpha_interval.value_or(std::nan("")));
  m.key("pairwise").put('[');
  for (std::size_t k = 0; k < r.pairwise.size(); ++k) {
    out.write(k ? ", {" : "{");
    json_members p(out);
    p.string("a", r.pairwise[k].a);
    p.string("b", r.pairwise[k].b);
    p.number("kappa", r.pairwise[k].kappa);
    out.put('}');
  }
  out.write("]}\n");
}

}  // namespace tiers
