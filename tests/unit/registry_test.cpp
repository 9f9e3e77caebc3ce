// The registry: look-up, sniffing, and the round trip of every format over what it carries.
#include <algorithm>
#include <catch2/catch.hpp>
#include <filesystem>
#include <limits>
#include <set>

#include "support.hpp"
#include "tiers/derive.hpp"
#include "tiers/merge.hpp"

using namespace tiers;
using namespace tiers::test;

namespace {

// What a document should look like after a round trip through format `f`: the
// specification of "lossless for what it declares", applied to the model.
document restrict_to(document doc, const format& f) {
  const feature_set fs = f.carries;
  auto owned = [&](std::string_view key) {
    return (!f.own_prefix.empty() && key.substr(0, f.own_prefix.size()) == f.own_prefix) ||
           std::find(f.own_keys.begin(), f.own_keys.end(), key) != f.own_keys.end();
  };
  auto keep_owned = [&](attribute_map& map) {
    erase_if(map, [&](const auto& kv) { return !owned(kv.first); });
  };
  if (!fs.has(feature::media)) {
    doc.media.uri.reset();
    doc.media.duration.reset();
  }
  if (!fs.has(feature::frame_rate)) doc.media.frame_rate.reset();
  if (!fs.has(feature::metadata)) keep_owned(doc.metadata);
  if (!fs.has(feature::empty_tiers))
    std::erase_if(doc.tiers, [](const tier& t) { return t.annotations.empty(); });
  const std::size_t words = word_tier_index(doc, f);
  if (!fs.has(feature::several_tiers) && doc.tiers.size() > 1) {
    std::vector<tier> kept{doc.tiers[0]};
    if (words != no_tier) kept.push_back(doc.tiers[words]);
    doc.tiers = std::move(kept);
  }
  for (std::size_t k = 0; k < doc.tiers.size(); ++k) {
    tier& t = doc.tiers[k];
    if (!fs.has(feature::instant_tiers)) t.kind = tier_kind::interval;
    if (!fs.has(feature::tier_sources)) t.source.reset();
    const bool inline_words = fs.has(feature::inline_words) && fs.has(feature::several_tiers) &&
                              t.parent && t.parent->rel == relation::within &&
                              t.name == t.parent->tier + ".words";
    if (!fs.has(feature::tier_parents) && !(k == 1 && words != no_tier) && !inline_words)
      t.parent.reset();
    if (!fs.has(feature::vocabularies)) t.vocabulary.reset();
    if (!fs.has(feature::tier_attributes)) keep_owned(t.attributes);
    for (annotation& a : t.annotations) {
      if (!fs.has(feature::markup)) a.markup.reset();
      if (!fs.has(feature::confidence)) a.confidence.reset();
      if (!fs.has(feature::ids)) a.id.reset();
      if (!fs.has(feature::parent_refs)) a.parent.reset();
      if (!fs.has(feature::annotation_attributes)) keep_owned(a.attributes);
    }
  }
  // TTML shows nothing of an annotation that does not end after it starts, nor of a div
  // without p; and its markup is XML content, which the rich document's cue markup is not.
  if (f.name == "ttml") {
    for (tier& t : doc.tiers) {
      std::erase_if(t.annotations, [](const annotation& a) { return a.end <= a.start; });
      for (annotation& a : t.annotations)
        if (a.markup && a.markup->find('<') != std::string::npos) a.markup.reset();
    }
    std::erase_if(doc.tiers, [](const tier& t) { return t.annotations.empty(); });
  }
  return doc;
}

// One-tier formats name their tier after the file: the test names it as the file would.
read_options options_for(const format& f, const document& doc) {
  read_options o;
  if (!f.carries.has(feature::several_tiers) && !doc.tiers.empty()) o.tier_name = doc.tiers[0].name;
  return o;
}

}  // namespace

