// A co-occurrence analysis as the options say: each document counted, the counts added up,
// the table made and tested.
#include "tiers/cooccur.hpp"
#include "tiers/inputs.hpp"

namespace tiers {

cooccur_options cooccur_options_of(const cooccur_settings& o) {
  cooccur_options l;
  const auto relation = value_named(cooccur_relation_names, o.relation);
  if (!relation)
    throw usage_error("--relation: '" + o.relation + "' is not " +
                      quoted_names(cooccur_relation_names));
  l.relation = *relation;
  l.fold_case = o.fold_case;
  for (std::size_t from = 0; !o.b_labels.empty() && from <= o.b_labels.size();) {
    const std::size_t comma = std::min(o.b_labels.find(',', from), o.b_labels.size());
    l.b_labels.push_back(o.b_labels.substr(from, comma - from));
    from = comma + 1;
  }
  if (!value_named(cooccur_sort_names, o.sort))
    throw usage_error("--sort: '" + o.sort + "' is not " + quoted_names(cooccur_sort_names));
  parse_duration_arg("--window", o.window);
  if (o.a.empty() || o.b.empty()) throw usage_error("cooccur: name the two tiers: --a A --b B");
  return l;
}

result<counted_document> count_document(const document& doc, const std::string& name,
                                        const cooccur_settings& o, const std::string& rate_setting,
                                        bool keep) {
  result<counted_document> out;
  cooccur_options l = cooccur_options_of(o);
  l.window = parse_duration_option("--window", o.window, duration_kind::length,
                                   frame_rate_of(doc, rate_setting));
  const tier* a = find_tier(doc, o.a);
  const tier* b = find_tier(doc, o.b);
  for (const auto& [t, wanted] : {std::pair{a, &o.a}, std::pair{b, &o.b}})
    if (!t) {
      diagnostic d;
      d.file = name;
      d.code = "cooccur.tier";
      d.message = "no tier " + quote_name(*wanted) + " (its tiers: " + tier_names(doc) + ")";
      out.diagnostics.push_back(std::move(d));
      return out;
    }
  counted_document& c = out.value;
  c.counts.add(*a, *b, l);
  if (keep) {
    c.a = *a;
    c.b = *b;
    c.recording.name = name;
    c.recording.length = doc.media.duration.value_or(latest_end(*a, *b));
    c.recording.media = doc.media.uri.value_or("");
    c.recording.options = l;
  }
  return out;
}

void gather_counts(std::vector<counted_document>& each, cooccur_counts& all,
                   std::vector<cooccur_recording>& recordings) {
  for (counted_document& c : each) {
    all.add(c.counts);
    if (c.a) {
      c.recording.a = &*c.a;
      c.recording.b = &*c.b;
      recordings.push_back(c.recording);
    }
  }
}

std::vector<pair_statistics> cooccur_run(std::vector<counted_document>& each,
                                         const cooccur_settings& o, cooccur_counts& all,
                                         std::vector<cooccur_recording>& recordings) {
  gather_counts(each, all, recordings);
  std::vector<pair_statistics> table =
      cooccur_table(all, o.min_count, *value_named(cooccur_sort_names, o.sort));
  if (o.permutations > 0) permutation_test(table, recordings, o.permutations, o.seed);
  return table;
}

}  // namespace tiers
