// JSON text output: the one writer that every JSON the project writes goes through.
#pragma once

#include <cstdint>
#include <optional>
#include <string_view>
#include <vector>

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

/// The one JSON writer of the project (RFC 8259): objects, arrays, strings, exact decimals.
/// Each object or array is written on one line, with ", " and ": " between its parts, or
/// broken: one member or element per line, indented two spaces per broken container around
/// it. Formats choose per container, so that a document stays readable in diffs (one
/// annotation per line) without a line per number. The caller balances begins and ends and
/// writes the final newline.
class json_writer {
 public:
  explicit json_writer(byte_sink& out) : out_(out) {}

  /// Starts the member `k` of the open object; the next call writes its value.
  json_writer& key(std::string_view k) {
    before_value();
    // Keys are nearly always short ASCII names: written at once, without the UTF-8 and escape
    // passes that a string of data needs. (Inline: a native document writes millions.)
    bool plain = k.size() <= 60;
    for (std::size_t i = 0; plain && i < k.size(); ++i)
      plain = k[i] >= 0x20 && k[i] < 0x7f && k[i] != '"' && k[i] != '\\';
    if (!plain) {
      escaped_key(k);
    } else {
      char buf[64];
      buf[0] = '"';
      k.copy(buf + 1, k.size());
      buf[k.size() + 1] = '"';
      buf[k.size() + 2] = ':';
      buf[k.size() + 3] = ' ';
      out_.write(std::string_view(buf, k.size() + 4));
    }
    keyed_ = true;
    return *this;
  }
  void begin_object(bool broken = false);
  void end_object();
  void begin_array(bool broken = false);
  void end_array();

  void string(std::string_view v);
  void number(double v);  ///< shortest form that reads back; NaN and infinities as null
  void count(std::uint64_t n);
  void integer(std::int64_t n);
  void seconds(time_ns t);  ///< exact to the nanosecond, without exponent
  void boolean(bool b);
  void null();
  void raw(std::string_view json);  ///< a value that is JSON text already

  // A member and its value in one call.
  void string(std::string_view k, std::string_view v) { key(k).string(v); }
  void number(std::string_view k, double v) { key(k).number(v); }
  void count(std::string_view k, std::uint64_t n) { key(k).count(n); }
  void integer(std::string_view k, std::int64_t n) { key(k).integer(n); }
  void seconds(std::string_view k, time_ns t) { key(k).seconds(t); }
  void boolean(std::string_view k, bool b) { key(k).boolean(b); }
  /// A member that may be unknown: its value, or null.
  void maybe_number(std::string_view k, const std::optional<double>& v) {
    if (v)
      number(k, *v);
    else
      key(k).null();
  }
  void maybe_seconds(std::string_view k, const std::optional<time_ns>& t) {
    if (t)
      seconds(k, *t);
    else
      key(k).null();
  }

  /// `{"k": "v", …}` from a map of strings, on one line.
  template <class Map>
  void string_map(const Map& map) {
    begin_object();
    for (const auto& [k, v] : map)
      string(k, v);
    end_object();
  }
  template <class Strings>
  void string_array(const Strings& strings) {
    begin_array();
    for (const auto& v : strings)
      string(v);
    end_array();
  }

 private:
  struct level {
    bool broken;
    bool first = true;
  };
  void before_value() {
    if (keyed_)
      keyed_ = false;
    else if (!open_.empty())
      separate(open_.back());
  }
  void separate(level& l);
  void escaped_key(std::string_view k);
  void open(char bracket, bool broken);
  void close(char bracket);
  void new_line();
  static constexpr std::string_view spaces = "                                                ";

  byte_sink& out_;
  std::vector<level> open_;
  int broken_ = 0;      // broken containers open: the indentation, two spaces each
  bool keyed_ = false;  // a key was written; the value follows it directly
};

/// `{"kind": "machine", "agent": …, "version": …}`.
void write_json_source(json_writer& j, const tier_source& source);

/// `{"uri": …, "duration": …, "frame_rate": "30000/1001"}` with the fields present.
void write_json_media(json_writer& j, const media_info& media);

}  // namespace tiers::detail
