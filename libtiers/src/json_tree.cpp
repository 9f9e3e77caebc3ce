// The located JSON tree: nlohmann's SAX events, each value stamped with its byte offset.
#include "json_tree.hpp"

#include <algorithm>
#include <charconv>

#include "json_sax.hpp"
#include "tiers/detail/report.hpp"

namespace tiers::detail {
namespace {

using json = nlohmann::json;

class tree_builder final : public nlohmann::json_sax<json> {
 public:
  tree_builder(std::string_view input, std::size_t& consumed, std::size_t max_depth,
               std::vector<diagnostic>& problems)
      : input_(input), consumed_(consumed), max_depth_(max_depth), problems_(problems) {}

  bool null() override { return add(leaf(json_node::type::null)); }
  bool boolean(bool v) override {
    json_node n = leaf(json_node::type::boolean);
    n.boolean = v;
    return add(std::move(n));
  }
  bool number_integer(number_integer_t v) override { return number(std::to_string(v)); }
  bool number_unsigned(number_unsigned_t v) override { return number(std::to_string(v)); }
  bool number_float(number_float_t, const string_t& text) override { return number(text); }
  bool string(string_t& v) override {
    json_node n = leaf(json_node::type::string);
    // The parser has read the closing quote; the value starts at its opening one.
    n.offset = opening_quote();
    n.text = std::move(v);
    return add(std::move(n));
  }
  bool binary(binary_t&) override { return fail("json.syntax", here(), "binary values"); }
  bool start_object(std::size_t) override { return open(json_node::type::object); }
  bool end_object() override { return close(); }
  bool start_array(std::size_t) override { return open(json_node::type::array); }
  bool end_array() override { return close(); }
  bool key(string_t& k) override {
    json_node& o = stack_.back();
    for (const std::string& existing : o.keys)
      if (existing == k)
        return fail("json.duplicate", opening_quote(), "duplicate key " + quote_name(k));
    o.keys.push_back(std::move(k));
    o.key_offsets.push_back(opening_quote());
    return true;
  }
  bool parse_error(std::size_t, const std::string&,
                   const nlohmann::detail::exception& ex) override {
    const std::string what = parse_error_text(ex);
    return fail("json.syntax", parse_error_offset(what, consumed_, input_.size()),
                "invalid JSON: " + what);
  }

  std::optional<json_node> root;
  bool failed = false;

 private:
  std::size_t here() const { return consumed_ > 0 ? consumed_ - 1 : 0; }
  std::size_t opening_quote() const { return detail::opening_quote(input_, here()); }
  json_node leaf(json_node::type t) const {
    json_node n;
    n.kind = t;
    n.offset = here();
    return n;
  }
  bool number(std::string text) {
    json_node n = leaf(json_node::type::number);
    // The parser has read the number and, unless the input ended, the byte after it.
    auto in_number = [](char c) {
      return (c >= '0' && c <= '9') || c == '-' || c == '+' || c == '.' || c == 'e' || c == 'E';
    };
    std::size_t at = std::min(here(), input_.size() - 1);
    if (at > 0 && !in_number(input_[at])) --at;
    while (at > 0 && in_number(input_[at - 1]))
      --at;
    n.offset = at;
    std::size_t end = at;
    while (end < input_.size() && in_number(input_[end]))
      ++end;
    // The number as written, so that `1.10` reads as exactly as the user wrote it.
    n.text = end > at ? std::string(input_.substr(at, end - at)) : std::move(text);
    return add(std::move(n));
  }
  bool add(json_node n) {
    if (stack_.empty()) {
      root = std::move(n);
      return true;
    }
    stack_.back().items.push_back(std::move(n));
    return true;
  }
  bool open(json_node::type t) {
    if (stack_.size() >= max_depth_)
      return fail("json.depth", here(),
                  "values nest deeper than " + std::to_string(max_depth_) + " levels");
    stack_.push_back(leaf(t));
    return true;
  }
  bool close() {
    json_node n = std::move(stack_.back());
    stack_.pop_back();
    return add(std::move(n));
  }
  bool fail(std::string code, std::size_t offset, std::string message) {
    if (!failed)
      problems_.push_back(
          make_diagnostic(severity::error, std::move(code), offset, std::move(message)));
    failed = true;
    return false;
  }

