// Checking one document: which tiers play which role, emitting located problems, the profile's
// requirements, and the captions' lag against the word timings.
#include <algorithm>
#include <cassert>
#include <cmath>
#include <cstdio>

#include "checker.hpp"
#include "detail/report.hpp"

namespace tiers::detail {

std::string clock(time_ns t) {
  return format_clock(t, 3);
}

std::string seconds(time_ns t) {
  // Milliseconds are what people can see; the exact value is in the JSON report.
  const double s = std::round(static_cast<double>(t) / 1e6) / 1e3;
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.3f", s);
  std::string out = buf;
  while (out.back() == '0')
    out.pop_back();
  if (out.back() == '.') out.pop_back();
  return out + " s";
}

void sort_problems(std::vector<problem>& problems) {
  std::stable_sort(problems.begin(), problems.end(), [](const problem& a, const problem& b) {
    return std::pair(a.diag.line, a.diag.column) < std::pair(b.diag.line, b.diag.column);
  });
}

std::string number(double v) {
  char buf[32];
  std::snprintf(buf, sizeof buf, "%.1f", v);
  std::string out = buf;
  if (out.ends_with(".0")) out.resize(out.size() - 2);
  return out;
}

checker::checker(const document& doc, const source_map& positions, const std::string& file,
                 const profile& p, const check_context& context, file_report& out)
    : doc_(doc), positions_(positions), file_(file), profile_(p), context_(context), out_(out) {
  min_gap_ = p.limits.min_gap.at(doc.media.frame_rate.value_or(p.limits.frame_rate));
}

problem* checker::emit(std::string_view rule, std::size_t t, std::size_t a, std::string message) {
  // A rule the catalogue does not know has no level and would be off without a word
  // (tests/scripts/rule_ids.py checks the literals of every emit call).
  assert(find_rule(rule) && "a rule emitted must be in the catalogue (rules.cpp)");
  const rule_level level = profile_.level(rule);
  if (level == rule_level::off) return nullptr;
  problem& p = out_.problems.emplace_back();
  p.diag.level = severity_of(level);
  p.diag.code = std::string(rule);
  p.diag.message = std::move(message);
  p.diag.file = file_;
  if (t != no_index) {
    p.tier = doc_.tiers[t].name;
    const source_position at =
        a == no_index ? positions_.of_tier(t) : positions_.of_annotation(t, a);
    p.diag.offset = at.offset;
    p.diag.line = at.line;
    p.diag.column = at.column;
    if (a != no_index) {
      const annotation& x = doc_.tiers[t].annotations[a];
      p.start = x.start;
      p.end = x.end;
      if (x.id) p.id = *x.id;
    }
  }
  return &p;
}

std::string checker::where(std::size_t t, std::size_t a) const {
  const source_position at = a == no_index ? positions_.of_tier(t) : positions_.of_annotation(t, a);
  return at.line > 0 ? "line " + std::to_string(at.line) : std::string();
}

namespace {

std::optional<std::size_t> index_of(const document& doc, std::string_view name) {
  for (std::size_t k = 0; k < doc.tiers.size(); ++k)
    if (doc.tiers[k].name == name) return k;
  return std::nullopt;
}

std::string labels(const std::vector<std::string>& v) {
  std::string s;
  for (std::size_t k = 0; k < v.size() && k < 8; ++k)
    s += (k ? ", " : "") + v[k];
  if (v.size() > 8) s += ", …";
  return s.empty() ? "none" : s;
}

bool same_labels(std::vector<std::string> a, std::vector<std::string> b) {
  std::sort(a.begin(), a.end());
  std::sort(b.begin(), b.end());
  return a == b;
}

}  // namespace

void checker::check_profile() {
  for (const tier_spec& spec : profile_.tiers) {
    const auto t = index_of(doc_, spec.name);
    if (!t) {
      if (spec.required)
        emit("dataset.tier-missing", no_index, no_index,
             "no tier " + quote_name(spec.name) + ", which the profile requires");
      continue;
    }
    const tier& have = doc_.tiers[*t];
    // A format that cannot say a tier is of instants (a table) makes it an interval tier of
    // instants; that is no conflict with a profile that says instants.
    const bool instants = std::all_of(have.annotations.begin(), have.annotations.end(),
                                      [](const annotation& a) { return a.start == a.end; });
    const bool unsaid = !context_.instant_tiers && have.kind == tier_kind::interval && instants;
    if (spec.kind && *spec.kind != have.kind && !unsaid)
      emit("dataset.tier-kind", *t, no_index,
           "tier " + quote_name(have.name) + " is " + detail::kind_tier(have.kind) +
               "; the profile says " + std::string(to_string(*spec.kind)));
    if (spec.parent && have.parent && *spec.parent != *have.parent)
      emit("dataset.tier-parent", *t, no_index,
           "tier " + quote_name(have.name) + " has parent " + quote_name(have.parent->tier) + " (" +
               std::string(to_string(have.parent->rel)) + "); the profile says " +
               quote_name(spec.parent->tier) + " (" + std::string(to_string(spec.parent->rel)) +
               ")");
    if (spec.vocabulary && have.vocabulary && !same_labels(*spec.vocabulary, *have.vocabulary))
      emit("dataset.tier-vocabulary", *t, no_index,
           "tier " + quote_name(have.name) + " declares the labels " + labels(*have.vocabulary) +
               "; the profile's are " + labels(*spec.vocabulary));
  }
  if (profile_.tiers.empty()) return;
  for (std::size_t t = 0; t < doc_.tiers.size(); ++t) {
    const std::string& name = doc_.tiers[t].name;
    const bool role = (context_.captions && *context_.captions == name) ||
                      (profile_.captions && *profile_.captions == name) ||
                      (!context_.words_doc && ((context_.words && *context_.words == name) ||
                                               (profile_.words && *profile_.words == name)));
    if (!profile_.find_tier(name) && !role)
      emit("dataset.tier-unexpected", t, no_index,
           "tier " + quote_name(name) + " is not one the profile declares");
  }
}

void checker::check_lag(std::size_t c) {
  const std::optional<std::string>& wanted = context_.words ? context_.words : profile_.words;
  const document& wdoc = context_.words_doc ? *context_.words_doc : doc_;
  if (!wanted && !context_.words_doc) return;
  std::optional<std::size_t> w;
  if (wanted)
    w = index_of(wdoc, *wanted);
  else if (wdoc.tiers.size() == 1)
    w = 0;
  else
    w = index_of(wdoc, "words");
  const std::string in_file = context_.words_doc ? " in " + context_.words_file : "";
  if (!w) {
    // One problem per cause: a tier of this document that the profile requires is reported
    // missing by check_profile already.
    const std::string name = wanted ? *wanted : "words";
    const tier_spec* spec = context_.words_doc ? nullptr : profile_.find_tier(name);
    if (spec && spec->required) return;
    emit("dataset.tier-missing", no_index, no_index,
         (wanted ? "no tier " + quote_name(*wanted) : std::string("no tier 'words'")) + in_file +
             " to compare the captions with" + (wanted ? "" : " (name it: --words FILE:TIER)"));
    return;
  }
  const tier& captions = doc_.tiers[c];
  const tier& words = wdoc.tiers[*w];
  const check_limits& l = profile_.limits;
  const caption_alignment al = align_captions(captions, words, l.window);
  lag_report report;
  report.captions = captions.name;
  report.words = words.name;
  report.stats = summarize_lag(al);
  report.tokens = al.tokens;
  report.matched = al.matched;
  for (std::size_t k = 0; k < al.cues.size(); ++k) {
    const cue_alignment& a = al.cues[k];
    const annotation& x = captions.annotations[k];
    lag_report::cue& row = report.cues.emplace_back();
    row.position = k + 1;
    if (x.id) row.id = *x.id;
    row.start = x.start;
    row.end = x.end;
    if (a.first_word) row.word_start = words.annotations[*a.first_word].start;
    row.lag = a.lag;
    row.words = a.tokens;
    row.matched = a.matched;
    const std::optional<time_ns>& lag = a.lag;
    if (!lag) continue;
    problem* p = nullptr;
    if (*lag > l.max_late)
      p = emit("lag.late", c, k,
               "cue appears " + seconds(*lag) + " after its first word is spoken (at most " +
                   seconds(l.max_late) + ")");
    else if (-*lag > l.max_early)
      p = emit("lag.early", c, k,
               "cue appears " + seconds(-*lag) + " before its first word is spoken (at most " +
                   seconds(l.max_early) + " early)");
    if (p) {
      p->value = static_cast<double>(*lag) / 1e9;
      p->limit = static_cast<double>(*lag > 0 ? l.max_late : -l.max_early) / 1e9;
    }
  }
  if (al.tokens > 0 && al.coverage() < l.min_coverage) {
    char pct[32], min[32];
    std::snprintf(pct, sizeof pct, "%.1f %%", 100 * al.coverage());
    std::snprintf(min, sizeof min, "%g %%", 100 * l.min_coverage);
    if (problem* p = emit("lag.coverage", c, no_index,
                          "only " + std::string(pct) + " of the caption words (" +
                              std::to_string(al.matched) + " of " + std::to_string(al.tokens) +
                              ") were found in " + quote_name(words.name) + in_file +
                              " (at least " + min + "): the lag figures are unreliable")) {
      p->value = al.coverage();
      p->limit = l.min_coverage;
    }
  }
  out_.lag = std::move(report);
}

void checker::run() {
  const std::optional<std::string>& captions =
      context_.captions ? context_.captions : profile_.captions;
  if (captions) {
    if (auto c = index_of(doc_, *captions))
      captions_ = *c;
    else
      emit("dataset.tier-missing", no_index, no_index,
           "no tier " + quote_name(*captions) + " to check as captions");
  }
  check_names();
  check_profile();
  for (std::size_t t = 0; t < doc_.tiers.size(); ++t) {
    check_time(t);
    check_tier_spans(t);
    check_structure(t);
    check_text(t);
  }
  if (captions_ != no_index) {
    check_captions(captions_);
    check_lag(captions_);
  }
}

}  // namespace tiers::detail

