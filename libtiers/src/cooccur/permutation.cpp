// The permutation test of co-occurrence: tier B shifted circularly within each recording.
#include <map>
#include <string_view>
#include <unordered_map>

#include "detail/hash.hpp"
#include "detail/random.hpp"
#include "spans.hpp"
#include "tiers/cooccur.hpp"
#include "tiers/text.hpp"

namespace tiers {

time_ns latest_end(const tier& a, const tier& b) {
  time_ns end = 0;
  for (const tier* t : {&a, &b})
    for (const annotation& x : t->annotations)
      end = std::max({end, x.end, x.start});
  return end;
}

permutation_counts count_permutations(const std::vector<label_pair>& pairs,
                                      const std::vector<cooccur_recording>& recordings,
                                      std::uint32_t permutations, std::uint64_t seed) {
  permutation_counts out;
  out.permutations = permutations;
  out.seed = seed;
  out.pairs = pairs;
  // The pairs, by label ids of their own.
  std::unordered_map<std::string, std::uint32_t> a_ids, b_ids;
  std::unordered_map<std::uint64_t, std::size_t> row;  // a·2³² + b → row
  for (std::size_t k = 0; k < pairs.size(); ++k) {
    const auto a =
        a_ids.try_emplace(pairs[k].first, static_cast<std::uint32_t>(a_ids.size())).first;
    const auto b =
        b_ids.try_emplace(pairs[k].second, static_cast<std::uint32_t>(b_ids.size())).first;
    row[(static_cast<std::uint64_t>(a->second) << 32) | b->second] = k;
  }
  std::vector<std::uint64_t> shifted(pairs.size() * permutations, 0);  // [row][permutation]
  for (const cooccur_recording& r : recordings) {
    const cooccur_options& o = r.options;
    auto fold = [&](const std::string& s) { return o.fold_case ? fold_case(s) : s; };
    std::vector<detail::a_item> as;
    for (const annotation& x : r.a->annotations) {
      if (x.end < x.start) continue;
      const auto it = a_ids.find(fold(x.text));
      if (it != a_ids.end()) as.push_back({x.start, x.end, it->second});
    }
    const std::vector<std::string> wanted = detail::counted_labels(o);
    const std::vector<detail::b_span> bs =
        detail::b_spans(*r.b, o.window, [&](const std::string& text, std::uint32_t& id) {
          const std::string l = fold(text);
          if (!wanted.empty() && !std::binary_search(wanted.begin(), wanted.end(), l)) return false;
          const auto it = b_ids.find(l);
          if (it == b_ids.end()) return false;
          id = it->second;
          return true;
        });
    if (as.empty() || bs.empty() || r.length <= 0) continue;
    std::uint64_t state = seed ^ detail::fnv1a64(r.name);
    std::vector<detail::b_span> moved;
    for (std::uint32_t p = 0; p < permutations; ++p) {
      const time_ns offset =
          static_cast<time_ns>(detail::uniform_below(state, static_cast<std::uint64_t>(r.length)));
      moved.clear();
      for (const detail::b_span& s : bs) {
        // Shifted by the offset; a span that passes the end goes on from the start.
        const time_ns from = s.from + offset, to = s.to + offset;
        if (from >= r.length)
          moved.push_back({from - r.length, to - r.length, s.label, s.index});
        else if (to > r.length) {
          moved.push_back({from, r.length, s.label, s.index});
          moved.push_back({0, to - r.length, s.label, s.index});
        } else {
          moved.push_back({from, to, s.label, s.index});
        }
      }
      detail::each_cooccurrence(
          as, moved, o.relation, [&](std::size_t k, const std::vector<std::uint32_t>& found) {
            for (const std::uint32_t y : found) {
              const auto it = row.find((static_cast<std::uint64_t>(as[k].label) << 32) | y);
              if (it != row.end()) ++shifted[it->second * permutations + p];
            }
          });
    }
  }
  out.counts.resize(pairs.size());
  for (std::size_t k = 0; k < pairs.size(); ++k)
    out.counts[k].assign(shifted.begin() + static_cast<std::ptrdiff_t>(k * permutations),
                         shifted.begin() + static_cast<std::ptrdiff_t>((k + 1) * permutations));
  return out;
}

void permutation_counts::add(const permutation_counts& other) {
  for (std::size_t k = 0; k < counts.size() && k < other.counts.size(); ++k)
    for (std::size_t p = 0; p < counts[k].size() && p < other.counts[k].size(); ++p)
      counts[k][p] += other.counts[k][p];
}

void set_permutation_p(std::vector<pair_statistics>& table, const permutation_counts& c) {
  std::map<label_pair, std::size_t> row;
  for (std::size_t k = 0; k < c.pairs.size(); ++k)
    row.emplace(c.pairs[k], k);
  for (pair_statistics& s : table) {
    const auto it = row.find({s.a, s.b});
    if (it == row.end()) continue;
    std::uint64_t as_large = 0;
    for (const std::uint64_t shifted : c.counts[it->second])
      as_large += shifted >= s.count;
    s.perm_p = static_cast<double>(1 + as_large) / static_cast<double>(c.permutations + 1);
  }
}

void permutation_test(std::vector<pair_statistics>& table,
                      const std::vector<cooccur_recording>& recordings, std::uint32_t permutations,
                      std::uint64_t seed) {
  std::vector<label_pair> pairs;
  for (const pair_statistics& s : table)
    pairs.emplace_back(s.a, s.b);
  set_permutation_p(table, count_permutations(pairs, recordings, permutations, seed));
}

}  // namespace tiers
