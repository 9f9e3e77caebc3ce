// tiers-corpus: invented corpora of a chosen size, deterministic from a seed, for benchmarks and
// scale tests. Nothing here describes real people or programmes.
//
//   tiers-corpus --hours H [--seed S] --out DIR            one document of H hour-long
//                                                          programmes back to back, in every
//                                                          format, plus a per-frame signal
//   tiers-corpus --files N [--seed S] [--minutes M] --out DIR
//                                                          N files (JSON) of M minutes each
//                                                          (default 60), for batch and sharding
//                                                          runs; about one in fifty lacks its
//                                                          head-nod tier, as real datasets do
//   … --only FORMAT,…                                      only these files (vtt and ttml
//                                                          alone need only the captions)
#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <random>
#include <string>

#include "tiers/tiers.hpp"

namespace {

using namespace tiers;

const char* const vocabulary[] = {
    "the",        "we",      "and",    "a",       "to",      "of",   "in",      "our",
    "garden",     "street",  "share",  "water",   "seeds",   "beds", "spring",  "tools",
    "library",    "compost", "snails", "beans",   "lettuce", "rota", "evening", "meeting",
    "neighbours", "planted", "summer", "harvest", "fence",   "rain", "soil",    "together",
    "every",      "week",    "that",   "it",      "is",      "was",  "with",    "for"};
const char* const gestures[] = {"beat", "deictic", "iconic", "metaphoric"};
const char* const phases[] = {"prep", "stroke", "retract"};

constexpr time_ns ms = 1'000'000;
constexpr time_ns hour = 3600 * ns_per_second;

struct generator {
  std::mt19937_64 rng;
  explicit generator(std::uint64_t seed) : rng(seed) {}
  // A time between lo and hi, in whole milliseconds, as aligners and editors write them.
  time_ns between(time_ns lo, time_ns hi) {
    return std::uniform_int_distribution<time_ns>(lo / ms, hi / ms)(rng) * ms;
  }
  int count(int lo, int hi) { return std::uniform_int_distribution<int>(lo, hi)(rng); }
  double chance() { return std::uniform_real_distribution<double>(0, 1)(rng); }
  template <class T, std::size_t N>
  const char* pick(T (&a)[N]) {
    return a[std::uniform_int_distribution<std::size_t>(0, N - 1)(rng)];
  }
};

annotation span(time_ns start, time_ns end, std::string text) {
  annotation a;
  a.start = start;
  a.end = end;
  a.text = std::move(text);
  return a;
}

// One hour-long programme starting at `origin`: about 9,000 words at speech rate, about 1,200
// caption cues shown 2–6 s after their words, gestures with phases that partition them, head
// nods, and a machine gesture tier that mostly agrees with the human one.
void programme(generator& g, time_ns origin, document& doc, std::size_t& cue_id, int minutes) {
  const time_ns span_end = origin + hour / 60 * minutes;
  tier& captions = doc.tiers[0];
  tier& words = doc.tiers[1];
  tier& human = doc.tiers[2];
  tier& phase = doc.tiers[3];
  tier& nods = doc.tiers[4];
  tier& machine = doc.tiers[5];
  time_ns t = origin + 2 * ns_per_second;
  const time_ns lag = g.between(2000 * ms, 6000 * ms);
  while (t < span_end - 20 * ns_per_second) {
    const std::size_t first = words.annotations.size();
    const int n = g.count(5, 10);
    std::string line1, line2;
    for (int k = 0; k < n; ++k) {
      const time_ns d = g.between(180 * ms, 420 * ms);
      annotation w = span(t, t + d, g.pick(vocabulary));
      w.confidence = g.count(55, 99) / 100.0;
      (k < n / 2 ? line1 : line2) += (k == 0 || k == n / 2 ? "" : " ") + w.text;
      words.annotations.push_back(std::move(w));
      t += d + g.between(10 * ms, 60 * ms);
    }
    annotation c = span(words.annotations[first].start + lag, words.annotations.back().end + lag,
                        line1 + "\n" + line2 + ".");
    c.text[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(c.text[0])));
    c.id = "c" + std::to_string(++cue_id);
    c.attributes["speaker"] = g.chance() < 0.5 ? "Moderator" : "Guest";
    captions.annotations.push_back(std::move(c));
    t += g.between(300 * ms, 900 * ms);
  }
  for (time_ns s = origin + 5 * ns_per_second; s < span_end - 30 * ns_per_second;) {
    const time_ns length = g.between(600 * ms, 3000 * ms);
    const std::string label = g.pick(gestures);
    human.annotations.push_back(span(s, s + length, label));
    const time_ns a = s + length / 3, b = s + 2 * length / 3;
    phase.annotations.push_back(span(s, a, phases[0]));
    phase.annotations.push_back(span(a, b, phases[1]));
    phase.annotations.push_back(span(b, s + length, phases[2]));
    if (g.chance() < 0.9) {
      annotation m =
          span(s + g.between(-200 * ms, 200 * ms), s + length + g.between(-200 * ms, 200 * ms),
               g.chance() < 0.8 ? label : g.pick(gestures));
      m.confidence = g.count(30, 99) / 100.0;
      machine.annotations.push_back(std::move(m));
    }
    s += length + g.between(2 * ns_per_second, 8 * ns_per_second);
  }
  for (time_ns s = origin + 3 * ns_per_second; s < span_end; s += g.count(5, 25) * ns_per_second)
    nods.annotations.push_back(span(s, s, "nod"));
}