namespace tiers {

std::string format_problem(const problem& p) {
  diagnostic d = p.diag;
  if (p.id) d.message = "annotation " + detail::quote_name(*p.id) + ": " + d.message;
  if (p.diag.line > 0 || p.tier.empty()) return format_diagnostic(d);
  std::string context = "tier " + detail::quote_name(p.tier);
  if (p.start) context += " at " + detail::clock(*p.start);
  d.message = context + (p.id ? ", " : ": ") + d.message;
  return format_diagnostic(d);
}

std::size_t file_report::count(severity level) const {
  return static_cast<std::size_t>(std::count_if(
      problems.begin(), problems.end(), [&](const problem& p) { return p.diag.level == level; }));
}

namespace {

// The reader's authoring-rule warnings that the model's rules report too, with their ids.
bool reported_by_model(std::string_view code) {
  return code == "vtt.order" || code == "vtt.empty" || code == "vtt.id";
}

problem from_diagnostic(const diagnostic& d) {
  problem p;
  p.diag = d;
  return p;
}

}  // namespace

file_report unreadable_file(const std::string& file, const std::vector<diagnostic>& read) {
  file_report r;
  r.path = file;
  for (const diagnostic& d : read)
    r.problems.push_back(from_diagnostic(d));
  detail::sort_problems(r.problems);
  return r;
}

file_report check_document(const document& doc, const source_map& positions,
                           const std::string& file, const profile& p, const check_context& context,
                           const std::vector<diagnostic>& read) {
  file_report r;
  r.path = file;
  for (const diagnostic& d : read)
    if (!reported_by_model(d.code)) r.problems.push_back(from_diagnostic(d));
  detail::checker(doc, positions, file, p, context, r).run();
  detail::sort_problems(r.problems);
  r.shape = shape_of(doc, positions);
  return r;
}

void add_tally(std::vector<rule_tally>& counts, const file_report& report) {
  for (const problem& p : report.problems) {
    auto it = std::find_if(counts.begin(), counts.end(), [&](const rule_tally& c) {
      return c.rule == p.diag.code && c.level == p.diag.level;
    });
    if (it == counts.end()) it = counts.insert(counts.end(), {p.diag.code, p.diag.level, 0});
    ++it->problems;
  }
}

std::vector<rule_tally> tally(const file_report& report) {
  std::vector<rule_tally> counts;
  add_tally(counts, report);
  return counts;
}

check_summary summarize(std::span<const std::vector<rule_tally>> files) {
  check_summary s;
  s.files = files.size();
  for (const std::vector<rule_tally>& counts : files) {
    std::size_t of[3] = {0, 0, 0};  // by severity: note, warning, error
    std::vector<std::string_view> seen;
    for (const rule_tally& c : counts) {
      of[static_cast<std::size_t>(c.level)] += c.problems;
      auto it = std::find_if(s.by_rule.begin(), s.by_rule.end(),
                             [&](const auto& r) { return r.rule == c.rule && r.level == c.level; });
      if (it == s.by_rule.end()) it = s.by_rule.insert(s.by_rule.end(), {c.rule, c.level, 0, 0});
      it->problems += c.problems;
      if (std::find(seen.begin(), seen.end(), c.rule) == seen.end()) {
        seen.push_back(c.rule);
        ++it->files;
      }
    }
    s.errors += of[static_cast<std::size_t>(severity::error)];
    s.warnings += of[static_cast<std::size_t>(severity::warning)];
    s.notes += of[static_cast<std::size_t>(severity::note)];
    s.files_with_errors += of[static_cast<std::size_t>(severity::error)] > 0;
    s.files_with_warnings += of[static_cast<std::size_t>(severity::warning)] > 0;
  }
  std::stable_sort(s.by_rule.begin(), s.by_rule.end(), [](const auto& a, const auto& b) {
    if (a.level != b.level) return a.level > b.level;
    if (a.problems != b.problems) return a.problems > b.problems;
    return a.rule < b.rule;
  });
  return s;
}

check_summary summarize(std::span<const file_report> reports) {
  std::vector<std::vector<rule_tally>> files;
  files.reserve(reports.size());
  for (const file_report& r : reports)
    files.push_back(tally(r));
  return summarize(std::span<const std::vector<rule_tally>>(files));
}

}  // namespace tiers
