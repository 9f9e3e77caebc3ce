// The model's small containers (attribute_map, optional_text) and the buffered byte sink: the
// behaviour of the std types they stand in for, and what their economy must not change.
#include <catch2/catch.hpp>
#include <stdexcept>
#include <string>
#include <vector>

#include "tiers/model.hpp"
#include "tiers/sink.hpp"

using namespace tiers;

namespace {

// Records each block it is handed, to see where the buffer flushes.
class recording_sink final : public byte_sink {
 public:
  std::vector<std::string> blocks;
  ~recording_sink() override { flush(); }

 protected:
  void emit(const char* data, std::size_t size) override { blocks.emplace_back(data, size); }
};

}  // namespace

TEST_CASE("attribute_map behaves as the ordered map it stands for", "[model]") {
  attribute_map m;
  CHECK(m.empty());
  CHECK(m.size() == 0);
  CHECK(m.begin() == m.end());
  CHECK(m.find("a") == m.end());
  CHECK(m.erase("a") == 0);
  m["b"] = "2";
  m.emplace("a", "1");
  CHECK(m.size() == 2);
  CHECK(m.begin()->first == "a");  // ordered by name
  CHECK(m.at("b") == "2");
  CHECK_THROWS_AS(m.at("c"), std::out_of_range);
  CHECK_FALSE(m.emplace("a", "other").second);  // a key stays unique
  CHECK(m.at("a") == "1");

  attribute_map copy = m;
  CHECK(copy == m);
  CHECK(erase_if(m, [](const auto& kv) { return kv.first == "a"; }) == 1);
  CHECK(m == attribute_map{{"b", "2"}});
  CHECK(copy.size() == 2);  // a copy is deep
  CHECK(m.erase("b") == 1);
  // Emptied, it equals one that never held anything.
  CHECK(m.empty());
  CHECK(m == attribute_map{});
  const attribute_map moved = std::move(copy);
  CHECK(moved.size() == 2);
}

TEST_CASE("optional_text behaves as std::optional<std::string>", "[model]") {
  optional_text t;
  CHECK_FALSE(t);
  CHECK(t == std::nullopt);
  CHECK(t.value_or("none") == "none");
  CHECK(t.to_optional() == std::nullopt);
  t = "c1";
  CHECK(t.has_value());
  CHECK(t == "c1");
  CHECK(*t == "c1");
  CHECK(t->size() == 2);
  const optional_text copy = t;
  t = std::string("c2");
  CHECK(copy == "c1");  // a copy is deep
  CHECK(t.to_optional() == std::optional<std::string>("c2"));
  CHECK_FALSE(t == copy);
  CHECK(optional_text(std::optional<std::string>()) == optional_text());
  CHECK(optional_text(std::string()) == "");  // an empty text is a value, not an absence
  CHECK_FALSE(optional_text(std::string()) == std::nullopt);
  t.reset();
  CHECK(t == std::nullopt);
}

TEST_CASE("byte_sink passes every byte on in order, whatever the sizes of the writes", "[model]") {
  std::string expected;
  recording_sink out;
  // Small writes fill the buffer; a write that does not fit flushes it first; one as large as
  // the buffer or larger goes straight through.
  for (int k = 0; k < 20000; ++k) {
    const std::string piece = std::to_string(k) + ",";
    out.write(piece);
    expected += piece;
  }
  out.put('|');
  expected += '|';
  const std::string big(200000, 'x');
  out.write(big);
  expected += big;
  out.write("");
  out.flush();
  out.flush();  // nothing more to hand on
  std::string got;
  for (const std::string& b : out.blocks) {
    CHECK_FALSE(b.empty());
    got += b;
  }
  CHECK(got == expected);
  CHECK(out.blocks.back() == big);  // handed on whole, not copied through the buffer
  std::string text;
  {
    string_sink s(text);
    s.write("abc");
    s.put('d');
  }  // a string sink flushes when it goes
  CHECK(text == "abcd");
}
