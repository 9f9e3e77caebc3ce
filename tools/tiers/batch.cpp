// Expanding inputs and running work on a pool of threads, with a progress bar on terminals.
#include "batch.hpp"

#include <unistd.h>

#include <algorithm>
#include <atomic>
#include <chrono>
#include <cstdio>
#include <filesystem>
#include <thread>
#include <unordered_set>

#include "tiers/format.hpp"

namespace tiers::cli {

namespace fs = std::filesystem;

int for_each_document(const std::vector<input_file>& files, const input_options& base,
                      unsigned jobs, const char* verb,
                      const std::function<void(std::size_t, document&&)>& work) {
  std::atomic<bool> failed = false;
  run_parallel(
      files.size(), jobs,
      [&](std::size_t k) {
        try {
          input_options in = base;
          in.path = files[k].path;
          work(k, load_document(in));
        } catch (const rejected&) {
          failed = true;  // its reasons are printed
        } catch (const error& e) {
          report(e.diag());
          failed = true;
        }
      },
      verb);
  return failed ? exit_rejected : exit_ok;
}

std::vector<input_file> expand_inputs(const std::vector<std::string>& paths) {
  std::vector<input_file> out;
  for (const std::string& p : paths) {
    std::error_code ec;
    if (p == "-" || !fs::is_directory(p, ec)) {
      out.push_back({p, fs::path(p).filename().string()});
      continue;
    }
    std::vector<input_file> found;
    fs::recursive_directory_iterator it(p, fs::directory_options::skip_permission_denied, ec), end;
    for (; !ec && it != end; it.increment(ec)) {
      const std::string name = it->path().filename().string();
      if (!name.empty() && name[0] == '.') {
        if (it->is_directory(ec)) it.disable_recursion_pending();
        continue;
      }
      // lexically: the iterator's paths all start with p, and relative() would resolve both
      // paths on the disk for every file.
      if (it->is_regular_file(ec) && format_for_path(it->path().string()))
        found.push_back({it->path().string(), it->path().lexically_relative(p).string()});
    }
    std::sort(found.begin(), found.end(),
              [](const input_file& a, const input_file& b) { return a.path < b.path; });
    out.insert(out.end(), found.begin(), found.end());
  }
  // The first of each path, in order: a hash set, since archives list hundreds of thousands.
  std::vector<input_file> unique;
  std::unordered_set<std::string> seen;
  seen.reserve(out.size());
  for (input_file& f : out)
    if (seen.insert(f.path).second) unique.push_back(std::move(f));
  return unique;
}

namespace {

// Draws "VERB [####....] 12/40 UNITS" over itself, ten times a second, until all are done.
void show_progress(const std::atomic<std::size_t>& done, std::size_t total, const char* verb,
                   const char* units) {
  using namespace std::chrono_literals;
  for (;;) {
    const std::size_t d = done.load();
    constexpr std::size_t width = 30;
    const std::size_t filled = total ? d * width / total : width;
    std::fprintf(stderr, "\r%s [%s%s] %zu/%zu %s", verb, std::string(filled, '#').c_str(),
                 std::string(width - filled, '.').c_str(), d, total, units);
    std::fflush(stderr);
    if (d >= total) break;
    std::this_thread::sleep_for(100ms);
  }
  std::fprintf(stderr, "\r\033[K");
  std::fflush(stderr);
}

}  // namespace

void run_parallel(std::size_t count, unsigned jobs, const std::function<void(std::size_t)>& work,
                  const char* verb, const char* units) {
  std::atomic<std::size_t> next{0}, done{0};
  auto worker = [&] {
    for (std::size_t k; (k = next.fetch_add(1)) < count; done.fetch_add(1))
      work(k);
  };
  if (jobs == 0) jobs = std::max(1u, std::thread::hardware_concurrency());
  jobs = static_cast<unsigned>(std::min<std::size_t>(jobs, std::max<std::size_t>(count, 1)));
  std::vector<std::thread> pool;
  for (unsigned k = 1; k < jobs; ++k)
    pool.emplace_back(worker);
  std::thread progress;
  if (count > 1 && isatty(STDERR_FILENO))
    progress = std::thread(show_progress, std::cref(done), count, verb, units);
  worker();
  for (std::thread& t : pool)
    t.join();
  if (progress.joinable()) progress.join();
}

}  // namespace tiers::cli
