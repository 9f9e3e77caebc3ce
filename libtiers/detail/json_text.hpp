// JSON text output shared by the json writer and the JSON summaries: strings and exact times.
#pragma once

#include <cstdint>
#include <string_view>

#include "tiers/model.hpp"
#include "tiers/sink.hpp"
#include "tiers/time.hpp"

namespace tiers::detail {

/// Writes `s` as a JSON string (RFC 8259 §7): quotes, backslashes and control characters
/// escaped, everything else as UTF-8.
void write_json_string(byte_sink& out, std::string_view s);

/// Writes a time as a JSON number of seconds, exact to the nanosecond, without exponent.
void write_json_seconds(byte_sink& out, time_ns t);

/// Writes a double in the shortest form that reads back to the same value.
void write_json_double(byte_sink& out, double v);

/// Writes `{"kind": "machine", "agent": …, "version": …}`.
void write_json_source(byte_sink& out, const tier_source& source);

/// Writes `{"uri": …, "duration": …, "frame_rate": "30000/1001"}` with the fields present.
void write_json_media(byte_sink& out, const media_info& media);

/// Writes the members of one JSON object in order, commas between them; the caller writes the
/// braces. `key` writes `"k": ` and leaves the value to the caller.
class json_members {
 public:
  explicit json_members(byte_sink& out) : out_(out) {}
  byte_sink& key(std::string_view k);
  void string(std::string_view k, std::string_view v);
  void number(std::string_view k, double v);  ///< NaN is written as null
  void count(std::string_view k, std::uint64_t n);
  void seconds(std::string_view k, time_ns t);

 private:
  byte_sink& out_;
  bool first_ = true;
};

}  // namespace tiers::detail