  std::string_view input_;
  std::size_t& consumed_;
  std::size_t max_depth_;
  std::vector<diagnostic>& problems_;
  std::vector<json_node> stack_;
};

}  // namespace

const json_node* json_node::member(std::string_view key) const {
  for (std::size_t k = 0; k < keys.size(); ++k)
    if (keys[k] == key) return &items[k];
  return nullptr;
}

std::string_view type_name(json_node::type t) {
  switch (t) {
    case json_node::type::null:
      return "null";
    case json_node::type::boolean:
      return "true or false";
    case json_node::type::number:
      return "a number";
    case json_node::type::string:
      return "a string";
    case json_node::type::array:
      return "an array";
    case json_node::type::object:
      return "an object";
  }
  return "a value";
}

std::optional<json_node> parse_json_tree(std::string_view text, std::vector<diagnostic>& problems,
                                         std::size_t max_depth) {
  const std::size_t bom = text.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0;
  std::size_t consumed = bom;
  tree_builder b(text, consumed, max_depth, problems);
  counting_iterator first{text.data() + bom, &consumed};
  counting_iterator last{text.data() + text.size(), &consumed};
  const bool ok = json::sax_parse(first, last, &b, json::input_format_t::json, true);
  if (!ok || b.failed || !b.root) {
    if (!b.failed)
      problems.push_back(
          make_diagnostic(severity::error, "json.syntax", text.size(), "invalid JSON"));
    return std::nullopt;
  }
  return std::move(b.root);
}

json_fields::json_fields(const json_node& object, std::string_view what, std::string_view prefix,
                         std::vector<diagnostic>& problems)
    : object_(object),
      what_(what),
      prefix_(prefix),
      problems_(problems),
      used_(object.keys.size(), false) {}

const json_node* json_fields::get(std::string_view key) {
  for (std::size_t k = 0; k < object_.keys.size(); ++k)
    if (object_.keys[k] == key) {
      used_[k] = true;
      return &object_.items[k];
    }
  return nullptr;
}

void json_fields::bad(const json_node& value, std::string message) {
  problems_.push_back(
      make_diagnostic(severity::error, prefix_ + ".value", value.offset, std::move(message)));
}

const json_node* json_fields::typed(std::string_view key, json_node::type want,
                                    std::string_view as) {
  const json_node* n = get(key);
  if (!n) return nullptr;
  if (n->kind != want) {
    bad(*n, quote_name(key) + " must be " + std::string(as) + ", not " +
                std::string(type_name(n->kind)));
    return nullptr;
  }
  return n;
}

std::optional<std::string> json_fields::string(std::string_view key) {
  const json_node* n = typed(key, json_node::type::string, "a string");
  return n ? std::optional<std::string>(n->text) : std::nullopt;
}

std::optional<double> json_fields::number(std::string_view key) {
  const json_node* n = typed(key, json_node::type::number, "a number");
  if (!n) return std::nullopt;
  double v = 0;
  auto [p, ec] = std::from_chars(n->text.data(), n->text.data() + n->text.size(), v);
  if (ec != std::errc{}) {
    bad(*n, quote_name(key) + " is out of range");
    return std::nullopt;
  }
  return v;
}

std::optional<bool> json_fields::boolean(std::string_view key) {
  const json_node* n = typed(key, json_node::type::boolean, "true or false");
  return n ? std::optional<bool>(n->boolean) : std::nullopt;
}

const json_node* json_fields::object(std::string_view key) {
  return typed(key, json_node::type::object, "an object");
}

const json_node* json_fields::array(std::string_view key) {
  return typed(key, json_node::type::array, "an array");
}

bool json_fields::require(std::string_view key) {
  for (const std::string& k : object_.keys)
    if (k == key) return true;
  problems_.push_back(make_diagnostic(severity::error, prefix_ + ".member", object_.offset,
                                      what_ + " has no " + quote_name(key)));
  return false;
}

void json_fields::finish() {
  for (std::size_t k = 0; k < object_.keys.size(); ++k)
    if (!used_[k])
      problems_.push_back(
          make_diagnostic(severity::error, prefix_ + ".member", object_.key_offsets[k],
                          "unknown member " + quote_name(object_.keys[k]) + " in " + what_));
}

}  // namespace tiers::detail
