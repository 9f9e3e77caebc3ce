// Caption-to-word alignment and lag: injected lags on invented speech are recovered.
#include <catch2/catch.hpp>
#include <cmath>
#include <random>

#include "tiers/lag.hpp"

using namespace tiers;

namespace {

// Invented speech: `count` words from a small vocabulary, so that words repeat often (the
// alignment must use order, not just spelling), 0.25–0.6 s each with short pauses.
tier invented_words(std::size_t count, std::uint32_t seed) {
  static const char* vocabulary[] = {"the",    "garden", "we",     "share", "water",  "and",
                                     "seeds",  "a",      "street", "of",    "tools",  "in",
                                     "spring", "beds",   "is",     "our",   "snails", "compost"};
  std::mt19937 rng(seed);
  std::uniform_int_distribution<int> pick(0, 17), length(250, 600), pause(20, 200);
  tier words;
  words.name = "words";
  time_ns t = ns_per_second;
  for (std::size_t k = 0; k < count; ++k) {
    annotation w;
    w.start = t;
    w.end = t + length(rng) * 1'000'000;
    w.text = vocabulary[pick(rng)];
    t = w.end + pause(rng) * 1'000'000;
    words.annotations.push_back(std::move(w));
  }
  return words;
}

// Captions of those words, 5–9 words a cue, in capitals with punctuation as live captions are,
// each cue shown `lag(first word's start)` after its first word starts.
template <class Lag>
tier captions_of(const tier& words, std::uint32_t seed, Lag lag) {
  std::mt19937 rng(seed);
  std::uniform_int_distribution<std::size_t> size(5, 9);
  tier cues;
  cues.name = "captions";
  for (std::size_t k = 0; k < words.annotations.size();) {
    const std::size_t n = std::min(size(rng), words.annotations.size() - k);
    annotation c;
    for (std::size_t w = k; w < k + n; ++w) {
      std::string word = words.annotations[w].text;
      for (char& ch : word)
        ch = static_cast<char>(std::toupper(static_cast<unsigned char>(ch)));
      c.text += (w == k ? "" : w == k + n / 2 ? "\n" : " ") + word;
    }
    c.text += ".";
    c.id = std::to_string(k);  // its first word, the truth the alignment must find
    const time_ns shift = lag(words.annotations[k].start);
    c.start = words.annotations[k].start + shift;
    c.end = words.annotations[k + n - 1].end + shift;
    cues.annotations.push_back(std::move(c));
    k += n;
  }
  return cues;
}

}  // namespace

TEST_CASE("a constant injected lag is recovered", "[lag]") {
  // Invented data (demo scenario); the 20 ms bound is the acceptance figure.
  const tier words = invented_words(9000, 7);
  const tier cues = captions_of(words, 8, [](time_ns) { return 2'500'000'000; });
  const caption_alignment al = align_captions(cues, words);
  const lag_statistics s = summarize_lag(al);
  CHECK(s.coverage == 1.0);
  CHECK(s.cues == cues.annotations.size());
  CHECK(std::abs(s.median - 2'500'000'000) <= 20'000'000);
  CHECK(std::abs(s.p90 - 2'500'000'000) <= 20'000'000);
  CHECK(std::abs(s.max - 2'500'000'000) <= 20'000'000);
}

TEST_CASE("a drifting lag is recovered cue by cue", "[lag]") {
  // The lag grows from 1 s to 9 s over the hour, as when a captioner falls behind.
  const tier words = invented_words(9000, 11);
  const double span = static_cast<double>(words.annotations.back().end);
  auto drift = [&](time_ns t) {
    return ns_per_second + static_cast<time_ns>(8.0e9 * static_cast<double>(t) / span);
  };
  const tier cues = captions_of(words, 12, drift);
  const caption_alignment al = align_captions(cues, words);
  std::size_t within = 0;
  for (std::size_t k = 0; k < cues.annotations.size(); ++k) {
    const cue_alignment& c = al.cues[k];
    const std::size_t first = std::stoul(*cues.annotations[k].id);
    const time_ns truth = drift(words.annotations[first].start);
    if (c.first_word == first && c.lag && std::abs(*c.lag - truth) <= 20'000'000) ++within;
  }
  CHECK(within == cues.annotations.size());
}

TEST_CASE("paraphrased captions still align, and coverage says how much", "[lag]") {
  tier words = invented_words(3000, 21);
  tier cues = captions_of(words, 22, [](time_ns) { return 4 * ns_per_second; });
  // Every tenth cue gets a word the speaker never said.
  for (std::size_t k = 0; k < cues.annotations.size(); k += 10)
    cues.annotations[k].text += " INDEED";
  const caption_alignment al = align_captions(cues, words);
  CHECK(al.matched == 3000);
  CHECK(al.tokens == 3000 + (cues.annotations.size() + 9) / 10);
  CHECK(summarize_lag(al).median == 4 * ns_per_second);
}

TEST_CASE("cues whose words lie outside the window find nothing", "[lag]") {
  tier words = invented_words(200, 31);
  tier cues = captions_of(words, 32, [](time_ns) { return 45 * ns_per_second; });
  const caption_alignment al = align_captions(cues, words, lag_window{});
  // 45 s late: beyond the default 30 s look-back, so only repeated words can match by chance.
  CHECK(al.coverage() < 0.9);
  const caption_alignment wide = align_captions(cues, words, lag_window{60 * ns_per_second, 0});
  CHECK(wide.coverage() == 1.0);
  CHECK(summarize_lag(wide).median == 45 * ns_per_second);
}

TEST_CASE("quantiles interpolate between ranks", "[lag]") {
  // Linear interpolation between closest ranks (common practice: the default of R's
  // quantile() type 7 and NumPy).
  std::vector<time_ns> v{4, 1, 3, 2};
  CHECK(quantile(v, 0.5) == 3);  // 2.5, rounded half away from zero
  std::vector<time_ns> w{10, 20, 30, 40, 50, 60, 70, 80, 90, 100};
  CHECK(quantile(w, 0.9) == 91);
  std::vector<time_ns> none;
  CHECK(quantile(none, 0.5) == 0);
}

TEST_CASE("empty tiers align to nothing", "[lag]") {
  const caption_alignment al = align_captions(tier{}, tier{});
  CHECK(al.tokens == 0);
  CHECK(al.coverage() == 0.0);
  CHECK(summarize_lag(al).cues == 0);
}
