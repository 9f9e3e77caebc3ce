// Drawing the review sample: strata, their shares of n, and a simple random sample of each
// that does not depend on the order the inputs are read in (docs/review.md).
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <map>
#include <numeric>
#include <unordered_map>

#include "detail/hash.hpp"
#include "detail/random.hpp"
#include "tiers/review.hpp"

namespace tiers {
namespace {

namespace fs = std::filesystem;

bool has_scheme(std::string_view uri) {
  const std::size_t colon = uri.find(':');
  if (colon == std::string_view::npos || colon == 0) return false;
  if (!std::isalpha(static_cast<unsigned char>(uri[0]))) return false;
  return std::all_of(uri.begin(), uri.begin() + static_cast<std::ptrdiff_t>(colon), [](char c) {
    return std::isalnum(static_cast<unsigned char>(c)) || c == '+' || c == '-' || c == '.';
  });
}

// A path segment as a URI path segment (RFC 3986: unreserved characters and sub-delimiters
// kept, everything else as %XX of its UTF-8 bytes).
std::string encode_segment(std::string_view segment) {
  std::string out;
  for (unsigned char c : segment) {
    if (std::isalnum(c) ||
        std::string_view("-._~!$&'()*+,;=:@").find(static_cast<char>(c)) != std::string_view::npos)
      out += static_cast<char>(c);
    else
      out += fmt::format("%{:02X}", c);
  }
  return out;
}

// The band of a confidence: 0 for below the first limit, …, bands.size() for the last band,
// bands.size() + 1 for no confidence at all.
std::size_t band_of(const std::vector<double>& bands, std::optional<double> confidence) {
  if (!confidence) return bands.size() + 1;
  return static_cast<std::size_t>(std::upper_bound(bands.begin(), bands.end(), *confidence) -
                                  bands.begin());
}

}  // namespace

std::string confidence_band(const std::vector<double>& bands, std::optional<double> confidence) {
  if (!confidence) return "no confidence";
  const std::size_t at = band_of(bands, confidence);
  const double low = at == 0 ? 0 : bands[at - 1];
  if (at == bands.size()) return fmt::format("[{},1]", low);
  return fmt::format("[{},{})", low, bands[at]);
}

std::string media_from(std::string_view uri, const std::string& document_path,
                       const std::string& folder) {
  if (uri.empty() || has_scheme(uri) || uri.front() == '/') return std::string(uri);
  // Lexically, as the user named the paths: links are not followed, so that a link into a
  // corpus gives links through it rather than to wherever it points.
  auto resolved = [](fs::path p) {
    if (p.empty()) p = ".";
    std::error_code ec;
    fs::path out = fs::absolute(p, ec);
    return (ec ? p : out).lexically_normal();
  };
  const fs::path from = resolved(folder);
  const fs::path doc_folder = resolved(fs::path(document_path).parent_path());
  const fs::path rel = doc_folder.lexically_relative(from);
  std::string out;
  if (rel.empty()) {
    // No relative way (another drive, say): the document's folder as a file URI path.
    for (const fs::path& part : doc_folder.relative_path())
      out += "/" + encode_segment(part.string());
    return "file://" + out + "/" + std::string(uri);
  }
  for (const fs::path& part : rel)
    if (!part.empty() && part != ".") out += encode_segment(part.string()) + "/";
  return out + std::string(uri);
}

std::string media_fragment(std::string_view uri, time_ns start, time_ns end, time_ns context) {
  const time_ns from = std::max<time_ns>(0, start - context);
  const time_ns to = std::max(from, end + context);
  std::string base(uri.substr(0, uri.find('#')));  // a fragment of its own is replaced
  return base + "#t=" + format_seconds(from) + "," + format_seconds(to);
}

std::vector<std::uint64_t> allocate(std::uint64_t n, const std::vector<std::uint64_t>& sizes,
                                    const std::vector<double>& weights, std::uint64_t floor) {
  const std::size_t h = sizes.size();
  const std::uint64_t total =
      std::min<std::uint64_t>(n, std::accumulate(sizes.begin(), sizes.end(), std::uint64_t{0}));
  std::vector<double> floors(h, 0);
  std::uint64_t floor_sum = 0;
  for (std::size_t k = 0; k < h; ++k)
    floor_sum += std::min(floor, sizes[k]);
  if (floor_sum <= total)
    for (std::size_t k = 0; k < h; ++k)
      floors[k] = static_cast<double>(std::min(floor, sizes[k]));
  // x_h(λ) = min(N_h, max(floor_h, λ w_h)) grows with λ: find the λ whose shares add up to n.
  auto share = [&](double lambda, std::size_t k) {
    return std::min(static_cast<double>(sizes[k]), std::max(floors[k], lambda * weights[k]));
  };
  auto sum = [&](double lambda) {
    double s = 0;
    for (std::size_t k = 0; k < h; ++k)
      s += share(lambda, k);
    return s;
  };
  double low = 0, high = 1;
  while (sum(high) < static_cast<double>(total) && high < 1e300)
    high *= 2;
  for (int k = 0; k < 200; ++k) {
    const double mid = low + (high - low) / 2;
    (sum(mid) < static_cast<double>(total) ? low : high) = mid;
  }
  std::vector<std::uint64_t> out(h);
  std::vector<double> exact(h);
  std::uint64_t given = 0;
  for (std::size_t k = 0; k < h; ++k) {
    exact[k] = share(high, k);
    out[k] = std::min(sizes[k], static_cast<std::uint64_t>(std::floor(exact[k] + 1e-9)));
    given += out[k];
  }
  // What rounding down left over goes to the largest remainders (the first stratum on a tie).
  while (given < total) {
    std::size_t best = h;
    for (std::size_t k = 0; k < h; ++k)
      if (out[k] < sizes[k] && (best == h || exact[k] - static_cast<double>(out[k]) >
                                                 exact[best] - static_cast<double>(out[best])))
        best = k;
    ++out[best];
    ++given;
  }
  while (given > total) {  // only by a floating-point hair: from the smallest remainders
    std::size_t worst = h;
    for (std::size_t k = 0; k < h; ++k)
      if (out[k] > static_cast<std::uint64_t>(floors[k]) &&
          (worst == h ||
           exact[k] - static_cast<double>(out[k]) < exact[worst] - static_cast<double>(out[worst])))
        worst = k;
    --out[worst];
    --given;
  }
  return out;
}

// By key; two equal keys (a chance of about one in 2^64 a pair) by file and time, so that the
// order never depends on the order of reading.
bool sampler::before(const kept& a, const kept& b) const {
  if (a.key != b.key) return a.key < b.key;
  return std::tie(sources_[a.source].file, a.start, a.end) <
         std::tie(sources_[b.source].file, b.start, b.end);
}

void sampler::keep(stratum& s, kept&& k) const {
  auto larger = [this](const kept& a, const kept& b) { return before(a, b); };
  if (s.smallest.size() < options_.n) {
    s.smallest.push_back(std::move(k));
    std::push_heap(s.smallest.begin(), s.smallest.end(), larger);
  } else if (!s.smallest.empty() && larger(k, s.smallest.front())) {
    std::pop_heap(s.smallest.begin(), s.smallest.end(), larger);
    s.smallest.back() = std::move(k);
    std::push_heap(s.smallest.begin(), s.smallest.end(), larger);
  }
}

sampler::stratum& sampler::stratum_named(std::size_t rank, std::string name) {
  auto it = strata_.find(std::pair(rank, name));
  if (it == strata_.end()) it = strata_.emplace(std::pair(rank, std::move(name)), stratum{}).first;
  it->second.name = &it->first.second;
  return it->second;
}

void sampler::add(const std::string& file, const tier& t, const media_place& media) {
  // The strata met in this file, looked up once each: a band by its index, a label by its text
  // (a view into the tier, which outlives the call).
  std::vector<stratum*> bands(options_.bands.size() + 2, nullptr);
  std::unordered_map<std::string_view, stratum*> labels;
  stratum* whole = nullptr;
  auto stratum_of = [&](const annotation& a) -> stratum& {
    switch (options_.by) {
      case stratify_by::confidence: {
        const std::size_t band = band_of(options_.bands, a.confidence);
        stratum*& s = bands[band];
        if (!s) s = &stratum_named(band, confidence_band(options_.bands, a.confidence));
        return *s;
      }
      case stratify_by::label: {
        stratum*& s = labels[a.text];
        if (!s) s = &stratum_named(0, a.text);
        return *s;
      }
      case stratify_by::file:
      case stratify_by::none:
        break;
    }
    if (!whole) whole = &stratum_named(0, options_.by == stratify_by::file ? file : "all");
    return *whole;
  };
  // The file's own sequence of keys: the k-th annotation's is the k-th number of SplitMix64
  // from a start made of the seed and the file's name.
  std::uint64_t start = options_.seed ^ detail::fnv1a64(file);
  const std::uint64_t base = detail::splitmix(start);
  const auto from = static_cast<std::uint32_t>(sources_.size());
  sources_.push_back({file, t.name, media, options_.context});
  for (std::size_t k = 0; k < t.annotations.size(); ++k) {
    const annotation& a = t.annotations[k];
    std::uint64_t state = base + k * 0x9e3779b97f4a7c15ULL;
    const std::uint64_t key = detail::splitmix(state);
    stratum& s = stratum_of(a);
    ++s.size;
    if (options_.n == 0 || (s.smallest.size() == options_.n && key > s.smallest.front().key))
      continue;  // cannot be drawn: spare building its row
    keep(s, {key, from, a.start, a.end, a.text, a.confidence});
  }
}

void sampler::add(sampler&& other) {
  const auto offset = static_cast<std::uint32_t>(sources_.size());
  for (source& f : other.sources_)
    sources_.push_back(std::move(f));
  for (auto& [where, theirs] : other.strata_) {
    stratum& s = stratum_named(where.first, where.second);
    s.size += theirs.size;
    for (kept& k : theirs.smallest) {
      k.source += offset;
      keep(s, std::move(k));
    }
  }
}

std::uint64_t sampler::population() const {
  std::uint64_t n = 0;
  for (const auto& [where, s] : strata_)
    n += s.size;
  return n;
}

std::vector<stratum_count> sampler::strata() const {
  std::vector<std::uint64_t> sizes;
  std::vector<double> weights;
  for (const auto& [where, s] : strata_) {
    sizes.push_back(s.size);
    weights.push_back(options_.share == allocation::equal ? 1.0 : static_cast<double>(s.size));
  }
  const std::vector<std::uint64_t> drawn = allocate(options_.n, sizes, weights, 2);
  std::vector<stratum_count> out;
  std::size_t k = 0;
  for (const auto& [where, s] : strata_)
    out.push_back({where.second, s.size, drawn[k++]});
  return out;
}

std::vector<sample_row> sampler::draw() const {
  const std::vector<stratum_count> counts = strata();
  struct chosen {
    const kept* k;
    const stratum_count* stratum;
  };
  std::vector<chosen> all;
  std::size_t h = 0;
  auto by_key = [this](const kept* a, const kept* b) { return before(*a, *b); };
  for (const auto& [where, s] : strata_) {
    std::vector<const kept*> smallest;
    for (const kept& k : s.smallest)
      smallest.push_back(&k);
    std::sort(smallest.begin(), smallest.end(), by_key);
    const stratum_count& c = counts[h++];
    smallest.resize(std::min<std::size_t>(smallest.size(), c.drawn));
    for (const kept* k : smallest)
      all.push_back({k, &c});
  }
  // In the order of their keys, the strata come interleaved at random: a review stopped half
  // way has looked at a random half of every stratum, not at the first strata only.
  std::sort(all.begin(), all.end(),
            [&](const chosen& a, const chosen& b) { return by_key(a.k, b.k); });
  std::vector<sample_row> out;
  out.reserve(all.size());
  for (const chosen& c : all) {
    const kept& k = *c.k;
    const source& from = sources_[k.source];
    sample_row r;
    r.sample_id = out.size() + 1;
    r.file = from.file;
    r.tier = from.tier;
    r.start = k.start;
    r.end = k.end;
    r.label = k.label;
    r.confidence = k.confidence;
    r.stratum = c.stratum->name;
    r.stratum_size = c.stratum->size;
    r.weight = static_cast<double>(c.stratum->size) / static_cast<double>(c.stratum->drawn);
    r.link = media_fragment(from.media.from_sheet, k.start, k.end, from.context);
    r.media = media_fragment(from.media.from_page, k.start, k.end, from.context);
    out.push_back(std::move(r));
  }
  return out;
}

}  // namespace tiers
