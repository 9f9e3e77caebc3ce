// Dataset descriptions, patterns, the recordings they find, and a recording's files joined.
#include <catch2/catch.hpp>
#include <filesystem>
#include <fstream>

#include "support.hpp"
#include "tiers/dataset.hpp"

namespace tiers {
namespace {

namespace fs = std::filesystem;

const char* const example = R"({"format": "tiers-dataset", "version": 1,
 "sources": [
  {"pattern": "captions/{id}.vtt", "rename": {"*": "captions"}},
  {"pattern": "aligner/{id}.csv", "read": {"columns": "start=t_begin_ms,end=t_end_ms,text=token",
   "time_unit": "ms", "tier_name": "words"},
   "source": {"kind": "machine", "agent": "aligner", "version": "2.1"}},
  {"pattern": "coding/{id}.gestures.csv", "read": {"rate": 25, "strict": true}, "kind": "interval",
   "source": {"kind": "human", "agent": "coder-a"}}
 ]})";

TEST_CASE("a dataset description reads, and writes back as it reads", "[dataset]") {
  const dataset_result r = read_dataset(example, "dataset.json");
  REQUIRE(r.ok());
  REQUIRE(r.value.sources.size() == 3);
  const dataset_source& aligner = r.value.sources[1];
  CHECK(aligner.pattern == "aligner/{id}.csv");
  CHECK(aligner.read.size() == 3);
  CHECK(aligner.read[1] == std::pair<std::string, std::string>{"time_unit", "ms"});
  CHECK(aligner.source == tier_source{source_kind::machine, "aligner", "2.1"});
  CHECK(r.value.sources[0].rename.front().first == "*");
  // Numbers and booleans are taken as written, for the reader of the files to check.
  CHECK(r.value.sources[2].read[0].second == "25");
  CHECK(r.value.sources[2].read[1].second == "true");
  CHECK(r.value.sources[2].kind == tier_kind::interval);
  CHECK_FALSE(r.value.sources[2].signal);
  const dataset_result scores = read_dataset(
      R"({"format": "tiers-dataset", "version": 1, "sources": [{"pattern": "scores/{id}.csv",
          "kind": "signal", "read": {"rate": "25"}}]})",
      "d.json");
  REQUIRE(scores.ok());
  CHECK(scores.value.sources[0].signal);
  CHECK(dataset_json(scores.value).find(R"("kind": "signal")") != std::string::npos);

  const std::string text = dataset_json(r.value);
  test::save_json_output("dataset-description", text);
  const dataset_result again = read_dataset(text, "again.json");
  REQUIRE(again.ok());
  CHECK(dataset_json(again.value) == text);
}

TEST_CASE("a dataset description's mistakes are located", "[dataset]") {
  struct bad_case {
    const char* text;
    const char* code;
    std::size_t line, column;
  };
  const bad_case cases[]{
      {"{\"format\": \"tiers-dataset\", \"version\": 1,\n \"sources\": [{\"pattern\": "
       "\"captions/*.vtt\"}]}",
       "dataset.value", 2, 26},  // no {id}
      {"{\"format\": \"tiers-dataset\", \"version\": 1,\n \"sources\": [{\"pattern\": "
       "\"../{id}.vtt\"}]}",
       "dataset.value", 2, 26},  // outside the folder
      {"{\"format\": \"tiers-dataset\", \"version\": 1,\n \"sources\": [{\"pattern\": "
       "\"/data/{id}.vtt\"}]}",
       "dataset.value", 2, 26},
      {"{\"format\": \"tiers-dataset\", \"version\": 1,\n \"sources\": [{\"pattern\": "
       "\"{id}/{id}.vtt\"}]}",
       "dataset.value", 2, 26},
      {"{\"format\": \"tiers-dataset\", \"version\": 1, \"sources\": [\n {\"pattern\": "
       "\"{id}.csv\", \"read\": {\"time-unit\": \"ms\"}}]}",
       "dataset.member", 2, 35},  // the option's name has underscores
      {"{\"format\": \"tiers-dataset\", \"version\": 1, \"sources\": [\n {\"pattern\": "
       "\"{id}.csv\", \"source\": {\"kind\": \"robot\"}}]}",
       "dataset.value", 2, 45},
      {"{\"format\": \"tiers-dataset\", \"version\": 1, \"sources\": [\n {\"pattern\": "
       "\"{id}.csv\", \"kind\": \"point\"}]}",
       "dataset.value", 2, 34},  // "signal" is the third kind
      {"{\"format\": \"tiers-dataset\", \"version\": 1, \"sources\": [\n {\"pattern\": "
       "\"{id}.csv\"}, {\"pattern\": \"{id}.csv\"}]}",
       "dataset.value", 2, 39},  // one pattern twice
      {"{\"format\": \"tiers-dataset\", \"version\": 2, \"sources\": []}", "dataset.value", 1, 40},
      {"{\"format\": \"tiers-dataset\", \"version\": 1}", "dataset.member", 1, 1},
  };
  for (const bad_case& c : cases) {
    INFO(c.text);
    const dataset_result r = read_dataset(c.text, "d.json");
    REQUIRE_FALSE(r.ok());
    CHECK(r.diagnostics.front().code == c.code);
    CHECK(r.diagnostics.front().file == "d.json");
    CHECK(r.diagnostics.front().line == c.line);
    CHECK(r.diagnostics.front().column == c.column);
  }
}

