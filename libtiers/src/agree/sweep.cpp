// Confidence threshold sweeps: how precision, recall and kappa move as a machine tier's
// less confident annotations are left out, for choosing `merge --min-confidence`.
#include <algorithm>
#include <cmath>
#include <set>

#include "tiers/agree.hpp"

namespace tiers {
namespace {

// The thresholds to try: the distinct confidences (the lowest keeps everything), or a regular
// ladder from 0 to 1 whose rungs are computed, not summed, so that 0.05 steps land on 0.35.
std::vector<double> thresholds_of(const std::vector<sweep_part>& parts,
                                  std::optional<double> step) {
  std::set<double> out;
  if (step) {
    const auto n = static_cast<long>(std::floor(1 / *step + 1e-9));
    for (long k = 0; k <= n; ++k)
      out.insert(std::min(1.0, static_cast<double>(k) * *step));
    return {out.begin(), out.end()};
  }
  for (const sweep_part& p : parts)
    for (const annotation& a : p.candidate->annotations)
      if (a.confidence) out.insert(*a.confidence);
  return {out.begin(), out.end()};
}

tier kept_at(const tier& candidate, double threshold, std::uint64_t& kept) {
  tier t;
  t.name = candidate.name;
  for (const annotation& a : candidate.annotations)
    if (!a.confidence || *a.confidence >= threshold) {
      t.annotations.push_back(a);
      ++kept;
    }
  return t;
}

}  // namespace

threshold_sweep sweep_thresholds(const std::vector<sweep_part>& parts,
                                 const segment_options& matching, std::optional<double> step,
                                 std::optional<double> target_precision) {
  threshold_sweep out;
  out.target = target_precision;
  for (const sweep_part& p : parts)
    for (const annotation& a : p.candidate->annotations) {
      ++out.candidates;
      out.unscored += !a.confidence;
    }
  for (const double threshold : thresholds_of(parts, step)) {
    sweep_point point;
    point.threshold = threshold;
    std::vector<agreement_report> reports;
    for (const sweep_part& p : parts) {
      const tier kept = kept_at(*p.candidate, threshold, point.kept);
      reports.push_back(compare_tiers(*p.reference, kept, p.grid, matching));
    }
    const agreement_report pooled =
        reports.size() == 1 ? std::move(reports.front()) : pool_agreements(reports);
    point.kept_share = out.candidates == 0
                           ? std::nan("")
                           : static_cast<double>(point.kept) / static_cast<double>(out.candidates);
    point.precision = pooled.frames.precision;
    point.recall = pooled.frames.recall;
    point.f1 = pooled.frames.f1;
    point.kappa = pooled.frames.kappa;
    point.segment_precision = pooled.segments.precision;
    point.segment_recall = pooled.segments.recall;
    point.segment_f1 = pooled.segments.f1;
    out.points.push_back(point);
  }
  if (target_precision)
    for (const sweep_point& p : out.points) {
      // NaN (nothing kept) never reaches a target.
      if (!out.frames_threshold && p.precision >= *target_precision)
        out.frames_threshold = p.threshold;
      if (!out.segments_threshold && p.segment_precision >= *target_precision)
        out.segments_threshold = p.threshold;
    }
  return out;
}

}  // namespace tiers
