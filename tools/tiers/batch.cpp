// Running work on a pool of threads, with a progress bar on terminals.
#include "batch.hpp"

#include <unistd.h>

#include <atomic>
#include <chrono>
#include <cstdio>
#include <thread>

#include "tiers/format.hpp"

namespace tiers::cli {

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
  std::atomic<std::size_t> done{0};
  std::thread progress;
  if (count > 1 && isatty(STDERR_FILENO))
    progress = std::thread(show_progress, std::cref(done), count, verb, units);
  try {
    tiers::run_parallel(count, jobs, work, &done);
  } catch (...) {
    done = count;  // the bar stops when all are done: the rest will not be
    if (progress.joinable()) progress.join();
    throw;
  }
  if (progress.joinable()) progress.join();
}

}  // namespace tiers::cli
