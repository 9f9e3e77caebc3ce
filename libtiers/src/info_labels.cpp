// Label statistics over documents: count, total, mean and median duration, share of the
// tier's time and mean confidence, per tier and label.
#include <algorithm>

#include "detail/json_text.hpp"
#include "tiers/info.hpp"

namespace tiers {

label_tally::tier_data& label_tally::tier_named(const std::string& name,
                                                const std::string& source) {
  const auto [it, added] = index_.emplace(name + '\0' + source, tiers_.size());
  if (added) tiers_.push_back({name, source, {}, {}});
  return tiers_[it->second];
}

void label_tally::add(const document& doc) {
  ++documents_;
  for (const tier& t : doc.tiers) {
    tier_data& d = tier_named(t.name, t.source ? std::string(to_string(t.source->kind)) : "");
    for (const annotation& a : t.annotations) {
      const auto [it, added] = d.labels.try_emplace(a.text);
      if (added) d.order.push_back(a.text);
      label_data& l = it->second;
      l.durations.push_back(a.end - a.start);
      if (a.confidence) {
        l.confidence_sum += *a.confidence;
        ++l.with_confidence;
      }
    }
  }
}

void label_tally::add(const label_tally& other) {
  documents_ += other.documents_;
  for (const tier_data& o : other.tiers_) {
    tier_data& d = tier_named(o.name, o.source);
    for (const std::string& label : o.order) {
      const label_data& from = o.labels.at(label);
      const auto [it, added] = d.labels.try_emplace(label);
      if (added) d.order.push_back(label);
      label_data& l = it->second;
      l.durations.insert(l.durations.end(), from.durations.begin(), from.durations.end());
      l.confidence_sum += from.confidence_sum;
      l.with_confidence += from.with_confidence;
    }
  }
}

std::vector<label_statistics> label_tally::table() const {
  std::vector<label_statistics> out;
  for (const tier_data& t : tiers_) {
    time_ns tier_total = 0;
    for (const auto& [label, l] : t.labels)
      for (time_ns d : l.durations)
        tier_total += d;
    const std::size_t first = out.size();
    for (const std::string& label : t.order) {
      const label_data& l = t.labels.at(label);
      label_statistics s;
      s.tier = t.name;
      s.source = t.source;
      s.label = label;
      s.count = l.durations.size();
      for (time_ns d : l.durations)
        s.total += d;
      s.mean = static_cast<double>(s.total) / 1e9 / static_cast<double>(s.count);
      std::vector<time_ns> sorted = l.durations;
      const std::size_t mid = sorted.size() / 2;
      std::nth_element(sorted.begin(), sorted.begin() + static_cast<std::ptrdiff_t>(mid),
                       sorted.end());
      const time_ns upper = sorted[mid];
      if (sorted.size() % 2 == 1) {
        s.median = static_cast<double>(upper) / 1e9;
      } else {
        const time_ns lower =
            *std::max_element(sorted.begin(), sorted.begin() + static_cast<std::ptrdiff_t>(mid));
        s.median = (static_cast<double>(lower) + static_cast<double>(upper)) / 2e9;
      }
      if (tier_total > 0) s.share = static_cast<double>(s.total) / static_cast<double>(tier_total);
      s.with_confidence = l.with_confidence;
      if (l.with_confidence > 0)
        s.mean_confidence = l.confidence_sum / static_cast<double>(l.with_confidence);
      out.push_back(std::move(s));
    }
    std::stable_sort(out.begin() + static_cast<std::ptrdiff_t>(first), out.end(),
                     [](const label_statistics& a, const label_statistics& b) {
                       return a.count != b.count ? a.count > b.count : a.label < b.label;
                     });
  }
  return out;
}

void write_labels_json(const std::vector<label_statistics>& table, std::size_t documents,
                       byte_sink& out) {
  detail::json_writer j(out);
  j.begin_object(true);
  j.count("documents", documents);
  j.key("labels").begin_array(true);
  for (const label_statistics& s : table) {
    j.begin_object();
    j.string("tier", s.tier);
    if (s.source.empty())
      j.key("source").null();
    else
      j.string("source", s.source);
    j.string("label", s.label);
    j.count("count", s.count);
    j.seconds("total", s.total);
    j.number("mean", s.mean);
    j.number("median", s.median);
    j.maybe_number("share", s.share);
    j.maybe_number("mean_confidence", s.mean_confidence);
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.put('\n');
}

}  // namespace tiers
