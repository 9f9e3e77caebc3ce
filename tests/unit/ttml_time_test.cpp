// TTML2 time expressions and timing parameters (w3c/ttml2, spec/ttml2.xml, §10.3 and §7.2).
#include <catch2/catch.hpp>

#include "formats/ttml/ttml_time.hpp"

using namespace tiers;
using namespace tiers::detail::ttml;

namespace {
timing_parameters params(std::string_view rate, std::string_view multiplier,
                         std::string_view sub = "", std::string_view ticks = "") {
  timing_parameters p;
  REQUIRE_FALSE(read_parameters(rate, multiplier, sub, ticks, p));
  return p;
}
}  // namespace

TEST_CASE("ttml timing parameters and their defaults", "[ttml][time]") {
  // Defaults (CHECKS.md, read in TTML2): frame rate 30, multiplier 1:1, sub-frame rate 1, tick
  // rate = effective frame rate × sub-frame rate when a frame rate is given, else 1.
  const timing_parameters none = params("", "");
  CHECK(none.frame_rate == rational{30, 1});
  CHECK(none.tick_rate == rational{1, 1});
  const timing_parameters ntsc = params("30", "1000 1001");
  CHECK(ntsc.frame_rate == rational{30000, 1001});
  CHECK(ntsc.tick_rate == rational{30000, 1001});
  CHECK(params("25", "", "2").tick_rate == rational{50, 1});
  CHECK(params("30", "", "", "10000000").tick_rate == rational{10000000, 1});
  timing_parameters p;
  CHECK(read_parameters("0", "", "", "", p));
  CHECK(read_parameters("30", "1000", "", "", p));
  CHECK(read_parameters("", "", "", "-5", p));
}

TEST_CASE("ttml clock-time and offset-time, exactly", "[ttml][time]") {
  const timing_parameters ntsc = params("30", "1000 1001");
  const timing_parameters plain = params("", "");
  // Media time = 3600h + 60m + s + (frames + subFrames/subFrameRate) / effective frame rate
  // (CHECKS.md, read in TTML2). 00:00:02:15 at 30000/1001: 2 + 15 × 1001/30000 = 2.5005 s
  // (computed; the imsc 1.1.5 package reports the same event time).
  CHECK(parse_time_expression("00:00:02:15", ntsc) == 2'500'500'000);
  CHECK(parse_time_expression("00:00:01:10.1", params("25", "", "2")) == 1'420'000'000);
  CHECK(parse_time_expression("01:02:03.25", plain) == 3723'250'000'000);
  CHECK(parse_time_expression("100:00:00", plain) == 360000 * ns_per_second);
  // Offset times: 10 frames at 30000/1001 = 0.3336666… s, to the nearest nanosecond.
  CHECK(parse_time_expression("10f", ntsc) == 333'666'667);
  CHECK(parse_time_expression("30000000t", params("", "", "", "10000000")) == 3 * ns_per_second);
  CHECK(parse_time_expression("1t", ntsc) == 33'366'667);
  CHECK(parse_time_expression("5t", plain) == 5 * ns_per_second);
  CHECK(parse_time_expression("1.5h", plain) == 5400 * ns_per_second);
  CHECK(parse_time_expression("90m", plain) == 5400 * ns_per_second);
  CHECK(parse_time_expression("250ms", plain) == 250'000'000);
  CHECK(parse_time_expression("1.001s", plain) == 1'001'000'000);
  // IMSC 1.1 worked example (CHECKS.md): 00:00:05.1 at 30000/1001 falls in frame 153.
  const time_ns t = *parse_time_expression("00:00:05.1", ntsc);
  CHECK(*parse_time_expression("152f", ntsc) < t);
  CHECK(t < *parse_time_expression("153f", ntsc));
  for (std::string_view bad : {"", "1:00:00", "00:60:00", "00:00:61", "10", "10x", "00:00:00.",
                               "0.5.5s", "-1s", "00:00", "00:00:00:", "1 s", "s"}) {
    INFO(bad);
    CHECK_FALSE(parse_time_expression(bad, plain));
  }
}