TEST_CASE("patterns: {id} takes as little as it can, * stays in a folder, ** spans folders",
          "[dataset]") {
  CHECK(match_pattern("captions/{id}.vtt", "captions/ep01.vtt") == "ep01");
  CHECK(match_pattern("captions/{id}.vtt", "captions/sub/ep01.vtt") == std::nullopt);
  CHECK(match_pattern("coding/{id}.gestures.csv", "coding/ep01.gestures.csv") == "ep01");
  CHECK(match_pattern("coding/{id}.gestures.csv", "coding/ep01.csv") == std::nullopt);
  CHECK(match_pattern("{id}.csv", "ep.01.csv") == "ep.01");
  CHECK(match_pattern("{id}*.csv", "ep01-take2.csv") == "e");  // the shortest id
  CHECK(match_pattern("*/{id}.csv", "2024/ep01.csv") == "ep01");
  CHECK(match_pattern("*/{id}.csv", "2024/05/ep01.csv") == std::nullopt);
  CHECK(match_pattern("**/{id}.csv", "ep01.csv") == "ep01");
  CHECK(match_pattern("**/{id}.csv", "2024/05/ep01.csv") == "ep01");
  CHECK(match_pattern("{id}/**", "ep01/a/b.csv") == "ep01");
  CHECK(match_pattern("{id}/**", "ep01") == std::nullopt);
  CHECK(match_pattern("a/{id}.vtt", "a/.vtt") == std::nullopt);  // an id is never empty
}

TEST_CASE("a source's files name their tier after the pattern, not after the recording",
          "[dataset]") {
  CHECK(tier_name_of("coding/{id}.gestures.csv") == "gestures");
  CHECK(tier_name_of("captions/{id}.vtt") == "captions");
  CHECK(tier_name_of("{id}_head-nods.tsv") == "head-nods");
  CHECK(tier_name_of("aligner/words-{id}") == "words");
  CHECK(tier_name_of("**/{id}.vtt").empty());
  CHECK(tier_name_of("captions/**/{id}.vtt") == "captions");
  CHECK(tier_name_of("captions/**/**/{id}.vtt") == "captions");
  CHECK(tier_name_of("sub*/**/{id}.vtt").empty());
  CHECK(tier_name_of("{id}.vtt").empty());
  CHECK(tier_name_of("sub*/{id}.vtt").empty());
}

void touch(const fs::path& p) {
  fs::create_directories(p.parent_path());
  std::ofstream(p) << "x";
}

TEST_CASE("recordings are found by their sources, and what each lacks is known", "[dataset]") {
  const fs::path root = fs::temp_directory_path() / "tiers-dataset-find";
  fs::remove_all(root);
  for (const char* f :
       {"captions/ep01.vtt", "captions/ep02.vtt", "captions/.ep09.vtt", "captions/notes.txt",
        "aligner/ep01.csv", "aligner/ep03.csv", "coding/deep/er/ep01.gestures.csv"})
    touch(root / f);
  dataset_description d;
  for (const char* p : {"captions/{id}.vtt", "aligner/{id}.csv", "coding/**/{id}.gestures.csv"})
    d.sources.emplace_back().pattern = p;
  const auto r = find_recordings(d, root.string(), "d.json");
  REQUIRE(r.ok());
  REQUIRE(r.value.size() == 3);
  CHECK(r.value[0].id == "ep01");
  CHECK(r.value[0].files == std::vector<std::string>{"captions/ep01.vtt", "aligner/ep01.csv",
                                                     "coding/deep/er/ep01.gestures.csv"});
  CHECK(r.value[0].complete());
  CHECK(r.value[1].id == "ep02");
  CHECK(r.value[1].files == std::vector<std::string>{"captions/ep02.vtt", "", ""});
  CHECK_FALSE(r.value[1].complete());
  CHECK(r.value[2].id == "ep03");

  // A link that stays inside the folder is a file like any other; one that leads out is refused.
  touch(root.parent_path() / "tiers-dataset-elsewhere" / "secret.csv");
  fs::create_symlink(root / "aligner/ep03.csv", root / "aligner/ep04.csv");
  const auto linked = find_recordings(d, root.string(), "d.json");
  REQUIRE(linked.ok());
  CHECK(linked.value.size() == 4);
  fs::create_symlink(root.parent_path() / "tiers-dataset-elsewhere" / "secret.csv",
                     root / "aligner/ep05.csv");
  const auto outside = find_recordings(d, root.string(), "d.json");
  REQUIRE_FALSE(outside.ok());
  CHECK(outside.diagnostics.front().code == "dataset.outside");
  CHECK(outside.diagnostics.front().message.find("aligner/ep05.csv") != std::string::npos);
  fs::remove(root / "aligner/ep05.csv");
  fs::remove(root / "aligner/ep04.csv");
  fs::remove_all(root.parent_path() / "tiers-dataset-elsewhere");

  touch(root / "coding/ep01.gestures.csv");  // a second file for ep01 of that source
  const auto twice = find_recordings(d, root.string(), "d.json");
  REQUIRE_FALSE(twice.ok());
  CHECK(twice.diagnostics.front().code == "dataset.ambiguous");
  CHECK(twice.diagnostics.front().message.find("coding/deep/er/ep01.gestures.csv") !=
        std::string::npos);
  fs::remove_all(root);
}

