// CSV and TSV: RFC 4180 quoting, column maps, time syntaxes, and located errors.
#include <catch2/catch.hpp>

#include "support.hpp"

using namespace tiers;
using namespace tiers::test;

TEST_CASE("csv quotes fields with commas, quotes and line breaks (RFC 4180 §2)", "[csv]") {
  document doc;
  tier& t = doc.tiers.emplace_back();
  t.name = "notes, first";
  annotation a;
  a.start = 0;
  a.end = 1'500'000'000;
  a.text = "she said \"yes\"\nthen left, quickly";
  t.annotations.push_back(a);
  const std::string csv = write_as("csv", doc);
  CHECK(csv ==
        "tier,start,end,text\r\n"
        "\"notes, first\",0,1.5,\"she said \"\"yes\"\"\nthen left, quickly\"\r\n");
  CHECK(read_as("csv", csv) == doc);
}

TEST_CASE("tsv quotes only fields with tabs, quotes or line breaks", "[tsv]") {
  document doc;
  tier& t = doc.tiers.emplace_back();
  t.name = "a,b";
  annotation a;
  a.start = 250'000'000;
  a.end = 500'000'000;
  a.text = "x\ty";
  t.annotations.push_back(a);
  const std::string tsv = write_as("tsv", doc);
  CHECK(tsv == "tier\tstart\tend\ttext\na,b\t0.25\t0.5\t\"x\ty\"\n");
  CHECK(read_as("tsv", tsv) == doc);
}

TEST_CASE("csv reads CRLF, LF and CR line ends, a BOM, and skips empty lines", "[csv]") {
  for (std::string_view eol : {"\r\n", "\n", "\r"}) {
    const std::string text = "\xEF\xBB\xBFtier,start,end,text" + std::string(eol) + "a,1,2,x" +
                             std::string(eol) + std::string(eol) + "a,3,4,\"y" + std::string(eol) +
                             "z\"" + std::string(eol);
    const document doc = read_as("csv", text);
    REQUIRE(doc.tiers.size() == 1);
    REQUIRE(doc.tiers[0].annotations.size() == 2);
    CHECK(doc.tiers[0].annotations[1].text == "y" + std::string(eol) + "z");
  }
}

TEST_CASE("csv: optional columns, attributes and empty cells", "[csv]") {
  const document doc = read_as("csv",
                               "tier,start,end,text,confidence,id,speaker,note\n"
                               "w,0.5,0.75,hello,0.25,w1,A,\n"
                               "w,1,1.5,world,,,B,checked\n"
                               "g,2,3,beat,,,,\n");
  REQUIRE(doc.tiers.size() == 2);
  const annotation& a = doc.tiers[0].annotations[0];
  CHECK(a.confidence == 0.25);
  CHECK(a.id == "w1");
  CHECK(a.attributes == attribute_map{{"speaker", "A"}});
  const annotation& b = doc.tiers[0].annotations[1];
  CHECK_FALSE(b.confidence);
  CHECK_FALSE(b.id);
  CHECK(b.attributes == attribute_map{{"note", "checked"}, {"speaker", "B"}});
  CHECK(doc.tiers[1].annotations[0].attributes.empty());
}

