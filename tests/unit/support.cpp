// Shared unit-test helpers (see support.hpp).
#include "support.hpp"

#include <cmath>

#include <unistd.h>
#include <catch2/catch.hpp>
#include <cstdlib>
#include <filesystem>
#include <fstream>

namespace tiers::test {

document rich_document() {
  document doc;
  doc.media = {"recordings/panel-07.mp4", 95 * ns_per_second + 40'000'000, rational{30000, 1001}};
  doc.metadata = {{"project", "invented demo"}, {"session", "7"}};
  tier captions;
  captions.name = "captions";
  captions.source = tier_source{source_kind::human, "captioner-2", std::nullopt};
  captions.attributes = {{"language", "en"}};
  annotation c1;
  c1.start = 1'250'000'000;
  c1.end = 3'999'000'000;
  c1.text = "Welcome, everyone — \"quoted\"\nsecond line";
  c1.markup = "<v Host>Welcome, everyone — \"quoted\"\nsecond line";
  c1.id = "c1";
  c1.attributes = {{"speaker", "Host"}};
  annotation c2;
  c2.start = 4'000'000'000;
  c2.end = 7'123'000'000;
  c2.text = "tab\there, comma, and a backslash \\ ünïcödé";
  c2.id = "c2";
  captions.annotations = {c1, c2};

  tier words;
  words.name = "words";
  words.parent = parent_link{"captions", relation::refers};
  words.source = tier_source{source_kind::machine, "aligner-demo", "0.9.1"};
  for (time_ns k = 0; k < 5; ++k) {
    annotation w;
    w.start = 1'250'000'000 + k * 333'333'333;
    w.end = w.start + 300'000'001;
    w.text = std::string("w") + std::to_string(k);
    w.confidence = 0.1 + 0.2 * static_cast<double>(k);
    w.parent = "c1";
    words.annotations.push_back(w);
  }

  tier gestures;
  gestures.name = "gestures";
  gestures.vocabulary = std::vector<std::string>{"beat", "point", "rest"};
  annotation g;
  g.start = 2'000'000'000;
  g.end = 2'600'000'000;
  g.text = "beat";
  gestures.annotations = {g};

  tier nods;
  nods.name = "nods";
  nods.kind = tier_kind::instant;
  annotation n;
  n.start = n.end = 5'500'000'000;
  n.text = "nod";
  nods.annotations = {n};

  tier empty;
  empty.name = "gaze (not yet annotated)";
  doc.tiers = {captions, words, gestures, nods, empty};
  return doc;
}

std::string slurp(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}

std::string sample(std::string_view name) {
  return slurp(std::string(TIERS_SAMPLES_DIR) + "/" + std::string(name));
}

std::string write_as(std::string_view name, const document& doc) {
  const format* f = find_format(name);
  REQUIRE(f != nullptr);
  std::string out;
  {
    string_sink sink(out);
    f->write(doc, sink, {});
  }
  if (name == "json") save_json_output("write_as", out);
  if (name == "ttml") save_output("write_as", out, "ttml");
  return out;
}

document read_as(std::string_view name, std::string_view text, const read_options& options) {
  const format* f = find_format(name);
  REQUIRE(f != nullptr);
  read_result r = read_document(text, *f, options, "test");
  for (const diagnostic& d : r.diagnostics)
    UNSCOPED_INFO(format_diagnostic(d));
  REQUIRE(r.ok());
  return r.value;
}

diagnostic first_error(std::string_view name, std::string_view text, const read_options& options) {
  const format* f = find_format(name);
  REQUIRE(f != nullptr);
  read_result r = read_document(text, *f, options, "test");
  for (const diagnostic& d : r.diagnostics)
    if (d.level == severity::error) return d;
  FAIL("expected an error reading " << name << ": " << text);
  return {};
}

void save_json_output(std::string_view label, std::string_view json) {
  save_output(label, json, "json");
}

void save_output(std::string_view label, std::string_view text, std::string_view extension) {
  const char* dir = std::getenv("TIERS_TEST_OUTPUT");
  if (!dir || !*dir) return;
  // Test cases run as separate processes, possibly at once: the process id keeps names apart.
  static int counter = 0;
  std::filesystem::create_directories(dir);
  const std::string path = std::string(dir) + "/" + std::string(label) + "-" +
                           std::to_string(::getpid()) + "-" + std::to_string(++counter) + "." +
                           std::string(extension);
  std::ofstream(path, std::ios::binary) << text;
}

annotation seg(double start, double end, std::string label) {
  annotation a;
  a.start = std::llround(start * 1e9);
  a.end = std::llround(end * 1e9);
  a.text = std::move(label);
  return a;
}

tier tier_of(std::vector<annotation> annotations) {
  tier t;
  t.annotations = std::move(annotations);
  return t;
}

}  // namespace tiers::test
