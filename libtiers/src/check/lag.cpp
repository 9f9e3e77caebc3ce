// Banded alignment of caption words with timed words (see lag.hpp), and lag statistics.
#include "tiers/lag.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <numeric>
#include <string>
#include <unordered_map>

#include "detail/exact.hpp"
#include "tiers/text.hpp"

namespace tiers {
namespace {

using detail::saturating_add;

// Tokens become small integers, so that the inner loop compares numbers, not strings.
class interner {
 public:
  std::uint32_t operator()(std::string_view token) {
    if (auto it = ids_.find(token); it != ids_.end()) return it->second;
    const auto id = static_cast<std::uint32_t>(ids_.size());
    ids_.emplace(std::string(token), id);
    return id;
  }

 private:
  // Looked up by view: a token seen before (most are) costs no string.
  struct hash {
    using is_transparent = void;
    std::size_t operator()(std::string_view s) const { return std::hash<std::string_view>{}(s); }
  };
  std::unordered_map<std::string, std::uint32_t, hash, std::equal_to<>> ids_;
};

struct token {
  std::uint32_t id;
  std::size_t owner;  // the cue or word annotation it comes from
};

// The annotations of `t` in start-time order (ties keep the tier's order).
std::vector<std::size_t> by_start(const tier& t) {
  std::vector<std::size_t> order(t.annotations.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return t.annotations[a].start < t.annotations[b].start;
  });
  return order;
}

std::vector<token> tokens_of(const tier& t, const std::vector<std::size_t>& order, interner& ids) {
  std::vector<token> out;
  for (std::size_t k : order)
    for_each_word_token(t.annotations[k].text, [&](std::string_view w) {
      out.push_back({ids(w), k});
    });
  return out;
}

// The band of each caption token i (1-based): the words a[i]..b[i] (1-based) inside its cue's
// window, both non-decreasing in i.
struct band {
  std::vector<std::size_t> a, b;
};

band bands_of(const tier& captions, const tier& words, const std::vector<token>& cap,
              const std::vector<token>& wrd, lag_window window) {
  const std::size_t m = cap.size(), n = wrd.size();
  band out{std::vector<std::size_t>(m + 1), std::vector<std::size_t>(m + 1)};
  std::vector<time_ns> word_start(n);
  for (std::size_t j = 0; j < n; ++j)
    word_start[j] = words.annotations[wrd[j].owner].start;
  for (std::size_t i = 1; i <= m; ++i) {
    const annotation& cue = captions.annotations[cap[i - 1].owner];
    const time_ns from = saturating_add(cue.start, -window.before);
    const time_ns to = saturating_add(std::max(cue.end, cue.start), window.after);
    const auto lo = std::lower_bound(word_start.begin(), word_start.end(), from);
    const auto hi = std::upper_bound(word_start.begin(), word_start.end(), to);
    out.a[i] =
        std::max<std::size_t>(static_cast<std::size_t>(lo - word_start.begin()) + 1, out.a[i - 1]);
    out.b[i] =
        std::max<std::size_t>(static_cast<std::size_t>(hi - word_start.begin()), out.b[i - 1]);
    out.b[i] = std::max(out.b[i], out.a[i] - 1);
  }
  return out;
}

enum move : std::uint8_t { from_left, from_above, diagonal };

// The longest common subsequence's table, restricted to the bands: the move into each cell.
// Row i keeps columns a[i]-1 .. b[i], from row_start[i]: the column before the band stands for
// every word before it, since token i cannot match those. Beyond b[i] nothing changes, so a
// later row reads row i's value at min(j, b[i]).
struct band_table {
  std::vector<std::size_t> row_start;
  // Two bits a cell: the table is the largest thing a check holds (a cue's window of about
  // forty seconds spans about a hundred words, for every caption word of the file).
  std::vector<std::uint8_t> packed;
  void set(std::size_t cell, std::uint8_t how) {
    packed[cell >> 2] |= static_cast<std::uint8_t>(how << ((cell & 3) * 2));
  }
  std::uint8_t at(std::size_t cell) const {
    return static_cast<std::uint8_t>((packed[cell >> 2] >> ((cell & 3) * 2)) & 3);
  }
};

band_table fill_table(const std::vector<token>& cap, const std::vector<token>& wrd,
                      const band& bands) {
  const std::size_t m = cap.size(), n = wrd.size();
  band_table t;
  t.row_start.assign(m + 2, 0);
  for (std::size_t i = 1; i <= m; ++i)
    t.row_start[i + 1] = t.row_start[i] + (bands.b[i] - bands.a[i] + 2);
  t.packed.assign((t.row_start[m + 1] + 3) / 4, 0);
  std::vector<std::uint32_t> previous(n + 1, 0), current, word_ids(n);
  for (std::size_t j = 0; j < n; ++j)
    word_ids[j] = wrd[j].id;
  std::size_t prev_first = 0, prev_last = n;  // row 0: every column is 0
  for (std::size_t i = 1; i <= m; ++i) {
    const std::size_t first = bands.a[i] - 1, last = bands.b[i];
    // Row i-1 read at column j: its value there up to prev_last, its last value beyond.
    const std::uint32_t* above = previous.data();
    const std::uint32_t beyond = previous[prev_last - prev_first];
    current.assign(last - first + 1, 0);
    const std::size_t row = t.row_start[i];
    std::uint32_t diagonal_value = first <= prev_last ? above[first - prev_first] : beyond;
    std::uint32_t left = diagonal_value;
    current[0] = left;
    t.set(row, from_above);
    const std::uint32_t tok = cap[i - 1].id;
    // One cell, without branches (the moves are data the predictor cannot learn): the first of
    // above, left and diagonal that gives the longest subsequence, in that order of preference.
    auto cell = [&](std::size_t j, std::uint32_t up) {
      const bool take_left = left > up;
      std::uint32_t best = take_left ? left : up;
      std::uint8_t how = take_left ? from_left : from_above;
      const bool take_diagonal = (word_ids[j - 1] == tok) & (diagonal_value + 1 > best);
      best = take_diagonal ? diagonal_value + 1 : best;
      how = take_diagonal ? static_cast<std::uint8_t>(diagonal) : how;
      current[j - first] = best;
      t.set(row + (j - first), how);
      left = best;
      diagonal_value = up;
    };
    const std::size_t within = std::min(last, prev_last);
    for (std::size_t j = first + 1; j <= within; ++j)
      cell(j, above[j - prev_first]);
    for (std::size_t j = std::max(first, within) + 1; j <= last; ++j)
      cell(j, beyond);
    previous.swap(current);
    prev_first = first;
    prev_last = last;
  }
  return t;
}

// Back from the last cell: the word (1-based) each caption token matched, if any.
std::vector<std::optional<std::size_t>> trace_back(const band& bands, const band_table& t,
                                                   std::size_t m) {
  std::vector<std::optional<std::size_t>> match(m + 1);
  std::size_t i = m, j = bands.b[m];
  while (i > 0) {
    const std::size_t col = std::min(j, bands.b[i]);
    if (col < bands.a[i]) {  // before the band: token i is unmatched
      j = col;
      --i;
      continue;
    }
    const std::uint8_t how = t.at(t.row_start[i] + (col - (bands.a[i] - 1)));
    if (how == diagonal) {
      match[i] = col;
      j = col - 1;
      --i;
    } else if (how == from_left) {
      j = col - 1;
    } else {
      j = col;
      --i;
    }
  }
  return match;
}

}  // namespace

