// Writes an IMSC 1.1 Text Profile document; one plan, shared with the loss report, decides
// what each tier and annotation becomes.
#include <map>
#include <numeric>
#include <pugixml.hpp>
#include <set>
#include <sstream>

#include "detail/markup.hpp"
#include "detail/report.hpp"
#include "ttml_format.hpp"
#include "ttml_time.hpp"

namespace tiers::detail {
namespace {

using namespace ttml;

constexpr std::string_view profile = "http://www.w3.org/ns/ttml/profile/imsc1.1/text";

// XML 1.0 Name characters, ASCII only (enough for identifiers tiers writes), without ':'.
bool is_ncname(std::string_view s) {
  if (s.empty()) return false;
  auto start = [](char c) {
    return (c >= 'A' && c <= 'Z') || (c >= 'a' && c <= 'z') || c == '_' ||
           static_cast<unsigned char>(c) >= 0x80;
  };
  if (!start(s[0])) return false;
  for (char c : s)
    if (!start(c) && !(c >= '0' && c <= '9') && c != '-' && c != '.') return false;
  return true;
}

// Characters XML 1.0 cannot hold (C0 controls other than tab, LF and CR; U+FFFE, U+FFFF):
// the same rule the reader refuses them by.
bool xml_safe(std::string_view s) {
  return !first_forbidden(s, false);
}

// An attribute name the writer can write: an NCName, or PREFIX:NCName with a prefix the
// document declares (`declared`: the TTML prefixes, xml, and the source's own declarations).
bool writable_name(std::string_view name, const std::set<std::string, std::less<>>& declared) {
  const std::size_t colon = name.find(':');
  if (colon == std::string_view::npos) return is_ncname(name);
  const std::string_view prefix = name.substr(0, colon), local = name.substr(colon + 1);
  return is_ncname(prefix) && is_ncname(local) && declared.count(prefix) != 0;
}

// What the writer writes itself on each element: a kept attribute of the same name would be a
// second one (not well-formed XML) or would change the times and white space the writer gives.
bool own_attribute(std::string_view element, std::string_view name) {
  if (element == "tt")
    return name == "xml:lang" || name == "xmlns" || name.starts_with("xmlns:") ||
           name.starts_with("ttp:");
  if (name == "xml:id" || name == "begin" || name == "end" || name == "dur") return true;
  return element == "div" ? name == "timeContainer" : name == "xml:space";
}

// Text content needs `&`, `<`, `>` escaped; attribute values also quotes and the white
// space that attribute normalisation would turn into spaces.
void escape(std::string& out, std::string_view s, bool attribute) {
  if (!attribute) return append_escaped(out, s);
  for (char c : s) {
    if (c == '"')
      out += "&quot;";
    else if (c == '\n')
      out += "&#10;";
    else if (c == '\t')
      out += "&#9;";
    else if (c == '\r')
      out += "&#13;";
    else
      append_escaped(out, std::string_view(&c, 1));
  }
}

// A time as TTML writes it: whole frames as "Nf" when the document has a frame rate and the
// time is a frame boundary, else clock time with as many fraction digits as it needs.
std::string time_text(time_ns t, const std::optional<rational>& rate) {
  if (rate) {
    __extension__ typedef __int128 wide;
    const wide n = static_cast<wide>(t) * rate->num;
    const wide d = static_cast<wide>(rate->den) * ns_per_second;
    const auto frames = static_cast<std::int64_t>((n + d / 2) / d);
    if (frame_time(frames, *rate).value == t) return std::to_string(frames) + "f";
  }
  return format_clock_exact(t);
}

// What a fragment of p content reads as: text (with br as '\n'); nothing when it is not
// well-formed with the namespaces the writer declares.
std::optional<std::string> fragment_text(std::string_view markup, const std::string& declarations) {
  const std::string wrapped = "<p xmlns=\"" + std::string(ns_tt) + "\" xmlns:tts=\"" +
                              std::string(ns_tts) + "\" xmlns:ttm=\"" + std::string(ns_ttm) + "\"" +
                              declarations + ">" + std::string(markup) + "</p>";
  pugi::xml_document doc;
  if (!doc.load_buffer(wrapped.data(), wrapped.size(), pugi::parse_default | pugi::parse_ws_pcdata,
                       pugi::encoding_utf8))
    return std::nullopt;
  std::string text;
  const auto walk = [&](const pugi::xml_node& n, const auto& self) -> void {
    for (pugi::xml_node c : n.children()) {
      if (c.type() == pugi::node_pcdata || c.type() == pugi::node_cdata) {
        for (const char* v = c.value(); *v; ++v)
          text += *v == '\n' || *v == '\r' || *v == '\t' ? ' ' : *v;
      } else if (std::string_view(c.name()) == "br") {
        text += '\n';
      } else if (std::string_view(c.name()) == "span") {
        self(c, self);  // other elements are pruned, as the reader (and TTML processors) prune them
      }
    }
  };
  walk(doc.first_child(), walk);
  return collapse_space(text);
}

// The agents a kept head defines (id -> name), as the reader finds them: an agent's name is
// its ttm:name, white space collapsed, else its id.
std::map<std::string, std::string, std::less<>> head_agents(const std::string& head,
                                                            const std::string& declarations) {
  std::map<std::string, std::string, std::less<>> out;
  if (head.empty()) return out;
  const std::string wrapped = "<head xmlns=\"" + std::string(ns_tt) + "\" xmlns:ttm=\"" +
                              std::string(ns_ttm) + "\"" + declarations + ">" + head + "</head>";
  pugi::xml_document doc;
  if (!doc.load_buffer(wrapped.data(), wrapped.size(), pugi::parse_default | pugi::parse_ws_pcdata,
                       pugi::encoding_utf8))
    return out;
  for (pugi::xpath_node x : doc.select_nodes("//*")) {
    const pugi::xml_node n = x.node();
    const std::string id = n.attribute("xml:id").value();
    if (std::string_view(n.name()) != "ttm:agent" || id.empty()) continue;
    std::string name = id;
    for (pugi::xml_node c : n.children())
      if (std::string_view(c.name()) == "ttm:name") name = collapse_space(c.text().get());
    out[id] = name;
  }
  return out;
}

// The speaker the reader takes from a p's ttm:agent: its first id's agent's name, else the id.
std::optional<std::string> agent_speaker(
    std::string_view refs, const std::map<std::string, std::string, std::less<>>& agents) {
  const std::string_view first = next_idref(refs);
  if (first.empty()) return std::nullopt;
  const auto it = agents.find(first);
  return it == agents.end() ? std::string(first) : it->second;
}

struct plan {
  std::string lang = "und";
  std::string declarations;  // extra xmlns from the source document
  std::string tt_attributes;
  std::string head;
  std::map<std::string, std::string> agent_ids;  // speaker -> agent id, for speakers without one
  std::vector<std::string> problems;
  std::map<std::string, std::size_t> counted;
  std::set<std::size_t> skipped_tiers;        // word tiers their parent's markup already carries
  std::set<const annotation*> usable_markup;  // markup that is TTML content spelling the text
  // What xml:id may hold (an NCName, unique in the document, as xml:id requires): the ids and
  // tier names written; the others are reported lost and written without one.
  std::set<const annotation*> written_ids;
  std::set<std::size_t> named_tiers;
  // Kept ttml: attributes (of tt, a div, a p) written back; the others are listed lost.
  std::set<std::pair<const void*, std::string>> written_attributes;
  std::set<const annotation*> written_speakers;  // speakers written as agents of their own
};

// Decides, once for the writer and the loss report, what of a document the TTML is written
// with: one member function per part of the decision.
struct planner {
  const document& doc;
  plan p;
  std::set<std::string, std::less<>> declared;  // namespace prefixes bound in the output
  std::set<std::string> ids;                    // the xml:ids taken so far

