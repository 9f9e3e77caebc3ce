// Reads a JSON document with the installed libtiers and writes it as CSV, and streams it into
// tiers text and into a handler of its own: proves that the public headers and the package
// config suffice.
#include <cstdio>
#include <memory>
#include <string>
#include <tiers/tiers.hpp>

namespace {

// A consumer's own handler: counts what it is handed.
struct counter final : tiers::document_handler {
  int tiers = 0, annotations = 0;
  bool begin_document(const tiers::document&) override { return true; }
  bool begin_tier(const tiers::tier&) override { return ++tiers, true; }
  bool add(const tiers::annotation&) override { return ++annotations, true; }
  bool end_tier() override { return true; }
  bool end_document() override { return true; }
};

}  // namespace

int main() {
  const std::string input = R"({"format": "tiers", "version": 1, "tiers": [
    {"name": "notes", "annotations": [{"start": 1.5, "end": 2.000000001, "text": "a, b"}]}]})";
  const tiers::format* json = tiers::find_format("json");
  const tiers::format* csv = tiers::find_format("csv");
  if (!json || !csv) return 1;
  const tiers::read_result r = tiers::read_document(input, *json, {}, "inline");
  if (!r.ok()) return 1;
  std::string out;
  {
    tiers::string_sink sink(out);
    csv->write(r.value, sink, {});
  }
  const std::string expected = "tier,start,end,text\r\nnotes,1.5,2.000000001,\"a, b\"\r\n";
  std::printf("%s", out.c_str());
  if (out != expected) return 1;

  const tiers::format* text = tiers::find_format("tiers");
  if (!text || !tiers::streams_losslessly(*json, *text)) return 1;
  std::string streamed;
  {
    tiers::string_sink sink(streamed);
    const std::unique_ptr<tiers::document_handler> writer = text->stream_writer(sink);
    if (tiers::stream_document(input, *json, {}, *writer).status != tiers::stream_status::done)
      return 1;
  }
  std::printf("%s", streamed.c_str());
  if (streamed != "tiers 1\n\ntier notes interval\n  00:00:01.500 00:00:02.000000001 | a, b\n")
    return 1;
  counter count;
  const tiers::stream_result r2 = tiers::stream_document(input, *json, {}, count);
  return r2.ok() && count.tiers == 1 && count.annotations == 1 ? 0 : 1;
}
