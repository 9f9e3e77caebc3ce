// Every string of a document as valid UTF-8: what writers are given, so that no output holds
// bytes a reader (or any UTF-8 consumer) would refuse.
#include "detail/utf8.hpp"
#include "tiers/model.hpp"

namespace tiers::detail {
namespace {

// Calls `f(std::string&)` (or const) on every string `doc` holds but attribute keys, which
// `f_map` handles (a map's keys cannot be changed in place).
template <class Doc, class F, class M>
void each_string(Doc& doc, F&& f, M&& f_map) {
  auto opt = [&](auto& o) {
    if (o) f(*o);
  };
  opt(doc.media.uri);
  f_map(doc.metadata);
  for (auto& t : doc.tiers) {
    f(t.name);
    if (t.parent) f(t.parent->tier);
    if (t.source) {
      opt(t.source->agent);
      opt(t.source->version);
    }
    if (t.vocabulary)
      for (auto& v : *t.vocabulary)
        f(v);
    f_map(t.attributes);
    for (auto& a : t.annotations) {
      f(a.text);
      opt(a.markup);
      opt(a.id);
      opt(a.parent);
      f_map(a.attributes);
    }
  }
}

bool valid(std::string_view s) {
  return find_invalid_utf8(s) == std::string_view::npos;
}

}  // namespace

void visit_strings(const document& doc, const std::function<void(std::string_view)>& f) {
  each_string(
      doc, [&](const std::string& s) { f(s); },
      [&](const attribute_map& m) {
        for (const auto& [k, v] : m) {
          f(k);
          f(v);
        }
      });
}

bool document_is_utf8(const document& doc) {
  bool ok = true;
  each_string(
      doc, [&](const std::string& s) { ok = ok && valid(s); },
      [&](const attribute_map& m) {
        for (const auto& [k, v] : m)
          ok = ok && valid(k) && valid(v);
      });
  return ok;
}

document with_utf8_repaired(const document& doc) {
  document out = doc;
  std::size_t replaced = 0;
  auto fix = [&](std::string& s) {
    if (!valid(s)) s = repair_utf8(s, replaced);
  };
  each_string(out, fix, [&](attribute_map& m) {
    attribute_map fixed;
    for (const auto& [k, v] : m) {
      std::string key = k, value = v;
      fix(key);
      fix(value);
      fixed[std::move(key)] = std::move(value);  // two keys may now meet: the later wins
    }
    m = std::move(fixed);
  });
  return out;
}

}  // namespace tiers::detail
