// tiers-bench: times reading a file, and writing it in a format, inside one process; prints one
// JSON object with the bytes, annotations, seconds of each phase and the peak resident memory.
// With --stream, the file is streamed (format::stream) to a handler that counts annotations and
// keeps nothing: the reader's own speed, without building a document. With --cooccur, the
// document is read and then tier A is counted against tier B (tiers cooccur's counting, one
// thread): its seconds after reading and the A annotations a second.
//
//   tiers-bench FILE [FORMAT OUT]
//   tiers-bench --stream FILE
//   tiers-bench --cooccur FILE A B
//   tiers-bench --sample FILE TIER   (tiers sample's draw of 500 in four confidence bands)
#include <sys/resource.h>

#include <chrono>
#include <cstdio>
#include <optional>
#include <string>

#include "tiers/tiers.hpp"

namespace {

struct counter final : tiers::document_handler {
  std::size_t annotations = 0;
  bool begin_document(const tiers::document&) override { return true; }
  bool begin_tier(const tiers::tier&) override { return true; }
  bool add(const tiers::annotation&) override { return ++annotations, true; }
  bool end_tier() override { return true; }
  bool end_document() override { return true; }
};

void print(std::size_t bytes, std::size_t annotations, double read, double write) {
  rusage usage{};
  getrusage(RUSAGE_SELF, &usage);
  std::printf(
      "{\"bytes\": %zu, \"annotations\": %zu, \"read_seconds\": %.6f, "
      "\"write_seconds\": %.6f, \"peak_rss_bytes\": %lld}\n",
      bytes, annotations, read, write, static_cast<long long>(usage.ru_maxrss) * 1024);
}

int stream(const char* path) {
  using clock = std::chrono::steady_clock;
  const auto t0 = clock::now();
  const std::string text = tiers::read_input(path);
  const tiers::format* fmt = tiers::format_for_path(path);
  if (!fmt || !fmt->stream) {
    std::fprintf(stderr, "tiers-bench: %s does not stream\n", path);
    return 2;
  }
  tiers::read_options options;
  options.tier_name = "corpus";
  counter count;
  const tiers::stream_result r = tiers::stream_document(text, *fmt, options, count, path);
  if (r.status != tiers::stream_status::done || !r.ok()) {
    std::fprintf(stderr, "tiers-bench: %s was not streamed\n", path);
    return 1;
  }
  print(text.size(), count.annotations, std::chrono::duration<double>(clock::now() - t0).count(),
        0);
  return 0;
}

// The document at `path`, read whole; null (said why) when it lacks a tier of `names`.
std::optional<tiers::document> read_with(const char* path,
                                         std::initializer_list<std::string> names) {
  const std::string text = tiers::read_input(path);
  const tiers::format* fmt = tiers::format_for_path(path);
  if (!fmt) return std::nullopt;
  tiers::read_result r = tiers::read_document(text, *fmt, {}, path);
  for (const std::string& name : names)
    if (!r.ok() || !tiers::find_tier(r.value, name)) {
      std::fprintf(stderr, "tiers-bench: %s has no tier %s\n", path, name.c_str());
      return std::nullopt;
    }
  return std::move(r.value);
}

// `tiers sample`'s draw over one tier after reading: four confidence bands, 500 drawn.
int sample(const char* path, const std::string& name) {
  using clock = std::chrono::steady_clock;
  const std::optional<tiers::document> doc = read_with(path, {name});
  if (!doc) return 1;
  const tiers::tier& t = *tiers::find_tier(*doc, name);
  tiers::sample_options o;
  o.n = 500;
  o.by = tiers::stratify_by::confidence;
  o.bands = {0.5, 0.7, 0.9};
  const auto t0 = clock::now();
  tiers::sampler s(o);
  s.add(path, t, {"media.webm", "media.webm"});
  const std::size_t drawn = s.draw().size();
  const double seconds = std::chrono::duration<double>(clock::now() - t0).count();
  std::printf("{\"annotations\": %zu, \"drawn\": %zu, \"sample_seconds\": %.6f}\n",
              t.annotations.size(), drawn, seconds);
  return 0;
}

int cooccur(const char* path, const std::string& a, const std::string& b) {
  using clock = std::chrono::steady_clock;
  const std::optional<tiers::document> doc = read_with(path, {a, b});
  if (!doc) return 1;
  const tiers::tier* ta = tiers::find_tier(*doc, a);
  const tiers::tier* tb = tiers::find_tier(*doc, b);
  const auto t0 = clock::now();
  tiers::cooccur_counts counts;
  counts.add(*ta, *tb, {});
  const double seconds = std::chrono::duration<double>(clock::now() - t0).count();
  std::printf("{\"annotations\": %llu, \"pairs\": %zu, \"count_seconds\": %.6f}\n",
              static_cast<unsigned long long>(counts.n()), counts.pairs().size(), seconds);
  return 0;
}

}  // namespace

int main(int argc, char** argv) {
  using clock = std::chrono::steady_clock;
  if (argc == 5 && std::string(argv[1]) == "--cooccur") {
    try {
      return cooccur(argv[2], argv[3], argv[4]);
    } catch (const tiers::error& e) {
      std::fprintf(stderr, "tiers-bench: %s\n", e.what());
      return 1;
    }
  }
  if (argc == 4 && std::string(argv[1]) == "--sample") {
    try {
      return sample(argv[2], argv[3]);
    } catch (const tiers::error& e) {
      std::fprintf(stderr, "tiers-bench: %s\n", e.what());
      return 1;
    }
  }
  if (argc == 3 && std::string(argv[1]) == "--stream") {
    try {
      return stream(argv[2]);
    } catch (const tiers::error& e) {
      std::fprintf(stderr, "tiers-bench: %s\n", e.what());
      return 1;
    }
  }
  if (argc != 2 && argc != 4) {
    std::fprintf(stderr,
                 "usage: tiers-bench FILE [FORMAT OUT] | --stream FILE | --cooccur FILE A B | "
                 "--sample FILE TIER\n");
    return 2;
  }
  try {
    const auto t0 = clock::now();
    const std::string text = tiers::read_input(argv[1]);
    const tiers::format* fmt = tiers::format_for_path(argv[1]);
    if (!fmt) {
      std::fprintf(stderr, "tiers-bench: no format for %s\n", argv[1]);
      return 2;
    }
    tiers::read_options options;
    options.tier_name = "corpus";
    tiers::read_result r = tiers::read_document(text, *fmt, options, argv[1]);
    const auto t1 = clock::now();
    if (!r.ok()) {
      std::fprintf(stderr, "tiers-bench: %s\n", tiers::format_diagnostic(r.diagnostics[0]).c_str());
      return 1;
    }
    std::size_t annotations = 0;
    for (const tiers::tier& t : r.value.tiers)
      annotations += t.annotations.size();
    double write_seconds = 0;
    if (argc == 4) {
      const auto t2 = clock::now();
      tiers::atomic_file out(argv[3]);
      tiers::find_format(argv[2])->write(r.value, out, {});
      out.commit();
      write_seconds = std::chrono::duration<double>(clock::now() - t2).count();
    }
    print(text.size(), annotations, std::chrono::duration<double>(t1 - t0).count(), write_seconds);
  } catch (const tiers::error& e) {
    std::fprintf(stderr, "tiers-bench: %s\n", e.what());
    return 1;
  }
  return 0;
}
