// The recordings of a dataset: files found by the sources' patterns, their tiers given what
// each source says, and a recording's files joined into one document.
#include <algorithm>
#include <filesystem>
#include <map>
#include <system_error>

#include "detail/report.hpp"
#include "tiers/dataset.hpp"

namespace tiers {
namespace {

namespace fs = std::filesystem;
using detail::quote_name;

// Whether path[s…] fits pattern[p…]; `id` gets what {id} stood for. Wildcards take as few
// characters as they can, so the first fit found gives the shortest id.
bool fits(std::string_view pattern, std::size_t p, std::string_view path, std::size_t s,
          std::string& id) {
  if (p == pattern.size()) return s == path.size();
  const bool segment_start = p == 0 || pattern[p - 1] == '/';
  if (pattern.compare(p, 4, "{id}") == 0) {
    for (std::size_t n = s; n < path.size() && path[n] != '/'; ++n)
      if (fits(pattern, p + 4, path, n + 1, id)) {
        id = std::string(path.substr(s, n + 1 - s));
        return true;
      }
    return false;
  }
  if (segment_start && pattern.compare(p, 3, "**/") == 0) {
    for (std::size_t n = s; n <= path.size(); ++n)
      if ((n == s || path[n - 1] == '/') && fits(pattern, p + 3, path, n, id)) return true;
    return false;
  }
  if (segment_start && pattern.substr(p) == "**") return s < path.size();
  if (pattern[p] == '*') {
    for (std::size_t n = s;; ++n) {
      if (fits(pattern, p + 1, path, n, id)) return true;
      if (n == path.size() || path[n] == '/') return false;
    }
  }
  return s < path.size() && path[s] == pattern[p] && fits(pattern, p + 1, path, s + 1, id);
}

// The folders before the first one with a wildcard: where the search for a pattern starts.
std::string fixed_folder(std::string_view pattern) {
  std::size_t end = 0;
  for (std::size_t slash = pattern.find('/'); slash != std::string_view::npos;
       slash = pattern.find('/', slash + 1)) {
    if (pattern.substr(end, slash - end).find_first_of("*{") != std::string_view::npos) break;
    end = slash + 1;
  }
  return std::string(pattern.substr(0, end));
}

// How many folders below fixed_folder a pattern's files can lie; none: any number (`**`).
std::optional<std::size_t> depth_below(std::string_view pattern, std::size_t fixed) {
  const std::string_view rest = pattern.substr(fixed);
  if (rest.find("**") != std::string_view::npos) return std::nullopt;
  return static_cast<std::size_t>(std::count(rest.begin(), rest.end(), '/'));
}

bool hidden(const fs::path& p) {
  const std::string name = p.filename().string();
  return !name.empty() && name[0] == '.';
}

// The files below root/folder that could fit `pattern`, relative to root with `/`, sorted.
// `escaping` gets those that are links leading out of the root (once every link is followed):
// a description from someone else must not pull in files outside the folder it describes.
std::vector<std::string> candidates(const fs::path& root, const std::string& pattern,
                                    std::vector<std::string>& escaping) {
  const std::string folder = fixed_folder(pattern);
  const std::optional<std::size_t> depth = depth_below(pattern, folder.size());
  std::vector<std::string> out;
  std::error_code ec;
  const fs::path inside = fs::weakly_canonical(root, ec);
  const fs::path start = folder.empty() ? root : root / folder;
  if (!fs::is_directory(start, ec)) return out;
  fs::recursive_directory_iterator it(start, fs::directory_options::skip_permission_denied, ec);
  for (; !ec && it != fs::recursive_directory_iterator(); it.increment(ec)) {
    const fs::directory_entry& e = *it;
    if (hidden(e.path())) {
      if (e.is_directory(ec)) it.disable_recursion_pending();
      continue;
    }
    if (e.is_directory(ec)) {
      if (depth && static_cast<std::size_t>(it.depth()) >= *depth) it.disable_recursion_pending();
      continue;
    }
    if (!e.is_regular_file(ec)) continue;
    std::string relative = folder + e.path().lexically_relative(start).generic_string();
    const fs::path resolved = fs::weakly_canonical(e.path(), ec);
    const fs::path below = ec ? fs::path() : resolved.lexically_relative(inside);
    if (below.empty() || *below.begin() == "..") {
      escaping.push_back(std::move(relative));
      continue;
    }
    out.push_back(std::move(relative));
  }
  std::sort(out.begin(), out.end());
  return out;
}

diagnostic problem_in(const std::string& file, severity level, std::string code,
                      std::string message) {
  diagnostic d;
  d.level = level;
  d.file = file;
  d.code = std::move(code);
  d.message = std::move(message);
  return d;
}

}  // namespace

bool recording::complete() const {
  return std::none_of(files.begin(), files.end(), [](const std::string& f) { return f.empty(); });
}

std::optional<std::string> match_pattern(std::string_view pattern, std::string_view path) {
  std::string id;
  if (!fits(pattern, 0, path, 0, id)) return std::nullopt;
  return id;
}

result<std::vector<recording>> find_recordings(const dataset_description& d,
                                               const std::string& root, const std::string& file,
                                               std::string_view description_text) {
  result<std::vector<recording>> r;
  std::map<std::string, recording> by_id;
  for (std::size_t k = 0; k < d.sources.size(); ++k) {
    const dataset_source& s = d.sources[k];
    std::vector<std::string> escaping;
    for (const std::string& path : candidates(root.empty() ? "." : root, s.pattern, escaping)) {
      std::optional<std::string> id = match_pattern(s.pattern, path);
      if (!id) continue;
      recording& rec = by_id[*id];
      if (rec.files.empty()) {
        rec.id = *id;
        rec.files.resize(d.sources.size());
      }
      if (!rec.files[k].empty()) {
        diagnostic p = problem_in(file, severity::error, "dataset.ambiguous",
                                  "the pattern " + quote_name(s.pattern) + " gives the recording " +
                                      quote_name(*id) + " two files, " + quote_name(rec.files[k]) +
                                      " and " + quote_name(path) + ": make it tell them apart");
        p.offset = s.offset;
        r.diagnostics.push_back(std::move(p));
        continue;
      }
      rec.files[k] = path;
    }
    for (const std::string& path : escaping)
      if (match_pattern(s.pattern, path))
        r.diagnostics.push_back(problem_in(
            file, severity::error, "dataset.outside",
            quote_name(path) + " is a link that leads outside the description's folder; name "
                               "files elsewhere on the command line"));
  }
  for (auto& [id, rec] : by_id)
    r.value.push_back(std::move(rec));
  if (!description_text.empty()) locate_all(description_text, r.diagnostics);
  return r;
}

std::vector<diagnostic> apply_source(document& doc, const dataset_source& s,
                                     const std::string& file) {
  std::vector<diagnostic> out;
  if (!s.rename.empty()) {
    std::map<std::string, std::string, std::less<>> names;
    std::optional<std::string> every;
    for (const auto& [from, to] : s.rename) {
      if (from == "*")
        every = to;
      else
        names.emplace(from, to);
    }
    for (const auto& [from, to] : names)
      if (!find_tier(doc, from))
        out.push_back(problem_in(
            file, severity::warning, "input.rename",
            "has no tier " + quote_name(from) + " to rename (tiers: " + tier_names(doc) + ")"));
    auto renamed = [&](const std::string& name) -> std::string {
      if (auto it = names.find(name); it != names.end()) return it->second;
      return every ? *every : name;
    };
    for (tier& t : doc.tiers) {
      if (t.parent && find_tier(doc, t.parent->tier)) t.parent->tier = renamed(t.parent->tier);
    }
    for (tier& t : doc.tiers)
      t.name = renamed(t.name);
    std::map<std::string_view, std::size_t> seen;
    for (const tier& t : doc.tiers)
      if (++seen[t.name] == 2)
        out.push_back(problem_in(file, severity::error, "input.rename",
                                 "renaming gives two tiers the name " + quote_name(t.name)));
  }
  for (tier& t : doc.tiers) {
    if (s.source) t.source = s.source;
    if (!s.kind) continue;
    if (*s.kind == tier_kind::instant) {
      const auto spans = std::find_if(t.annotations.begin(), t.annotations.end(),
                                      [](const annotation& a) { return a.end != a.start; });
      if (spans != t.annotations.end()) {
        out.push_back(problem_in(file, severity::error, "input.kind",
                                 "the tier " + quote_name(t.name) +
                                     " cannot be an instant tier: its annotation at " +
                                     format_clock(spans->start) + " spans " +
                                     format_seconds(spans->end - spans->start) + " s"));
        continue;
      }
    }
    t.kind = *s.kind;
  }
  return out;
}

result<document> join_recording(std::vector<merge_input> parts,
                                std::vector<std::string>* tier_files) {
  result<document> r;
  document& doc = r.value;
  std::map<std::string, std::string, std::less<>> tier_from;  // tier name → file
  std::optional<std::string> uri_from, rate_from;
  std::map<std::string, std::string, std::less<>> key_from;
  for (merge_input& part : parts) {
    media_info& m = part.doc.media;
    if (m.uri) {
      if (!doc.media.uri) {
        doc.media.uri = m.uri;
        uri_from = part.file;
      } else if (*doc.media.uri != *m.uri) {
        r.diagnostics.push_back(problem_in(part.file, severity::error, "dataset.media",
                                           "names the media " + quote_name(*m.uri) + ", and " +
                                               *uri_from + " names " + quote_name(*doc.media.uri) +
                                               ": the files are not of one recording"));
      }
    }
    if (m.duration) doc.media.duration = std::max(doc.media.duration.value_or(0), *m.duration);
    if (m.frame_rate) {
      if (!doc.media.frame_rate) {
        doc.media.frame_rate = m.frame_rate;
        rate_from = part.file;
      } else if (*doc.media.frame_rate != *m.frame_rate) {
        r.diagnostics.push_back(problem_in(
            part.file, severity::warning, "dataset.media",
            "gives the frame rate " + format_rational(*m.frame_rate) + ", and " + *rate_from +
                " gives " + format_rational(*doc.media.frame_rate) + ": the first is kept"));
      }
    }
    for (const auto& [key, value] : part.doc.metadata) {
      const auto [it, fresh] = doc.metadata.emplace(key, value);
      if (fresh)
        key_from.emplace(key, part.file);
      else if (it->second != value)
        r.diagnostics.push_back(problem_in(part.file, severity::warning, "dataset.metadata",
                                           "gives " + quote_name(key) + " another value than " +
                                               key_from[key] + ": the first is kept"));
    }
    for (tier& t : part.doc.tiers) {
      const auto [it, fresh] = tier_from.emplace(t.name, part.file);
      if (!fresh && it->second != part.file) {
        r.diagnostics.push_back(
            problem_in(part.file, severity::error, "dataset.clash",
                       "has a tier " + quote_name(t.name) + ", and so has " + it->second +
                           ": give one of them another name (\"rename\" in the dataset's source)"));
        continue;
      }
      if (tier_files) tier_files->push_back(part.file);
      doc.tiers.push_back(std::move(t));
    }
  }
  return r;
}

}  // namespace tiers