TEST_CASE("every format round-trips what it declares it carries", "[registry][round-trip]") {
  const document full = rich_document();
  for (const format& f : formats()) {
    INFO("format " << f.name);
    const document expected = restrict_to(full, f);
    const read_options o = options_for(f, full);
    for (const std::string& loss : find_losses(expected, f))
      UNSCOPED_INFO("loss: " << loss);
    // The loss report and the declaration agree: nothing is reported for what is carried...
    for (const std::string& loss : find_losses(expected, f))
      UNSCOPED_INFO("loss: " << loss);
    CHECK(find_losses(expected, f).empty());
    // ...and writing the restricted document, then reading it, gives it back exactly.
    CHECK(read_as(f.name, write_as(f.name, expected), o) == expected);
    // Writing the full document drops exactly what the loss report lists.
    CHECK(find_losses(full, f).empty() == (expected == full));
    if (f.name != "ttml") CHECK(read_as(f.name, write_as(f.name, full), o) == expected);
  }
}

TEST_CASE("every format's output is recognised by its own sniffer first", "[registry]") {
  for (const format& f : formats()) {
    INFO("format " << f.name);
    const document doc = restrict_to(rich_document(), f);
    const auto sniffed = sniff_formats(write_as(f.name, doc));
    REQUIRE_FALSE(sniffed.empty());
    CHECK(sniffed.front()->name == f.name);
  }
  CHECK(sniff_formats("just some words").empty());
}

TEST_CASE("formats are found by name and by extension, in any case", "[registry]") {
  std::set<std::string_view> names;
  for (const format& f : formats()) {
    CHECK(names.insert(f.name).second);
    CHECK(find_format(f.name) == &f);
    for (std::string_view ext : f.extensions)
      CHECK(format_for_path("dir/file" + std::string(ext)) == &f);
  }
  CHECK(format_for_path("x.CSV") == find_format("csv"));
  CHECK(format_for_path("a.json.tsv") == find_format("tsv"));
  CHECK(format_for_path("noextension") == nullptr);
  CHECK(find_format("xml") == nullptr);
}

TEST_CASE("feature names are distinct lower-case words joined by hyphens", "[registry]") {
  std::set<std::string_view> names;
  for (int k = 0; k < feature_count; ++k) {
    const std::string_view name = to_string(static_cast<feature>(k));
    INFO(k);
    CHECK_FALSE(name.empty());
    CHECK(name.find_first_not_of("abcdefghijklmnopqrstuvwxyz-") == std::string_view::npos);
    CHECK(names.insert(name).second);
  }
}

TEST_CASE("loss reports name what is dropped", "[registry][loss]") {
  const std::vector<std::string> losses = find_losses(rich_document(), *find_format("csv"));
  const std::vector<std::string> expected = {
      "empty tier 'gaze (not yet annotated)'",
      "the instant kind (read back as zero-length intervals) of tier 'nods'",
      "the source of tiers 'captions', 'words'",
      "the parent link of tier 'words'",
      "the vocabulary of tier 'gestures'",
      "the attributes of tier 'captions'",
      "media uri, duration, frame rate",
      "document metadata (2 entries)",
  };
  CHECK(losses == expected);
}

TEST_CASE("every prefix of a valid file is read or refused with a located error",
          "[registry][bad-input]") {
  for (const format& f : formats()) {
    INFO("format " << f.name);
    const std::string text = write_as(f.name, restrict_to(rich_document(), f));
    for (std::size_t n = 0; n < text.size(); ++n) {
      const read_result r = read_document(std::string_view(text).substr(0, n), f, {}, "prefix");
      for (const diagnostic& d : r.diagnostics) {
        if (d.level != severity::error) continue;
        INFO(n << ": " << format_diagnostic(d));
        CHECK(d.line >= 1);
        CHECK(d.column >= 1);
      }
    }
  }
}

TEST_CASE("extreme times are summarised without overflow", "[info]") {
  document doc;
  tier& t = doc.tiers.emplace_back();
  t.name = "wide";
  annotation a;
  a.start = std::numeric_limits<time_ns>::min();
  a.end = std::numeric_limits<time_ns>::max();
  t.annotations = {a, a};
  const document_summary s = summarize(doc);
  CHECK(s.tiers[0].annotated == std::numeric_limits<time_ns>::max());
  CHECK(s.reference == std::numeric_limits<time_ns>::max());
}

