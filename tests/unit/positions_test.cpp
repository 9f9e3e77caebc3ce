// Source positions: every reader says where each tier and annotation is, and the line it names
// holds that annotation.
#include <catch2/catch.hpp>

#include "support.hpp"

using namespace tiers;

namespace {

std::string line_at(std::string_view text, std::size_t line) {
  std::size_t start = 0;
  for (std::size_t k = 1; k < line; ++k)
    start = text.find('\n', start) + 1;
  return std::string(text.substr(start, text.find('\n', start) - start));
}

}  // namespace

TEST_CASE("every reader locates each annotation of the samples", "[positions]") {
  // file, format, what the line of every annotation contains
  const std::vector<std::tuple<std::string, std::string, std::string>> cases{
      {"panel-discussion.json", "json", "\"start\""}, {"panel-discussion.csv", "csv", ","},
      {"panel-discussion.tsv", "tsv", "\t"},          {"panel-discussion.tiers", "tiers", ":"},
      {"panel-discussion.ttml", "ttml", "<p"},        {"panel-discussion.vtt", "vtt", "-->"},
  };
  for (const auto& [file, name, marker] : cases) {
    CAPTURE(file);
    const std::string text = test::sample(file);
    read_options options;
    options.positions = true;
    options.tier_name = "captions";
    const read_result r = read_document(text, *find_format(name), options, file);
    REQUIRE(r.ok());
    REQUIRE(r.positions.tiers.size() == r.value.tiers.size());
    std::size_t previous_line = 0;
    for (std::size_t t = 0; t < r.value.tiers.size(); ++t) {
      CHECK(r.positions.of_tier(t).line > 0);
      // Word tiers made from cue text sit inside their cues: their lines are the cues'.
      if (r.value.tiers[t].name.ends_with(".words")) continue;
      for (std::size_t a = 0; a < r.value.tiers[t].annotations.size(); ++a) {
        const source_position p = r.positions.of_annotation(t, a);
        REQUIRE(p.line > 0);
        CHECK(p.column >= 1);
        CHECK(line_at(text, p.line).find(marker) != std::string::npos);
        if (name != "csv" && name != "tsv") CHECK(p.line > previous_line);
        previous_line = p.line;
      }
    }
  }
}

TEST_CASE("positions are left out unless asked for", "[positions]") {
  const read_result r =
      read_document("tier,start,end,text\na,1,2,x\n", *find_format("csv"), read_options{});
  REQUIRE(r.ok());
  CHECK(r.positions.tiers.empty());
  CHECK(r.positions.of_annotation(0, 0).line == 0);
}

TEST_CASE("table rows are located by their physical line", "[positions]") {
  read_options options;
  options.positions = true;
  const read_result r =
      read_document("tier,start,end,text\na,1,2,\"two\nlines\"\nb,3,4,y\na,5,6,z\n",
                    *find_format("csv"), options);
  REQUIRE(r.ok());
  REQUIRE(r.value.tiers.size() == 2);
  CHECK(r.positions.of_tier(1).line == 4);
  CHECK(r.positions.of_annotation(0, 1).line == 5);
  CHECK(r.positions.of_annotation(1, 0).line == 4);
}
