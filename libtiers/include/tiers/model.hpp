// The document model: media, tiers and annotations, shared by every format.
#pragma once

#include <cstdint>
#include <initializer_list>
#include <map>
#include <memory>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "tiers/time.hpp"

namespace tiers {

/// Name/value pairs, ordered by name. Keys a format cannot map to a field of its own are kept
/// here with the format's prefix (`vtt:line`), so that a round trip through json keeps them.
///
/// A map is allocated only when it holds something: most annotations have no attributes, and
/// an archive holds millions of annotations, so an empty one costs one pointer. Otherwise it
/// behaves as the std::map it wraps (the subset of its interface listed here).
class attribute_map {
 public:
  using map_type = std::map<std::string, std::string, std::less<>>;
  using iterator = map_type::iterator;
  using const_iterator = map_type::const_iterator;
  using value_type = map_type::value_type;

  attribute_map() = default;
  attribute_map(std::initializer_list<value_type> items)
      : map_(items.size() ? std::make_unique<map_type>(items) : nullptr) {}
  attribute_map(const attribute_map& o)
      : map_(o.map_ && !o.map_->empty() ? std::make_unique<map_type>(*o.map_) : nullptr) {}
  attribute_map(attribute_map&&) noexcept = default;
  attribute_map& operator=(const attribute_map& o) {
    if (this != &o)
      map_ = o.map_ && !o.map_->empty() ? std::make_unique<map_type>(*o.map_) : nullptr;
    return *this;
  }
  attribute_map& operator=(attribute_map&&) noexcept = default;

  bool empty() const { return !map_ || map_->empty(); }
  std::size_t size() const { return map_ ? map_->size() : 0; }
  iterator begin() { return map_ ? map_->begin() : none().begin(); }
  iterator end() { return map_ ? map_->end() : none().end(); }
  const_iterator begin() const { return map_ ? map_->cbegin() : none().cbegin(); }
  const_iterator end() const { return map_ ? map_->cend() : none().cend(); }
  iterator find(std::string_view key) { return map_ ? map_->find(key) : none().end(); }
  const_iterator find(std::string_view key) const { return map_ ? map_->find(key) : none().cend(); }
  std::size_t count(std::string_view key) const { return map_ ? map_->count(key) : 0; }
  const std::string& at(std::string_view key) const;
  std::string& operator[](std::string key) { return own()[std::move(key)]; }
  template <class... Args>
  std::pair<iterator, bool> emplace(Args&&... args) {
    return own().emplace(std::forward<Args>(args)...);
  }
  std::size_t erase(std::string_view key);
  void clear() { map_.reset(); }
  /// Removes every pair for which `pred(pair)` holds; returns how many.
  template <class Pred>
  friend std::size_t erase_if(attribute_map& m, Pred pred) {
    return m.map_ ? std::erase_if(*m.map_, pred) : 0;
  }
  friend bool operator==(const attribute_map& a, const attribute_map& b) {
    return a.empty() ? b.empty() : !b.empty() && *a.map_ == *b.map_;
  }

 private:
  map_type& own() {
    if (!map_) map_ = std::make_unique<map_type>();
    return *map_;
  }
  // Never holds anything: iterators of an empty map stand for those of an unallocated one.
  static map_type& none();
  std::unique_ptr<map_type> map_;
};

/// An optional text kept out of line: one pointer when absent, so that the many annotations
/// without an id, markup or parent cost little. Behaves like std::optional<std::string>.
class optional_text {
 public:
  optional_text() = default;
  optional_text(std::nullopt_t) {}
  optional_text(std::string s) : text_(std::make_unique<std::string>(std::move(s))) {}
  optional_text(const char* s) : optional_text(std::string(s)) {}
  optional_text(const std::optional<std::string>& o)
      : text_(o ? std::make_unique<std::string>(*o) : nullptr) {}
  optional_text(const optional_text& o)
      : text_(o.text_ ? std::make_unique<std::string>(*o.text_) : nullptr) {}
  optional_text(optional_text&&) noexcept = default;
  optional_text& operator=(const optional_text& o) {
    if (this != &o) text_ = o.text_ ? std::make_unique<std::string>(*o.text_) : nullptr;
    return *this;
  }
  optional_text& operator=(optional_text&&) noexcept = default;
  optional_text& operator=(std::nullopt_t) {
    text_.reset();
    return *this;
  }
  optional_text& operator=(std::string s) {
    if (text_)
      *text_ = std::move(s);
    else
      text_ = std::make_unique<std::string>(std::move(s));
    return *this;
  }
  optional_text& operator=(const char* s) { return *this = std::string(s); }

