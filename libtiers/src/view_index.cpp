// The open-addressing index of string views (linear probing).
#include "detail/view_index.hpp"

#include <bit>
#include <cstring>
#include <functional>

namespace tiers::detail {

view_index::view_index(std::size_t expected) {
  // At most three quarters full: a capacity of at least 4/3 of the keys, and 16 at least.
  slots_.resize(std::bit_ceil(std::max<std::size_t>(16, expected + expected / 3 + 1)));
}

std::uint64_t view_index::hash_of(std::string_view key) {
  // The top bit marks a used slot; the low bits, which pick the slot, stay the hash's own.
  return static_cast<std::uint64_t>(std::hash<std::string_view>()(key)) | (std::uint64_t{1} << 63);
}

// The slot holding `key`, or the empty slot where it would go.
std::size_t view_index::probe(std::uint64_t hash, std::string_view key) const {
  const std::size_t mask = slots_.size() - 1;
  for (std::size_t i = static_cast<std::size_t>(hash) & mask;; i = (i + 1) & mask) {
    const slot& s = slots_[i];
    if (s.hash == 0) return i;
    if (s.hash == hash && s.size == key.size() &&
        (key.empty() || std::memcmp(s.data, key.data(), key.size()) == 0))
      return i;
  }
}

std::pair<std::size_t, bool> view_index::emplace(std::string_view key, std::size_t value) {
  if ((size_ + 1) * 4 > slots_.size() * 3) grow();
  const std::uint64_t hash = hash_of(key);
  slot& s = slots_[probe(hash, key)];
  if (s.hash != 0) return {s.value, false};
  s = {hash, key.data(), static_cast<std::uint32_t>(key.size()), static_cast<std::uint32_t>(value)};
  ++size_;
  return {value, true};
}

const std::uint32_t* view_index::find(std::string_view key) const {
  const slot& s = slots_[probe(hash_of(key), key)];
  return s.hash != 0 ? &s.value : nullptr;
}

void view_index::grow() {
  std::vector<slot> old(slots_.size() * 2);
  old.swap(slots_);
  const std::size_t mask = slots_.size() - 1;
  for (const slot& s : old)
    if (s.hash != 0) {
      std::size_t i = static_cast<std::size_t>(s.hash) & mask;
      while (slots_[i].hash != 0)
        i = (i + 1) & mask;
      slots_[i] = s;
    }
}

}  // namespace tiers::detail
