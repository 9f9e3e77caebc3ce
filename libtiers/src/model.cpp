// Names of the model's enumerations and tier look-up.
#include "tiers/model.hpp"

#include <algorithm>
#include <stdexcept>

#include "tiers/diagnostic.hpp"

namespace tiers {

attribute_map::map_type& attribute_map::none() {
  static map_type empty;
  return empty;
}

const std::string& attribute_map::at(std::string_view key) const {
  const auto it = find(key);
  if (it == end()) throw std::out_of_range("attribute_map::at: no key " + std::string(key));
  return it->second;
}

std::size_t attribute_map::erase(std::string_view key) {
  if (!map_) return 0;
  const auto it = map_->find(key);
  if (it == map_->end()) return 0;
  map_->erase(it);
  return 1;
}

const tier* find_tier(const document& doc, std::string_view name) {
  auto it = std::find_if(doc.tiers.begin(), doc.tiers.end(),
                         [&](const tier& t) { return t.name == name; });
  return it == doc.tiers.end() ? nullptr : &*it;
}

tier* find_tier(document& doc, std::string_view name) {
  return const_cast<tier*>(find_tier(static_cast<const document&>(doc), name));
}

std::string tier_names(const document& doc) {
  std::string s;
  for (const tier& t : doc.tiers)
    s += (s.empty() ? "" : ", ") + quote_name(t.name);
  return s.empty() ? "none" : s;
}

std::string words_tier_name(std::string_view parent) {
  return std::string(parent) + ".words";
}

bool is_words_tier_of(const tier& t, std::string_view parent) {
  return t.parent && t.parent->rel == relation::within && t.parent->tier == parent &&
         t.name == words_tier_name(parent);
}

std::string_view to_string(tier_kind kind) {
  return kind == tier_kind::instant ? "instant" : "interval";
}

std::string_view to_string(source_kind kind) {
  return kind == source_kind::machine ? "machine" : "human";
}

std::string_view to_string(relation rel) {
  switch (rel) {
    case relation::within:
      return "within";
    case relation::partition:
      return "partition";
    case relation::refers:
      return "refers";
  }
  return "within";
}

std::optional<tier_kind> parse_tier_kind(std::string_view text) {
  if (text == "interval") return tier_kind::interval;
  if (text == "instant") return tier_kind::instant;
  return std::nullopt;
}

std::optional<source_kind> parse_source_kind(std::string_view text) {
  if (text == "human") return source_kind::human;
  if (text == "machine") return source_kind::machine;
  return std::nullopt;
}

std::optional<relation> parse_relation(std::string_view text) {
  if (text == "within") return relation::within;
  if (text == "partition") return relation::partition;
  if (text == "refers") return relation::refers;
  return std::nullopt;
}

}  // namespace tiers
