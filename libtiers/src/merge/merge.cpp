// Merging documents of one recording: media and metadata joined, tier names kept apart by
// the clash rule, shifts applied (constant or estimated), combinations added.
#include <algorithm>
#include <charconv>
#include <filesystem>
#include <map>
#include <set>

#include "detail/exact.hpp"
#include "detail/report.hpp"
#include "tiers/io.hpp"
#include "tiers/lag.hpp"
#include "tiers/merge.hpp"

namespace tiers {
namespace {

// A number as written: 0.5, not 0.500000.
std::string shortest(double v) {
  char buf[32];
  return {buf, std::to_chars(buf, buf + sizeof buf, v).ptr};
}

using detail::quote_name;

class merger {
 public:
  merger(std::vector<merge_input> inputs, const merge_plan& plan, merge_result& out)
      : inputs_(std::move(inputs)), plan_(plan), out_(out) {}

  void run() {
    join_media();
    if (!out_.ok()) return;
    join_metadata();
    name_tiers();
    if (!out_.ok()) return;
    for (const shift_step& s : plan_.shifts)
      shift(s);
    for (const combine_step& c : plan_.combine)
      combine(c);
    std::string files;
    for (const merge_input& in : inputs_)
      files += (files.empty() ? "" : "\n") + in.file;
    out_.value.metadata["merge:inputs"] = files;
    out_.value.metadata["merge:plan"] = plan_json(plan_);
  }

 private:
  void report(severity level, std::string code, std::string message) {
    diagnostic d;
    d.level = level;
    d.code = std::move(code);
    d.message = std::move(message);
    out_.diagnostics.push_back(std::move(d));
  }
  std::string stem(const merge_input& in) const { return name_from_path(in.file); }

  void join_media() {
    media_info& m = out_.value.media;
    const merge_input* uri_from = nullptr;
    for (const merge_input& in : inputs_) {
      const media_info& x = in.doc.media;
      if (x.uri) {
        if (m.uri && *m.uri != *x.uri)
          report(severity::error, "merge.media",
                 in.file + " describes " + quote_name(*x.uri) + ", but " + uri_from->file +
                     " describes " + quote_name(*m.uri) + ": not the same recording");
        if (!m.uri) {
          m.uri = x.uri;
          uri_from = &in;
        }
      }
      if (x.duration && m.duration && *x.duration != *m.duration)
        report(severity::warning, "merge.media",
               in.file + " gives the media a duration of " + format_clock(*x.duration) +
                   ", another input " + format_clock(*m.duration) + "; the first is kept");
      if (x.frame_rate && m.frame_rate && *x.frame_rate != *m.frame_rate)
        report(severity::warning, "merge.media",
               in.file + " gives the media a frame rate of " + format_rational(*x.frame_rate) +
                   ", another input " + format_rational(*m.frame_rate) + "; the first is kept");
      if (!m.duration) m.duration = x.duration;
      if (!m.frame_rate) m.frame_rate = x.frame_rate;
    }
  }

  void join_metadata() {
    for (const merge_input& in : inputs_)
      for (const auto& [key, value] : in.doc.metadata) {
        auto [it, added] = out_.value.metadata.emplace(key, value);
        if (added || it->second == value) continue;
        // Different values of one key: the later one is kept under its file's name.
        out_.value.metadata[stem(in) + ":" + key] = value;
      }
  }

  std::string prefix_of(const merge_input& in, const tier& t) const {
    if (plan_.clash == clash_rule::prefix_file) return stem(in);
    if (t.source && t.source->agent) return *t.source->agent;
    // A tier without a source is named after its file: "unknown" would tell nothing apart.
    return t.source ? std::string(to_string(t.source->kind)) : stem(in);
  }

