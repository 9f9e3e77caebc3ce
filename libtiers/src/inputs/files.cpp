// The files of the folders named, and work on many of them at once.
#include <algorithm>
#include <charconv>
#include <exception>
#include <filesystem>
#include <mutex>
#include <numeric>
#include <thread>
#include <unordered_set>

#include "tiers/inputs.hpp"

namespace tiers {

namespace fs = std::filesystem;

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

void run_parallel(std::size_t count, unsigned jobs, const std::function<void(std::size_t)>& work,
                  std::atomic<std::size_t>* done) {
  std::atomic<std::size_t> next{0};
  // What a call throws (a usage error found only once a document is read, say) must not end
  // the process from a worker thread: the first is kept, no further work is handed out, and it
  // is thrown again on the calling thread once every worker has stopped.
  std::mutex guard;
  std::exception_ptr failure;
  auto worker = [&] {
    for (std::size_t k; (k = next.fetch_add(1)) < count;) {
      try {
        work(k);
      } catch (...) {
        const std::lock_guard<std::mutex> lock(guard);
        if (!failure) failure = std::current_exception();
        next = count;
      }
      if (done) done->fetch_add(1);
    }
  };
  if (jobs == 0) jobs = std::max(1u, std::thread::hardware_concurrency());
  jobs = static_cast<unsigned>(std::min<std::size_t>(jobs, std::max<std::size_t>(count, 1)));
  std::vector<std::thread> pool;
  for (unsigned k = 1; k < jobs; ++k)
    pool.emplace_back(worker);
  worker();
  for (std::thread& t : pool)
    t.join();
  if (failure) std::rethrow_exception(failure);
}

std::vector<std::size_t> shard_places(const std::vector<std::string>& files,
                                      const std::string& spec) {
  const std::size_t slash = spec.find('/');
  unsigned long k = 0, n = 0;
  const char* end = spec.data() + spec.size();
  const bool ok = slash != std::string::npos &&
                  std::from_chars(spec.data(), spec.data() + slash, k).ptr == spec.data() + slash &&
                  std::from_chars(spec.data() + slash + 1, end, n).ptr == end && k >= 1 && n >= 1 &&
                  k <= n;
  if (!ok) throw usage_error("--shard: '" + spec + "' is not K/N with 1 <= K <= N, e.g. 3/8");
  std::vector<std::size_t> order(files.size());
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(),
                   [&](std::size_t a, std::size_t b) { return files[a] < files[b]; });
  std::vector<std::size_t> out;
  for (std::size_t i = k - 1; i < order.size(); i += n)
    out.push_back(order[i]);
  return out;
}

}  // namespace tiers
