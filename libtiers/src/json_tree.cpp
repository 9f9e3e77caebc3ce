// The located JSON tree: the JSON scanner's events, each value stamped with its byte offset.
#include "detail/json_tree.hpp"

#include <algorithm>
#include <charconv>

#include "detail/json_scan.hpp"
#include "detail/report.hpp"

namespace tiers::detail {
namespace {

// Builds the tree from the scanner's events; objects and arrays wait on a stack until closed.
class tree_builder {
 public:
  explicit tree_builder(std::vector<diagnostic>& problems) : problems_(problems) {}

  bool on_null(std::size_t at) { return add(leaf(json_node::type::null, at)); }
  bool on_bool(bool v, std::size_t at) {
    json_node n = leaf(json_node::type::boolean, at);
    n.boolean = v;
    return add(std::move(n));
  }
  bool on_number(std::string_view text, std::size_t at) {
    json_node n = leaf(json_node::type::number, at);
    n.text = text;  // as written, so that `1.10` reads as exactly as the user wrote it
    return add(std::move(n));
  }
  bool on_string(std::string& v, std::size_t at) {
    json_node n = leaf(json_node::type::string, at);
    n.text = std::move(v);
    return add(std::move(n));
  }
  bool on_start_object(std::size_t at) { return open(json_node::type::object, at); }
  bool on_start_array(std::size_t at) { return open(json_node::type::array, at); }
  bool on_end_object(std::size_t) { return close(); }
  bool on_end_array(std::size_t) { return close(); }
  bool on_key(std::string& k, std::size_t at) {
    json_node& o = stack_.back();
    for (const std::string& existing : o.keys)
      if (existing == k) return fail("json.duplicate", at, "duplicate key " + quote_name(k));
    o.keys.push_back(std::move(k));
    o.key_offsets.push_back(at);
    return true;
  }
  bool fail(std::string code, std::size_t offset, std::string message) {
    if (!failed)
      problems_.push_back(
          make_diagnostic(severity::error, std::move(code), offset, std::move(message)));
    failed = true;
    return false;
  }

  std::optional<json_node> root;
  bool failed = false;

 private:
  static json_node leaf(json_node::type t, std::size_t at) {
    json_node n;
    n.kind = t;
    n.offset = at;
    return n;
  }
  bool add(json_node n) {
    if (stack_.empty()) {
      root = std::move(n);
      return true;
    }
    stack_.back().items.push_back(std::move(n));
    return true;
  }
  bool open(json_node::type t, std::size_t at) {
    stack_.push_back(leaf(t, at));
    return true;
  }
  bool close() {
    json_node n = std::move(stack_.back());
    stack_.pop_back();
    return add(std::move(n));
  }

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
  tree_builder b(problems);
  if (auto e = scan_json(text, b, max_depth))
    b.fail(e->message.find("nest deeper") != std::string::npos ? "json.depth" : "json.syntax",
           e->offset, "invalid JSON: " + e->message);
  if (b.failed || !b.root) return std::nullopt;
  return std::move(b.root);
}

std::optional<json_node> parse_json_object(std::string_view text, std::vector<diagnostic>& problems,
                                           std::size_t max_depth, std::string_view what,
                                           std::string_view prefix) {
  std::optional<json_node> root = parse_json_tree(text, problems, max_depth);
  if (root && root->kind != json_node::type::object) {
    problems.push_back(make_diagnostic(severity::error, std::string(prefix) + ".value",
                                       root->offset, std::string(what) + " is a JSON object"));
    root.reset();
  }
  return root;
}

void json_fields::kind_and_version(std::string_view kind, bool required, std::string_view why) {
  const std::optional<std::string> format = string("format");
  if ((!required || require("format")) && format && *format != kind)
    bad(*get("format"), "'format' must be \"" + std::string(kind) + "\"" + std::string(why));
  if (const json_node* v = get("version"); (!required || require("version")) && v &&
                                           (v->kind != json_node::type::number || v->text != "1"))
    bad(*v, "'version' must be 1");
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
