// Hostile input, in process: every sample cut at every byte, random bytes, and the resource
// limits. A reader may refuse, but never crash or hang, and says what and where.
#include <algorithm>
#include <catch2/catch.hpp>
#include <random>

#include "detail/utf8.hpp"
#include "support.hpp"

using namespace tiers;

namespace {

// Every diagnostic says what and where (when it has a byte offset, a line and column too).
void require_worded(const read_result& r, std::string_view input) {
  for (const diagnostic& d : r.diagnostics) {
    INFO(format_diagnostic(d));
    REQUIRE_FALSE(d.code.empty());
    REQUIRE_FALSE(d.message.empty());
    if (d.offset != no_offset) {
      // WebVTT is read from a copy with U+FFFD (3 bytes) for each invalid byte, and is located
      // there
      REQUIRE(d.offset <= 3 * input.size() + 3);
      REQUIRE(d.line > 0);
    }
  }
  if (!r.ok()) REQUIRE(has_errors(r.diagnostics));
}

const std::vector<std::pair<std::string, std::string>> samples{
    {"panel-discussion.json", "json"},     {"panel-discussion.csv", "csv"},
    {"panel-discussion.tsv", "tsv"},       {"panel-discussion.vtt", "vtt"},
    {"panel-discussion.ttml", "ttml"},     {"panel-discussion.tiers", "tiers"},
    {"panel-discussion.flat.json", "json"}};

}  // namespace

TEST_CASE("every sample cut at every byte is read or refused, with a located reason", "[hostile]") {
  for (const auto& [file, name] : samples) {
    const std::string text = test::sample(file);
    REQUIRE_FALSE(text.empty());
    const format& fmt = *find_format(name);
    std::size_t refused = 0;
    for (std::size_t cut = 0; cut <= text.size(); ++cut) {
      const std::string_view part(text.data(), cut);
      const read_result r = read_document(part, fmt, {}, file);
      require_worded(r, part);
      refused += !r.ok();
    }
    INFO(file);
    CHECK(refused > 0);  // cuts inside a structure are refused
  }
}

TEST_CASE("random bytes are refused or read, never a crash", "[hostile]") {
  std::mt19937 rng(20261202);
  std::uniform_int_distribution<int> byte(0, 255), length(0, 400);
  for (const format& fmt : formats())
    for (int k = 0; k < 300; ++k) {
      std::string junk(static_cast<std::size_t>(length(rng)), '\0');
      for (char& c : junk)
        c = static_cast<char>(byte(rng));
      if (k % 3 == 0) junk = "WEBVTT\n\n" + junk;  // get past the signatures some of the time
      if (k % 3 == 1) junk = "tiers 1\n" + junk;
      require_worded(read_document(junk, fmt, {}, "junk"), junk);
    }
}

TEST_CASE("resource limits refuse what nothing sound needs, where it is", "[hostile]") {
  // A 20 MB field: a quote left open in a real file can swallow the rest of it like this.
  std::string big = "tier,start,end,text\nt,1,2,short\nt,3,4,\"";
  big.append(20u << 20, 'x');
  big += "\"\n";
  const read_result r = read_document(big, *find_format("csv"), {}, "big.csv");
  REQUIRE_FALSE(r.ok());
  CHECK(r.diagnostics.back().code == "limit.text");
  CHECK(r.diagnostics.back().line == 3);
  read_options generous;
  generous.max_text = 32u << 20;
  CHECK(read_document(big, *find_format("csv"), generous, "big.csv").ok());

  // A million tiers.
  std::string many = "{\"format\": \"tiers\", \"version\": 1, \"tiers\": [";
  for (int k = 0; k < 1'000'000; ++k)
    many += (k ? ",{\"name\":\"t" : "{\"name\":\"t") + std::to_string(k) + "\"}";
  many += "]}";
  const read_result m = read_document(many, *find_format("json"), {}, "many.json");
  REQUIRE_FALSE(m.ok());
  CHECK(m.diagnostics.back().code == "limit.tiers");
  CHECK(m.diagnostics.back().column > 1'000'000);  // at the first tier beyond the limit
}

TEST_CASE("numbers with thousands of digits and times beyond range are refused quickly",
          "[hostile]") {
  const std::string digits(5000, '9');
  for (const std::string& t :
       std::vector<std::string>{digits, "0." + digits, "1e300", "-1e300", digits + "e-4990"}) {
    const std::string doc =
        "{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", "
        "\"annotations\": [{\"start\": " +
        t + ", \"end\": 1}]}]}";
    const read_result r = read_document(doc, *find_format("json"), {}, "t.json");
    require_worded(r, doc);
  }
  const std::string doc =
      "{\"format\": \"tiers\", \"version\": 1, \"tiers\": [{\"name\": \"t\", "
      "\"annotations\": [{\"start\": " +
      digits + ", \"end\": 1}]}]}";
  CHECK(read_document(doc, *find_format("json"), {}, "t.json").diagnostics.back().code ==
        "time.range");
}

// Sizes at which a pairwise comparison would run for many minutes (2.2 s at 30,000 columns,
// growing with the square) and a sorted or hashed one takes well under a second: the test
// times out if the work is quadratic again.
TEST_CASE("a header of a million columns is checked for repeats in n log n", "[hostile]") {
  std::string table;
  for (int k = 0; k < 1'000'000; ++k)
    table += "c" + std::to_string(k) + ",";
  table += "start,c999999\n";
  const read_result r = read_document(table, *find_format("csv"), {}, "wide.csv");
  require_worded(r, table);
  REQUIRE_FALSE(r.ok());
  CHECK(r.diagnostics.back().code == "csv.header");
  CHECK(r.diagnostics.back().message == "column 'c999999' appears twice");
  CHECK(r.diagnostics.back().offset == table.size() - 8);
}

