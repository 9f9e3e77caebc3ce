// What a document would lose in a format: compares the document with the format's features.
#include <algorithm>
#include <cstddef>
#include <functional>

#include "detail/report.hpp"
#include "detail/utf8.hpp"
#include "tiers/format.hpp"
#include "tiers/io.hpp"

namespace tiers {
namespace {

using detail::plural;

const tier* tier_at(const document& doc, std::size_t k) {
  return k < doc.tiers.size() ? &doc.tiers[k] : nullptr;
}

using detail::quote_name;

// "'a', 'b' and 3 more" — tier lists stay readable on wide documents.
std::string name_list(const std::vector<std::string_view>& names) {
  constexpr std::size_t shown = 8;
  std::string s;
  for (std::size_t k = 0; k < names.size() && k < shown; ++k) {
    if (k > 0) s += ", ";
    s += quote_name(names[k]);
  }
  if (names.size() > shown) s += " and " + std::to_string(names.size() - shown) + " more";
  return s;
}

// One line for every tier in which `count` finds annotations with the feature.
void per_annotation(const document& doc, std::string_view what,
                    const std::function<bool(const annotation&)>& has,
                    std::vector<std::string>& out) {
  for (const tier& t : doc.tiers) {
    std::size_t n = 0;
    for (const annotation& a : t.annotations)
      n += has(a) ? 1 : 0;
    if (n > 0)
      out.push_back(std::string(what) + " of " + plural(n, "annotation", "annotations") +
                    " in tier " + quote_name(t.name));
  }
}

// One line naming every tier for which `has` holds.
void per_tier(const document& doc, std::string_view what,
              const std::function<bool(const tier&)>& has, std::vector<std::string>& out) {
  std::vector<std::string_view> names;
  for (const tier& t : doc.tiers)
    if (has(t)) names.push_back(t.name);
  if (!names.empty())
    out.push_back(std::string(what) + " of " + (names.size() == 1 ? "tier " : "tiers ") +
                  name_list(names));
}

// Keys the format carries although it carries no attributes or metadata in general.
bool owned_key(const format& fmt, std::string_view key) {
  if (!fmt.own_prefix.empty() && key.substr(0, fmt.own_prefix.size()) == fmt.own_prefix)
    return true;
  return std::find(fmt.own_keys.begin(), fmt.own_keys.end(), key) != fmt.own_keys.end();
}

// A word tier that a format with inline words writes inside its parent's annotations.
bool inline_word_tier(const format& fmt, const tier& t) {
  return fmt.carries.has(feature::several_tiers) && fmt.carries.has(feature::inline_words) &&
         t.parent && is_words_tier_of(t, t.parent->tier);
}

void feature_losses(const document& doc, const format& fmt, feature f,
                    std::vector<std::string>& out) {
  // A format with inline words carries the first tier's word tier and its parent link.
  const tier* words = tier_at(doc, word_tier_index(doc, fmt));
  switch (f) {
    case feature::several_tiers: {
      std::vector<std::string_view> rest;
      for (std::size_t k = 1; k < doc.tiers.size(); ++k)
        if (&doc.tiers[k] != words) rest.push_back(doc.tiers[k].name);
      if (!rest.empty()) out.push_back("tiers after the first: " + name_list(rest));
      break;
    }
    case feature::empty_tiers: {
      std::vector<std::string_view> names;
      for (const tier& t : doc.tiers)
        if (t.annotations.empty()) names.push_back(t.name);
      if (!names.empty())
        out.push_back((names.size() == 1 ? "empty tier " : "empty tiers ") + name_list(names));
      break;
    }
    case feature::instant_tiers:
      per_tier(
          doc, "the instant kind (read back as zero-length intervals)",
          [](const tier& t) { return t.kind == tier_kind::instant; }, out);
      break;
    case feature::tier_sources:
      per_tier(
          doc, "the source", [](const tier& t) { return t.source.has_value(); }, out);
      break;
    case feature::tier_parents:
      per_tier(
          doc, "the parent link",
          [&](const tier& t) {
            return t.parent.has_value() && &t != words && !inline_word_tier(fmt, t);
          },
          out);
      break;
    case feature::vocabularies:
      per_tier(
          doc, "the vocabulary", [](const tier& t) { return t.vocabulary.has_value(); }, out);
      break;
    case feature::tier_attributes:
      per_tier(
          doc, "the attributes",
          [&](const tier& t) {
            return std::any_of(t.attributes.begin(), t.attributes.end(),
                               [&](const auto& kv) { return !owned_key(fmt, kv.first); });
          },
          out);
      break;
    case feature::markup:
      per_annotation(
          doc, "markup", [](const annotation& a) { return a.markup.has_value(); }, out);
      break;
    case feature::confidence:
      per_annotation(
          doc, "confidence", [](const annotation& a) { return a.confidence.has_value(); }, out);
      break;
    case feature::ids:
      per_annotation(
          doc, "ids", [](const annotation& a) { return a.id.has_value(); }, out);
      break;
    case feature::parent_refs:
      per_annotation(
          doc, "parent ids", [](const annotation& a) { return a.parent.has_value(); }, out);
      break;
    case feature::annotation_attributes:
      per_annotation(
          doc, "attributes",
          [&](const annotation& a) {
            return std::any_of(a.attributes.begin(), a.attributes.end(),
                               [&](const auto& kv) { return !owned_key(fmt, kv.first); });
          },
          out);
      break;
    case feature::media: {
      std::vector<std::string> parts;
      if (doc.media.uri) parts.push_back("uri");
      if (doc.media.duration) parts.push_back("duration");
      if (doc.media.frame_rate && !fmt.carries.has(feature::frame_rate))
        parts.push_back("frame rate");
      if (!parts.empty()) {
        std::string s = "media ";
        for (std::size_t k = 0; k < parts.size(); ++k)
          s += (k ? ", " : "") + parts[k];
        out.push_back(s);
      }
      break;
    }
    case feature::metadata: {
      const auto n = static_cast<std::size_t>(
          std::count_if(doc.metadata.begin(), doc.metadata.end(),
                        [&](const auto& kv) { return !owned_key(fmt, kv.first); }));
      if (n > 0) out.push_back("document metadata (" + plural(n, "entry", "entries") + ")");
      break;
    }
    case feature::inline_words:
      break;  // widens what several_tiers and tier_parents allow; nothing of its own
    case feature::frame_rate:
      if (doc.media.frame_rate && fmt.carries.has(feature::media))
        out.push_back("media frame rate");
      break;
  }
}

}  // namespace

std::size_t word_tier_index(const document& doc, const format& fmt) {
  if (fmt.carries.has(feature::several_tiers) || !fmt.carries.has(feature::inline_words) ||
      doc.tiers.empty())
    return no_tier;
  for (std::size_t k = 1; k < doc.tiers.size(); ++k) {
    const auto& p = doc.tiers[k].parent;
    if (p && p->tier == doc.tiers[0].name && p->rel == relation::within) return k;
  }
  return no_tier;
}

std::string_view to_string(feature f) {
  switch (f) {
    case feature::several_tiers:
      return "several-tiers";
    case feature::empty_tiers:
      return "empty-tiers";
    case feature::instant_tiers:
      return "instant-tiers";
    case feature::tier_sources:
      return "tier-sources";
    case feature::tier_parents:
      return "tier-parents";
    case feature::vocabularies:
      return "vocabularies";
    case feature::tier_attributes:
      return "tier-attributes";
    case feature::markup:
      return "markup";
    case feature::confidence:
      return "confidence";
    case feature::ids:
      return "ids";
    case feature::parent_refs:
      return "parent-refs";
    case feature::annotation_attributes:
      return "annotation-attributes";
    case feature::media:
      return "media";
    case feature::metadata:
      return "metadata";
    case feature::inline_words:
      return "inline-words";
    case feature::frame_rate:
      return "frame-rate";
  }
  return "";
}

std::vector<std::string> find_losses(const document& doc, const format& fmt,
                                     const output_context& where) {
  std::vector<std::string> out;
  for (int k = 0; k < feature_count; ++k) {
    const auto f = static_cast<feature>(k);
    if (!fmt.carries.has(f)) feature_losses(doc, fmt, f, out);
  }
  if (fmt.extra_losses) fmt.extra_losses(doc, out);
  if (!detail::document_is_utf8(doc)) out.push_back("bytes that are not UTF-8 (written as U+FFFD)");
  if (!fmt.carries.has(feature::several_tiers) && !doc.tiers.empty() && !where.path.empty() &&
      where.path != "-") {
    const std::string stem = name_from_path(where.path);
    const std::string& name = doc.tiers.front().name;
    if (name != stem && (where.given_name.empty() || name != where.given_name))
      out.push_back("the tier name " + quote_name(name) + " (a " + std::string(fmt.name) +
                    " file names no tier; read back, it is named " + quote_name(stem) +
                    " after the file)");
  }
  return out;
}

}  // namespace tiers
