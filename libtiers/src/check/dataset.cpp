// Comparing the files of a dataset with one another: what most files have, each file should.
#include <algorithm>
#include <map>

#include "checker.hpp"
#include "detail/report.hpp"
#include "tiers/check.hpp"

namespace tiers {
namespace {

using detail::quote_name;

// Two thirds: with fewer files agreeing there is no clear rule to hold the others to.
bool most(std::size_t part, std::size_t whole) {
  return whole >= 3 && part * 3 >= whole * 2;
}

std::string vocabulary_key(const std::optional<std::vector<std::string>>& v) {
  if (!v) return "\x01none";
  std::vector<std::string> sorted = *v;
  std::sort(sorted.begin(), sorted.end());
  std::string key;
  for (const std::string& s : sorted)
    key += s + '\0';
  return key;
}

void add(file_report& r, const std::string& tier, source_position at, severity level,
         std::string message) {
  problem& p = r.problems.emplace_back();
  p.diag.level = level;
  p.diag.code = "dataset.inconsistent";
  p.diag.message = std::move(message);
  p.diag.file = r.path;
  p.diag.offset = at.offset;
  p.diag.line = at.line;
  p.diag.column = at.column;
  p.tier = tier;
}

}  // namespace

std::vector<tier_shape> shape_of(const document& doc, const source_map& positions) {
  std::vector<tier_shape> out;
  for (std::size_t t = 0; t < doc.tiers.size(); ++t)
    out.push_back(
        {doc.tiers[t].name, doc.tiers[t].kind, doc.tiers[t].vocabulary, positions.of_tier(t)});
  return out;
}

void check_dataset(std::span<file_report> reports, const profile& p) {
  for (file_report& r : reports)
    std::erase_if(r.problems,
                  [](const problem& x) { return x.diag.code == "dataset.inconsistent"; });
  const rule_level level = p.level("dataset.inconsistent");
  if (level == rule_level::off) return;
  const severity sev = severity_of(level);
  std::size_t files = 0;
  // tier name -> files that have it, and its kinds and vocabularies with their counts
  struct seen {
    std::size_t files = 0;
    std::map<tier_kind, std::size_t> kinds;
    std::map<std::string, std::size_t> vocabularies;
  };
  std::map<std::string, seen, std::less<>> tiers;
  // Each file's tiers by name, first of each name only (tier.duplicate-name reports the rest):
  // a sorted index keeps this O(n log n) in the number of tiers.
  const auto first_of_each = [](const std::vector<tier_shape>& shapes) {
    std::map<std::string_view, const tier_shape*> out;
    for (const tier_shape& t : shapes)
      out.emplace(t.name, &t);
    return out;
  };
  for (const file_report& r : reports) {
    const auto& s = r.shape;
    if (!s) continue;
    ++files;
    for (const auto& [name, t] : first_of_each(*s)) {
      seen& x = tiers[std::string(name)];
      ++x.files;
      ++x.kinds[t->kind];
      ++x.vocabularies[vocabulary_key(t->vocabulary)];
    }
  }
  std::vector<const decltype(tiers)::value_type*> common;  // what most files have
  for (const auto& entry : tiers)
    if (most(entry.second.files, files) && !p.find_tier(entry.first)) common.push_back(&entry);
  for (std::size_t k = 0; k < reports.size(); ++k) {
    if (!reports[k].shape) continue;
    const auto mine = first_of_each(*reports[k].shape);
    for (const auto* entry : common)
      if (!mine.contains(entry->first))
        add(reports[k], "", {}, sev,
            "no tier " + quote_name(entry->first) + ", which " +
                std::to_string(entry->second.files) + " of " + std::to_string(files) +
                " files have");
    for (const auto& [name_view, it] : mine) {
      const std::string name(name_view);
      if (p.find_tier(name)) continue;  // the profile's own rules hold it to account
      const seen& x = tiers.find(name_view)->second;
      for (const auto& [kind, n] : x.kinds)
        if (kind != it->kind && most(n, x.files))
          add(reports[k], name, it->where, sev,
              "tier " + quote_name(name) + " is " + detail::kind_tier(it->kind) + " here, " +
                  detail::kind_tier(kind) + " in " + std::to_string(n) + " of the " +
                  std::to_string(x.files) + " files that have it");
      const std::string mine_key = vocabulary_key(it->vocabulary);
      for (const auto& [key, n] : x.vocabularies)
        if (key != mine_key && most(n, x.files))
          add(reports[k], name, it->where, sev,
              "tier " + quote_name(name) +
                  (it->vocabulary ? " declares other labels" : " declares no labels") +
                  " than in " + std::to_string(n) + " of the " + std::to_string(x.files) +
                  " files that have it");
    }
    detail::sort_problems(reports[k].problems);
  }
}

}  // namespace tiers