TEST_CASE("comparing files with 300,000 tiers each is n log n", "[hostile]") {
  std::vector<file_report> reports(3);
  for (std::size_t f = 0; f < reports.size(); ++f) {
    reports[f].path = "f" + std::to_string(f) + ".json";
    auto& shape = reports[f].shape.emplace();
    for (int k = 0; k < 300'000; ++k)
      shape.push_back({"t" + std::to_string(k),
                       f == 2 && k == 7 ? tier_kind::instant : tier_kind::interval,
                       std::nullopt,
                       {}});
  }
  reports[1].shape->pop_back();  // the other two have it
  check_dataset(reports, profile{});
  REQUIRE(reports[0].problems.empty());
  REQUIRE(reports[1].problems.size() == 1);
  CHECK(reports[1].problems[0].diag.message == "no tier 't299999', which 2 of 3 files have");
  REQUIRE(reports[2].problems.size() == 1);
  CHECK(reports[2].problems[0].diag.message ==
        "tier 't7' is an instant tier here, an interval tier in 2 of the 3 files that have it");
}

TEST_CASE("no writer writes bytes that are not UTF-8; the loss is listed", "[hostile]") {
  // A program (not a reader: readers refuse or repair such input) may hand any bytes over.
  document doc;
  tier& t = doc.tiers.emplace_back();
  t.name = "caf\xe9";
  annotation a;
  a.start = 0;
  a.end = ns_per_second;
  a.text = "lone \xed\xa0\x80 surrogate, cut \xe2\x82";
  a.id = "c\xff";
  a.attributes = {{"speaker", "Zo\xeb"}};
  t.annotations = {a};
  doc.metadata = {{"note\xc0", "overlong \xc0\xaf"}};
  for (const format& f : formats()) {
    INFO(f.name);
    const std::vector<std::string> losses = find_losses(doc, f);
    CHECK(std::find(losses.begin(), losses.end(), "bytes that are not UTF-8 (written as U+FFFD)") !=
          losses.end());
    const std::string written = test::write_as(f.name, doc);
    CHECK(detail::find_invalid_utf8(written) == std::string::npos);
    CHECK(written.find("\xef\xbf\xbd") != std::string::npos);  // U+FFFD where the bytes were
  }
}

TEST_CASE("a NUL in a text is kept, refused or replaced with a warning: never cut short",
          "[hostile]") {
  using namespace std::string_literals;
  struct sample_case {
    std::string format, input;
    enum { kept, refused, replaced } outcome;
  };
  const std::vector<sample_case> cases{
      // RFC 8259 §7: a raw control character is not JSON; \u0000 is, and is kept.
      {"json",
       R"({"format":"tiers","version":1,"tiers":[{"name":"t","annotations":[{"start":0,"end":1,"text":"a)"s +
           '\0' + R"(b"}]}]})",
       sample_case::refused},
      {"json",
       R"({"format":"tiers","version":1,"tiers":[{"name":"t","annotations":[{"start":0,"end":1,"text":"a\u0000b"}]}]})",
       sample_case::kept},
      // Tables take any UTF-8 in a field (common practice beyond RFC 4180's ASCII TEXTDATA).
      {"csv", "tier,start,end,text\nt,0,1,a"s + '\0' + "b\n", sample_case::kept},
      {"tsv", "tier\tstart\tend\ttext\nt\t0\t1\ta"s + '\0' + "b\n", sample_case::kept},
      // WebVTT §6.1 step 1: the parser replaces NUL by U+FFFD.
      {"vtt", "WEBVTT\n\n00:00.000 --> 00:01.000\na"s + '\0' + "b\n", sample_case::replaced},
      // XML 1.0 §2.2: not a character, raw or by reference.
      {"ttml",
       "<tt xmlns=\"http://www.w3.org/ns/ttml\"><body><div><p begin=\"0s\" end=\"1s\">a"s + '\0' +
           "b</p></div></body></tt>",
       sample_case::refused},
      {"ttml",
       "<tt xmlns=\"http://www.w3.org/ns/ttml\"><body><div><p begin=\"0s\" "
       "end=\"1s\">a&#0;b</p></div></body></tt>",
       sample_case::refused},
      // tiers text writes controls as escapes; a raw one is not its syntax.
      {"tiers", "tiers 1\n\ntier t interval\n  00:00:00.000 00:00:01.000 a"s + '\0' + "b\n",
       sample_case::refused},
  };
  for (const sample_case& c : cases) {
    INFO(c.format << ": " << c.input);
    const read_result r = read_document(c.input, *find_format(c.format), {}, "nul");
    require_worded(r, c.input);
    if (c.outcome == sample_case::refused) {
      CHECK_FALSE(r.ok());
      continue;
    }
    REQUIRE(r.ok());
    const std::string& text = r.value.tiers.at(0).annotations.at(0).text;
    if (c.outcome == sample_case::kept) {
      CHECK(text == "a\0b"s);
      CHECK(r.diagnostics.empty());
    } else {
      CHECK(text ==
            "a\xEF\xBF\xBD"
            "b");
      REQUIRE(r.diagnostics.size() == 1);
      CHECK(r.diagnostics[0].code == "input.utf8");
      CHECK(r.diagnostics[0].level == severity::warning);
    }
  }
}