  void problem(const std::string& what) { ++p.counted[what]; }
  bool take_id(const std::string& id) { return is_ncname(id) && ids.insert(id).second; }

  // Foreign namespaces of the root that can be declared again.
  void namespaces() {
    for (const auto& [k, v] : doc.metadata)
      if (k.starts_with("ttml:xmlns:")) {
        const std::string prefix = k.substr(11);
        if (is_ncname(prefix) && !declared.count(prefix) && prefix != "xmlns" && xml_safe(v) &&
            v != ns_tt && v != ns_tts && v != ns_ttm && v != ns_ttp) {
          std::string a = " xmlns:" + prefix + "=\"";
          escape(a, v, true);
          p.declarations += a + "\"";
          declared.insert(prefix);
        } else {
          p.problems.push_back("document metadata " + quote_name(k) +
                               " (not a namespace declaration the writer can add)");
        }
      }
  }

  // A kept attribute is written when its name is one XML allows here, the writer does not
  // write it itself, and its value is text XML can hold.
  bool keep(const void* owner, std::string_view element, const std::string& key,
            const std::string& value) {
    const std::string_view name = std::string_view(key).substr(key.find(':') + 1);
    if (!writable_name(name, declared) || own_attribute(element, name) || !xml_safe(value))
      return false;
    p.written_attributes.emplace(owner, key);
    return true;
  }

