// join_as_voices: speaker tiers become one cue tier whose annotations name their speaker.
#include "tiers/voices.hpp"

#include <algorithm>

#include "detail/report.hpp"

namespace tiers {

document join_as_voices(const document& doc, const std::string& name,
                        std::vector<std::string>& losses) {
  document out;
  out.media = doc.media;
  out.metadata = doc.metadata;
  tier& joined = out.tiers.emplace_back();
  joined.name = name;
  for (const tier& t : doc.tiers) {
    std::vector<std::string> parts;
    if (t.source) parts.push_back("source");
    if (t.parent) parts.push_back("parent link");
    if (t.vocabulary) parts.push_back("vocabulary");
    if (!t.attributes.empty()) parts.push_back("attributes");
    if (t.kind == tier_kind::instant) parts.push_back("instant kind");
    if (!parts.empty()) {
      std::string line = "the ";
      for (std::size_t k = 0; k < parts.size(); ++k)
        line += (k == 0 ? "" : k + 1 == parts.size() ? " and " : ", ") + parts[k];
      losses.push_back(line + " of tier " + detail::quote_name(t.name) +
                       " (joined into the voices of " + detail::quote_name(name) + ")");
    }
    for (const annotation& a : t.annotations) {
      annotation& c = joined.annotations.emplace_back(a);
      c.attributes.emplace("speaker", t.name);
    }
  }
  std::stable_sort(joined.annotations.begin(), joined.annotations.end(),
                   [](const annotation& a, const annotation& b) { return a.start < b.start; });
  return out;
}

}  // namespace tiers
