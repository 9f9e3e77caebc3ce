// Tables of the names an enumeration's values have in files and on the command line, so that
// readers, writers and a program's option checks spell them from one place.
#pragma once

#include <cstddef>
#include <optional>
#include <string>
#include <string_view>

namespace tiers {

template <class E>
struct enum_name {
  E value;
  std::string_view name;
};

/// The name of `value` in `table` (empty when the table lacks it).
template <class E, std::size_t N>
constexpr std::string_view name_of(const enum_name<E> (&table)[N], E value) {
  for (const enum_name<E>& n : table)
    if (n.value == value) return n.name;
  return {};
}

/// The value called `name` in `table`, if any.
template <class E, std::size_t N>
constexpr std::optional<E> value_named(const enum_name<E> (&table)[N], std::string_view name) {
  for (const enum_name<E>& n : table)
    if (n.name == name) return n.value;
  return std::nullopt;
}

/// The names for a message: `"a", "b" or "c"`.
template <class E, std::size_t N>
std::string quoted_names(const enum_name<E> (&table)[N]) {
  std::string s;
  for (std::size_t k = 0; k < N; ++k) {
    if (k > 0) s += k + 1 == N ? " or " : ", ";
    s += '"';
    s += table[k].name;
    s += '"';
  }
  return s;
}

}  // namespace tiers