  void name_tiers() {
    std::map<std::string, std::size_t> count;
    for (const merge_input& in : inputs_) {
      std::set<std::string> once;  // a name repeated inside one file is that file's business
      for (const tier& t : in.doc.tiers)
        if (once.insert(t.name).second) ++count[t.name];
    }
    std::vector<std::string> clashes;
    for (const auto& [name, n] : count)
      if (n > 1) clashes.push_back(quote_name(name));
    if (!clashes.empty() && plan_.clash == clash_rule::fail) {
      std::string list;
      for (const std::string& c : clashes)
        list += (list.empty() ? "" : ", ") + c;
      report(severity::error, "merge.clash",
             "more than one input has the tiers " + list +
                 "; choose how to keep them apart: --clash prefix-file or prefix-source");
      return;
    }
    for (merge_input& in : inputs_) {
      std::map<std::string, std::string> renamed;
      for (tier& t : in.doc.tiers) {
        if (count[t.name] < 2) continue;
        const std::string name = prefix_of(in, t) + ":" + t.name;
        renamed[t.name] = name;
        report(severity::note, "merge.rename",
               "tier " + quote_name(t.name) + " of " + in.file + " is now " + quote_name(name));
        t.name = name;
      }
      // Parents within the file follow their renamed tiers.
      for (tier& t : in.doc.tiers)
        if (t.parent)
          if (auto it = renamed.find(t.parent->tier); it != renamed.end())
            t.parent->tier = it->second;
    }
    // Renamed tiers can still meet (two files with one stem, two tiers of one agent).
    std::map<std::string, std::size_t> owner;
    for (std::size_t k = 0; k < inputs_.size(); ++k)
      for (const tier& t : inputs_[k].doc.tiers)
        if (auto [it, added] = owner.emplace(t.name, k); !added && it->second != k) {
          report(severity::error, "merge.clash",
                 "two inputs still have a tier " + quote_name(t.name) +
                     " after renaming; use the other clash rule");
          return;
        }
    for (merge_input& in : inputs_)
      for (tier& t : in.doc.tiers)
        out_.value.tiers.push_back(std::move(t));
  }

  tier* find(std::string_view name, std::string_view role) {
    if (tier* t = find_tier(out_.value, name)) return t;
    report(severity::error, "merge.tier",
           "no tier " + quote_name(name) + " to " + std::string(role) +
               " (tiers: " + tier_names(out_.value) + ")");
    return nullptr;
  }

  void shift(const shift_step& s) {
    tier* t = find(s.tier, "shift");
    if (!t) return;
    time_ns by = s.by.value_or(0);
    std::string how = "by " + format_seconds(by) + " s";
    if (s.align_to) {
      const tier* ref = find(*s.align_to, "align to");
      if (!ref) return;
      const auto e = estimate_offset(*t, *ref, s.max_offset);
      if (!e) {
        report(severity::error, "merge.shift",
               "cannot estimate the offset of " + quote_name(t->name) + " against " +
                   quote_name(ref->name) + ": no annotations within " +
                   format_seconds(s.max_offset) + " s of one another");
        return;
      }
      by = e->offset;
      how = "by " + format_seconds(by) + " s, estimated against " + quote_name(ref->name) +
            " from " + std::to_string(e->pairs) + " pairs" +
            (e->by_label ? "" : " (labels ignored: none shared)") + ", spread " +
            format_seconds(e->spread) + " s";
    }
    for (annotation& a : t->annotations) {
      if (__builtin_add_overflow(a.start, by, &a.start) ||
          __builtin_add_overflow(a.end, by, &a.end)) {
        report(severity::error, "time.range",
               "shifting " + quote_name(t->name) + " " + how + " takes a time out of range");
        return;
      }
    }
    out_.value.metadata["merge:shift:" + t->name] = how;
    report(severity::note, "merge.shift", "tier " + quote_name(t->name) + " shifted " + how);
  }

