// Precision from a reviewed sample: per stratum and label with Wilson's and Clopper–Pearson's
// intervals, the stratified estimate over the whole population, and the lowest confidence
// threshold that reaches a target (docs/review.md).
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <map>
#include <set>

#include "detail/json_text.hpp"
#include "tiers/review.hpp"

namespace tiers {
namespace {

constexpr double nan = std::numeric_limits<double>::quiet_NaN();

struct judged {
  const sample_row* row;
  verdict v;
};

// The rows of one stratum, with its size.
struct stratum_rows {
  std::uint64_t size = 0;
  std::vector<judged> rows;
  std::uint64_t reviewed() const {
    return static_cast<std::uint64_t>(std::count_if(rows.begin(), rows.end(), [](const judged& j) {
      return j.v == verdict::yes || j.v == verdict::no;
    }));
  }
};

precision_row count_row(std::string name, std::uint64_t size, const std::vector<judged>& rows,
                        double level) {
  precision_row r;
  r.name = std::move(name);
  r.size = size;
  for (const judged& j : rows) {
    if (j.v == verdict::yes) ++r.correct;
    if (j.v == verdict::yes || j.v == verdict::no) ++r.reviewed;
    if (j.v == verdict::unsure) ++r.unsure;
    if (j.v == verdict::none) ++r.unreviewed;
  }
  r.precision = r.reviewed ? static_cast<double>(r.correct) / static_cast<double>(r.reviewed) : nan;
  r.wilson =
      wilson_interval(static_cast<double>(r.correct), static_cast<double>(r.reviewed), level);
  r.clopper_pearson = clopper_pearson_interval(r.correct, r.reviewed, level);
  return r;
}

// The precision of the part of the population `in` picks, from a stratified sample: the ratio
// Σ w y d / Σ w d with the weights w = N_h / n_h, and its variance by linearization,
// Σ N_h² (1 − n_h/N_h) s²_h(z) / n_h with z = d (y − p) / N̂. When `in` picks everything this
// is Cochran's Σ W_h² (1 − n_h/N_h) p_h q_h / (n_h − 1) exactly.
template <class In>
population_estimate estimate_part(const std::map<std::string, stratum_rows>& strata, In in,
                                  double level) {
  population_estimate e;
  double total = 0, right = 0;
  for (const auto& [name, s] : strata) {
    const std::uint64_t n = s.reviewed();
    if (n == 0) continue;
    const double w = static_cast<double>(s.size) / static_cast<double>(n);
    for (const judged& j : s.rows)
      if ((j.v == verdict::yes || j.v == verdict::no) && in(*j.row)) {
        total += w;
        ++e.reviewed;
        if (j.v == verdict::yes) {
          right += w;
          ++e.correct;
        }
      }
  }
  e.annotations = total;
  if (e.reviewed == 0) {
    e.precision = e.se = nan;
    return e;
  }
  const double p = right / total;
  double v = 0;
  for (const auto& [name, s] : strata) {
    const std::uint64_t n = s.reviewed();
    if (n < 2) continue;
    std::vector<double> z;
    for (const judged& j : s.rows)
      if (j.v == verdict::yes || j.v == verdict::no)
        z.push_back(in(*j.row) ? ((j.v == verdict::yes ? 1.0 : 0.0) - p) / total : 0.0);
    double mean = 0;
    for (double x : z)
      mean += x;
    mean /= static_cast<double>(n);
    double ss = 0;
    for (double x : z)
      ss += (x - mean) * (x - mean);
    const double nd = static_cast<double>(n), big_n = static_cast<double>(s.size);
    v += big_n * big_n * (1 - nd / big_n) * (ss / (nd - 1)) / nd;
  }
  e.precision = p;
  e.se = std::sqrt(std::max(0.0, v));
  // Wilson's interval at the effective sample size p q / v. Where the sample shows no
  // variance (every clip right, or every one wrong) that size is the clips reviewed, with the
  // finite-population correction; a census has no sampling error at all.
  double effective;
  if (v > 0) {
    effective = p * (1 - p) / v;
  } else {
    const double f = static_cast<double>(e.reviewed) / total;
    if (f >= 1 - 1e-12) {
      e.interval = {p, p};
      return e;
    }
    effective = static_cast<double>(e.reviewed) / (1 - f);
  }
  e.interval = wilson_interval(p * effective, effective, level);
  return e;
}

}  // namespace

precision_estimate estimate_precision(const std::vector<sample_row>& sheet,
                                      const estimate_options& options) {
  precision_estimate out;
  out.level = options.level;
  std::map<std::string, stratum_rows> strata;
  std::map<std::string, std::vector<judged>> labels;
  for (const sample_row& r : sheet) {
    const judged j{&r, parse_verdict(r.verdict).value_or(verdict::none)};
    stratum_rows& s = strata[r.stratum];
    s.size = r.stratum_size;
    s.rows.push_back(j);
    labels[r.label].push_back(j);
  }
  for (const auto& [name, s] : strata) {
    out.strata.push_back(count_row(name, s.size, s.rows, options.level));
    if (out.strata.back().reviewed == 0) out.unreviewed_strata.push_back(name);
  }
  for (const auto& [name, rows] : labels)
    out.labels.push_back(count_row(name, 0, rows, options.level));
  out.overall = estimate_part(
      strata, [](const sample_row&) { return true; }, options.level);
  if (options.target_precision) {
    threshold_choice t;
    t.target = *options.target_precision;
    std::set<double> candidates;
    for (const auto& [name, s] : strata)
      for (const judged& j : s.rows)
        if (j.row->confidence && (j.v == verdict::yes || j.v == verdict::no))
          candidates.insert(*j.row->confidence);
    for (double c : candidates) {
      population_estimate kept = estimate_part(
          strata, [c](const sample_row& r) { return r.confidence && *r.confidence >= c; },
          options.level);
      if (kept.interval.low >= t.target) {
        t.confidence = c;
        t.kept = kept;
        break;
      }
    }
    out.threshold = t;
  }
  return out;
}

namespace {

void write_interval(detail::json_writer& j, std::string_view low, std::string_view high,
                    const proportion_interval& i, bool known) {
  j.maybe_number(low, known ? std::optional(i.low) : std::nullopt);
  j.maybe_number(high, known ? std::optional(i.high) : std::nullopt);
}

void write_population(detail::json_writer& j, const population_estimate& e) {
  const bool known = e.reviewed > 0;
  j.begin_object();
  j.maybe_number("precision", known ? std::optional(e.precision) : std::nullopt);
  write_interval(j, "low", "high", e.interval, known);
  j.maybe_number("se", known ? std::optional(e.se) : std::nullopt);
  j.count("reviewed", e.reviewed);
  j.count("correct", e.correct);
  j.number("annotations", e.annotations);
  j.end_object();
}

void write_rows(detail::json_writer& j, std::string_view key,
                const std::vector<precision_row>& rows, bool strata) {
  j.key(key).begin_array(true);
  for (const precision_row& r : rows) {
    const bool known = r.reviewed > 0;
    j.begin_object();
    j.string("name", r.name);
    if (strata) j.count("size", r.size);
    j.count("reviewed", r.reviewed);
    j.count("correct", r.correct);
    j.count("unsure", r.unsure);
    j.count("unreviewed", r.unreviewed);
    j.maybe_number("precision", known ? std::optional(r.precision) : std::nullopt);
    write_interval(j, "wilson_low", "wilson_high", r.wilson, known);
    write_interval(j, "cp_low", "cp_high", r.clopper_pearson, known);
    j.end_object();
  }
  j.end_array();
}

}  // namespace

void write_estimate_json(const precision_estimate& e, byte_sink& out) {
  detail::json_writer j(out);
  j.begin_object(true);
  j.string("format", "tiers-estimate");
  j.count("version", 1);
  j.number("level", e.level);
  j.key("overall");
  write_population(j, e.overall);
  write_rows(j, "strata", e.strata, true);
  write_rows(j, "labels", e.labels, false);
  j.key("unreviewed_strata").string_array(e.unreviewed_strata);
  j.key("threshold");
  if (!e.threshold) {
    j.null();
  } else {
    j.begin_object();
    j.number("target", e.threshold->target);
    j.maybe_number("confidence", e.threshold->confidence);
    j.key("kept");
    if (e.threshold->confidence)
      write_population(j, e.threshold->kept);
    else
      j.null();
    j.end_object();
  }
  j.end_object();
  out.write("\n");
}

void annotate_precision(tier& t, const precision_estimate& e) {
  for (const char* key : {"precision", "precision_low", "precision_high", "precision_reviewed",
                          "precision_method", "precision_threshold", "precision_target"})
    t.attributes.erase(key);
  if (e.overall.reviewed == 0) return;
  t.attributes["precision"] = fmt::format("{:.4f}", e.overall.precision);
  t.attributes["precision_low"] = fmt::format("{:.4f}", e.overall.interval.low);
  t.attributes["precision_high"] = fmt::format("{:.4f}", e.overall.interval.high);
  t.attributes["precision_reviewed"] = std::to_string(e.overall.reviewed);
  t.attributes["precision_method"] = fmt::format(
      "{} reviewed sample, {} strat{}; Wilson interval at the effective sample size, level {}",
      e.strata.size() > 1 ? "stratified" : "simple random", e.strata.size(),
      e.strata.size() == 1 ? "um" : "a", e.level);
  if (e.threshold) {
    t.attributes["precision_target"] = fmt::format("{}", e.threshold->target);
    if (e.threshold->confidence)
      t.attributes["precision_threshold"] = fmt::format("{}", *e.threshold->confidence);
  }
}

}  // namespace tiers