  // The document's language, attributes of tt and head.
  void document_metadata() {
    for (const auto& [k, v] : doc.metadata) {
      if (k == "ttml:lang") {
        if (xml_safe(v))
          p.lang = v;
        else
          p.problems.push_back("the document's language (characters XML cannot hold)");
      } else if (k.starts_with("ttml:xmlns:")) {
        continue;
      } else if (k.starts_with("ttml:tt:")) {
        if (keep(&doc, "tt", k.substr(5), v)) {
          std::string a = " " + k.substr(8) + "=\"";
          escape(a, v, true);
          p.tt_attributes += a + "\"";
        } else {
          p.problems.push_back("document metadata " + quote_name(k) +
                               " (an attribute of tt the writer cannot write, or writes itself)");
        }
      } else if (k == "ttml:head") {
        if (!first_forbidden(v) && fragment_text(v, p.declarations))
          p.head = v;
        else
          p.problems.push_back("the TTML head (not well-formed XML)");
      } else if (k.rfind("ttml:", 0) == 0) {
        p.problems.push_back("document metadata " + quote_name(k) +
                             " (not a TTML head, language or attribute)");
      }
    }
  }

  // A word tier that the timed spans in its parent's markup already yield is not written
  // again: reading the parent alone, as the reader would, must give exactly these words.
  void skip_derived_words() {
    for (std::size_t k = 0; k < doc.tiers.size(); ++k) {
      const tier& w = doc.tiers[k];
      if (!w.parent || w.parent->rel != relation::within) continue;
      const tier* parent = find_tier(doc, w.parent->tier);
      if (!parent || !is_words_tier_of(w, parent->name)) continue;
      document alone;
      alone.media = doc.media;
      alone.metadata = doc.metadata;
      alone.tiers = {*parent};
      std::string text;
      {
        string_sink sink(text);
        write_ttml(alone, sink, {});
      }
      read_options o;
      const read_result back = read_ttml(text, o);
      const tier* derived = back.ok() ? find_tier(back.value, w.name) : nullptr;
      if (derived && derived->annotations == w.annotations)
        p.skipped_tiers.insert(k);
      else  // written as a div of its own, which has no parent
        p.problems.push_back("the parent link of tier " + quote_name(w.name) +
                             " (its words are not its parent's timed spans)");
    }
  }

  // Tier names as div ids, empty tiers, and kept attributes of a div.
  void tiers() {
    for (std::size_t k = 0; k < doc.tiers.size(); ++k) {
      const tier& t = doc.tiers[k];
      if (p.skipped_tiers.count(k)) continue;
      if (take_id(t.name))
        p.named_tiers.insert(k);
      else
        p.problems.push_back("the tier name " + quote_name(t.name) +
                             " (not a unique XML identifier)");
      if (t.annotations.empty())
        p.problems.push_back("empty tier " + quote_name(t.name) +
                             " (a div without p is not read back)");
      for (const auto& [key, value] : t.attributes)
        if (key.starts_with("ttml:") && !keep(&t, "div", key, value))
          p.problems.push_back("the attribute " + quote_name(key) + " of tier " +
                               quote_name(t.name) +
                               " (a name the writer cannot write, or writes itself)");
    }
  }

