// Reads TTML with pugixml (no DTD, no entity expansion, depth-limited), resolves TTML2 time
// containment (par and seq) to absolute media times, and maps div/p/span onto tiers.
#include <algorithm>
#include <cstdint>
#include <cstdio>
#include <map>
#include <optional>
#include <pugixml.hpp>
#include <set>
#include <sstream>
#include <vector>

#include "detail/exact.hpp"
#include "detail/positions.hpp"
#include "detail/report.hpp"
#include "ttml_format.hpp"
#include "ttml_time.hpp"

namespace tiers::detail {
namespace {

using namespace ttml;

bool xml_space(char c) {
  return c == ' ' || c == '\t' || c == '\n' || c == '\r';
}

std::string_view local_name(std::string_view qname) {
  const std::size_t colon = qname.find(':');
  return colon == std::string_view::npos ? qname : qname.substr(colon + 1);
}

// Takes the next id off an IDREFS value (ids between XML white space); empty when none is left.
std::string inner_xml(const pugi::xml_node& node) {
  std::ostringstream out;
  for (pugi::xml_node child : node.children())
    child.print(out, "", pugi::format_raw);
  return out.str();
}

struct span {
  time_ns begin;
  std::optional<time_ns> end;  // nullopt: indefinite
};

class ttml_reader {
 public:
  ttml_reader(std::string_view input, const read_options& options, read_result& out)
      : in_(input), out_(out), positions_(options, out) {}

  void run();
  // The phases of run: each returns false (or nothing) once the file is refused.
  bool parse(pugi::xml_document& doc);
  bool read_root(pugi::xml_document& doc, const pugi::xml_node& tt);
  void root_metadata(const pugi::xml_node& tt);
  void read_head(const pugi::xml_node& tt, const pugi::xml_node& head);
  void add_word_tiers();
  bool refuse(std::size_t offset, std::string code, std::string message) {
    fail(offset, std::move(code), std::move(message));
    return false;
  }

 private:
  void fail(std::size_t offset, std::string code, std::string message) {
    out_.diagnostics.push_back(
        make_diagnostic(severity::error, std::move(code), offset, std::move(message)));
  }
  void warn(std::size_t offset, std::string code, std::string message) {
    out_.diagnostics.push_back(
        make_diagnostic(severity::warning, std::move(code), offset, std::move(message)));
  }
  std::size_t at(const pugi::xml_node& n) const {
    const std::ptrdiff_t o = n.offset_debug();
    return o < 0 ? 0 : static_cast<std::size_t>(o);
  }

  // The namespace of a prefix ("" for the default namespace), as declared on tt.
  std::string_view ns_of(std::string_view prefix) const {
    auto it = prefixes_.find(prefix);
    return it == prefixes_.end() ? std::string_view{} : std::string_view(it->second);
  }
  // An element's local name when it is in the TTML namespace, else empty.
  std::string_view tt_name(const pugi::xml_node& n) const {
    const std::string_view q = n.name();
    const std::size_t colon = q.find(':');
    if (colon == std::string_view::npos) return default_tt_ ? q : std::string_view{};
    return ns_of(q.substr(0, colon)) == ns_tt ? local_name(q) : std::string_view{};
  }
  // An attribute's name with the canonical prefix of a TTML namespace (tts:, ttm:, ttp:).
  std::string canonical(std::string_view q) const {
    const std::size_t colon = q.find(':');
    if (colon == std::string_view::npos) return std::string(q);
    const std::string_view ns = ns_of(q.substr(0, colon));
    const std::string_view local = q.substr(colon + 1);
    if (ns == ns_tts) return "tts:" + std::string(local);
    if (ns == ns_ttm) return "ttm:" + std::string(local);
    if (ns == ns_ttp) return "ttp:" + std::string(local);
    return std::string(q);
  }
  std::optional<time_ns> time_attr(const pugi::xml_node& n, const char* name) {
    const pugi::xml_attribute a = n.attribute(name);
    if (!a) return std::nullopt;
    auto t = parse_time_expression(a.value(), params_);
    if (!t) {
      fail(at(n), "ttml.time",
           std::string(name) + " '" + a.value() + "' is not a TTML time expression");
      bad_time_ = true;
    }
    return t;
  }

