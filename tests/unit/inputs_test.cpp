// What programs do with their inputs (tiers/inputs.hpp): settings checked into reading options,
// files found in folders, durations read, and work on threads that fails without ending the
// process.
#include <catch2/catch.hpp>

#include <atomic>
#include <filesystem>
#include <fstream>
#include <stdexcept>

#include "support.hpp"
#include "tiers/inputs.hpp"

using namespace tiers;

TEST_CASE("inputs: reading settings become read options, bad values usage errors", "[inputs]") {
  reading_settings s;
  s.columns = "start=Begin,end=End";
  s.time_unit = "frames";
  s.rate = "30000/1001";
  const read_options o = reading_options(s, "dir/talk.gestures.csv");
  CHECK(o.tier_name == "talk.gestures");  // the file's stem
  CHECK(o.rate == rational{30000, 1001});
  CHECK(o.unit == time_unit::frames);
  CHECK(o.columns.size() == 2);
  for (auto bad :
       {&reading_settings::rate, &reading_settings::time_unit, &reading_settings::from,
        &reading_settings::columns, &reading_settings::source, &reading_settings::kind}) {
    reading_settings b;
    b.*bad = "nonsense";
    CHECK_THROWS_AS(reading_options(b, "x.csv"), usage_error);
  }
}

TEST_CASE("inputs: a file read as the settings say, its tiers given their source", "[inputs]") {
  reading_settings s;
  s.source = "machine:demo-aligner@2.1";
  const read_result r =
      read_input_file(std::string(TIERS_SAMPLES_DIR) + "/panel-discussion.vtt", s);
  REQUIRE(r.ok());
  REQUIRE_FALSE(r.value.tiers.empty());
  REQUIRE(r.value.tiers.front().source);
  CHECK(r.value.tiers.front().source->kind == source_kind::machine);
  CHECK(r.value.tiers.front().source->agent == "demo-aligner");
  CHECK_THROWS_AS(read_input_file("no/such/file.vtt", {}), error);
}

TEST_CASE("inputs: folders give their tier files, sorted, hidden ones and others left out",
          "[inputs]") {
  namespace fs = std::filesystem;
  const fs::path root = fs::temp_directory_path() / "tiers-inputs-test";
  fs::remove_all(root);
  fs::create_directories(root / "b" / ".hidden");
  for (const char* name : {"b/2.vtt", "a.csv", "b/.hidden/x.vtt", "notes.txt", "b/1.json"})
    std::ofstream(root / name) << "";
  std::vector<std::string> found;
  for (const input_file& f : expand_inputs({root.string(), (root / "a.csv").string()}))
    found.push_back(f.relative);
  CHECK(found == std::vector<std::string>{"a.csv", "b/1.json", "b/2.vtt"});  // a.csv once
  fs::remove_all(root);
}

TEST_CASE("inputs: durations as options give them", "[inputs]") {
  CHECK(parse_duration_option("--step", "250ms") == 250'000'000);
  CHECK(parse_duration_option("--step", "2f", duration_kind::length, rational{25, 1}) ==
        80'000'000);
  CHECK(parse_duration_option("--shift", "-0.5s", duration_kind::offset) == -500'000'000);
  CHECK_THROWS_AS(parse_duration_option("--step", "0", duration_kind::positive), usage_error);
  CHECK_THROWS_AS(parse_duration_option("--step", "-1s"), usage_error);
  CHECK_THROWS_AS(parse_duration_option("--step", "2f"), usage_error);  // frames, no rate
}

TEST_CASE("inputs: work on threads runs every call, and a throw comes back to the caller",
          "[inputs]") {
  std::atomic<std::size_t> sum{0}, done{0};
  run_parallel(
      1000, 4, [&](std::size_t k) { sum += k; }, &done);
  CHECK(sum == 999 * 1000 / 2);
  CHECK(done == 1000);
  // A usage error met by a worker (a frame duration for a document without a rate) must not
  // end the process: it is the caller's to report.
  std::atomic<std::size_t> started{0};
  CHECK_THROWS_AS(run_parallel(1000, 4,
                               [&](std::size_t k) {
                                 ++started;
                                 if (k == 10) throw usage_error("--window: frames, no rate");
                               }),
                  usage_error);
  CHECK(started < 1000);  // no further work was handed out
}
