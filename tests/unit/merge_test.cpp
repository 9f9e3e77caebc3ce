// Merging on hand-built cases: the combining strategies (trimmed, not dropped), the review
// tier, clash rules, shifts and plans.
#include <catch2/catch.hpp>
#include <cmath>
#include <filesystem>
#include <fstream>

#include "tiers/merge.hpp"

using namespace tiers;

namespace {

annotation seg(double start, double end, std::string label, std::optional<double> conf = {}) {
  annotation a;
  a.start = std::llround(start * 1e9);
  a.end = std::llround(end * 1e9);
  a.text = std::move(label);
  a.confidence = conf;
  return a;
}

tier tier_of(std::string name, std::vector<annotation> as) {
  tier t;
  t.name = std::move(name);
  t.annotations = std::move(as);
  return t;
}

// "origin label start-end" for each annotation, in seconds.
std::vector<std::string> describe(const tier& t) {
  std::vector<std::string> out;
  for (const annotation& a : t.annotations) {
    char buf[128];
    const auto it = a.attributes.find("origin");
    std::snprintf(buf, sizeof buf, "%s %s %g-%g",
                  it == a.attributes.end() ? "-" : it->second.c_str(), a.text.c_str(),
                  static_cast<double>(a.start) / 1e9, static_cast<double>(a.end) / 1e9);
    out.push_back(buf);
  }
  return out;
}

const tier human = tier_of("human", {seg(0, 2, "stroke"), seg(4, 6, "hold")});
combine_step step_of(combine_strategy s = combine_strategy::human_first) {
  combine_step c;
  c.into = "gestures";
  c.human = "human";
  c.machine = "machine";
  c.strategy = s;
  return c;
}

const tier machine = tier_of("machine", {seg(1, 5, "stroke", 0.9), seg(7, 8, "prep", 0.3)});

}  // namespace

TEST_CASE("human-first keeps human annotations and fills the rest, trimmed", "[merge]") {
  combine_step step = step_of();
  step.min_confidence = 0.5;
  step.review = "review";
  const combined_tiers r = combine_tiers(human, machine, step);
  CHECK(describe(r.merged) ==
        std::vector<std::string>{"human stroke 0-2", "machine stroke 2-4", "human hold 4-6"});
  CHECK(r.machine_trimmed == 1);
  CHECK(r.machine_dropped == 1);  // prep, confidence 0.3
  CHECK(r.merged.annotations[1].confidence == 0.9);
  // Human annotations are kept exactly: every field.
  annotation expected = human.annotations[1];
  expected.attributes["origin"] = "human";
  CHECK(r.merged.annotations[2] == expected);
  REQUIRE(r.review);
  CHECK(describe(*r.review) == std::vector<std::string>{"- human: stroke; machine: none 0-1",
                                                        "- human: none; machine: stroke 2-4",
                                                        "- human: hold; machine: stroke 4-5",
                                                        "- human: hold; machine: none 5-6"});
  CHECK(r.review->annotations[2].attributes.at("disagreement") == "labels");
  CHECK(r.review->annotations[2].attributes.at("human") == "hold");
  CHECK(r.review->annotations[2].attributes.at("machine") == "stroke");
}

TEST_CASE("pieces shorter than the minimum duration are dropped; split pieces get ids", "[merge]") {
  tier m = tier_of("machine", {seg(1.95, 4.2, "beat", 0.8)});
  m.annotations[0].id = "m7";
  const tier h = tier_of("human", {seg(0, 2, "beat"), seg(3, 4, "beat")});
  combine_step step = step_of();
  step.min_duration = 100'000'000;
  const combined_tiers r = combine_tiers(h, m, step);
  // 1.95–2 is covered by the first human beat; 2–3 stays; 4–4.2 stays (200 ms).
  CHECK(describe(r.merged) == std::vector<std::string>{"human beat 0-2", "machine beat 2-3",
                                                       "human beat 3-4", "machine beat 4-4.2"});
  CHECK(r.merged.annotations[1].id == "m7.1");
  CHECK(r.merged.annotations[3].id == "m7.2");
  step.min_duration = 300'000'000;
  CHECK(combine_tiers(h, m, step).merged.annotations.size() == 3);
}

