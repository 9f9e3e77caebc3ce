// Combining a human and a machine tier: the time line is cut at every boundary of either
// side; in each piece the strategy decides which annotations stand; the runs of pieces where
// an annotation stands become its (possibly trimmed) copies.
#include <algorithm>
#include <map>
#include <set>

#include "tiers/merge.hpp"

namespace tiers {
namespace {

struct source_annotation {
  const annotation* a;
  bool human;
};

// The labels of a set of annotations, sorted and unique, for comparing two sides.
std::vector<std::string_view> labels_of(const std::vector<const source_annotation*>& active) {
  std::vector<std::string_view> out;
  for (const source_annotation* s : active)
    out.push_back(s->a->text);
  std::sort(out.begin(), out.end());
  out.erase(std::unique(out.begin(), out.end()), out.end());
  return out;
}

std::string joined(const std::vector<std::string_view>& labels) {
  std::string s;
  for (std::string_view l : labels)
    s += (s.empty() ? "" : ", ") + std::string(l);
  return s;
}

using run_list = std::vector<std::pair<time_ns, time_ns>>;

struct disagreement {
  time_ns from, to;
  std::vector<std::string_view> human, machine;
};

// What a sweep over the pieces finds: for every annotation, the runs of pieces [from, to)
// where it stands, and the spans where the two sides' labels differ.
struct sweep_result {
  std::map<const source_annotation*, run_list> runs;
  std::vector<disagreement> review;
};

// The annotations to combine: every human one, and the machine ones confident enough.
std::vector<source_annotation> sources(const tier& human, const tier& machine,
                                       const combine_step& step, combined_tiers& out) {
  std::vector<source_annotation> all;
  for (const annotation& a : human.annotations)
    all.push_back({&a, true});
  for (const annotation& a : machine.annotations) {
    // No confidence is no evidence against an annotation: it stays.
    if (a.confidence && *a.confidence < step.min_confidence) {
      ++out.machine_dropped;
      ++out.below_confidence;
      continue;
    }
    all.push_back({&a, false});
  }
  return all;
}

// Whether `s` stands in a piece where the human side has labels `hl` (none: `no_human`) and
// the machine side `ml`.
bool stands(combine_strategy strategy, const source_annotation& s,
            const std::vector<std::string_view>& hl, const std::vector<std::string_view>& ml,
            bool no_human) {
  switch (strategy) {
    case combine_strategy::human_first:
      return s.human || no_human;
    case combine_strategy::union_:
      return s.human || !std::binary_search(hl.begin(), hl.end(), s.a->text);
    case combine_strategy::intersection:
      return s.human && std::binary_search(ml.begin(), ml.end(), s.a->text);
  }
  return false;
}

// Cuts the time line at every boundary of an annotation with a length and decides, piece by
// piece, which annotations stand.
sweep_result sweep(const std::vector<source_annotation>& all, combine_strategy strategy) {
  std::set<time_ns> cuts;
  std::map<time_ns, std::vector<const source_annotation*>> starting;
  for (const source_annotation& s : all)
    if (s.a->end > s.a->start) {
      cuts.insert(s.a->start);
      cuts.insert(s.a->end);
      starting[s.a->start].push_back(&s);
    }
  const std::vector<time_ns> times(cuts.begin(), cuts.end());
  sweep_result out;
  std::vector<const source_annotation*> active;
  for (std::size_t k = 0; k + 1 < times.size(); ++k) {
    const time_ns from = times[k], to = times[k + 1];
    std::erase_if(active, [&](const source_annotation* s) { return s->a->end <= from; });
    if (auto it = starting.find(from); it != starting.end())
      active.insert(active.end(), it->second.begin(), it->second.end());
    std::vector<const source_annotation*> h, m;
    for (const source_annotation* s : active)
      (s->human ? h : m).push_back(s);
    const std::vector<std::string_view> hl = labels_of(h), ml = labels_of(m);
    for (const source_annotation* s : active) {
      if (!stands(strategy, *s, hl, ml, h.empty())) continue;
      run_list& r = out.runs[s];
      if (!r.empty() && r.back().second == from)
        r.back().second = to;
      else
        r.emplace_back(from, to);
    }
    if ((h.empty() && m.empty()) || hl == ml) continue;
    std::vector<disagreement>& review = out.review;
    if (!review.empty() && review.back().to == from && review.back().human == hl &&
        review.back().machine == ml)
      review.back().to = to;
    else
      review.push_back({from, to, hl, ml});
  }
  return out;
}

// The copies of each annotation over the runs where it stands (pieces shorter than the minimum
// dropped), counted on the machine side, into the merged tier in start order.
void place_copies(const std::vector<source_annotation>& all,
                  const std::map<const source_annotation*, run_list>& runs,
                  const combine_step& step, combined_tiers& out) {
  for (const source_annotation& s : all) {
    const annotation& a = *s.a;
    if (a.end <= a.start) {
      // Instants cover no time: human ones stand in the strategies that keep human annotations.
      if (s.human && step.strategy != combine_strategy::intersection) {
        annotation copy = a;
        copy.attributes["origin"] = "human";
        out.merged.annotations.push_back(std::move(copy));
      }
      continue;
    }
    const auto it = runs.find(&s);
    const bool whole =
        it != runs.end() && it->second.size() == 1 && it->second[0] == std::pair(a.start, a.end);
    run_list pieces;
    std::size_t short_pieces = 0;
    if (it != runs.end()) {
      for (const auto& p : it->second)
        if (whole || p.second - p.first >= step.min_duration)
          pieces.push_back(p);
        else
          ++short_pieces;
    }
    if (!s.human) {
      out.too_short += short_pieces;
      if (it == runs.end()) ++out.covered;
      if (whole)
        ++out.machine_kept;
      else if (pieces.empty())
        ++out.machine_dropped;
      else
        out.machine_trimmed += pieces.size();
    }
    for (std::size_t k = 0; k < pieces.size(); ++k) {
      annotation copy = a;
      copy.start = pieces[k].first;
      copy.end = pieces[k].second;
      if (copy.id && pieces.size() > 1) *copy.id += "." + std::to_string(k + 1);
      copy.attributes["origin"] = s.human ? "human" : "machine";
      out.merged.annotations.push_back(std::move(copy));
    }
  }
  std::stable_sort(out.merged.annotations.begin(), out.merged.annotations.end(),
                   [](const annotation& a, const annotation& b) { return a.start < b.start; });
}

// The review tier: one annotation per span where the sides disagree, saying how.
tier review_tier(const tier& human, const tier& machine, const combine_step& step,
                 const std::vector<disagreement>& review, std::size_t& left_out) {
  tier r;
  r.name = *step.review;
  r.attributes = {{"merge:human", human.name}, {"merge:machine", machine.name}};
  if (step.review_min > 0) r.attributes["merge:review_min"] = format_seconds(step.review_min) + "s";
  for (const disagreement& d : review) {
    if (d.to - d.from < step.review_min) {
      ++left_out;
      continue;
    }
    annotation a;
    a.start = d.from;
    a.end = d.to;
    const std::string hs = d.human.empty() ? "none" : joined(d.human);
    const std::string ms = d.machine.empty() ? "none" : joined(d.machine);
    a.text = "human: " + hs + "; machine: " + ms;
    if (!d.human.empty()) a.attributes["human"] = joined(d.human);
    if (!d.machine.empty()) a.attributes["machine"] = joined(d.machine);
    a.attributes["disagreement"] = d.human.empty()     ? "machine only"
                                   : d.machine.empty() ? "human only"
                                                       : "labels";
    r.annotations.push_back(std::move(a));
  }
  return r;
}

}  // namespace

combined_tiers combine_tiers(const tier& human, const tier& machine, const combine_step& step) {
  combined_tiers out;
  out.merged.name = step.into;
  out.merged.attributes = {
      {"merge:human", human.name},
      {"merge:machine", machine.name},
      {"merge:strategy", std::string(name_of(combine_strategy_names, step.strategy))}};
  const std::vector<source_annotation> all = sources(human, machine, step, out);
  const sweep_result swept = sweep(all, step.strategy);
  place_copies(all, swept.runs, step, out);
  if (step.review) out.review = review_tier(human, machine, step, swept.review, out.review_short);
  return out;
}

}  // namespace tiers