tier tier_named(const char* name, time_ns start, time_ns end) {
  tier t;
  t.name = name;
  annotation a;
  a.start = start;
  a.end = end;
  t.annotations.push_back(a);
  return t;
}

document two_tier_document() {
  document doc;
  doc.tiers.push_back(tier_named("hands", 0, 1'000'000'000));
  doc.tiers.push_back(tier_named("strokes", 5, 5));
  doc.tiers.back().parent = parent_link{"hands", relation::within};
  return doc;
}

TEST_CASE("a source names its tiers, says who made them and what they stand for", "[dataset]") {
  document doc = two_tier_document();
  dataset_source s;
  s.rename = {{"hands", "gesture"}, {"feet", "steps"}};
  s.source = parse_tier_source("human:coder-a");
  std::vector<diagnostic> d = apply_source(doc, s, "ep01.csv");
  REQUIRE(d.size() == 1);  // no tier 'feet'
  CHECK(d[0].level == severity::warning);
  CHECK(doc.tiers[0].name == "gesture");
  CHECK(doc.tiers[1].parent->tier == "gesture");  // the link follows the name
  CHECK(doc.tiers[1].source == tier_source{source_kind::human, "coder-a", std::nullopt});

  dataset_source every;
  every.rename = {{"*", "same"}};
  document both = two_tier_document();
  d = apply_source(both, every, "ep01.csv");
  REQUIRE(has_errors(d));
  CHECK(d.back().code == "input.rename");

  dataset_source instants;
  instants.kind = tier_kind::instant;
  document spans = two_tier_document();
  d = apply_source(spans, instants, "ep01.csv");
  REQUIRE(d.size() == 1);  // 'hands' spans a second; 'strokes' may be instants
  CHECK(d[0].code == "input.kind");
  CHECK(d[0].message.find("'hands'") != std::string::npos);
  CHECK(spans.tiers[1].kind == tier_kind::instant);
}

TEST_CASE("a tier source as --source writes it: a kind, an agent, a version", "[dataset]") {
  CHECK(parse_tier_source("machine:aligner@2.1") ==
        tier_source{source_kind::machine, "aligner", "2.1"});
  CHECK(parse_tier_source("human") == tier_source{source_kind::human, std::nullopt, std::nullopt});
  CHECK(parse_tier_source("machine:detector@v1@rc") ==
        tier_source{source_kind::machine, "detector@v1", "rc"});
  CHECK_FALSE(parse_tier_source("robot:x"));
  CHECK_FALSE(parse_tier_source("machine:"));
  CHECK_FALSE(parse_tier_source("machine:x@"));
}

TEST_CASE("a recording's files join into one document", "[dataset]") {
  document a = two_tier_document();
  a.media.uri = "ep01.mp4";
  a.metadata["coder"] = "a";
  document b;
  b.tiers.push_back(tier_named("words", 0, 1));
  b.media.duration = 60'000'000'000;
  b.metadata["coder"] = "b";
  std::vector<std::string> files;
  result<document> r = join_recording({{"a.csv", a}, {"b.csv", b}}, &files);
  REQUIRE(r.ok());
  CHECK(r.value.tiers.size() == 3);
  CHECK(files == std::vector<std::string>{"a.csv", "a.csv", "b.csv"});
  CHECK(r.value.media.uri == "ep01.mp4");
  CHECK(r.value.media.duration == 60'000'000'000);
  REQUIRE(r.diagnostics.size() == 1);
  CHECK(r.diagnostics[0].code == "dataset.metadata");
  CHECK(r.value.metadata.at("coder") == "a");

  document c;
  c.tiers.push_back(tier_named("hands", 0, 1));
  c.media.uri = "ep02.mp4";
  r = join_recording({{"a.csv", a}, {"c.csv", c}});
  REQUIRE_FALSE(r.ok());
  CHECK(r.diagnostics[0].code == "dataset.media");
  CHECK(r.diagnostics[1].code == "dataset.clash");
  CHECK(r.diagnostics[1].file == "c.csv");
  CHECK(r.diagnostics[1].message.find("a.csv") != std::string::npos);
}

}  // namespace
}  // namespace tiers
