// Caption cues against word timings: which word each caption word is, and how far each cue
// lags behind its speech. Shared by `tiers check` (measuring) and `tiers retime` (fixing).
#pragma once

#include <cstddef>
#include <optional>
#include <vector>

#include "tiers/model.hpp"

namespace tiers {

/// Where to look for a cue's words: those starting from `before` ahead of the cue's start to
/// `after` past its end. Live captions trail their speech, so the window reaches further back.
struct lag_window {
  time_ns before = 30 * ns_per_second;
  time_ns after = 10 * ns_per_second;
};

/// One cue's share of the alignment. Word indices are into the word tier's annotations.
struct cue_alignment {
  std::size_t tokens = 0;   ///< caption words in the cue (word_tokens of its text)
  std::size_t matched = 0;  ///< of those, how many were found among the timed words
  std::optional<std::size_t> first_word, last_word;  ///< the first and last matched words
  /// Cue start − start of its first matched word: positive when the cue comes late.
  std::optional<time_ns> lag;
};

struct caption_alignment {
  std::vector<cue_alignment> cues;  ///< index for index with the caption tier's annotations
  std::size_t tokens = 0;           ///< caption words in all cues
  std::size_t matched = 0;          ///< of those, found among the timed words
  /// matched / tokens; 0 when the captions have no words.
  double coverage() const {
    return tokens == 0 ? 0.0 : static_cast<double>(matched) / static_cast<double>(tokens);
  }
};

/// Aligns the words of the caption cues with the timed words: both texts are cut into word
/// tokens (Unicode word boundaries, NFKC case folding, punctuation dropped) and the two token
/// sequences are aligned in order, maximising the matches, by dynamic programming restricted
/// to a band: a cue's tokens are compared only with words inside its window. The cost is the
/// number of caption tokens times the words in one window — linear in the length of the
/// recording, not quadratic. Neither tier needs to be sorted.
caption_alignment align_captions(const tier& captions, const tier& words, lag_window window = {});

/// Median, 90th percentile and maximum of the cues' lags (percentiles interpolate linearly
/// between ranks, rounded to the nanosecond), over the cues with a matched word.
struct lag_statistics {
  std::size_t cues = 0;  ///< cues with a lag
  time_ns median = 0;
  time_ns p90 = 0;
  time_ns max = 0;
  double coverage = 0;  ///< share of caption words found among the timed words
};
lag_statistics summarize_lag(const caption_alignment& alignment);

/// The `q`-quantile (0–1) of `values`, interpolating linearly between ranks; sorts `values`.
/// Zero for no values.
time_ns quantile(std::vector<time_ns>& values, double q);

}  // namespace tiers
