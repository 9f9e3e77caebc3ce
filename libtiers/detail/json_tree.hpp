// A small JSON tree whose every value knows its byte offset, for the files people write by hand
// (check profiles, merge plans), whose mistakes must be shown where they are.
#pragma once

#include <cstddef>
#include <cstdint>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/diagnostic.hpp"

namespace tiers::detail {

struct json_node {
  enum class type : std::uint8_t { null, boolean, number, string, array, object };
  type kind = type::null;
  std::size_t offset = 0;  ///< of the value's first byte
  bool boolean = false;
  std::string text;               ///< a string's value; a number as written
  std::vector<json_node> items;   ///< an array's elements, or an object's member values
  std::vector<std::string> keys;  ///< an object's member names, index for index with items
  std::vector<std::size_t> key_offsets;

  /// The value of member `key` of an object, or null.
  const json_node* member(std::string_view key) const;
};

std::string_view type_name(json_node::type t);

/// Parses `text` (RFC 8259, a byte order mark allowed). On failure returns nothing and appends
/// one error (`json.syntax`, `json.duplicate`, or `json.depth` beyond `max_depth`) with its
/// byte offset.
std::optional<json_node> parse_json_tree(std::string_view text, std::vector<diagnostic>& problems,
                                         std::size_t max_depth = 64);

/// The root object of a document of one of the project's own kinds (a profile, a merge plan, a
/// dataset description): nothing when the text is not JSON or its root is no object, with the
/// problem appended (`<prefix>.value`: "a merge plan is a JSON object" from `what`).
std::optional<json_node> parse_json_object(std::string_view text, std::vector<diagnostic>& problems,
                                           std::size_t max_depth, std::string_view what,
                                           std::string_view prefix);

/// Reads the members of one object, reporting type errors at the value and, on `finish`, every
/// member that was not asked for. Codes: `<prefix>.value` and `<prefix>.member`.
class json_fields {
 public:
  json_fields(const json_node& object, std::string_view what, std::string_view prefix,
              std::vector<diagnostic>& problems);

  /// The member, when present (and marks it as known).
  const json_node* get(std::string_view key);
  /// Typed members; a member of another type is reported and reads as absent.
  std::optional<std::string> string(std::string_view key);
  std::optional<double> number(std::string_view key);
  std::optional<bool> boolean(std::string_view key);
  const json_node* object(std::string_view key);
  const json_node* array(std::string_view key);
  /// Reports a member that is missing; returns false.
  bool require(std::string_view key);
  /// Reports a problem with a member's value (`<prefix>.value`).
  void bad(const json_node& value, std::string message);
  /// Checks `"format": kind` and `"version": 1`, each reported when missing if `required`;
  /// `why` follows the message of a wrong format.
  void kind_and_version(std::string_view kind, bool required, std::string_view why = {});
  /// Reports the members no `get` asked for.
  void finish();

 private:
  const json_node* typed(std::string_view key, json_node::type want, std::string_view as);
  const json_node& object_;
  std::string what_, prefix_;
  std::vector<diagnostic>& problems_;
  std::vector<bool> used_;
};

}  // namespace tiers::detail
