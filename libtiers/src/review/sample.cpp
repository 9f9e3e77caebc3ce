// Drawing the review sample: strata, their shares of n, and a simple random sample of each
// that does not depend on the order the inputs are read in (docs/review.md).
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <map>
#include <numeric>

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

// Where a stratum sorts: confidence bands in their order, the rest by name.
using stratum_key = std::pair<std::size_t, std::string>;

stratum_key stratum_of(const sample_options& o, const std::string& file, const annotation& a) {
  switch (o.by) {
    case stratify_by::confidence: {
      const auto band = a.confidence
                            ? static_cast<std::size_t>(
                                  std::upper_bound(o.bands.begin(), o.bands.end(), *a.confidence) -
                                  o.bands.begin())
                            : o.bands.size() + 1;
      return {band, confidence_band(o.bands, a.confidence)};
    }
    case stratify_by::label:
      return {0, a.text};
    case stratify_by::file:
      return {0, file};
    case stratify_by::none:
      break;
  }
  return {0, "all"};
}

bool before(std::uint64_t ka, const sample_row& a, std::uint64_t kb, const sample_row& b) {
  return std::tie(ka, a.file, a.start, a.end) < std::tie(kb, b.file, b.start, b.end);
}

}  // namespace

std::string confidence_band(const std::vector<double>& bands, std::optional<double> confidence) {
  if (!confidence) return "no confidence";
  const auto at = static_cast<std::size_t>(
      std::upper_bound(bands.begin(), bands.end(), *confidence) - bands.begin());
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

void sampler::keep(stratum& s, kept&& k) const {
  auto larger = [](const kept& a, const kept& b) { return before(a.key, a.row, b.key, b.row); };
  if (s.smallest.size() < options_.n) {
    s.smallest.push_back(std::move(k));
    std::push_heap(s.smallest.begin(), s.smallest.end(), larger);
  } else if (!s.smallest.empty() && larger(k, s.smallest.front())) {
    std::pop_heap(s.smallest.begin(), s.smallest.end(), larger);
    s.smallest.back() = std::move(k);
    std::push_heap(s.smallest.begin(), s.smallest.end(), larger);
  }
}

void sampler::add(const std::string& file, const tier& t, const media_place& media) {
  // The file's own sequence of keys: the k-th annotation's is the k-th number of SplitMix64
  // from a start made of the seed and the file's name.
  std::uint64_t start = options_.seed ^ detail::fnv1a64(file);
  const std::uint64_t base = detail::splitmix(start);
  for (std::size_t k = 0; k < t.annotations.size(); ++k) {
    const annotation& a = t.annotations[k];
    std::uint64_t state = base + k * 0x9e3779b97f4a7c15ULL;
    const std::uint64_t key = detail::splitmix(state);
    stratum_key where = stratum_of(options_, file, a);
    auto it = strata_.find(where);
    if (it == strata_.end()) it = strata_.emplace(std::move(where), stratum{}).first;
    stratum& s = it->second;
    ++s.size;
    if (options_.n == 0 || (s.smallest.size() == options_.n && key > s.smallest.front().key))
      continue;  // cannot be drawn: spare building its row
    kept row{key, {}};
    row.row.file = file;
    row.row.tier = t.name;
    row.row.start = a.start;
    row.row.end = a.end;
    row.row.label = a.text;
    row.row.confidence = a.confidence;
    row.row.stratum = it->first.second;
    row.row.link = media_fragment(media.from_sheet, a.start, a.end, options_.context);
    row.row.media = media_fragment(media.from_page, a.start, a.end, options_.context);
    keep(s, std::move(row));
  }
}

void sampler::add(sampler&& other) {
  for (auto& [where, theirs] : other.strata_) {
    stratum& s = strata_[where];
    s.size += theirs.size;
    for (kept& k : theirs.smallest)
      keep(s, std::move(k));
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
  std::vector<kept> all;
  std::size_t h = 0;
  for (const auto& [where, s] : strata_) {
    std::vector<kept> smallest = s.smallest;
    std::sort(smallest.begin(), smallest.end(),
              [](const kept& a, const kept& b) { return before(a.key, a.row, b.key, b.row); });
    const stratum_count& c = counts[h++];
    smallest.resize(std::min<std::size_t>(smallest.size(), c.drawn));
    for (kept& k : smallest) {
      k.row.stratum_size = c.size;
      k.row.weight = static_cast<double>(c.size) / static_cast<double>(c.drawn);
      all.push_back(std::move(k));
    }
  }
  // In the order of their keys, the strata come interleaved at random: a review stopped half
  // way has looked at a random half of every stratum, not at the first strata only.
  std::sort(all.begin(), all.end(),
            [](const kept& a, const kept& b) { return before(a.key, a.row, b.key, b.row); });
  std::vector<sample_row> out;
  out.reserve(all.size());
  for (kept& k : all) {
    k.row.sample_id = out.size() + 1;
    out.push_back(std::move(k.row));
  }
  return out;
}

}  // namespace tiers