  bool has_value() const { return text_ != nullptr; }
  explicit operator bool() const { return has_value(); }
  std::string& operator*() { return *text_; }
  const std::string& operator*() const { return *text_; }
  std::string* operator->() { return text_.get(); }
  const std::string* operator->() const { return text_.get(); }
  std::string value_or(std::string_view fallback) const {
    return text_ ? *text_ : std::string(fallback);
  }
  void reset() { text_.reset(); }
  std::optional<std::string> to_optional() const {
    return text_ ? std::optional<std::string>(*text_) : std::nullopt;
  }

  friend bool operator==(const optional_text& a, const optional_text& b) {
    return a.text_ ? b.text_ && *a.text_ == *b.text_ : !b.text_;
  }
  friend bool operator==(const optional_text& a, std::nullopt_t) { return !a.text_; }
  friend bool operator==(const optional_text& a, std::string_view b) {
    return a.text_ && *a.text_ == b;
  }
  friend bool operator==(const optional_text& a, const char* b) { return a == std::string_view(b); }
  friend bool operator==(const optional_text& a, const std::string& b) {
    return a == std::string_view(b);
  }

 private:
  std::unique_ptr<std::string> text_;
};

/// What an annotation stands for in time.
enum class tier_kind : std::uint8_t {
  interval,  ///< each annotation spans [start, end)
  instant,   ///< each annotation is an instant: start == end
};

/// Who made a tier.
enum class source_kind : std::uint8_t { human, machine };

/// The origin of a tier: a person or a program, with the program's name and version.
struct tier_source {
  source_kind kind = source_kind::human;
  std::optional<std::string> agent;    ///< e.g. the aligner or detector, or the annotator
  std::optional<std::string> version;  ///< of the agent
  friend bool operator==(const tier_source&, const tier_source&) = default;
};

/// How a child tier's annotations relate to its parent tier's.
enum class relation : std::uint8_t {
  within,     ///< each child lies inside some parent annotation
  partition,  ///< the children of a parent annotation cover it exactly, without gaps or overlaps
  refers,     ///< each child names one parent annotation by id (annotation::parent)
};

/// A child tier's link to its parent tier.
struct parent_link {
  std::string tier;  ///< the parent tier's name
  relation rel = relation::within;
  friend bool operator==(const parent_link&, const parent_link&) = default;
};

/// One labelled span or instant.
struct annotation {
  time_ns start = 0;
  time_ns end = 0;                   ///< equal to start in an instant tier
  std::string text;                  ///< plain text
  optional_text markup;              ///< the original formatted text, e.g. a cue's tags
  std::optional<double> confidence;  ///< in [0, 1]
  optional_text id;
  optional_text parent;  ///< id of the parent annotation, for relation::refers
  attribute_map attributes;
  friend bool operator==(const annotation&, const annotation&) = default;
};

/// A named layer of annotations of one kind.
struct tier {
  std::string name;
  tier_kind kind = tier_kind::interval;
  std::optional<parent_link> parent;
  std::optional<tier_source> source;
  std::optional<std::vector<std::string>> vocabulary;  ///< the allowed labels, when declared
  attribute_map attributes;
  std::vector<annotation> annotations;
  friend bool operator==(const tier&, const tier&) = default;
};

/// The recording the tiers describe.
struct media_info {
  std::optional<std::string> uri;
  std::optional<time_ns> duration;
  std::optional<rational> frame_rate;
  friend bool operator==(const media_info&, const media_info&) = default;
};

/// A set of tiers over one recording.
///
/// The model holds whatever a reader found. It guarantees only what its types guarantee
/// (times are representable, kinds and relations are from their lists); readers also reject
/// a confidence outside [0, 1]. Everything else — annotation order, overlaps, start after end,
/// unique tier names, parents that exist — is left to validation, so that `tiers check` can
/// report it rather than a reader refusing the file. See docs/model.md.
struct document {
  media_info media;
  attribute_map metadata;
  std::vector<tier> tiers;
  friend bool operator==(const document&, const document&) = default;
};

/// The first tier named `name`, or null.
const tier* find_tier(const document& doc, std::string_view name);
tier* find_tier(document& doc, std::string_view name);

/// The tiers' names as messages list them: `'captions', 'words'`, or `none`.
std::string tier_names(const document& doc);

/// The name readers of formats with inline word timings (WebVTT, TTML) give the words of the
/// tier `parent`: `PARENT.words`. Their writers put back inline only the words so named.
std::string words_tier_name(std::string_view parent);

/// Whether `t` is, by that convention, the words of the tier `parent`: a `within` child of it
/// named words_tier_name(parent).
bool is_words_tier_of(const tier& t, std::string_view parent);

std::string_view to_string(tier_kind kind);
std::string_view to_string(source_kind kind);
std::string_view to_string(relation rel);
std::optional<tier_kind> parse_tier_kind(std::string_view text);
std::optional<source_kind> parse_source_kind(std::string_view text);
std::optional<relation> parse_relation(std::string_view text);

}  // namespace tiers