caption_alignment align_captions(const tier& captions, const tier& words, lag_window window) {
  caption_alignment out;
  out.cues.resize(captions.annotations.size());
  interner ids;
  const std::vector<token> cap = tokens_of(captions, by_start(captions), ids);
  const std::vector<token> wrd = tokens_of(words, by_start(words), ids);
  out.tokens = cap.size();
  for (const token& t : cap)
    ++out.cues[t.owner].tokens;
  const std::size_t m = cap.size();
  if (m == 0 || wrd.empty()) return out;
  const band bands = bands_of(captions, words, cap, wrd, window);
  const std::vector<std::optional<std::size_t>> match =
      trace_back(bands, fill_table(cap, wrd, bands), m);
  for (std::size_t k = 1; k <= m; ++k) {
    if (!match[k]) continue;
    cue_alignment& c = out.cues[cap[k - 1].owner];
    const std::size_t word = wrd[*match[k] - 1].owner;
    ++c.matched;
    ++out.matched;
    if (!c.first_word) c.first_word = word;
    c.last_word = word;
  }
  for (std::size_t k = 0; k < out.cues.size(); ++k) {
    cue_alignment& c = out.cues[k];
    if (c.first_word)
      c.lag = captions.annotations[k].start - words.annotations[*c.first_word].start;
  }
  return out;
}

time_ns quantile(std::vector<time_ns>& values, double q) {
  if (values.empty()) return 0;
  std::sort(values.begin(), values.end());
  const double rank = q * static_cast<double>(values.size() - 1);
  const auto lo = static_cast<std::size_t>(std::floor(rank));
  const std::size_t hi = std::min(lo + 1, values.size() - 1);
  const double frac = rank - static_cast<double>(lo);
  // The difference fits a double exactly enough: it is rounded to the nanosecond once.
  const double step =
      static_cast<double>(static_cast<detail::i128>(values[hi]) - values[lo]) * frac;
  return values[lo] + static_cast<time_ns>(std::llround(step));
}

lag_statistics summarize_lag(const caption_alignment& alignment) {
  lag_statistics s;
  std::vector<time_ns> lags;
  for (const cue_alignment& c : alignment.cues)
    if (c.lag) lags.push_back(*c.lag);
  s.cues = lags.size();
  s.coverage = alignment.coverage();
  if (lags.empty()) return s;
  s.max = *std::max_element(lags.begin(), lags.end());
  s.median = quantile(lags, 0.5);
  s.p90 = quantile(lags, 0.9);
  return s;
}

}  // namespace tiers