TEST_CASE("csv from other tools: a column map, a fixed tier name, other time syntaxes",
          "[csv][columns]") {
  read_options o;
  o.columns = parse_column_map("tier=Layer,start=Begin,end=End,text=Value").value;
  const document doc = read_as("csv",
                               "Layer,Begin,End,Value,Annotator\n"
                               "gesture,00:00:01.250,00:00:02.000,beat,R2\n"
                               "gesture,00:01:00.5,1:00:00,hold,R2\n",
                               o);
  REQUIRE(doc.tiers.size() == 1);
  CHECK(doc.tiers[0].name == "gesture");
  CHECK(doc.tiers[0].annotations[0].start == 1'250'000'000);
  CHECK(doc.tiers[0].annotations[1].start == 60'500'000'000);
  CHECK(doc.tiers[0].annotations[1].end == 3600 * ns_per_second);
  CHECK(doc.tiers[0].annotations[0].attributes == attribute_map{{"Annotator", "R2"}});

  read_options ms;
  ms.tier_name = "scores";
  ms.unit = time_unit::milliseconds;
  const document d2 = read_as("csv", "start,end,text\n1250,1500,x\n", ms);
  CHECK(d2.tiers[0].name == "scores");
  CHECK(d2.tiers[0].annotations[0].start == 1'250'000'000);

  read_options frames;
  frames.unit = time_unit::frames;
  frames.rate = rational{30000, 1001};
  const document d3 = read_as("csv", "start,duration,text\n30000,1,x\n", frames);
  CHECK(d3.tiers[0].annotations[0].start == 1001 * ns_per_second);
  CHECK(d3.tiers[0].annotations[0].end == 1001 * ns_per_second + 33'366'667);
}

TEST_CASE("csv reads SMPTE drop-frame timecode", "[csv][timecode]") {
  // Source: ../shared/CHECKS.md, drop-frame table at 30000/1001 (rule read in TTML2
  // ttp:dropMode; frame counts computed). Each row: timecode, frame count.
  const std::pair<const char*, std::int64_t> table[] = {
      {"00:00:59;29", 1799},   {"00:01:00;02", 1800},  {"00:02:00;02", 3598},
      {"00:10:00;00", 17982},  {"00:11:00;02", 19782}, {"01:00:00;00", 107892},
      {"23:59:59;29", 2589407}};
  std::string csv = "start,text\r\n";
  for (const auto& [tc, frames] : table)
    csv += std::string(tc) + "," + tc + "\r\n";
  read_options o;
  o.rate = rational{30000, 1001};
  const document doc = read_as("csv", csv, o);
  REQUIRE(doc.tiers.at(0).annotations.size() == std::size(table));
  for (std::size_t k = 0; k < std::size(table); ++k) {
    INFO(table[k].first);
    const annotation& a = doc.tiers[0].annotations[k];
    // frame × 1001/30000 s, to the nearest nanosecond
    CHECK(a.start == (table[k].second * 1001 * ns_per_second * 2 + 30000) / (2 * 30000));
  }
  // One timecode hour is 3599.9964 s (CHECKS.md, computed).
  CHECK(doc.tiers[0].annotations[5].start == 3'599'996'400'000);
}

TEST_CASE("csv without end or duration column is an instant tier", "[csv]") {
  const document doc = read_as("csv", "tier,start,text\nnods,1.5,nod\n");
  CHECK(doc.tiers[0].kind == tier_kind::instant);
  CHECK(doc.tiers[0].annotations[0].end == 1'500'000'000);
}

TEST_CASE("column maps are checked", "[csv][columns]") {
  const auto problem = [](std::string_view text) {
    const result<column_map> r = parse_column_map(text);
    REQUIRE(r.diagnostics.size() == 1);
    CHECK(r.diagnostics[0].code == "columns.map");
    CHECK_FALSE(r.ok());
    return r.diagnostics[0].message;
  };
  CHECK(problem("start") == "expected ROLE=COLUMN, got 'start'");
  CHECK(problem("begin=Start") ==
        "unknown role 'begin' (roles: tier, start, end, duration, text, markup, confidence, id, "
        "parent)");
  CHECK(problem("start=A,start=B") == "role 'start' is mapped twice");
  const result<column_map> good = parse_column_map("start=Begin,end=End");
  CHECK(good.ok());
  CHECK(good.value == column_map{{"start", "Begin"}, {"end", "End"}});
}

TEST_CASE("bad csv is rejected with its physical line and column", "[csv][bad-input]") {
  struct row {
    const char* input;
    const char* code;
    std::size_t line, column;
    const char* message_part;
  };
  const row rows[] = {
      {"", "csv.header", 1, 1, "empty"},
      {"tier,end,text\na,1,x\n", "csv.header", 1, 1, "no 'start' column"},
      {"tier,start,end,text\na,1,2,\"open\nstill open\n", "csv.quote", 2, 7, "not closed"},
      {"tier,start,end,text\na,1,2,\"closed\"junk\n", "csv.quote", 2, 15, "after a closing quote"},
      {"tier,start,end,text\na,1,2,x\nb,3,4\n", "csv.fields", 3, 1, "row has 3 fields"},
      {"tier,start,end,text\na,1,2,\"two\nlines\"\nb,x,4,y\n", "csv.time", 4, 3,
       "'x' is not a time"},
      {"tier,start,end,text\na,,2,x\n", "csv.time", 2, 3, "empty start"},
      {"tier,start,end,text\na,1,99999999999,x\n", "time.range", 2, 5, "out of range"},
      {"tier,start,end,text,confidence\na,1,2,x,high\n", "csv.confidence", 2, 9, "not a number"},
      {"tier,start,end,text,confidence\na,1,2,x,1.01\n", "csv.confidence", 2, 9, "from 0 to 1"},
      {"tier,start,end,text,text\n", "csv.header", 1, 21, "appears twice"},
      {"tier,start,end,duration\n", "csv.header", 1, 16, "both 'end' and 'duration'"},
      {"start\n00:00:01:00\n", "csv.time", 2, 1, "needs a frame rate"},
      {"tier,start,end,text\n\xC3\xA9,1,2,x\n\xFF", "input.utf8", 3, 1,
       "byte 0xFF at byte offset 29"},
  };
  for (const row& r : rows) {
    INFO(r.input);
    const diagnostic d = first_error("csv", r.input);
    CHECK(d.code == r.code);
    CHECK(d.line == r.line);
    CHECK(d.column == r.column);
    CHECK_THAT(d.message, Catch::Contains(r.message_part));
  }
}

TEST_CASE("csv reports a mapped column that is missing", "[csv][columns][bad-input]") {
  read_options o;
  o.columns = parse_column_map("start=Begin").value;
  const diagnostic d = first_error("csv", "Start,End\n1,2\n", o);
  CHECK(d.code == "csv.header");
  CHECK_THAT(d.message, Catch::Contains("no column 'Begin' for role 'start'"));
}

TEST_CASE("table losses: empty values, attributes named like columns, repeated tier names",
          "[csv][loss]") {
  document doc;
  tier t;
  t.name = "x";
  annotation a;
  a.id = "";
  a.attributes = {{"start", "clash"}};
  t.annotations = {a};
  doc.tiers = {t, t};
  const std::vector<std::string> losses = find_losses(doc, *find_format("csv"));
  REQUIRE(losses.size() == 5);
  CHECK(losses[0] ==
        "empty markup, ids or attribute values (read back as absent) of 1 annotation in tier 'x'");
  CHECK(losses[1] ==
        "attributes named like a column (tier, start, end, ...) of 1 annotation in tier 'x'");
  CHECK(losses[4] == "the separation of the tiers named 'x' (read back as one tier)");
}