TEST_CASE("what was left out is counted by reason; short disagreements leave the review",
          "[merge]") {
  const tier h = tier_of("human", {seg(0, 2, "beat"), seg(10, 12, "beat")});
  const tier m = tier_of("machine", {seg(1.9, 2.1, "beat", 0.8),     // a 0.1 s piece after 2
                                     seg(10.5, 11.5, "beat", 0.9),   // wholly under a human beat
                                     seg(20, 21, "beat", 0.2),       // below the confidence
                                     seg(30, 30.15, "beat", 0.9)});  // kept whole: 0.15 s
  combine_step step = step_of();
  step.min_confidence = 0.5;
  step.min_duration = 150'000'000;
  step.review = "review";
  step.review_min = 200'000'000;
  const combined_tiers r = combine_tiers(h, m, step);
  CHECK(r.below_confidence == 1);
  CHECK(r.covered == 1);
  CHECK(r.too_short == 1);  // 2–2.1
  CHECK(r.machine_dropped == 3);
  CHECK(r.machine_kept == 1);
  REQUIRE(r.review);
  // The machine-only spans 2–2.1 (0.1 s) and 30–30.15 (0.15 s) are under 0.2 s and left out;
  // the human-only spans 0–1.9, 10–10.5 and 11.5–12 remain.
  CHECK(describe(*r.review) == std::vector<std::string>{"- human: beat; machine: none 0-1.9",
                                                        "- human: beat; machine: none 10-10.5",
                                                        "- human: beat; machine: none 11.5-12"});
  CHECK(r.review_short == 2);
  CHECK(r.review->attributes.at("merge:review_min") == "0.2s");
}

TEST_CASE("union keeps both sides where labels differ; intersection keeps agreement", "[merge]") {
  const tier h = tier_of("human", {seg(0, 2, "stroke")});
  const tier m = tier_of("machine", {seg(1, 3, "hold"), seg(1, 3, "stroke")});
  combine_step step = step_of(combine_strategy::union_);
  CHECK(describe(combine_tiers(h, m, step).merged) ==
        std::vector<std::string>{"human stroke 0-2", "machine hold 1-3", "machine stroke 2-3"});
  const tier h2 = tier_of("human", {seg(0, 4, "stroke")});
  const tier m2 = tier_of("machine", {seg(1, 2, "stroke"), seg(3, 5, "stroke"), seg(2, 3, "x")});
  step.strategy = combine_strategy::intersection;
  CHECK(describe(combine_tiers(h2, m2, step).merged) ==
        std::vector<std::string>{"human stroke 1-2", "human stroke 3-4"});
}

TEST_CASE("merging documents: clash rules, parents follow, media must agree", "[merge]") {
  auto input = [](std::string file, std::string agent) {
    merge_input in;
    in.file = std::move(file);
    in.doc.media.uri = "meeting.mp4";
    tier g = tier_of("gestures", {seg(1, 2, "beat")});
    g.source = tier_source{source_kind::machine, agent, std::nullopt};
    tier p = tier_of("phases", {seg(1, 2, "stroke")});
    p.parent = parent_link{"gestures", relation::within};
    in.doc.tiers = {g, p};
    return in;
  };
  merge_plan plan;
  merge_result r = merge_documents({input("a/anna.json", "x"), input("b/ben.json", "y")}, plan);
  REQUIRE_FALSE(r.ok());
  CHECK(r.diagnostics.back().code == "merge.clash");
  CHECK(r.diagnostics.back().message ==
        "more than one input has the tiers 'gestures', 'phases'; choose how to keep them apart: "
        "--clash prefix-file or prefix-source");

  plan.clash = clash_rule::prefix_file;
  r = merge_documents({input("a/anna.json", "x"), input("b/ben.json", "y")}, plan);
  REQUIRE(r.ok());
  REQUIRE(r.value.tiers.size() == 4);
  CHECK(r.value.tiers[0].name == "anna:gestures");
  CHECK(r.value.tiers[3].name == "ben:phases");
  CHECK(r.value.tiers[3].parent->tier == "ben:gestures");
  CHECK(r.value.tiers[0].source->agent == "x");  // every tier keeps its source
  CHECK(r.value.metadata.at("merge:inputs") == "a/anna.json\nb/ben.json");
  CHECK(r.value.metadata.at("merge:plan").find("\"clash\": \"prefix-file\"") != std::string::npos);

  plan.clash = clash_rule::prefix_source;
  r = merge_documents({input("a/anna.json", "x"), input("b/ben.json", "y")}, plan);
  REQUIRE(r.ok());
  CHECK(r.value.tiers[2].name == "y:gestures");
  r = merge_documents({input("a/anna.json", "x"), input("b/ben.json", "x")}, plan);
  CHECK_FALSE(r.ok());  // both from agent x: the names still clash, and that is said

  merge_input other = input("c.json", "z");
  other.doc.media.uri = "another.mp4";
  plan.clash = clash_rule::prefix_file;
  r = merge_documents({input("a.json", "x"), other}, plan);
  REQUIRE_FALSE(r.ok());
  CHECK(r.diagnostics.front().code == "merge.media");
}