  // Offsets add up along the containers (and a seq's children one after another): each sum is
  // checked, and one beyond the model's range is time.range, not a wrapped, negative time.
  time_ns sum(time_ns a, time_ns b, const pugi::xml_node& n) {
    if (const auto t = add_times(a, b)) return *t;
    if (!bad_time_)
      fail(at(n), "time.range",
           "this element's time, added to the times of the elements it lies in, is out of range");
    bad_time_ = true;
    return a;
  }

  // XML and its namespaces allow an attribute once per element (Namespaces in XML 1.0 §6.3:
  // also not under two prefixes of one namespace); pugixml does not check it, and a second one
  // would be dropped silently.
  bool unique_attributes(pugi::xml_document& doc) {
    struct walker : pugi::xml_tree_walker {
      ttml_reader& reader;
      pugi::xml_node bad;
      std::string name;
      std::vector<std::string> names;
      explicit walker(ttml_reader& r) : reader(r) {}
      bool for_each(pugi::xml_node& n) override {
        if (n.type() != pugi::node_element || !n.first_attribute() ||
            !n.first_attribute().next_attribute())
          return true;
        names.clear();  // one buffer for every element
        for (pugi::xml_attribute a : n.attributes())
          names.push_back(reader.canonical(a.name()));
        std::sort(names.begin(), names.end());
        const auto twice = std::adjacent_find(names.begin(), names.end());
        if (twice == names.end()) return true;
        bad = n;
        name = *twice;
        return false;
      }
    } w(*this);
    if (doc.traverse(w)) return true;
    fail(at(w.bad), "ttml.xml",
         "not well-formed XML: attribute " + w.name + " appears twice on one element");
    return false;
  }
  // Whether `block` is exactly what the writer makes of speakers: a metadata element holding
  // only `<ttm:agent xml:id="ID" type="person"><ttm:name type="full">NAME</ttm:name></ttm:agent>`
  // elements with distinct ids; collects the ids.
  bool writer_speakers(const pugi::xml_node& block, std::set<std::string, std::less<>>& ids) {
    auto only = [](const pugi::xml_node& n, std::string_view a, std::string_view b = {}) {
      std::size_t count = 0;
      for (pugi::xml_attribute at : n.attributes()) {
        const std::string_view name = at.name();
        if (name != a && (b.empty() || name != b)) return false;
        ++count;
      }
      return count == (b.empty() ? 1u : 2u);
    };
    if (tt_name(block) != "metadata" || !only(block, "xml:id")) return false;
    for (pugi::xml_node agent : block.children()) {
      if (agent.type() != pugi::node_element || canonical(agent.name()) != "ttm:agent" ||
          !only(agent, "xml:id", "type") ||
          std::string_view(agent.attribute("type").value()) != "person")
        return false;
      const pugi::xml_node name = agent.first_child();
      if (!name || name.next_sibling() || canonical(name.name()) != "ttm:name" ||
          !only(name, "type") || std::string_view(name.attribute("type").value()) != "full")
        return false;
      for (pugi::xml_node t : name.children())
        if (t.type() != pugi::node_pcdata) return false;
      const std::string_view id = agent.attribute("xml:id").value();
      if (id.empty() || !ids.emplace(id).second) return false;
    }
    return !ids.empty();
  }
  span resolve(const pugi::xml_node& n, time_ns sync, std::optional<time_ns> parent_end,
               bool in_seq);
  // `current` is the index of the tier of the div being read, or no_tier: nested divs add
  // tiers, so pointers into the tier list would not stay valid.
  void walk(const pugi::xml_node& n, const span& active, std::size_t current);
  void read_p(const pugi::xml_node& p, const span& active, std::size_t tier_index);
  void text_of(const pugi::xml_node& n, std::string& out, const span& active, bool preserve,
               std::vector<annotation>* words, std::vector<std::size_t>* word_offsets);

