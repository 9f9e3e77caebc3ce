// Partial co-occurrence counts as JSON, written by a shard and read back to be added up.
#include <algorithm>
#include <charconv>
#include <map>

#include "detail/json_text.hpp"
#include "detail/json_tree.hpp"
#include "detail/report.hpp"
#include "tiers/cooccur.hpp"

namespace tiers {
namespace {

using detail::json_fields;
using detail::json_node;

// Labels and their totals, sorted by label.
std::vector<std::pair<std::string, std::uint64_t>> totals(const std::vector<std::string>& labels,
                                                          const std::vector<std::uint64_t>& n) {
  std::vector<std::pair<std::string, std::uint64_t>> out;
  for (std::size_t k = 0; k < labels.size(); ++k)
    out.emplace_back(labels[k], n[k]);
  std::sort(out.begin(), out.end());
  return out;
}

}  // namespace

void write_cooccur_counts_json(const cooccur_part& p, byte_sink& out) {
  detail::json_writer j(out);
  const cooccur_counts& c = p.counts;
  j.begin_object(true);
  j.string("format", "tiers-cooccur-counts");
  j.count("version", 1);
  if (!p.shard.empty()) j.string("shard", p.shard);
  j.string("a_tier", p.a_tier);
  j.string("b_tier", p.b_tier);
  j.string("relation", name_of(cooccur_relation_names, p.options.relation));
  j.string("window", p.window);
  j.boolean("fold_case", p.options.fold_case);
  j.key("b_labels").string_array(p.options.b_labels);
  j.key("recordings").string_array(p.recordings);
  j.count("n", c.n());
  for (const auto& [key, labels, n] : {std::tuple{"a", &c.a_labels(), &c.a_totals()},
                                       std::tuple{"b", &c.b_labels(), &c.b_totals()}}) {
    j.key(key).begin_array(true);
    for (const auto& [label, total] : totals(*labels, *n)) {
      j.begin_array();
      j.string(label);
      j.count(total);
      j.end_array();
    }
    j.end_array();
  }
  std::vector<std::tuple<std::string_view, std::string_view, std::uint64_t>> pairs;
  for (const auto& [k, count] : c.pairs())
    pairs.emplace_back(c.a_labels()[k >> 32], c.b_labels()[k & 0xffffffffu], count);
  std::sort(pairs.begin(), pairs.end());
  j.key("pairs").begin_array(true);
  for (const auto& [a, b, count] : pairs) {
    j.begin_array();
    j.string(a);
    j.string(b);
    j.count(count);
    j.end_array();
  }
  j.end_array();
  if (p.shifted) {
    const permutation_counts& s = *p.shifted;
    j.key("permutations").begin_object(true);
    j.count("count", s.permutations);
    j.count("seed", s.seed);
    j.key("pairs").begin_array(true);
    for (std::size_t k = 0; k < s.pairs.size(); ++k) {
      j.begin_array();
      j.string(s.pairs[k].first);
      j.string(s.pairs[k].second);
      j.begin_array();
      for (const std::uint64_t shifted : s.counts[k])
        j.count(shifted);
      j.end_array();
      j.end_array();
    }
    j.end_array();
    j.end_object();
  }
  j.end_object();
  out.put('\n');
}

result<cooccur_part> read_cooccur_counts(std::string_view text, const std::string& file) {
  result<cooccur_part> r;
  std::vector<diagnostic>& problems = r.diagnostics;
  cooccur_part& p = r.value;
  auto bad = [&](const json_node& n, std::string message) {
    problems.push_back(
        detail::make_diagnostic(severity::error, "cooccur.value", n.offset, std::move(message)));
  };
  auto count = [&](const json_node& n) {
    std::uint64_t v = 0;
    const char* end = n.text.data() + n.text.size();
    if (n.kind != json_node::type::number || std::from_chars(n.text.data(), end, v).ptr != end)
      bad(n, "a count was expected");
    return v;
  };
  auto strings = [&](const json_node* n, std::vector<std::string>& into) {
    if (!n) return;
    for (const json_node& s : n->items)
      if (s.kind == json_node::type::string)
        into.push_back(s.text);
      else
        bad(s, "a string was expected");
  };
  const std::optional<json_node> root =
      detail::parse_json_object(text, problems, 8, "a co-occurrence count", "cooccur");
  if (root) {
    json_fields f(*root, "the counts", "cooccur", problems);
    f.kind_and_version("tiers-cooccur-counts", true,
                       "--combine adds up the counts of cooccur --shard K/N --format json");
    p.shard = f.string("shard").value_or("");
    for (const char* key : {"a_tier", "b_tier", "relation", "window", "n", "a", "b", "pairs"})
      f.require(key);
    p.a_tier = f.string("a_tier").value_or("");
    p.b_tier = f.string("b_tier").value_or("");
    if (auto rel = f.string("relation")) {
      if (auto v = value_named(cooccur_relation_names, *rel))
        p.options.relation = *v;
      else
        bad(*f.get("relation"), "'relation' is " + quoted_names(cooccur_relation_names));
    }
    p.window = f.string("window").value_or("");
    p.options.fold_case = f.boolean("fold_case").value_or(false);
    strings(f.array("b_labels"), p.options.b_labels);
    strings(f.array("recordings"), p.recordings);
    if (const json_node* n = f.get("n")) p.counts.add_n(count(*n));
    for (const char* key : {"a", "b"})
      if (const json_node* list = f.array(key))
        for (const json_node& row : list->items) {
          if (row.kind != json_node::type::array || row.items.size() != 2 ||
              row.items[0].kind != json_node::type::string) {
            bad(row, "each label is [label, total]");
            continue;
          }
          const std::uint64_t total = count(row.items[1]);
          if (key[0] == 'a')
            p.counts.add_a_total(row.items[0].text, total);
          else
            p.counts.add_b_total(row.items[0].text, total);
        }
    if (const json_node* list = f.array("pairs"))
      for (const json_node& row : list->items) {
        if (row.kind != json_node::type::array || row.items.size() != 3 ||
            row.items[0].kind != json_node::type::string ||
            row.items[1].kind != json_node::type::string) {
          bad(row, "each pair is [a, b, count]");
          continue;
        }
        p.counts.add_raw(row.items[0].text, row.items[1].text, count(row.items[2]));
      }
    if (const json_node* perm = f.object("permutations")) {
      json_fields g(*perm, "the permutation counts", "cooccur", problems);
      permutation_counts s;
      for (const char* key : {"count", "seed", "pairs"})
        g.require(key);
      if (const json_node* n = g.get("count"))
        s.permutations = static_cast<std::uint32_t>(count(*n));
      if (const json_node* n = g.get("seed")) s.seed = count(*n);
      if (const json_node* list = g.array("pairs"))
        for (const json_node& row : list->items) {
          if (row.kind != json_node::type::array || row.items.size() != 3 ||
              row.items[0].kind != json_node::type::string ||
              row.items[1].kind != json_node::type::string ||
              row.items[2].kind != json_node::type::array ||
              row.items[2].items.size() != s.permutations) {
            bad(row, "each pair is [a, b, [a count per shift]]");
            continue;
          }
          s.pairs.emplace_back(row.items[0].text, row.items[1].text);
          s.counts.emplace_back();
          for (const json_node& c : row.items[2].items)
            s.counts.back().push_back(count(c));
        }
      g.finish();
      p.shifted = std::move(s);
    }
    f.finish();
  }
  locate_all(text, problems);
  for (diagnostic& d : problems)
    d.file = file;
  return r;
}

result<std::vector<label_pair>> read_cooccur_pairs(std::string_view text, const std::string& file) {
  result<std::vector<label_pair>> r;
  const std::optional<json_node> root =
      detail::parse_json_object(text, r.diagnostics, 8, "a co-occurrence table", "cooccur");
  if (root) {
    const json_node* pairs = root->member("pairs");
    if (!pairs || pairs->kind != json_node::type::array)
      r.diagnostics.push_back(detail::make_diagnostic(
          severity::error, "cooccur.value", root->offset,
          "a table of pairs was expected, as cooccur --format json prints it"));
    else
      for (const json_node& p : pairs->items) {
        const json_node* a = p.member("a");
        const json_node* b = p.member("b");
        if (!a || !b || a->kind != json_node::type::string || b->kind != json_node::type::string) {
          r.diagnostics.push_back(detail::make_diagnostic(
              severity::error, "cooccur.value", p.offset, "each pair names its \"a\" and \"b\""));
          continue;
        }
        r.value.emplace_back(a->text, b->text);
      }
  }
  locate_all(text, r.diagnostics);
  for (diagnostic& d : r.diagnostics)
    d.file = file;
  return r;
}

}  // namespace tiers