TEST_CASE("shifts: by a constant, and by an estimated offset with its spread", "[merge]") {
  merge_input human_in, machine_in;
  human_in.file = "human.json";
  machine_in.file = "machine.json";
  tier h = tier_of("human", {});
  tier m = tier_of("machine", {});
  for (int k = 0; k < 20; ++k) {
    h.annotations.push_back(seg(2.0 * k, 2.0 * k + 1, k % 3 ? "beat" : "point"));
    // The machine's clock runs 0.48 s early, give or take 10 ms.
    m.annotations.push_back(
        seg(2.0 * k - 0.48 + (k % 2 ? 0.01 : -0.01), 2.0 * k + 0.5, k % 3 ? "beat" : "point", 0.9));
  }
  human_in.doc.tiers = {h};
  machine_in.doc.tiers = {m};
  const auto e = estimate_offset(m, h, 10 * ns_per_second);
  REQUIRE(e);
  CHECK(std::abs(e->offset - 480'000'000) <= 10'000'000);
  CHECK(e->spread == 10'000'000);
  CHECK(e->pairs == 20);

  merge_plan plan;
  shift_step estimated, constant;
  estimated.tier = "machine";
  estimated.align_to = "human";
  constant.tier = "human";
  constant.by = ns_per_second;
  plan.shifts = {estimated, constant};
  const merge_result r = merge_documents({human_in, machine_in}, plan);
  REQUIRE(r.ok());
  CHECK(r.value.tiers[0].annotations[0].start == ns_per_second);
  CHECK(
      r.value.metadata.at("merge:shift:machine").find("estimated against 'human' from 20 pairs") !=
      std::string::npos);
}

TEST_CASE("plans: read, written back the same, mistakes located", "[merge]") {
  const char* text = R"({"clash": "prefix-source",
    "shift": [{"tier": "machine:gestures", "by": "-0.5s"}],
    "combine": [{"into": "gestures", "human": "human:gestures", "machine": "machine:gestures",
                 "strategy": "union", "min_confidence": 0.6, "min_duration": "120ms",
                 "review": "check-these"}]})";
  const plan_result r = read_merge_plan(text, "plan.json");
  REQUIRE(r.ok());
  CHECK(r.value.clash == clash_rule::prefix_source);
  CHECK(r.value.shifts[0].by == -500'000'000);
  CHECK(r.value.combine[0].strategy == combine_strategy::union_);
  CHECK(r.value.combine[0].min_duration == 120'000'000);
  const plan_result again = read_merge_plan(plan_json(r.value), "again.json");
  REQUIRE(again.ok());
  CHECK(plan_json(again.value) == plan_json(r.value));

  const plan_result bad = read_merge_plan(
      "{\"combine\": [{\"into\": \"g\", \"human\": \"h\",\n \"strategy\": "
      "\"both\"}]}",
      "plan.json");
  REQUIRE_FALSE(bad.ok());
  CHECK(bad.diagnostics[0].code == "plan.member");  // no 'machine'
  CHECK(bad.diagnostics[1].code == "plan.value");
  CHECK(bad.diagnostics[1].line == 2);
  CHECK(bad.diagnostics[1].column == 14);
}

TEST_CASE("a plan's inputs stay inside its folder once links are followed", "[merge][hostile]") {
  // `../` was refused while a symbolic link to the same place was followed: one rule now holds
  // for the resolved path (docs/security.md).
  namespace fs = std::filesystem;
  const fs::path top = fs::temp_directory_path() / "tiers-plan-links";
  fs::remove_all(top);
  fs::create_directories(top / "plan" / "sub");
  fs::create_directories(top / "elsewhere");
  for (const fs::path& f : {top / "plan" / "a.json", top / "plan" / "sub" / "b.json",
                            top / "elsewhere" / "secret.json"})
    std::ofstream(f) << "{}";
  fs::create_symlink(top / "elsewhere" / "secret.json", top / "plan" / "link.json");
  fs::create_symlink(top / "elsewhere", top / "plan" / "away");
  fs::create_symlink("sub/b.json", top / "plan" / "inner.json");  // stays inside: allowed
  const std::string plan_file = (top / "plan" / "plan.json").string();
  auto placed = [&](std::vector<std::string> inputs) {
    merge_plan p;
    p.inputs = std::move(inputs);
    const std::vector<diagnostic> d = place_plan_inputs(p, plan_file);
    return d.empty() ? p.inputs : std::vector<std::string>{"refused: " + d.at(0).message};
  };
  CHECK(placed({"a.json", "sub/b.json", "inner.json"}) ==
        std::vector<std::string>{(top / "plan" / "a.json").string(),
                                 (top / "plan" / "sub" / "b.json").string(),
                                 (top / "plan" / "inner.json").string()});
  for (const std::string& out :
       {std::string("link.json"), std::string("away/secret.json"),
        std::string("../elsewhere/secret.json"), std::string("sub/../../elsewhere/secret.json"),
        (top / "plan" / "a.json").string()}) {
    INFO(out);
    const std::vector<std::string> r = placed({"a.json", out});
    REQUIRE(r.size() == 1);
    CHECK(r[0].starts_with("refused: input '" + out + "' is outside the plan's folder"));
  }
  fs::remove_all(top);
}