document corpus(generator& g, int hours, bool captions_only = false, int minutes = 60) {
  document doc;
  doc.media.uri = "programme.mp4";
  doc.media.duration = hours * hour / 60 * minutes;
  doc.media.frame_rate = rational{25, 1};
  doc.metadata["scenario"] =
      "invented benchmark corpus: neighbourhood meetings that never took place";
  const char* names[] = {"captions", "words", "gestures", "phases", "head-nods", "detector"};
  for (const char* n : names)
    doc.tiers.emplace_back().name = n;
  doc.tiers[0].source = tier_source{source_kind::human, "captioner", std::nullopt};
  doc.tiers[1].source = tier_source{source_kind::machine, "demo-aligner", "1.4"};
  doc.tiers[2].source = tier_source{source_kind::human, "annotator-1", std::nullopt};
  doc.tiers[2].vocabulary = std::vector<std::string>{"beat", "deictic", "iconic", "metaphoric"};
  doc.tiers[3].parent = parent_link{"gestures", relation::partition};
  doc.tiers[3].vocabulary = std::vector<std::string>{"prep", "stroke", "retract"};
  doc.tiers[4].kind = tier_kind::instant;
  doc.tiers[5].source = tier_source{source_kind::machine, "demo-gesture-detector", "0.3"};
  std::size_t cue_id = 0;
  for (int h = 0; h < hours; ++h) {
    programme(g, h * hour, doc, cue_id, minutes);
    if (captions_only)  // keeps a long caption-only corpus small in memory while it is made
      for (std::size_t t = 1; t < doc.tiers.size(); ++t)
        doc.tiers[t].annotations.clear();
  }
  return doc;
}

void write(const document& doc, const std::string& path, const char* fmt) {
  atomic_file out(path);
  find_format(fmt)->write(doc, out, {});
  out.commit();
}

// Per-frame scores at 25 fps: three detectors, high inside their invented events.
void write_signal(generator& g, int hours, const std::string& path) {
  atomic_file out(path);
  out.write("frame,person_visible,hands_moving,head_turn\n");
  const std::int64_t frames = static_cast<std::int64_t>(hours) * 3600 * 25;
  double level[3] = {0.9, 0.1, 0.1};
  char buf[96];
  for (std::int64_t f = 0; f < frames; ++f) {
    for (double& l : level)
      if (g.chance() < 0.01) l = l > 0.5 ? 0.1 : 0.85;
    const int n =
        std::snprintf(buf, sizeof buf, "%lld,%.3f,%.3f,%.3f\n", static_cast<long long>(f),
                      level[0] + 0.1 * (g.chance() - 0.5), level[1] + 0.1 * (g.chance() - 0.5),
                      level[2] + 0.1 * (g.chance() - 0.5));
    out.write(std::string_view(buf, static_cast<std::size_t>(n)));
  }
  out.commit();
}

int usage() {
  std::fprintf(stderr,
               "usage: tiers-corpus (--hours H | --files N [--minutes M]) [--seed S] [--only "
               "F,...] --out DIR\n");
  return 2;
}

}  // namespace

int main(int argc, char** argv) {
  int hours = 0, files = 0, minutes = 60;
  std::uint64_t seed = 1;
  std::string out, only;
  for (int k = 1; k + 1 < argc; k += 2) {
    const std::string opt = argv[k], value = argv[k + 1];
    if (opt == "--hours")
      hours = std::atoi(value.c_str());
    else if (opt == "--files")
      files = std::atoi(value.c_str());
    else if (opt == "--seed")
      seed = std::strtoull(value.c_str(), nullptr, 10);
    else if (opt == "--out")
      out = value;
    else if (opt == "--minutes")
      minutes = std::atoi(value.c_str());
    else if (opt == "--only")
      only = "," + value + ",";
    else
      return usage();
  }
  if (out.empty() || (hours <= 0) == (files <= 0) || minutes < 1 || minutes > 60) return usage();
  std::filesystem::create_directories(out);
  generator g(seed);
  try {
    if (files > 0) {
      for (int k = 0; k < files; ++k) {
        char name[64];
        std::snprintf(name, sizeof name, "/session-%05d.json", k);
        document doc = corpus(g, 1, false, minutes);
        if (g.chance() < 0.02)
          std::erase_if(doc.tiers, [](const tiers::tier& t) { return t.name == "head-nods"; });
        write(doc, out + name, "json");
      }
      return 0;
    }
    auto wanted = [&](const char* f) {
      return only.empty() || only.find("," + std::string(f) + ",") != std::string::npos;
    };
    const bool captions_only = !only.empty() && !wanted("json") && !wanted("tiers") &&
                               !wanted("csv") && !wanted("tsv") && !wanted("signal");
    const document doc = corpus(g, hours, captions_only);
    if (wanted("machine")) {  // the detector's tier alone, for merging with the human tiers
      document machine = doc;
      std::erase_if(machine.tiers, [](const tiers::tier& t) { return t.name != "detector"; });
      machine.tiers[0].name = "gestures";
      write(machine, out + "/corpus.machine.json", "json");
    }
    for (const char* fmt : {"json", "tiers", "csv", "tsv"})
      if (wanted(fmt)) write(doc, out + "/corpus." + fmt, fmt);
    document captions = doc;
    captions.tiers.resize(1);
    captions.tiers[0].name = "corpus";
    captions.metadata.clear();
    captions.media = {};
    if (wanted("vtt")) write(captions, out + "/corpus.vtt", "vtt");
    captions.tiers[0].name = "captions";
    if (wanted("ttml")) write(captions, out + "/corpus.ttml", "ttml");
    if (wanted("signal")) write_signal(g, hours, out + "/corpus.signal.csv");
  } catch (const tiers::error& e) {
    std::fprintf(stderr, "tiers-corpus: %s\n", e.what());
    return 1;
  }
  return 0;
}