  // One p: its times, id, text, markup, kept attributes and speaker.
  void annotation_of(const annotation& a,
                     const std::map<std::string, std::string, std::less<>>& agents) {
    if (a.start < 0) problem("negative times");
    if (a.end <= a.start)
      problem("annotations that do not end after they start (never shown in TTML)");
    if (a.id && take_id(*a.id))
      p.written_ids.insert(&a);
    else if (a.id)
      problem("ids that are not unique XML identifiers");
    if (!xml_safe(a.text) || a.text.find('\r') != std::string::npos)
      problem("text with characters XML cannot hold");
    if (a.markup) {
      const auto text =
          first_forbidden(*a.markup) ? std::nullopt : fragment_text(*a.markup, p.declarations);
      if (text && *text == a.text)
        p.usable_markup.insert(&a);
      else
        problem("markup that is not TTML content spelling the text");
    }
    bool unkept = false;
    for (const auto& [key, value] : a.attributes)
      if (key.starts_with("ttml:") && !keep(&a, "p", key, value)) unkept = true;
    if (unkept) problem("ttml: attributes the writer cannot write, or writes itself");
    const auto speaker = a.attributes.find("speaker");
    if (speaker == a.attributes.end()) return;
    const auto own = a.attributes.find("ttml:ttm:agent");
    if (own != a.attributes.end() && p.written_attributes.count({&a, own->first})) {
      // The p's own agent names the speaker when read back: it must name this one.
      if (agent_speaker(own->second, agents) != speaker->second)
        problem("speakers other than the one the annotation's own ttm:agent names");
    } else if (!xml_safe(speaker->second) || collapse_space(speaker->second) != speaker->second ||
               speaker->second.empty()) {
      // An agent's name is read with its white space collapsed.
      problem("speakers with characters XML cannot hold or white space a name loses");
    } else {
      p.agent_ids.emplace(speaker->second, "");
      p.written_speakers.insert(&a);
    }
  }