  std::string_view in_;
  read_result& out_;
  std::map<std::string, std::string, std::less<>> prefixes_;
  bool default_tt_ = false;  // unprefixed names are TTML's (prefixes are the root's alone)
  std::map<std::string, std::string, std::less<>> agents_;  // agent id -> name
  std::set<std::string, std::less<>> generated_;  // agent ids of the writer's speakers block
  timing_parameters params_;
  bool bad_time_ = false;
  std::size_t divs_ = 0;
  std::map<std::size_t, std::vector<annotation>> words_;          // tier index -> its timed spans
  std::map<std::size_t, std::vector<std::size_t>> word_offsets_;  // and where they are
  position_recorder positions_;
};

bool ttml_reader::parse(pugi::xml_document& doc) {
  // pugixml holds the whole tree in memory, a few times the input: refuse what would not fit.
  if (in_.size() > max_bytes)
    return refuse(0, "ttml.size",
                  "the file is larger than " + std::to_string(max_bytes >> 20) +
                      " MiB, the most tiers reads as TTML");
  if (const std::optional<forbidden> f = first_forbidden(in_))
    return refuse(f->offset, "ttml.xml", "not well-formed XML: " + f->message);
  // parse_doctype makes a DTD visible, so that it can be refused; pugixml never expands
  // entities other than the predefined ones, so a DTD could do nothing but we refuse it plainly.
  const pugi::xml_parse_result r = doc.load_buffer(
      in_.data(), in_.size(), pugi::parse_default | pugi::parse_ws_pcdata | pugi::parse_doctype,
      pugi::encoding_utf8);
  if (!r)
    return refuse(static_cast<std::size_t>(r.offset), "ttml.xml",
                  std::string("not well-formed XML: ") + r.description());
  // Depth first, without recursion: a 200,000-deep document must not exhaust the stack.
  std::size_t depth = 0;
  for (pugi::xml_node n = doc.first_child(); n;) {
    if (n.type() == pugi::node_doctype)
      return refuse(at(n), "ttml.dtd",
                    "document type declarations are not processed (no DTDs, no entities)");
    if (n.first_child()) {
      if (++depth > max_depth)
        return refuse(at(n), "ttml.depth",
                      "elements nest deeper than " + std::to_string(max_depth) + " levels");
      n = n.first_child();
      continue;
    }
    while (n && !n.next_sibling()) {
      n = n.parent();
      if (depth > 0) --depth;
    }
    if (n) n = n.next_sibling();
  }
  return true;
}

// The root: namespaces, timing parameters, and its other attributes as metadata.
bool ttml_reader::read_root(pugi::xml_document& doc, const pugi::xml_node& tt) {
  for (pugi::xml_attribute a : tt.attributes()) {
    const std::string_view name = a.name();
    if (name == "xmlns")
      prefixes_[""] = a.value();
    else if (name.rfind("xmlns:", 0) == 0)
      prefixes_[std::string(name.substr(6))] = a.value();
  }
  default_tt_ = ns_of("") == ns_tt;
  if (tt_name(tt) != "tt")
    return refuse(at(tt), "ttml.root",
                  "not a TTML document: the root must be tt in namespace " + std::string(ns_tt));
  // Names are kept as tts:, ttm: and ttp: with those prefixes meaning TTML's namespaces, and
  // the writer declares them so: the same prefixes bound elsewhere could not be told apart.
  for (const auto& [prefix, ns] :
       {std::pair{"tts", ns_tts}, std::pair{"ttm", ns_ttm}, std::pair{"ttp", ns_ttp}}) {
    const auto declared = prefixes_.find(prefix);
    const std::string_view bound =
        declared == prefixes_.end() ? ns : std::string_view(declared->second);
    if (bound != ns)
      return refuse(at(tt), "ttml.namespace",
                    "the prefix " + std::string(prefix) + " is bound to '" + std::string(bound) +
                        "', not to " + std::string(ns) + ": tiers reads " + prefix +
                        ": only as TTML's own namespace");
  }
  if (!unique_attributes(doc)) return false;
  auto param = [&](std::string_view local) -> std::string_view {
    for (pugi::xml_attribute a : tt.attributes())
      if (canonical(a.name()) == "ttp:" + std::string(local)) return a.value();
    return {};
  };
  if (auto problem = read_parameters(param("frameRate"), param("frameRateMultiplier"),
                                     param("subFrameRate"), param("tickRate"), params_))
    return refuse(at(tt), "ttml.parameter", std::string(*problem));
  if (const std::string_view base = param("timeBase"); !base.empty() && base != "media")
    return refuse(at(tt), "ttml.parameter", "only ttp:timeBase=\"media\" is supported (IMSC 1.1)");
  if (params_.frame_rate_given) out_.value.media.frame_rate = params_.frame_rate;
  root_metadata(tt);
  return true;
}

// The root's other attributes: its language and foreign attributes and namespaces, as
// metadata that the writer puts back.
void ttml_reader::root_metadata(const pugi::xml_node& tt) {
  for (pugi::xml_attribute a : tt.attributes()) {
    const std::string name = canonical(a.name());
    if (name == "xml:lang") {
      // The writer's "und" (undetermined) is no information of its own.
      if (std::string_view(a.value()) != "und") out_.value.metadata.emplace("ttml:lang", a.value());
    } else if (name == "xmlns" || name.rfind("ttp:", 0) == 0) {
      continue;  // timing parameters are read above; the writer declares what it uses
    } else if (name.rfind("xmlns:", 0) == 0) {
      const std::string_view uri = a.value();
      if (uri != ns_tt && uri != ns_ttp && uri != ns_tts && uri != ns_ttm)
        out_.value.metadata.emplace("ttml:" + name, uri);
    } else {
      out_.value.metadata.emplace("ttml:tt:" + name, a.value());
    }
  }
}

// The head: the writer's block of speakers, kept head content, and the agents (TTML2 §12.1.1).
void ttml_reader::read_head(const pugi::xml_node& tt, const pugi::xml_node& head) {
  // The writer puts speakers that had no agent of their own into one metadata block; it
  // becomes speaker attributes again, not head content — when it has exactly the writer's
  // shape and every reference to its agents is a plain `ttm:agent="ID"`, which is all the
  // writer makes of a speaker. Otherwise it is kept like any other head content, and so are
  // the references.
  pugi::xml_node block;
  std::set<std::string, std::less<>> block_ids;
  for (pugi::xml_node c : head.children()) {
    std::set<std::string, std::less<>> ids;
    if (c.type() == pugi::node_element &&
        std::string_view(c.attribute("xml:id").value()) == speakers_block &&
        writer_speakers(c, ids)) {
      block = c;
      block_ids = std::move(ids);
      break;
    }
  }
  if (block)
    for (pugi::xpath_node x : tt.select_nodes(".//*")) {
      for (pugi::xml_attribute at : x.node().attributes()) {
        if (canonical(at.name()) != "ttm:agent") continue;
        std::string_view refs = at.value();
        if (block_ids.count(refs)) continue;
        for (std::string_view id = next_idref(refs); !id.empty(); id = next_idref(refs))
          if (block_ids.count(id)) block = pugi::xml_node{};
      }
    }
  std::string kept;
  for (pugi::xml_node c : head.children()) {
    if (block && c == block) {
      generated_.insert(block_ids.begin(), block_ids.end());
      continue;
    }
    std::ostringstream one;
    c.print(one, "", pugi::format_raw);
    kept += one.str();
  }
  if (!kept.empty()) out_.value.metadata.emplace("ttml:head", kept);
  // Agents (TTML2 §12.1.1): an id and, where given, a name, for ttm:agent on p.
  for (pugi::xpath_node x : head.select_nodes(".//*")) {
    const pugi::xml_node n = x.node();
    if (canonical(n.name()) != "ttm:agent") continue;
    std::string name = n.attribute("xml:id").value();
    if (name.empty()) continue;  // nothing can refer to it; it stays in ttml:head
    for (pugi::xml_node c : n.children())
      if (canonical(c.name()) == "ttm:name") name = collapse_space(c.text().get());
    agents_[n.attribute("xml:id").value()] = name;
  }
}

// Word tiers right after their tiers, in document order.
void ttml_reader::add_word_tiers() {
  for (auto it = words_.rbegin(); it != words_.rend(); ++it) {
    tier w;
    w.name = words_tier_name(out_.value.tiers[it->first].name);
    w.parent = parent_link{out_.value.tiers[it->first].name, relation::within};
    w.annotations = std::move(it->second);
    const auto after = static_cast<std::ptrdiff_t>(it->first) + 1;
    out_.value.tiers.insert(out_.value.tiers.begin() + after, std::move(w));
    if (positions_.on()) {
      source_map& map = out_.positions;
      const std::vector<std::size_t>& offsets = word_offsets_[it->first];
      map.tiers.insert(map.tiers.begin() + after, source_position{offsets.front()});
      std::vector<source_position> words;
      for (std::size_t offset : offsets)
        words.push_back({offset});
      map.annotations.insert(map.annotations.begin() + after, std::move(words));
    }
  }
}

void ttml_reader::run() {
  pugi::xml_document doc;
  if (!parse(doc)) return;
  const pugi::xml_node tt = doc.document_element();
  if (!read_root(doc, tt)) return;
  for (pugi::xml_node c : tt.children())
    if (tt_name(c) == "head") {
      read_head(tt, c);
      break;
    }
  for (pugi::xml_node c : tt.children())
    if (tt_name(c) == "body") {
      const span body = resolve(c, 0, std::nullopt, false);
      walk(c, body, no_tier);
    }
  if (bad_time_) return;
  if (bad_time_) return;
  add_word_tiers();
}

// The active interval of a timed element (TTML2 §10.4, SMIL subset): begin and end offsets
// count from the sync base (the parent's begin in a par container, the previous sibling's end
// in a seq container); dur counts from the begin; without either, a child of a par container
// lasts as long as its parent, a child of a seq container not at all, unless it is itself a seq
// container, which lasts until its last child ends.
span ttml_reader::resolve(const pugi::xml_node& n, time_ns sync, std::optional<time_ns> parent_end,
                          bool in_seq) {
  const auto b = time_attr(n, "begin");
  const auto e = time_attr(n, "end");
  const auto d = time_attr(n, "dur");
  span s{sum(sync, b.value_or(0), n), std::nullopt};
  if (e) s.end = sum(sync, *e, n);
  if (d) s.end = s.end ? std::min(*s.end, sum(s.begin, *d, n)) : sum(s.begin, *d, n);
  if (!s.end) {
    if (std::string_view(n.attribute("timeContainer").value()) == "seq") {
      time_ns last = s.begin;
      bool indefinite = false;
      for (pugi::xml_node c : n.children()) {
        if (c.type() != pugi::node_element) continue;
        const span cs = resolve(c, last, std::nullopt, true);
        if (!cs.end) {
          indefinite = true;
          break;
        }
        last = *cs.end;
      }
      if (!indefinite) s.end = last;
    } else if (in_seq) {
      s.end = s.begin;
    }
  }
  if (!s.end) s.end = parent_end;
  if (parent_end && s.end && *s.end > *parent_end) s.end = parent_end;
  return s;
}

void ttml_reader::walk(const pugi::xml_node& n, const span& active, std::size_t current) {
  const bool seq = std::string_view(n.attribute("timeContainer").value()) == "seq";
  time_ns sync = active.begin;
  for (pugi::xml_node c : n.children()) {
    const std::string_view name = tt_name(c);
    if (name != "div" && name != "p") continue;
    const span cs = resolve(c, seq ? sync : active.begin, active.end, seq);
    if (seq) {
      if (!cs.end) break;  // an indefinite child: later siblings never begin
      sync = *cs.end;
    }
    if (name == "div") {
      ++divs_;
      std::size_t index = no_tier;
      bool has_p = false;
      for (pugi::xml_node g : c.children())
        has_p |= tt_name(g) == "p";
      if (has_p) {
        index = out_.value.tiers.size();
        tier* t = &out_.value.tiers.emplace_back();
        positions_.tier(at(c));
        const std::string id = c.attribute("xml:id").value();
        t->name = id.empty() ? "div-" + std::to_string(divs_) : id;
        for (pugi::xml_attribute a : c.attributes()) {
          const std::string q = canonical(a.name());
          if (q != "xml:id" && q != "begin" && q != "end" && q != "dur" && q != "timeContainer")
            t->attributes.emplace("ttml:" + q, a.value());
        }
      }
      walk(c, cs, index);
      continue;
    }
    if (current == no_tier) {
      warn(at(c), "ttml.structure", "p outside a div is not read (IMSC puts p in div)");
      continue;
    }
    read_p(c, cs, current);
  }
}

void ttml_reader::text_of(const pugi::xml_node& n, std::string& out, const span& active,
                          bool preserve, std::vector<annotation>* words,
                          std::vector<std::size_t>* word_offsets) {
  for (pugi::xml_node c : n.children()) {
    if (c.type() == pugi::node_pcdata || c.type() == pugi::node_cdata) {
      // Line breaks in the source are white space; only br breaks a line (xml:space default).
      const std::string_view v = c.value();
      const std::size_t from = out.size();
      out += v;
      if (!preserve)
        for (std::size_t k = from; k < out.size(); ++k)
          if (out[k] == '\n' || out[k] == '\r' || out[k] == '\t') out[k] = ' ';
    } else if (c.type() == pugi::node_element) {
      const std::string_view name = tt_name(c);
      if (name == "br") {
        out += '\n';
      } else if (name == "span") {
        const bool keep =
            preserve || std::string_view(c.attribute("xml:space").value()) == "preserve";
        const bool timed = c.attribute("begin") || c.attribute("end") || c.attribute("dur");
        const span s = resolve(c, active.begin, active.end,
                               std::string_view(n.attribute("timeContainer").value()) == "seq");
        if (timed && words) {
          std::string piece;
          text_of(c, piece, s, keep, nullptr, nullptr);
          annotation w;
          w.start = s.begin;
          w.end = s.end.value_or(s.begin);
          w.text = keep ? piece : collapse_space(piece);
          if (!w.text.empty()) {
            words->push_back(std::move(w));
            word_offsets->push_back(at(c));
          }
          out += piece;
        } else {
          text_of(c, out, s, keep, words, word_offsets);
        }
      }
    }
  }
}

void ttml_reader::read_p(const pugi::xml_node& p, const span& active, std::size_t index) {
  annotation a;
  a.start = active.begin;
  if (!active.end) {
    warn(at(p), "ttml.end", "p has no end (its time is indefinite): read as zero length");
    a.end = a.start;
  } else {
    a.end = *active.end;
  }
  if (const char* id = p.attribute("xml:id").value(); *id) a.id = id;
  const bool preserve = std::string_view(p.attribute("xml:space").value()) == "preserve";
  std::vector<annotation> words;
  std::vector<std::size_t> word_offsets;
  std::string text;
  // Spans in a seq p follow one another; text_of resolves them against p's interval.
  text_of(p, text, active, preserve, &words, &word_offsets);
  a.text = preserve ? text : collapse_space(text);
  bool plain = true;
  for (pugi::xml_node c : p.children())
    if (c.type() == pugi::node_element && tt_name(c) != "br") plain = false;
  if (!plain) a.markup = inner_xml(p);
  for (pugi::xml_attribute at_ : p.attributes()) {
    const std::string q = canonical(at_.name());
    // xml:space only shapes the text, which the writer shapes the same way again.
    if (q == "xml:id" || q == "begin" || q == "end" || q == "dur" || q == "xml:space") continue;
    if (q == "ttm:agent") {
      // IDREFS: the first id names the speaker; the attribute itself is kept unless it is
      // exactly what the writer makes of a speaker.
      std::string_view refs = at_.value();
      const std::string_view first = next_idref(refs);
      if (!first.empty()) {
        auto it = agents_.find(first);
        a.attributes.emplace("speaker", it == agents_.end() ? std::string(first) : it->second);
        if (generated_.count(first) && first == at_.value()) continue;
      }
    }
    a.attributes.emplace("ttml:" + q, at_.value());
  }
  for (annotation& w : words)
    words_[index].push_back(std::move(w));
  for (std::size_t offset : word_offsets)
    word_offsets_[index].push_back(offset);
  out_.value.tiers[index].annotations.push_back(std::move(a));
  positions_.annotation(index, at(p));
}

}  // namespace

namespace {

// Text that is already collapsed: no tab or CR, no space at either end, next to another or
// next to a line break. Most text is, and is then copied as it is.
bool collapsed(std::string_view text) {
  if (text.empty()) return true;
  if (text.front() == ' ' || text.back() == ' ') return false;
  for (std::size_t k = 0; k < text.size(); ++k) {
    const char c = text[k];
    if (c == '\t' || c == '\r') return false;
    if (c == ' ' && (text[k + 1] == ' ' || text[k + 1] == '\n' || text[k - 1] == '\n'))
      return false;
  }
  return true;
}

}  // namespace

std::string ttml::collapse_space(std::string_view text) {
  if (collapsed(text)) return std::string(text);
  // '\n' stands for br: kept, with the spaces around it dropped.
  std::string out;
  bool pending = false;
  for (char c : text) {
    if (xml_space(c) && c != '\n') {
      pending = true;
      continue;
    }
    if (c == '\n') {
      while (!out.empty() && out.back() == ' ')
        out.pop_back();
      out += '\n';
      pending = false;
      continue;
    }
    if (pending && !out.empty() && out.back() != '\n') out += ' ';
    pending = false;
    out += c;
  }
  while (!out.empty() && out.back() == ' ')
    out.pop_back();
  return out;
}

int sniff_ttml(std::string_view head) {
  const std::size_t tt = head.find("<tt");
  if (tt == std::string_view::npos) return 0;
  return head.find(ns_tt) != std::string_view::npos ? 2 : 1;
}

read_result read_ttml(std::string_view input, const read_options& options) {
  read_result out;
  ttml_reader(input, options, out).run();
  return out;
}

}  // namespace tiers::detail