TEST_CASE("a one-tier format loses a tier name the output's file name does not give back",
          "[loss]") {
  document d;
  d.tiers.emplace_back().name = "captions";
  const format& vtt = *find_format("vtt");
  CHECK(find_losses(d, vtt).empty());                            // a stream: no name to compare
  CHECK(find_losses(d, vtt, {"out/captions.vtt", ""}).empty());  // the stem gives it back
  CHECK(find_losses(d, vtt, {"x.vtt", "captions"}).empty());     // reading gave it: none lost
  CHECK(find_losses(d, vtt, {"x.vtt", ""}) ==
        std::vector<std::string>{"the tier name 'captions' (a vtt file names no tier; read back, "
                                 "it is named 'x' after the file)"});
  CHECK(find_losses(d, *find_format("json"), {"x.json", ""}).empty());
}

TEST_CASE("name tables spell an enumeration's values both ways", "[names]") {
  CHECK(name_of(clash_rule_names, clash_rule::prefix_source) == "prefix-source");
  CHECK(value_named(combine_strategy_names, "union") == combine_strategy::union_);
  CHECK_FALSE(value_named(combine_strategy_names, "Union"));
  CHECK(quoted_names(signal_format_names) == R"("csv", "tsv" or "jsonl")");
  CHECK(value_named(time_unit_names, "ms") == time_unit::milliseconds);
}

TEST_CASE("a signal table's format from its extension", "[names]") {
  CHECK(signal_format_for_path("a/b.TSV") == signal_format::tsv);
  CHECK(signal_format_for_path("x.tab") == signal_format::tsv);
  CHECK(signal_format_for_path("x.ndjson") == signal_format::jsonl);
  CHECK(signal_format_for_path("x.csv") == signal_format::csv);
  CHECK_FALSE(signal_format_for_path("x.json"));
  CHECK_FALSE(signal_format_for_path("csv"));
}

TEST_CASE("the words of a tier by the inline-words convention", "[names]") {
  CHECK(words_tier_name("captions") == "captions.words");
  tier w;
  w.name = "captions.words";
  CHECK_FALSE(is_words_tier_of(w, "captions"));  // no parent link
  w.parent = parent_link{"captions", relation::within};
  CHECK(is_words_tier_of(w, "captions"));
  CHECK_FALSE(is_words_tier_of(w, "other"));
  w.parent->rel = relation::partition;
  CHECK_FALSE(is_words_tier_of(w, "captions"));
  CHECK(find_format("vtt")->holds_captions);
  CHECK_FALSE(find_format("ttml")->holds_captions);
}

TEST_CASE(
    "every format of the registry has the documentation, sample and golden case that "
    "DEVELOPERS.md's steps for a format ask for",
    "[registry]") {
  namespace fs = std::filesystem;
  const fs::path source = TIERS_SOURCE_DIR;
  std::vector<std::string> titles, commands, samples;
  for (const auto& e : fs::directory_iterator(source / "docs" / "formats")) {
    const std::string page = test::slurp(e.path().string());
    titles.push_back(page.substr(0, page.find('\n')));
  }
  for (const auto& e : fs::directory_iterator(source / "tests" / "golden"))
    if (fs::exists(e.path() / "cmd")) commands.push_back(test::slurp((e.path() / "cmd").string()));
  for (const auto& e : fs::directory_iterator(source / "samples"))
    samples.push_back(e.path().filename().string());
  auto any_has = [](const std::vector<std::string>& texts, const std::string& what) {
    return std::any_of(texts.begin(), texts.end(),
                       [&](const std::string& t) { return t.find(what) != std::string::npos; });
  };
  for (const format& f : formats()) {
    INFO(f.name);
    const std::string name(f.name);
    CHECK(any_has(titles, "`" + name + "`"));  // a page of docs/formats/ titled with its name
    bool sample = false, golden = any_has(commands, " " + name);
    for (std::string_view ext : f.extensions) {
      sample = sample || any_has(samples, std::string(ext));
      golden = golden || any_has(commands, std::string(ext));
    }
    CHECK(sample);  // a file of samples/ in the format
    CHECK(golden);  // a golden case that reads or writes it
  }
}