  // Agents for speakers get ids no element or agent reference of the document uses already:
  // a p that keeps its own ttm:agent must not come to name a generated speaker.
  void agent_ids() {
    std::set<std::string> taken = ids;
    for (const tier& t : doc.tiers)
      for (const annotation& a : t.annotations) {
        if (a.id) taken.insert(*a.id);
        if (auto it = a.attributes.find("ttml:ttm:agent"); it != a.attributes.end()) {
          std::string_view refs = it->second;
          while (!refs.empty()) {
            const std::size_t sp = refs.find(' ');
            taken.insert(std::string(refs.substr(0, sp)));
            refs = sp == std::string_view::npos ? std::string_view{} : refs.substr(sp + 1);
          }
        }
      }
    if (auto head = doc.metadata.find("ttml:head"); head != doc.metadata.end())
      for (std::size_t at = head->second.find("xml:id=\""); at != std::string::npos;
           at = head->second.find("xml:id=\"", at + 1)) {
        const std::size_t from = at + 8, to = head->second.find('"', from);
        taken.insert(head->second.substr(from, to == std::string::npos ? to : to - from));
      }
    std::size_t next = 1;
    for (auto& [speaker, id] : p.agent_ids) {
      do
        id = "agent-" + std::to_string(next++);
      while (taken.count(id));
    }
  }
};

plan make_plan(const document& doc) {
  planner pl{doc, {}, {"tts", "ttm", "ttp", "xml"}, {}};
  pl.namespaces();
  pl.document_metadata();
  const auto agents = head_agents(pl.p.head, pl.p.declarations);
  pl.skip_derived_words();
  pl.tiers();
  for (std::size_t k = 0; k < doc.tiers.size(); ++k)
    if (!pl.p.skipped_tiers.count(k))
      for (const annotation& a : doc.tiers[k].annotations)
        pl.annotation_of(a, agents);
  pl.agent_ids();
  return std::move(pl.p);
}

// The kept ttml: attributes of a div or p that the plan writes.
void write_kept(std::string& out, const void* owner, const attribute_map& attributes,
                const plan& p) {
  for (const auto& [key, value] : attributes) {
    if (!p.written_attributes.count({owner, key})) continue;
    out += " " + key.substr(5) + "=\"";
    escape(out, value, true);
    out += '"';
  }
}

void write_annotation(std::string& out, const annotation& a, const std::optional<rational>& rate,
                      const plan& p) {
  out += "      <p";
  if (p.written_ids.count(&a)) {
    out += " xml:id=\"";
    escape(out, *a.id, true);
    out += '"';
  }
  out += " begin=\"" + time_text(std::max<time_ns>(a.start, 0), rate) + "\" end=\"" +
         time_text(std::max<time_ns>(a.end, 0), rate) + "\"";
  write_kept(out, &a, a.attributes, p);
  if (p.written_speakers.count(&a))
    out += " ttm:agent=\"" + p.agent_ids.at(a.attributes.at("speaker")) + "\"";
  const bool markup = p.usable_markup.count(&a) != 0;
  if (!markup && collapse_space(a.text) != a.text) out += " xml:space=\"preserve\"";
  out += '>';
  if (markup) {
    out += *a.markup;
  } else {
    std::size_t begin = 0;
    for (;;) {
      const std::size_t nl = a.text.find('\n', begin);
      escape(out, std::string_view(a.text).substr(begin, nl - begin), false);
      if (nl == std::string::npos) break;
      out += "<br/>";
      begin = nl + 1;
    }
  }
  out += "</p>\n";
}

}  // namespace

void write_ttml(const document& doc, byte_sink& out, const write_options&) {
  const plan p = make_plan(doc);
  const std::optional<rational>& rate = doc.media.frame_rate;
  std::string s = "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n<tt xmlns=\"" + std::string(ns_tt) +
                  "\" xmlns:ttp=\"" + std::string(ns_ttp) + "\" xmlns:tts=\"" +
                  std::string(ns_tts) + "\" xmlns:ttm=\"" + std::string(ns_ttm) + "\"" +
                  p.declarations + " xml:lang=\"";
  escape(s, p.lang, true);
  s += "\" ttp:timeBase=\"media\" ttp:contentProfiles=\"" + std::string(profile) + "\"";
  if (rate) {
    // ttp:frameRate is a whole number; the multiplier carries the rest (30000/1001 = 30 ×
    // 1000/1001).
    const std::int64_t whole = (rate->num + rate->den - 1) / rate->den;
    s += " ttp:frameRate=\"" + std::to_string(whole) + "\"";
    if (whole * rate->den != rate->num) {
      const std::int64_t g = std::gcd(rate->num, whole * rate->den);
      s += " ttp:frameRateMultiplier=\"" + std::to_string(rate->num / g) + " " +
           std::to_string(whole * rate->den / g) + "\"";
    }
  }
  s += p.tt_attributes + ">\n  <head>";
  s += p.head;
  if (!p.agent_ids.empty()) {
    s += "<metadata xml:id=\"" + std::string(speakers_block) + "\">";
    for (const auto& [name, id] : p.agent_ids) {
      s += "<ttm:agent xml:id=\"" + id + "\" type=\"person\"><ttm:name type=\"full\">";
      escape(s, name, false);
      s += "</ttm:name></ttm:agent>";
    }
    s += "</metadata>";
  }
  s += "</head>\n  <body>\n";
  out.write(s);
  for (std::size_t k = 0; k < doc.tiers.size(); ++k) {
    if (p.skipped_tiers.count(k)) continue;
    const tier& t = doc.tiers[k];
    s = "    <div";
    if (p.named_tiers.count(k)) {
      s += " xml:id=\"";
      escape(s, t.name, true);
      s += '"';
    }
    write_kept(s, &t, t.attributes, p);
    s += ">\n";
    for (const annotation& a : t.annotations)
      write_annotation(s, a, rate, p);
    s += "    </div>\n";
    out.write(s);
  }
  out.write("  </body>\n</tt>\n");
}

void ttml_losses(const document& doc, std::vector<std::string>& losses) {
  const plan p = make_plan(doc);
  for (const auto& [what, n] : p.counted)
    losses.push_back(what + " (" + plural(n, "annotation", "annotations") + ")");
  losses.insert(losses.end(), p.problems.begin(), p.problems.end());
}

}  // namespace tiers::detail
