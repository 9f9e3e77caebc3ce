// Streaming: a document handed from reader to writer piece by piece must give the bytes the
// whole document gives, and an input whose order does not allow it must say so.
#include <catch2/catch.hpp>

#include "support.hpp"

using namespace tiers;
using tiers::test::read_as;
using tiers::test::rich_document;
using tiers::test::sample;
using tiers::test::write_as;

namespace {

// `input`, read as `from`, written as `to` through the streaming path; the status is returned
// and the diagnostics kept.
struct streamed {
  stream_status status;
  std::vector<diagnostic> diagnostics;
  std::string output;
};

streamed stream_as(std::string_view from, std::string_view to, std::string_view input,
                   const read_options& options = {}) {
  streamed s;
  {
    string_sink sink(s.output);
    const std::unique_ptr<document_handler> writer = find_format(to)->stream_writer(sink);
    stream_result r = stream_document(input, *find_format(from), options, *writer, "in");
    s.status = r.status;
    s.diagnostics = std::move(r.diagnostics);
    sink.flush();
  }
  return s;
}

// Records what it is handed, as a string, and stops after `limit` annotations.
struct recorder final : document_handler {
  std::string log;
  std::size_t limit = static_cast<std::size_t>(-1);
  bool begin_document(const document& d) override {
    log += "doc(" + std::to_string(d.metadata.size()) + ") ";
    return true;
  }
  bool begin_tier(const tier& t) override {
    log += "tier(" + t.name + ") ";
    return true;
  }
  bool add(const annotation& a) override {
    log += a.text + " ";
    return --limit > 0;
  }
  bool end_tier() override {
    log += "end ";
    return true;
  }
  bool end_document() override {
    log += "done";
    return true;
  }
};

}  // namespace

TEST_CASE("streamed conversions give the bytes the whole document gives", "[stream]") {
  const document rich = rich_document();
  for (const format& from : formats())
    for (const format& to : formats()) {
      if (!streams_losslessly(from, to)) continue;
      std::vector<std::string> inputs{write_as(from.name, rich)};
      for (const char* name : {"panel-discussion.", "panel-discussion.flat."}) {
        const std::string text = sample(std::string(name) + std::string(from.name));
        if (!text.empty()) inputs.push_back(text);
      }
      for (const std::string& input : inputs) {
        INFO(from.name << " to " << to.name << ":\n" << input);
        read_options options;
        options.tier_name = "notes";
        const streamed s = stream_as(from.name, to.name, input, options);
        REQUIRE(s.status == stream_status::done);
        CHECK(s.diagnostics.empty());
        CHECK(s.output == write_as(to.name, read_as(from.name, input, options)));
      }
    }
}

TEST_CASE("only conversions that can lose nothing stream", "[stream]") {
  auto lossless = [](std::string_view a, std::string_view b) {
    return streams_losslessly(*find_format(a), *find_format(b));
  };
  for (std::string_view from : {"csv", "tsv", "tiers", "json"})
    for (std::string_view to : {"json", "tiers"}) {
      INFO(from << " to " << to);
      CHECK(lossless(from, to));
    }
  // A table's header names every attribute; WebVTT orders cues; TTML is a tree; and JSON or
  // tiers text into a table or WebVTT can lose what a table cannot hold.
  CHECK_FALSE(lossless("json", "csv"));
  CHECK_FALSE(lossless("csv", "tsv"));
  CHECK_FALSE(lossless("vtt", "json"));
  CHECK_FALSE(lossless("ttml", "json"));
  CHECK_FALSE(lossless("json", "vtt"));
  CHECK_FALSE(lossless("json", "ttml"));
}