  void combine(combine_step c) {
    const tier* h = find(c.human, "combine as the human tier");
    const tier* m = find(c.machine, "combine as the machine tier");
    if (!h || !m) return;
    if (c.confidence_from_estimate && !threshold_from_estimate(*m, c)) return;
    for (const tier* t : {h, m})
      if (t->kind != tier_kind::interval) {
        report(severity::error, "merge.combine",
               quote_name(t->name) + " is an instant tier; combining needs interval tiers");
        return;
      }
    for (const std::string* name : {&c.into, c.review ? &*c.review : nullptr})
      if (name && find_tier(out_.value, *name)) {
        report(severity::error, "merge.combine",
               "a tier " + quote_name(*name) + " exists already; name the combined tier anew");
        return;
      }
    combined_tiers r = combine_tiers(*h, *m, c);
    using detail::plural;
    report(severity::note, "merge.combine",
           quote_name(c.into) + ": " +
               plural(h->annotations.size(), "human annotation", "human annotations") + ", " +
               plural(r.machine_kept, "machine annotation", "machine annotations") + " whole, " +
               plural(r.machine_trimmed, "trimmed piece", "trimmed pieces") +
               "; left out: " + std::to_string(r.below_confidence) + " below confidence " +
               shortest(c.min_confidence) + ", " + std::to_string(r.covered) +
               " covered by human annotations, " + plural(r.too_short, "piece", "pieces") +
               " shorter than " + format_seconds(c.min_duration) + " s" +
               (r.review
                    ? "; " + plural(r.review->annotations.size(), "disagreement", "disagreements") +
                          " in " + quote_name(r.review->name) +
                          (c.review_min > 0
                               ? " (" + std::to_string(r.review_short) + " shorter than " +
                                     format_seconds(c.review_min) + " s left out)"
                               : "")
                    : ""));
    out_.value.tiers.push_back(std::move(r.merged));
    if (r.review) out_.value.tiers.push_back(std::move(*r.review));
  }

  // The threshold `tiers estimate --target-precision P --annotate` recommended for the tier.
  bool threshold_from_estimate(const tier& m, combine_step& c) {
    const auto at = m.attributes.find("precision_threshold");
    double v = 0;
    if (at == m.attributes.end()) {
      const bool estimated = m.attributes.count("precision") > 0;
      report(severity::error, "merge.combine",
             quote_name(m.name) +
                 (estimated ? " has a precision estimate but no threshold"
                            : " holds no precision estimate") +
                 ": run tiers estimate SHEET --target-precision P --annotate on it first, or "
                 "give --min-confidence a number");
      return false;
    }
    const auto [end, ec] =
        std::from_chars(at->second.data(), at->second.data() + at->second.size(), v);
    if (ec != std::errc() || end != at->second.data() + at->second.size() || !(v >= 0 && v <= 1)) {
      report(severity::error, "merge.combine",
             quote_name(m.name) + "'s precision_threshold '" + at->second +
                 "' is not a confidence from 0 to 1");
      return false;
    }
    c.min_confidence = v;
    const auto target = m.attributes.find("precision_target");
    report(severity::note, "merge.combine",
           "min confidence " + shortest(v) + " for " + quote_name(m.name) + ", from its estimate" +
               (target != m.attributes.end() ? " (target precision " + target->second + ")" : ""));
    return true;
  }

  std::vector<merge_input> inputs_;
  const merge_plan& plan_;
  merge_result& out_;
};

}  // namespace

std::optional<offset_estimate> estimate_offset(const tier& moving, const tier& reference,
                                               time_ns max_offset) {
  std::vector<const annotation*> refs;
  for (const annotation& a : reference.annotations)
    refs.push_back(&a);
  std::stable_sort(refs.begin(), refs.end(),
                   [](const annotation* a, const annotation* b) { return a->start < b->start; });
  auto differences = [&](bool by_label) {
    std::vector<time_ns> d;
    for (const annotation& a : moving.annotations) {
      auto lo = std::lower_bound(refs.begin(), refs.end(),
                                 detail::saturating_difference(a.start, max_offset),
                                 [](const annotation* r, time_ns t) { return r->start < t; });
      std::optional<time_ns> best;
      for (auto it = lo;
           it != refs.end() && (*it)->start <= detail::saturating_add(a.start, max_offset); ++it)
        if (!by_label || (*it)->text == a.text) {
          const time_ns diff = detail::saturating_difference((*it)->start, a.start);
          if (!best || std::abs(diff) < std::abs(*best)) best = diff;
        }
      if (best) d.push_back(*best);
    }
    return d;
  };
  offset_estimate e;
  std::vector<time_ns> d = differences(true);
  if (d.empty()) {
    d = differences(false);
    e.by_label = false;
  }
  if (d.empty()) return std::nullopt;
  e.pairs = d.size();
  e.offset = quantile(d, 0.5);
  std::vector<time_ns> deviations;
  for (time_ns x : d)
    deviations.push_back(std::abs(x - e.offset));
  e.spread = quantile(deviations, 0.5);
  return e;
}

merge_result merge_documents(std::vector<merge_input> inputs, const merge_plan& plan) {
  merge_result out;
  merger(std::move(inputs), plan, out).run();
  return out;
}

}  // namespace tiers
