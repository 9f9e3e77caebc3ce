// Recording where tiers and annotations are in the input, for readers (read_options::positions).
#pragma once

#include <cstddef>

#include "tiers/format.hpp"

namespace tiers::detail {

/// Appends byte offsets to a read_result's source map, index for index with the document, and
/// does nothing when the caller did not ask for positions.
class position_recorder {
 public:
  position_recorder(const read_options& options, read_result& out)
      : on_(options.positions), map_(out.positions) {}

  bool on() const { return on_; }
  /// A new tier, appended to the document's tiers, starts at `offset`.
  void tier(std::size_t offset) {
    if (!on_) return;
    map_.tiers.push_back({offset});
    map_.annotations.emplace_back();
  }
  /// An annotation appended to tier `index` starts at `offset`.
  void annotation(std::size_t index, std::size_t offset) {
    if (!on_) return;
    if (map_.annotations.size() <= index) map_.annotations.resize(index + 1);
    map_.annotations[index].push_back({offset});
  }

 private:
  bool on_;
  source_map& map_;
};

}  // namespace tiers::detail
