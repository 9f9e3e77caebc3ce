// Rules on how tiers hang together: parent tiers, children inside (or partitioning) their
// parent annotations, references by id, unique ids, and labels from a vocabulary.
#include <algorithm>
#include <map>
#include <numeric>
#include <unordered_set>

#include "checker.hpp"
#include "detail/report.hpp"
#include "detail/view_index.hpp"

namespace tiers::detail {
namespace {

std::optional<std::size_t> index_of(const document& doc, std::string_view name) {
  for (std::size_t k = 0; k < doc.tiers.size(); ++k)
    if (doc.tiers[k].name == name) return k;
  return std::nullopt;
}

// Parent annotations by start, and for each the latest end among it and those before it: a
// child [s, e] lies inside some parent exactly when the parent found for s reaches e.
struct parent_index {
  std::vector<std::size_t> order;
  std::vector<time_ns> starts;
  std::vector<std::size_t> reach;  // index (into order) of the farthest-ending parent so far

  explicit parent_index(const std::vector<annotation>& ps) : order(ps.size()) {
    std::iota(order.begin(), order.end(), std::size_t{0});
    std::stable_sort(order.begin(), order.end(),
                     [&](std::size_t a, std::size_t b) { return ps[a].start < ps[b].start; });
    for (std::size_t k = 0; k < order.size(); ++k) {
      starts.push_back(ps[order[k]].start);
      const bool further = k == 0 || ps[order[k]].end > ps[order[reach[k - 1]]].end;
      reach.push_back(further ? k : reach[k - 1]);
    }
  }
  // The parent annotation that contains [s, e], or no_index.
  std::size_t containing(const std::vector<annotation>& ps, time_ns s, time_ns e) const {
    const auto it = std::upper_bound(starts.begin(), starts.end(), s);
    if (it == starts.begin()) return no_index;
    const std::size_t k = reach[static_cast<std::size_t>(it - starts.begin()) - 1];
    return ps[order[k]].end >= e ? order[k] : no_index;
  }
};

// structure.duplicate-id: an id used twice in one tier.
void duplicate_ids(checker& c, std::size_t t) {
  const auto& as = c.doc_.tiers[t].annotations;
  detail::view_index ids(as.size());
  for (std::size_t a = 0; a < as.size(); ++a) {
    if (!as[a].id) continue;
    const auto [first, added] = ids.emplace(*as[a].id, a);
    if (added) continue;
    const std::string there = c.where(t, first);
    c.emit("structure.duplicate-id", t, a,
           "id " + quote_name(*as[a].id) + " is used again" +
               (there.empty() ? "" : " (first at " + there + ")"));
  }
}

// structure.vocabulary: a label outside the tier's vocabulary (the profile's, else its own).
void vocabulary_labels(checker& c, std::size_t t, const std::vector<std::string>& vocabulary) {
  const tier& tr = c.doc_.tiers[t];
  const std::unordered_set<std::string_view> allowed(vocabulary.begin(), vocabulary.end());
  std::string listed;
  for (std::size_t k = 0; k < vocabulary.size() && k < 8; ++k)
    listed += (k ? ", " : "") + vocabulary[k];
  if (vocabulary.size() > 8) listed += ", …";
  for (std::size_t a = 0; a < tr.annotations.size(); ++a) {
    const std::string& label = tr.annotations[a].text;
    if (!label.empty() && !allowed.count(label))
      c.emit("structure.vocabulary", t, a,
             "label " + quote_name(label) + " is not in the vocabulary of " + quote_name(tr.name) +
                 " (" + (listed.empty() ? "no labels" : listed) + ")");
  }
}

// structure.parent-tier: the parent tier of `t` when it can hold children — it exists, is not
// `t` itself and does not have `t` among its ancestors — else no_index, the problem reported.
std::size_t parent_tier(checker& c, std::size_t t, const parent_link& link, bool declared) {
  const tier& tr = c.doc_.tiers[t];
  const auto p = index_of(c.doc_, link.tier);
  if (!p && !declared)
    return no_index;  // the profile's parent tier is missing: dataset.tier-missing
  if (!p || *p == t) {
    c.emit("structure.parent-tier", t, no_index,
           "tier " + quote_name(tr.name) + " names " + quote_name(link.tier) + " as its parent, " +
               (p ? "which is itself" : "which is not in the file"));
    return no_index;
  }
  // A parent chain that comes back to this tier is a cycle: no annotation can be placed.
  std::size_t up = *p;
  for (std::size_t steps = 0; steps < c.doc_.tiers.size(); ++steps) {
    const std::optional<parent_link>& next = c.doc_.tiers[up].parent;
    if (!next) break;
    const auto n = index_of(c.doc_, next->tier);
    if (!n) break;
    if (*n == t) {
      c.emit(
          "structure.parent-tier", t, no_index,
          "tier " + quote_name(tr.name) + " is its own ancestor through " + quote_name(link.tier));
      return no_index;
    }
    up = *n;
  }
  return *p;
}

// structure.missing-parent: children that refer to their parent annotation by id.
void parent_references(checker& c, std::size_t t, std::size_t p, const std::string& parent) {
  const auto& as = c.doc_.tiers[t].annotations;
  detail::view_index ids(c.doc_.tiers[p].annotations.size());
  for (const annotation& x : c.doc_.tiers[p].annotations)
    if (x.id) ids.emplace(*x.id, 0);
  for (std::size_t a = 0; a < as.size(); ++a) {
    if (!as[a].parent)
      c.emit("structure.missing-parent", t, a,
             "refers to no annotation of its parent tier " + quote_name(parent));
    else if (!ids.contains(*as[a].parent))
      c.emit("structure.missing-parent", t, a,
             "refers to " + quote_name(*as[a].parent) + ", which tier " + quote_name(parent) +
                 " does not have");
  }
}

using children_of = std::map<std::size_t, std::vector<std::size_t>>;  // parent -> children

// structure.outside-parent: a child inside no parent annotation. Returns the children of
// each parent annotation.
children_of place_children(checker& c, std::size_t t, std::size_t p, const std::string& parent) {
  const auto& as = c.doc_.tiers[t].annotations;
  const std::vector<annotation>& ps = c.doc_.tiers[p].annotations;
  const parent_index index(ps);
  children_of children;
  for (std::size_t a = 0; a < as.size(); ++a) {
    if (as[a].end < as[a].start) continue;  // reported by time.reversed
    const std::size_t in = index.containing(ps, as[a].start, as[a].end);
    if (in == no_index)
      c.emit("structure.outside-parent", t, a,
             "lies outside every annotation of its parent tier " + quote_name(parent) + " (" +
                 clock(as[a].start) + " to " + clock(as[a].end) + ")");
    else
      children[in].push_back(a);
  }
  return children;
}

// structure.partition: the children of each parent annotation cover it without gap or overlap.
void partitions(checker& c, std::size_t t, std::size_t p, children_of& children) {
  const auto& as = c.doc_.tiers[t].annotations;
  const std::vector<annotation>& ps = c.doc_.tiers[p].annotations;
  for (auto& [parent, kids] : children) {
    std::stable_sort(kids.begin(), kids.end(),
                     [&](std::size_t a, std::size_t b) { return as[a].start < as[b].start; });
    time_ns covered = ps[parent].start;
    const std::string of =
        "of its parent (" + clock(ps[parent].start) + " to " + clock(ps[parent].end) + ")";
    for (std::size_t a : kids) {
      if (as[a].start > covered)
        c.emit("structure.partition", t, a,
               "leaves " + clock(covered) + " to " + clock(as[a].start) + " " + of + " uncovered");
      else if (as[a].start < covered)
        c.emit("structure.partition", t, a,
               "overlaps its sibling by " + seconds(std::min(covered, as[a].end) - as[a].start) +
                   " where the children must partition their parent");
      covered = std::max(covered, as[a].end);
    }
    if (covered < ps[parent].end)
      c.emit("structure.partition", t, kids.back(),
             "leaves " + clock(covered) + " to " + clock(ps[parent].end) + " " + of +
                 " uncovered after it");
  }
}

}  // namespace

void checker::check_structure(std::size_t t) {
  const tier& tr = doc_.tiers[t];
  if (on("structure.duplicate-id")) duplicate_ids(*this, t);
  const tier_spec* spec = profile_.find_tier(tr.name);
  const std::optional<std::vector<std::string>>& vocabulary =
      spec && spec->vocabulary ? spec->vocabulary : tr.vocabulary;
  if (vocabulary && on("structure.vocabulary")) vocabulary_labels(*this, t, *vocabulary);

  // A tier without a parent of its own takes the one its profile declares (a table cannot say).
  const std::optional<parent_link>& link = tr.parent ? tr.parent : spec ? spec->parent : tr.parent;
  if (!link) return;
  const std::size_t p = parent_tier(*this, t, *link, tr.parent.has_value());
  if (p == no_index) return;
  if (link->rel == relation::refers) {
    if (on("structure.missing-parent")) parent_references(*this, t, p, link->tier);
    return;
  }
  children_of children = place_children(*this, t, p, link->tier);
  if (link->rel == relation::partition && on("structure.partition"))
    partitions(*this, t, p, children);
}

}  // namespace tiers::detail
