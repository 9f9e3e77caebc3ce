// Counting co-occurrences of tier A's annotations with tier B's labels, recording by recording,
// and the table of every pair with its statistics.
#include <algorithm>
#include <cmath>
#include <numeric>

#include "detail/json_text.hpp"
#include "spans.hpp"
#include "tiers/cooccur.hpp"
#include "tiers/text.hpp"

namespace tiers {
namespace {

std::uint64_t key(std::uint32_t x, std::uint32_t y) {
  return (static_cast<std::uint64_t>(x) << 32) | y;
}

}  // namespace

namespace detail {
std::vector<std::string> counted_labels(const cooccur_options& o) {
  std::vector<std::string> wanted;
  for (const std::string& l : o.b_labels)
    wanted.push_back(o.fold_case ? fold_case(l) : l);
  std::sort(wanted.begin(), wanted.end());
  return wanted;
}
}  // namespace detail

std::uint32_t cooccur_counts::id_in(label_index& index, std::vector<std::string>& labels,
                                    std::vector<std::uint64_t>& totals, std::string_view label) {
  if (const auto it = index.find(label); it != index.end()) return it->second;
  const auto id = static_cast<std::uint32_t>(labels.size());
  index.emplace(std::string(label), id);
  labels.emplace_back(label);
  totals.push_back(0);
  return id;
}

void cooccur_counts::add(const tier& a, const tier& b, const cooccur_options& o) {
  const std::vector<std::string> wanted = detail::counted_labels(o);
  std::vector<detail::b_span> bs =
      detail::b_spans(b, o.window, [&](const std::string& text, std::uint32_t& id) {
        std::string l = o.fold_case ? fold_case(text) : text;
        if (!wanted.empty() && !std::binary_search(wanted.begin(), wanted.end(), l)) return false;
        id = b_id(l);
        return true;
      });
  std::vector<detail::a_item> as;
  for (const annotation& x : a.annotations)
    if (x.end >= x.start)
      as.push_back({x.start, x.end, o.fold_case ? a_id(fold_case(x.text)) : a_id(x.text)});
  detail::each_cooccurrence(as, bs, o.relation,
                            [&](std::size_t k, const std::vector<std::uint32_t>& found) {
                              ++n_;
                              ++a_totals_[as[k].label];
                              for (const std::uint32_t y : found) {
                                ++b_totals_[y];
                                ++pairs_[key(as[k].label, y)];
                              }
                            });
}

void cooccur_counts::add(const cooccur_counts& other) {
  n_ += other.n_;
  for (std::size_t x = 0; x < other.a_labels_.size(); ++x)
    a_totals_[a_id(other.a_labels_[x])] += other.a_totals_[x];
  for (std::size_t y = 0; y < other.b_labels_.size(); ++y)
    b_totals_[b_id(other.b_labels_[y])] += other.b_totals_[y];
  for (const auto& [k, count] : other.pairs_)
    pairs_[key(a_id(other.a_labels_[k >> 32]), b_id(other.b_labels_[k & 0xffffffffu]))] += count;
}

void cooccur_counts::add_raw(const std::string& a_label, const std::string& b_label,
                             std::uint64_t count) {
  pairs_[key(a_id(a_label), b_id(b_label))] += count;
}
void cooccur_counts::add_a_total(const std::string& a_label, std::uint64_t count) {
  a_totals_[a_id(a_label)] += count;
}
void cooccur_counts::add_b_total(const std::string& b_label, std::uint64_t count) {
  b_totals_[b_id(b_label)] += count;
}

std::vector<pair_statistics> cooccur_table(const cooccur_counts& c, std::uint64_t min_count,
                                           cooccur_sort sort) {
  std::vector<pair_statistics> out;
  for (const auto& [k, count] : c.pairs()) {
    if (count < std::max<std::uint64_t>(1, min_count)) continue;
    const std::uint32_t x = static_cast<std::uint32_t>(k >> 32), y = static_cast<std::uint32_t>(k);
    pair_statistics s = table_statistics(count, c.a_totals()[x], c.b_totals()[y], c.n());
    s.a = c.a_labels()[x];
    s.b = c.b_labels()[y];
    out.push_back(std::move(s));
  }
  std::vector<double> p(out.size());
  for (std::size_t k = 0; k < out.size(); ++k)
    p[k] = out[k].fisher_p;
  const std::vector<double> adjusted = benjamini_hochberg(p);
  for (std::size_t k = 0; k < out.size(); ++k)
    out[k].p_adjusted = adjusted[k];
  auto strength = [&](const pair_statistics& s) -> double {
    switch (sort) {
      case cooccur_sort::count:
        return static_cast<double>(s.count);
      case cooccur_sort::g2:
        return s.g2;
      case cooccur_sort::fisher:
        return -s.fisher_p;
      case cooccur_sort::log_odds:
        return s.log_odds;
      case cooccur_sort::pmi:
        return s.pmi;
    }
    return s.g2;
  };
  std::sort(out.begin(), out.end(), [&](const pair_statistics& a, const pair_statistics& b) {
    const double x = strength(a), y = strength(b);
    if (x != y) return x > y;
    return std::tie(a.a, a.b) < std::tie(b.a, b.b);
  });
  return out;
}

void write_cooccur_json(const std::vector<pair_statistics>& table, std::uint64_t n,
                        const std::string& a_tier, const std::string& b_tier,
                        const cooccur_options& o, byte_sink& out) {
  detail::json_writer j(out);
  j.begin_object(true);
  j.count("n", n);
  j.string("a_tier", a_tier);
  j.string("b_tier", b_tier);
  j.string("relation", name_of(cooccur_relation_names, o.relation));
  j.seconds("window", o.window);
  j.key("pairs").begin_array(true);
  for (const pair_statistics& s : table) {
    j.begin_object();
    j.string("a", s.a);
    j.string("b", s.b);
    j.count("count", s.count);
    j.count("a_total", s.a_total);
    j.count("b_total", s.b_total);
    j.number("expected", s.expected);
    j.number("ratio", s.ratio);
    j.number("g2", s.g2);
    j.number("fisher_p", s.fisher_p);
    j.number("fisher_p_greater", s.fisher_p_greater);
    j.number("log_odds", s.log_odds);
    j.number("log_odds_low", s.log_odds_low);
    j.number("log_odds_high", s.log_odds_high);
    j.number("pmi", s.pmi);
    j.number("p_adjusted", s.p_adjusted);
    j.maybe_number("perm_p", s.perm_p);
    j.end_object();
  }
  j.end_array();
  j.end_object();
  out.put('\n');
}

}  // namespace tiers
