// Exact time values: integer nanoseconds, rational frame rates, and their text forms.
#pragma once

#include <cstdint>
#include <optional>
#include <string>
#include <string_view>

namespace tiers {

/// A time or duration: an exact count of nanoseconds (about ±292 years).
/// Floating-point time never enters the model; every parser below is exact or rounds once, to
/// the nearest nanosecond with ties away from zero.
using time_ns = std::int64_t;

inline constexpr time_ns ns_per_second = 1'000'000'000;

/// A positive rational number such as a frame rate: 25/1, 30000/1001.
/// Numerator and denominator are below 2^32 so that frame arithmetic stays exact.
struct rational {
  std::int64_t num = 0;
  std::int64_t den = 1;
  friend bool operator==(const rational&, const rational&) = default;
};

/// Parses `25`, `30000/1001` or `29.97` (a decimal is taken exactly: 2997/100) into a reduced
/// rational. Returns nothing for zero, negative, malformed or oversized values.
std::optional<rational> parse_rational(std::string_view text);

/// The NTSC rate (24000/1001, 30000/1001, 48000/1001, 60000/1001, 120000/1001) that a decimal
/// such as `29.97` or `23.976` abbreviates, when `text` is one: parse_rational takes the
/// decimal exactly (2997/100), which drifts from the video's frames by 3.6 s an hour, so a
/// caller warns rather than guessing. Nothing for integers, fractions and other decimals.
std::optional<rational> ntsc_rate_abbreviated(std::string_view text);

/// `25` for integers, `30000/1001` otherwise.
std::string format_rational(rational r);

/// Why a time text was not accepted.
enum class time_status : std::uint8_t {
  ok,
  syntax,         ///< not of the expected form
  out_of_range,   ///< well-formed, but outside what time_ns holds
  bad_field,      ///< a clock or timecode field out of its range (minutes ≥ 60, a dropped frame)
  needs_rate,     ///< frames or timecode without a frame rate
  not_drop_rate,  ///< drop-frame timecode at a rate that has no drop-frame counting
};

/// The outcome of parsing a time: the value when `status == ok`.
struct parsed_time {
  time_ns value = 0;
  time_status status = time_status::syntax;
  explicit operator bool() const { return status == time_status::ok; }
};

/// A short English description of a non-ok status, e.g. "is out of range".
std::string_view describe(time_status status);

/// Decimal seconds as in JSON or CSV: `12`, `-0.5`, `1.000000001`, `2.5e3`, `.5`.
/// Exact for up to nine fraction digits; more are rounded to the nearest nanosecond.
parsed_time parse_seconds(std::string_view text);

/// Decimal milliseconds, same grammar as parse_seconds: `1250`, `1250.5`.
parsed_time parse_milliseconds(std::string_view text);

/// Clock time `h…:mm:ss[.fraction]` or `mm:ss.fraction`: hours one or more digits, minutes and
/// seconds two digits each, 00–59; the fraction any number of digits. `mm:ss` without a
/// fraction is refused, since it reads as hours and minutes just as well.
parsed_time parse_clock(std::string_view text);

/// The start of frame `frame` at `rate` frames per second: frame × den / num seconds.
parsed_time frame_time(std::int64_t frame, rational rate);

/// A whole frame number, e.g. `153`, at `rate`.
parsed_time parse_frames(std::string_view text, std::optional<rational> rate);

/// SMPTE timecode `hh:mm:ss:ff`, or drop-frame `hh:mm:ss;ff` (rates 30000/1001 and 60000/1001:
/// frame numbers 0–1, or 0–3, are skipped at every minute not divisible by ten).
/// Returns the frame count through `frames` when given.
parsed_time parse_timecode(std::string_view text, std::optional<rational> rate,
                           std::int64_t* frames = nullptr);

/// A length of time as options and profiles write it: `250ms`, `1.5s`, `2f` (whole frames, at
/// a frame rate known only later), or a plain number, which is seconds. Never negative.
struct duration_value {
  time_ns ns = 0;                      ///< the length, unless it is counted in frames
  std::optional<std::int64_t> frames;  ///< the length in frames, when written with `f`
  /// The length in nanoseconds: frames at `rate`, rounded to the nearest nanosecond.
  time_ns at(rational rate) const;
  friend bool operator==(const duration_value&, const duration_value&) = default;
};

/// Parses a duration; nothing for malformed, negative or out-of-range text.
std::optional<duration_value> parse_duration(std::string_view text);

/// `2f`, `1.5s`, `0.25s`: what parse_duration reads back.
std::string format_duration(const duration_value& d);

/// Exact decimal seconds with as few fraction digits as needed: `1.25`, `-0.000000001`, `3`.
std::string format_seconds(time_ns t);

/// The same into `out`, which has room for 32 bytes, without allocating; returns the length.
/// For writers of millions of times.
std::size_t format_seconds_to(time_ns t, char* out);

/// Exact clock time: `01:02:03.25`, `00:00:00.000000001`, `-00:00:01.5`, `100:00:00` —
/// hours at least two digits, as few fraction digits as needed. Reads back with parse_clock
/// (after the sign).
std::string format_clock_exact(time_ns t);

/// Clock time for people: `01:02:03.250` (always hours; `decimals` fraction digits, 0–9,
/// rounded to the nearest).
std::string format_clock(time_ns t, int decimals = 3);

}  // namespace tiers
