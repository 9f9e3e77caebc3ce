// The HTML report's page as text: escaping, the data the script draws, and the agreement
// stretches. (What a browser makes of it is tests/scripts/report_browser.py.)
#include <catch2/catch.hpp>

#include "tiers/tiers.hpp"

using namespace tiers;

namespace {

annotation span_of(double start, double end, std::string text) {
  annotation a;
  a.start = static_cast<time_ns>(start * 1e9);
  a.end = static_cast<time_ns>(end * 1e9);
  a.text = std::move(text);
  return a;
}

std::string page_of(const document* doc, const file_report& checked, const tier* ref = nullptr,
                    const tier* cand = nullptr, html_report_options options = {}) {
  report_file f;
  f.check = &checked;
  f.doc = doc;
  f.reference = ref;
  f.candidate = cand;
  std::string page;
  string_sink out(page);
  write_html_report(std::span<const report_file>(&f, 1), options, out);
  out.flush();
  return page;
}

// The page's data (the JSON its script draws) without the whitespace between tokens, so that
// a check pins what is written, not how it is laid out.
std::string data_of(const std::string& page) {
  const std::string open = R"(<script type="application/json" id="tiers-data">)";
  const std::size_t from = page.find(open);
  if (from == std::string::npos) return {};
  const std::size_t to = page.find("</script>", from);
  std::string out;
  bool in_string = false, escaped = false;
  for (std::size_t k = from + open.size(); k < to; ++k) {
    const char c = page[k];
    if (in_string) {
      in_string = escaped || c != '"';
      escaped = !escaped && c == '\\';
    } else if (c == ' ' || c == '\n') {
      continue;
    } else {
      in_string = c == '"';
    }
    out += c;
  }
  return out;
}

std::size_t count_of(const std::string& text, std::string_view what) {
  std::size_t n = 0;
  for (std::size_t at = text.find(what); at != std::string::npos; at = text.find(what, at + 1))
    ++n;
  return n;
}

}  // namespace

TEST_CASE("report page: text from files cannot close the script element or add markup",
          "[report]") {
  const std::string hostile = "</script><script>alert(1)</script><!-- \"q\" & 'a'";
  document doc;
  tier& t = doc.tiers.emplace_back();
  t.name = hostile;
  t.annotations = {span_of(1, 2, hostile)};
  file_report checked;
  checked.path = "a\"b<c>.json";
  html_report_options options;
  options.title = hostile;
  const std::string page = page_of(&doc, checked, nullptr, nullptr, options);
  // The page's own two script elements, and no third.
  CHECK(count_of(page, "<script") == 2);
  CHECK(count_of(page, "</script>") == 2);
  CHECK(count_of(page, "<!--") == 0);
  // In the data, '<' is \u003c; in markup, text is escaped for content and attributes.
  CHECK(
      page.find(
          R"("name": "\u003c/script>\u003cscript>alert(1)\u003c/script>\u003c!-- \"q\" & 'a'")") !=
      std::string::npos);
  CHECK(
      page.find(
          R"(data-tier="&lt;/script&gt;&lt;script&gt;alert(1)&lt;/script&gt;&lt;!-- &quot;q&quot; &amp; 'a'")") !=
      std::string::npos);
  CHECK(page.find("<h2 id=\"file-0-title\">a\"b&lt;c&gt;.json</h2>") != std::string::npos);
}

TEST_CASE("report page: every tier a lane, annotations sorted by start for the script",
          "[report]") {
  document doc;
  tier& a = doc.tiers.emplace_back();
  a.name = "gestures";
  a.annotations = {span_of(5, 6, "late"), span_of(1, 2, "early")};
  tier& b = doc.tiers.emplace_back();
  b.name = "gestures";  // a duplicate name still gets its own lane
  b.source = tier_source{source_kind::machine, "detector", std::nullopt};
  b.annotations = {span_of(0.5, 1, "beat")};
  b.annotations[0].confidence = 0.25;
  file_report checked;
  checked.path = "x.json";
  const std::string page = page_of(&doc, checked);
  CHECK(page.find(R"(<div class="lane" data-tier="gestures" data-index="0">)") !=
        std::string::npos);
  CHECK(page.find(R"(<div class="lane" data-tier="gestures" data-index="1">)") !=
        std::string::npos);
  const std::string data = data_of(page);
  CHECK(data.find(R"("annotations":[[1,2,"early",null],[5,6,"late",null]])") != std::string::npos);
  CHECK(data.find(R"("source":"machine","annotations":[[0.5,1,"beat",0.25]])") !=
        std::string::npos);
  CHECK(page.find("interval · machine (detector) · 1") != std::string::npos);
}

TEST_CASE("report page: agreement stretches frame by frame, as tiers agree counts them",
          "[report][agree]") {
  // Invented tiers with a 10 ms grid: the frames whose middle lies in an annotation are its
  // frames (docs/agreement.md), so the stretches fall on the annotations' edges here.
  document doc;
  tier& ref = doc.tiers.emplace_back();
  ref.name = "human";
  ref.annotations = {span_of(0, 1, "beat"), span_of(2, 3, "iconic")};
  tier& cand = doc.tiers.emplace_back();
  cand.name = "machine";
  cand.annotations = {span_of(0.5, 1.5, "beat"), span_of(2, 3, "deictic")};
  file_report checked;
  checked.path = "x.json";
  const std::string page = page_of(&doc, checked, &doc.tiers[0], &doc.tiers[1]);
  CHECK(data_of(page).find(
            R"("stretches":[[0,0.5,"only-reference"],[0.5,1,"agree"],[1,1.5,"only-candidate"],)"
            R"([2,3,"differ"]])") != std::string::npos);
  CHECK(page.find("Agreement of machine with human") != std::string::npos);
  // The figures themselves come from compare_tiers (agree_test.cpp); here, that they are shown.
  CHECK(page.find("kappa (frames of 0.01 s)") != std::string::npos);
}

TEST_CASE("report page: a file without a document lists its problems and draws nothing",
          "[report]") {
  file_report checked;
  checked.path = "broken.json";
  problem p;
  p.diag.code = "json.syntax";
  p.diag.message = "expected a value";
  p.diag.line = 3;
  p.diag.column = 7;
  checked.problems.push_back(p);
  const std::string page = page_of(nullptr, checked);
  CHECK(page.find("could not be read") != std::string::npos);
  CHECK(page.find("class=\"timeline\"") == std::string::npos);
  CHECK(page.find("<td class=\"where\">broken.json:3:7</td>") != std::string::npos);
  CHECK(page.find("\"drawn\": false") != std::string::npos);
}
