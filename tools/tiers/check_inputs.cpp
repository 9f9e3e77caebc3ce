// Expanding the inputs of `tiers check` and checking them on a pool of threads.
#include "check_inputs.hpp"

#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cstdio>
#include <filesystem>
#include <thread>

#include "tiers/io.hpp"

namespace tiers::cli {

namespace fs = std::filesystem;

std::vector<std::string> expand_inputs(const std::vector<std::string>& paths) {
  std::vector<std::string> out;
  for (const std::string& p : paths) {
    std::error_code ec;
    if (p == "-" || !fs::is_directory(p, ec)) {
      out.push_back(p);
      continue;
    }
    std::vector<std::string> found;
    fs::recursive_directory_iterator it(p, fs::directory_options::skip_permission_denied, ec), end;
    for (; !ec && it != end; it.increment(ec)) {
      const std::string name = it->path().filename().string();
      if (!name.empty() && name[0] == '.') {
        if (it->is_directory(ec)) it.disable_recursion_pending();
        continue;
      }
      if (it->is_regular_file(ec) && format_for_path(it->path().string()))
        found.push_back(it->path().string());
    }
    std::sort(found.begin(), found.end());
    out.insert(out.end(), found.begin(), found.end());
  }
  // A file named twice (directly and through its folder) is checked once, where first named.
  std::vector<std::string> unique;
  for (std::string& f : out)
    if (std::find(unique.begin(), unique.end(), f) == unique.end()) unique.push_back(std::move(f));
  return unique;
}

namespace {

struct checked {
  file_report report;
  std::optional<std::vector<tier_shape>> shape;
};

checked check_one(const std::string& path, const check_options& o, const profile& p,
                  const check_context& shared) {
  const std::string name = display_name(path);
  auto unreadable = [&](diagnostic d) {
    d.file = name;
    return checked{unreadable_file(name, {d}), std::nullopt};
  };
  std::string content;
  try {
    content = read_input(path);
  } catch (const error& e) {
    return unreadable(e.diag());
  }
  diagnostic why;
  const format* fmt = input_format(o.input, path, content, why);
  if (!fmt) return unreadable(why);
  read_options options = reading_options(o.input, path);
  options.positions = true;
  read_result r = read_document(content, *fmt, options, name);
  if (!r.ok()) return {unreadable_file(name, r.diagnostics), std::nullopt};
  check_context roles = shared;
  roles.point_tiers = fmt->carries.has(feature::point_tiers);
  // A WebVTT file is a caption file: its cues are checked as captions unless told otherwise.
  if (!roles.captions && !p.captions && fmt->name == "vtt" && !r.doc.tiers.empty())
    roles.captions = r.doc.tiers.front().name;
  checked c{check_document(r.doc, r.positions, name, p, roles, r.diagnostics),
            shape_of(r.doc, r.positions)};
  return c;
}

// Draws "checking  12/40 files" over itself, ten times a second, until all are done.
void show_progress(const std::atomic<std::size_t>& done, std::size_t total) {
  using namespace std::chrono_literals;
  for (;;) {
    const std::size_t d = done.load();
    constexpr std::size_t width = 30;
    const std::size_t filled = total ? d * width / total : width;
    std::fprintf(stderr, "\rchecking [%s%s] %zu/%zu files", std::string(filled, '#').c_str(),
                 std::string(width - filled, '.').c_str(), d, total);
    std::fflush(stderr);
    if (d >= total) break;
    std::this_thread::sleep_for(100ms);
  }
  std::fprintf(stderr, "\r\033[K");
  std::fflush(stderr);
}

}  // namespace

std::vector<file_report> check_files(const std::vector<std::string>& files, const check_options& o,
                                     const profile& p, const check_context& roles) {
  std::vector<checked> results(files.size());
  std::atomic<std::size_t> next{0}, done{0};
  auto work = [&] {
    for (std::size_t k; (k = next.fetch_add(1)) < files.size(); done.fetch_add(1)) {
      try {
        results[k] = check_one(files[k], o, p, roles);
      } catch (const std::exception& e) {  // out of memory, above all: that file fails alone
        diagnostic d;
        d.file = display_name(files[k]);
        d.code = "io.read";
        d.message = std::string("could not be checked: ") + e.what();
        results[k] = {unreadable_file(d.file, {d}), std::nullopt};
      }
    }
  };
  unsigned jobs = o.jobs ? o.jobs : std::max(1u, std::thread::hardware_concurrency());
  jobs = static_cast<unsigned>(std::min<std::size_t>(jobs, std::max<std::size_t>(files.size(), 1)));
  std::vector<std::thread> pool;
  for (unsigned k = 1; k < jobs; ++k)
    pool.emplace_back(work);
  std::thread progress;
  if (files.size() > 1 && isatty(STDERR_FILENO))
    progress = std::thread(show_progress, std::cref(done), files.size());
  work();
  for (std::thread& t : pool)
    t.join();
  if (progress.joinable()) progress.join();

  std::vector<file_report> reports;
  std::vector<std::optional<std::vector<tier_shape>>> shapes;
  for (checked& c : results) {
    reports.push_back(std::move(c.report));
    shapes.push_back(std::move(c.shape));
  }
  check_dataset(reports, shapes, p);
  return reports;
}

}  // namespace tiers::cli
