// A hash index from strings held elsewhere to numbers, for the uniqueness checks that readers
// and checks make over millions of ids.
#pragma once

#include <cstddef>
#include <cstdint>
#include <string_view>
#include <utility>
#include <vector>

namespace tiers::detail {

/// Open addressing in one array of 24-byte slots: an insert costs one cache miss and no
/// allocation, where a node-based std::unordered_map costs a bucket, a node, a miss on each
/// and a node to free — over a million cue ids, most of a WebVTT read. The keys' bytes are not
/// copied and must outlive the index; values are below 2^32 (annotation or tier indexes), and
/// keys of 4 GiB or more (beyond any limit of the readers) are never found equal.
class view_index {
 public:
  /// Room for `expected` keys before the first growth.
  explicit view_index(std::size_t expected = 0);

  /// Adds `key` with `value` unless the key is there: returns the value stored under the key
  /// and whether this call added it.
  std::pair<std::size_t, bool> emplace(std::string_view key, std::size_t value);
  /// The value stored under `key`, or null.
  const std::uint32_t* find(std::string_view key) const;
  bool contains(std::string_view key) const { return find(key) != nullptr; }
  /// Starts loading the slot of `key` into the cache, for an emplace or find a little later:
  /// over millions of keys, that load is most of an insert's time.
  void prefetch(std::string_view key) const {
    __builtin_prefetch(&slots_[static_cast<std::size_t>(hash_of(key)) & (slots_.size() - 1)]);
  }
  std::size_t size() const { return size_; }

 private:
  struct slot {
    std::uint64_t hash = 0;  ///< 0: empty (hashes are stored with their top bit set)
    const char* data = nullptr;
    std::uint32_t size = 0;
    std::uint32_t value = 0;
  };
  static std::uint64_t hash_of(std::string_view key);
  std::size_t probe(std::uint64_t hash, std::string_view key) const;
  void grow();

  std::vector<slot> slots_;  ///< a power of two, at most three quarters full
  std::size_t size_ = 0;
};

}  // namespace tiers::detail
