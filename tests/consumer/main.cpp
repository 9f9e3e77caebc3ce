// Reads a JSON document with the installed libtiers and writes it as CSV: proves that the
// public headers and the package config suffice.
#include <cstdio>
#include <string>
#include <tiers/tiers.hpp>

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
  return out == expected ? 0 : 1;
}