TEST_CASE("an input whose order does not allow streaming says so", "[stream]") {
  struct order_case {
    std::string_view format, in_order, out_of_order;
  };
  const order_case cases[]{
      // A tier's rows apart from one another.
      {"csv", "tier,start,text\na,1,x\na,2,y\nb,3,z\n", "tier,start,text\na,1,x\nb,3,z\na,2,y\n"},
      // The document's metadata after its tiers; a tier's fields after its annotations; a
      // tier's annotations before its name.
      {"json", R"({"format": "tiers", "version": 1, "metadata": {"k": "v"}, "tiers": []})",
       R"({"format": "tiers", "version": 1, "tiers": [], "metadata": {"k": "v"}})"},
      {"json",
       R"({"format": "tiers", "version": 1, "tiers": [{"name": "a", "kind": "instant", "annotations": [{"start": 1}]}]})",
       R"({"format": "tiers", "version": 1, "tiers": [{"name": "a", "annotations": [{"start": 1}], "kind": "instant"}]})"},
      {"json", R"({"format": "tiers", "version": 1, "tiers": [{"name": "a", "annotations": []}]})",
       R"({"format": "tiers", "version": 1, "tiers": [{"annotations": [], "name": "a"}]})"},
      {"tiers", "tiers 1\nmeta k=v\n\ntier a interval\n  1.0 2.0 | x\n",
       "tiers 1\n\ntier a interval\n  1.0 2.0 | x\nmeta k=v\n"},
      {"tiers", "tiers 1\n\ntier a interval\n  attr k=v\n  1.0 2.0 | x\n",
       "tiers 1\n\ntier a interval\n  1.0 2.0 | x\n  attr k=v\n"},
  };
  for (const order_case& c : cases) {
    INFO(c.format << ":\n" << c.in_order << "\n" << c.out_of_order);
    const streamed good = stream_as(c.format, "json", c.in_order);
    CHECK(good.status == stream_status::done);
    CHECK(good.output == write_as("json", read_as(c.format, c.in_order)));
    CHECK(stream_as(c.format, "json", c.out_of_order).status == stream_status::not_streamed);
    // The document reads the same either way: only streaming depends on the order.
    CHECK(write_as("json", read_as(c.format, c.out_of_order)) ==
          write_as("json", read_as(c.format, c.in_order)));
  }
}

TEST_CASE(
    "streaming hands over in order, stops when told, and leaves limits and encodings to "
    "read_document",
    "[stream]") {
  const std::string text =
      "tiers 1\nmeta k=v\n\ntier a interval\n  1.0 2.0 | x\n  2.0 3.0 | y\n\ntier b interval\n"
      "\ntier c instant\n  4.0 | z\n";
  recorder all;
  CHECK(stream_document(text, *find_format("tiers"), {}, all).status == stream_status::done);
  CHECK(all.log == "doc(1) tier(a) x y end tier(b) end tier(c) z end done");
  recorder two;
  two.limit = 2;
  CHECK(stream_document(text, *find_format("tiers"), {}, two).status == stream_status::done);
  CHECK(two.log == "doc(1) tier(a) x y ");

  // Beyond a limit, or not UTF-8: not streamed, so that read_document locates the problem.
  read_options small;
  small.max_text = 1;
  recorder limited;
  const std::string long_text = "tier,start,text\na,1,x\na,2,yy\n";
  CHECK(stream_document(long_text, *find_format("csv"), small, limited).status ==
        stream_status::not_streamed);
  CHECK(tiers::test::first_error("csv", long_text, small).code == "limit.text");
  recorder latin1;
  CHECK(stream_document("tier,start,text\na,1,caf\xE9\n", *find_format("csv"), {}, latin1).status ==
        stream_status::not_streamed);
}

TEST_CASE("an error while streaming is located as reading the document locates it", "[stream]") {
  for (const auto& [format, text] : std::vector<std::pair<std::string_view, std::string>>{
           {"csv", "tier,start,end\na,1,2\na,x,3\n"},
           {"json", R"({"format": "tiers", "version": 1, "tiers": [{"name": "a", "annotations": )"
                    R"([{"start": 1, "end": 2}, {"start": "x"}]}]})"},
           {"tiers", "tiers 1\n\ntier a interval\n  1.0 2.0 | x\n  1.0 oops | y\n"},
           // A tier line that is wrong: no tier to hand over, and every later problem found.
           {"tiers", "tiers 1\ntier a b c d\n  1.0 2.0 | x\nbogus\n"},
           {"tiers", "tiers 1\ntier a\n  1.0 | x\ntier b c d e\n  2.0 | y\n"}}) {
    INFO(format << ": " << text);
    const streamed s = stream_as(format, "json", text);
    const read_result whole = read_document(text, *find_format(format), {}, "in");
    REQUIRE_FALSE(whole.ok());
    REQUIRE(s.diagnostics.size() == whole.diagnostics.size());
    for (std::size_t k = 0; k < s.diagnostics.size(); ++k) {
      CHECK(s.diagnostics[k].code == whole.diagnostics[k].code);
      CHECK(s.diagnostics[k].line == whole.diagnostics[k].line);
      CHECK(s.diagnostics[k].column == whole.diagnostics[k].column);
      CHECK(s.diagnostics[k].message == whole.diagnostics[k].message);
    }
  }
}
