// Exact time parsing and formatting: decimal seconds, milliseconds, clock time, frames,
// SMPTE timecode and rationals.
#include <catch2/catch.hpp>
#include <limits>

#include "tiers/time.hpp"

using namespace tiers;

namespace {
time_ns seconds(std::string_view s) {
  const parsed_time t = parse_seconds(s);
  INFO(s);
  REQUIRE(t);
  return t.value;
}
time_status status_of(parsed_time t) {
  return t.status;
}
}  // namespace

TEST_CASE("decimal seconds are read exactly", "[time]") {
  CHECK(seconds("0") == 0);
  CHECK(seconds("1.25") == 1'250'000'000);
  CHECK(seconds("3.000000001") == 3'000'000'001);
  CHECK(seconds("-0.5") == -500'000'000);
  CHECK(seconds("1234567.123456789") == 1'234'567'123'456'789);
  CHECK(seconds("2.5e3") == 2'500'000'000'000);
  CHECK(seconds("25E-1") == 2'500'000'000);
  CHECK(seconds("1e-9") == 1);
  CHECK(seconds(".5") == 500'000'000);
  CHECK(seconds("5.") == 5'000'000'000);
  CHECK(seconds("0.000") == 0);
  CHECK(seconds("-0") == 0);
  // The largest representable time, to the nanosecond.
  CHECK(seconds("9223372036.854775807") == std::numeric_limits<time_ns>::max());
  CHECK(seconds("-9223372036.854775807") == -std::numeric_limits<time_ns>::max());
}

TEST_CASE("more than nine fraction digits round to the nearest nanosecond, ties away from zero",
          "[time]") {
  CHECK(seconds("0.0000000005") == 1);
  CHECK(seconds("0.00000000049999") == 0);
  CHECK(seconds("-0.0000000005") == -1);
  CHECK(seconds("1.9999999995") == 2'000'000'000);
  CHECK(seconds("0.12345678949") == 123'456'789);
  CHECK(seconds("1.2499999999") == 1'250'000'000);
  CHECK(seconds("4e-10") == 0);
  CHECK(seconds("5e-10") == 1);
}

TEST_CASE("times beyond int64 nanoseconds and malformed numbers are refused", "[time]") {
  CHECK(status_of(parse_seconds("9223372036.854775808")) == time_status::out_of_range);
  CHECK(status_of(parse_seconds("1e300")) == time_status::out_of_range);
  CHECK(status_of(parse_seconds("1e999999999999")) == time_status::out_of_range);
  CHECK(parse_seconds("0e999999999999").value == 0);
  CHECK(seconds("1e-999999999999") == 0);
  // Thousands of digits are handled digit by digit, not through a double.
  CHECK(status_of(parse_seconds(std::string(5000, '7'))) == time_status::out_of_range);
  CHECK(seconds("0." + std::string(5000, '0') + "9") == 0);
  CHECK(seconds(std::string(5000, '0') + "1.5") == 1'500'000'000);
  for (std::string_view bad :
       {"", "abc", "1.2.3", "1e", "--1", "1 ", " 1", "e5", ".", "-", "0x10", "nan", "inf", "1,5"}) {
    INFO(bad);
    CHECK(status_of(parse_seconds(bad)) == time_status::syntax);
  }
}

TEST_CASE("milliseconds", "[time]") {
  CHECK(parse_milliseconds("1250").value == 1'250'000'000);
  CHECK(parse_milliseconds("0.000001").value == 1);
  CHECK(parse_milliseconds("-40").value == -40'000'000);
}

TEST_CASE("clock time", "[time]") {
  CHECK(parse_clock("01:02:03.250").value == 3723'250'000'000);
  CHECK(parse_clock("02:03.5").value == 123'500'000'000);
  CHECK(parse_clock("100:00:00").value == 360000 * ns_per_second);
  CHECK(parse_clock("0:00:01.000000001").value == 1'000'000'001);
  CHECK(status_of(parse_clock("00:60:00")) == time_status::bad_field);
  CHECK(status_of(parse_clock("00:00:60.000")) == time_status::bad_field);
  for (std::string_view bad : {"1:2:3", "00:00", "00::00.000", "00:00.", "00:00:00,5", ":00:00",
                               "aa:00:00", "00:000.000"}) {
    INFO(bad);
    CHECK_FALSE(parse_clock(bad));
  }
}

TEST_CASE("frame numbers at rational rates", "[time]") {
  const rational ntsc{30000, 1001};
  // Frame 1 starts at 1001/30000 s = 33366666.67 ns: rounded to the nearest nanosecond.
  CHECK(frame_time(1, ntsc).value == 33'366'667);
  CHECK(frame_time(30000, ntsc).value == 1001 * ns_per_second);
  CHECK(frame_time(-1, rational{25, 1}).value == -40'000'000);
  CHECK(parse_frames("250", rational{25, 1}).value == 10 * ns_per_second);
  CHECK(status_of(parse_frames("250", std::nullopt)) == time_status::needs_rate);
  CHECK(status_of(parse_frames("2.5", rational{25, 1})) == time_status::syntax);
  // IMSC 1.1 worked example (read in w3c/imsc; arithmetic computed): 00:00:05.1 at
  // 30000/1001 fps falls in frame ceil(5.1 × 30000/1001) = 153, i.e. between the starts of
  // frames 152 and 153.
  const time_ns t = parse_clock("00:00:05.1").value;
  CHECK(frame_time(152, ntsc).value < t);
  CHECK(t < frame_time(153, ntsc).value);
}

TEST_CASE("SMPTE drop-frame timecode at 30000/1001", "[time][timecode]") {
  // Source: ../shared/CHECKS.md, drop-frame table (rule read in TTML2 ttp:dropMode; conversions
  // computed).
  const rational ntsc{30000, 1001};
  struct row {
    const char* timecode;
    std::int64_t frames;
  };
  const row table[] = {{"00:00:59;29", 1799},   {"00:01:00;02", 1800},  {"00:02:00;02", 3598},
                       {"00:10:00;00", 17982},  {"00:11:00;02", 19782}, {"01:00:00;00", 107892},
                       {"23:59:59;29", 2589407}};
  for (const row& r : table) {
    INFO(r.timecode);
    std::int64_t frames = -1;
    const parsed_time t = parse_timecode(r.timecode, ntsc, &frames);
    REQUIRE(t);
    CHECK(frames == r.frames);
    CHECK(t.value == frame_time(r.frames, ntsc).value);
  }
  // One timecode hour is 107892 × 1001/30000 s = 3599.9964 s (CHECKS.md, computed).
  CHECK(parse_timecode("01:00:00;00", ntsc).value == 3'599'996'400'000);
  // Frames 00 and 01 do not exist at minute 1; they do at minute 10.
  CHECK(status_of(parse_timecode("00:01:00;00", ntsc)) == time_status::bad_field);
  CHECK(status_of(parse_timecode("00:01:00;01", ntsc)) == time_status::bad_field);
  CHECK(parse_timecode("00:10:00;00", ntsc));
  CHECK(status_of(parse_timecode("00:00:01;00", rational{25, 1})) == time_status::not_drop_rate);
}

TEST_CASE("non-drop timecode", "[time][timecode]") {
  CHECK(parse_timecode("01:00:00:00", rational{25, 1}).value == 3600 * ns_per_second);
  CHECK(parse_timecode("00:00:01:12", rational{25, 1}).value == 1'480'000'000);
  // 30 frames per timecode second at 30000/1001: 30 frames last 1.001 s.
  CHECK(parse_timecode("00:00:01:00", rational{30000, 1001}).value == 1'001'000'000);
  CHECK(status_of(parse_timecode("00:00:00:25", rational{25, 1})) == time_status::bad_field);
  CHECK(status_of(parse_timecode("00:00:00:00", std::nullopt)) == time_status::needs_rate);
  CHECK_FALSE(parse_timecode("0:00:00:00", rational{25, 1}));
  CHECK_FALSE(parse_timecode("00:00:00:", rational{25, 1}));
}

TEST_CASE("rationals", "[time]") {
  CHECK(parse_rational("25") == rational{25, 1});
  CHECK(parse_rational("30000/1001") == rational{30000, 1001});
  CHECK(parse_rational("60000/2002") == rational{30000, 1001});
  CHECK(parse_rational("29.97") == rational{2997, 100});
  for (std::string_view bad : {"0", "-1", "1/0", "/2", "2/", "abc", "25fps", "1.", "4294967296"}) {
    INFO(bad);
    CHECK_FALSE(parse_rational(bad));
  }
  CHECK(format_rational({30000, 1001}) == "30000/1001");
  CHECK(format_rational({25, 1}) == "25");
}

TEST_CASE("formatting seconds is exact and reads back", "[time]") {
  CHECK(format_seconds(0) == "0");
  CHECK(format_seconds(1) == "0.000000001");
  CHECK(format_seconds(-1) == "-0.000000001");
  CHECK(format_seconds(1'250'000'000) == "1.25");
  CHECK(format_seconds(std::numeric_limits<time_ns>::min()) == "-9223372036.854775808");
  CHECK(format_seconds(std::numeric_limits<time_ns>::max()) == "9223372036.854775807");
  for (time_ns t : {time_ns{0}, time_ns{1}, time_ns{-7}, time_ns{999'999'999},
                    time_ns{1'000'000'000}, time_ns{3'599'996'400'000},
                    std::numeric_limits<time_ns>::max(), std::numeric_limits<time_ns>::min() + 1}) {
    INFO(t);
    CHECK(parse_seconds(format_seconds(t)).value == t);
  }
}

TEST_CASE("clock time for people rounds at the shown precision", "[time]") {
  CHECK(format_clock(3723'250'000'000) == "01:02:03.250");
  CHECK(format_clock(2'249'999'999) == "00:00:02.250");
  CHECK(format_clock(2'249'499'999) == "00:00:02.249");
  CHECK(format_clock(59'999'600'000, 3) == "00:01:00.000");
  CHECK(format_clock(-1'500'000'000, 1) == "-00:00:01.5");
  CHECK(format_clock(90 * ns_per_second, 0) == "00:01:30");
}

TEST_CASE("exact clock time: two-digit fields, hours as many digits as they need", "[time]") {
  CHECK(format_clock_exact(0) == "00:00:00");
  CHECK(format_clock_exact(3599 * ns_per_second + 1) == "00:59:59.000000001");
  CHECK(format_clock_exact(9 * 3600 * ns_per_second) == "09:00:00");
  CHECK(format_clock_exact(100 * 3600 * ns_per_second + 61'500'000'000) == "100:01:01.5");
  CHECK(format_clock_exact(-61 * ns_per_second) == "-00:01:01");
  // The largest time: 9223372036.854775807 s is 2562047 h 47 min 16.854775807 s (computed).
  CHECK(format_clock_exact(std::numeric_limits<time_ns>::max()) == "2562047:47:16.854775807");
}

TEST_CASE("durations take a unit: s, ms or frames", "[time]") {
  CHECK(parse_duration("1.5s")->ns == 1'500'000'000);
  CHECK(parse_duration("1.5")->ns == 1'500'000'000);  // plain numbers are seconds
  CHECK(parse_duration("250ms")->ns == 250'000'000);
  CHECK(parse_duration("0.833333333s")->ns == 833'333'333);
  const auto two = parse_duration("2f");
  REQUIRE(two);
  CHECK(two->frames == 2);
  CHECK(two->at({25, 1}) == 80'000'000);
  // 2 × 1001/30000 s = 66,733,333.3… ns, rounded to the nearest (computed).
  CHECK(two->at({30000, 1001}) == 66'733'333);
  for (const char* bad : {"", "s", "-1s", "1.5 s", "2.5f", "f", "ms", "1e999s", "abc"}) {
    INFO(bad);
    CHECK_FALSE(parse_duration(bad));
  }
  CHECK(format_duration(*parse_duration("2f")) == "2f");
  CHECK(format_duration(*parse_duration("250ms")) == "0.25s");
}

TEST_CASE("decimals that abbreviate an NTSC rate are named, never taken for it", "[time]") {
  // The NTSC rates are whole × 1000/1001 (SMPTE ST 12-1; 29.97 and 23.976 are their usual
  // abbreviations, common practice). parse_rational still takes the decimal exactly.
  CHECK(parse_rational("29.97") == rational{2997, 100});
  CHECK(ntsc_rate_abbreviated("29.97") == rational{30000, 1001});
  CHECK(ntsc_rate_abbreviated("23.976") == rational{24000, 1001});
  CHECK(ntsc_rate_abbreviated("23.98") == rational{24000, 1001});
  CHECK(ntsc_rate_abbreviated("59.94") == rational{60000, 1001});
  CHECK_FALSE(ntsc_rate_abbreviated("30000/1001"));
  CHECK_FALSE(ntsc_rate_abbreviated("30"));
  CHECK_FALSE(ntsc_rate_abbreviated("30.0"));
  CHECK_FALSE(ntsc_rate_abbreviated("25.0"));
  CHECK_FALSE(ntsc_rate_abbreviated("29.5"));
}
