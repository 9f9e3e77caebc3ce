// A review sample as the options say: the settings checked, each document's tier added.
#include <fmt/format.h>

#include "tiers/inputs.hpp"
#include "tiers/review.hpp"

namespace tiers {
namespace {

std::vector<double> parse_limits(const std::string& text) {
  std::vector<double> out;
  for (std::size_t from = 0; from <= text.size();) {
    const std::size_t comma = std::min(text.find(',', from), text.size());
    const std::string part = text.substr(from, comma - from);
    char* end = nullptr;
    const double v = std::strtod(part.c_str(), &end);
    if (part.empty() || *end != '\0' || !(v > 0 && v < 1))
      throw usage_error("--strata: '" + part + "' is not a confidence limit between 0 and 1");
    if (!out.empty() && v <= out.back()) throw usage_error("--strata: the limits go up: " + text);
    out.push_back(v);
    from = comma + 1;
  }
  return out;
}

}  // namespace

sample_options sample_options_of(const sample_settings& o) {
  sample_options l;
  l.tier = o.tier;
  l.n = o.n;
  l.seed = o.seed;
  const auto share = value_named(allocation_names, o.allocation);
  if (!share)
    throw usage_error("--allocation: '" + o.allocation + "' is not " +
                      quoted_names(allocation_names));
  l.share = *share;
  if (!o.strata.empty()) {
    if (!o.by.empty() && o.by != "confidence")
      throw usage_error("sample: --strata sets confidence bands; it does not go with --by " + o.by);
    l.by = stratify_by::confidence;
    l.bands = parse_limits(o.strata);
  } else if (o.by == "confidence") {
    throw usage_error("sample --by confidence: give the bands' limits with --strata 0.5,0.7,0.9");
  } else if (!o.by.empty()) {
    const auto by = value_named(stratify_by_names, o.by);
    if (!by || *by == stratify_by::confidence)
      throw usage_error("--by: '" + o.by + "' is not confidence, label or file");
    l.by = *by;
  }
  parse_duration_arg("--context", o.context);
  return l;
}

void check_level(const char* option, double level) {
  if (!(level > 0 && level < 1))
    throw usage_error(
        fmt::format("{}: {} is not a confidence level between 0 and 1 (0.95)", option, level));
}

result<sampler> sample_document(const document& doc, const std::string& file,
                                const std::string& path, const sample_settings& o,
                                const std::string& sheet_folder, const std::string& page_folder,
                                const std::string& rate_setting) {
  sample_options here = sample_options_of(o);
  result<sampler> out{sampler(here), {}};
  const tier* t = find_tier(doc, o.tier);
  if (!t) {
    diagnostic d;
    d.file = file;
    d.code = "sample.tier";
    d.message = "no tier " + quote_name(o.tier) + " (its tiers: " + tier_names(doc) + ")";
    out.diagnostics.push_back(std::move(d));
    return out;
  }
  here.context = parse_duration_option("--context", o.context, duration_kind::length,
                                       frame_rate_of(doc, rate_setting));
  const std::string uri = doc.media.uri.value_or("");
  const media_place media{media_from(uri, path, sheet_folder), media_from(uri, path, page_folder)};
  out.value = sampler(here);
  out.value.add(file, *t, media);
  return out;
}

// A stratum with annotations but no clip drawn is absent from the sheet: the estimate cannot
// see it and would speak for the other strata only. Said, with what to do.
std::vector<diagnostic> sample_warnings(const std::vector<stratum_count>& strata,
                                        std::size_t without_media) {
  std::vector<diagnostic> out;
  std::vector<std::string> names;
  std::uint64_t annotations = 0;
  for (const stratum_count& c : strata)
    if (c.size > 0 && c.drawn == 0) {
      names.push_back(quote_name(c.name));
      annotations += c.size;
    }
  if (without_media > 0) {
    diagnostic d;
    d.level = severity::warning;
    d.code = "sample.media";
    d.message = fmt::format(
        "{} of the inputs name{} no media: {} clips' links hold only "
        "their times",
        without_media, without_media == 1 ? "s" : "", without_media == 1 ? "its" : "their");
    out.push_back(std::move(d));
  }
  if (names.empty()) return out;
  diagnostic d;
  d.level = severity::warning;
  d.code = "sample.strata";
  std::string listed;
  for (std::size_t k = 0; k < names.size() && k < 5; ++k)
    listed += (k ? ", " : "") + names[k];
  if (names.size() > 5) listed += fmt::format(" and {} more", names.size() - 5);
  d.message = fmt::format(
      "{} strat{} ({} annotation{}) got no clip, so an estimate from this sheet leaves {} out: "
      "{}; draw more (--n), fewer strata, or --allocation equal",
      names.size(), names.size() == 1 ? "um" : "a", annotations, annotations == 1 ? "" : "s",
      names.size() == 1 ? "it" : "them", listed);
  out.push_back(std::move(d));
  return out;
}

}  // namespace tiers
