// tiers-man: writes the manual pages of tiers (man(7)) from its command line's definitions and
// the docs, at build time.
//
//   tiers-man --docs DOCS_DIR --date YYYY-MM-DD -d OUT_DIR    writes OUT_DIR/tiers.1, …
#include <algorithm>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <stdexcept>
#include <string>
#include <vector>

#include "app.hpp"
#include "interface.hpp"
#include "man_page.hpp"
#include "tiers/io.hpp"

int main(int argc, char** argv) {
  namespace fs = std::filesystem;
  std::string docs, date, out;
  for (int i = 1; i + 1 < argc; i += 2) {
    const std::string opt = argv[i];
    (opt == "--docs" ? docs : opt == "--date" ? date : opt == "-d" ? out : docs) = argv[i + 1];
  }
  if (docs.empty() || date.empty() || out.empty()) {
    std::fprintf(stderr, "usage: tiers-man --docs DOCS_DIR --date YYYY-MM-DD -d OUT_DIR\n");
    return 2;
  }
  try {
    CLI::App app;
    int status = 0;
    tiers::cli::define_app(app, status);
    tiers::cli::manual_sources sources{tiers::read_input((fs::path(docs) / "cli.md").string()), {}};
    std::vector<fs::path> pages;
    for (const fs::directory_entry& e : fs::directory_iterator(docs))
      if (e.path().extension() == ".md" && e.path().filename() != "cli.md")
        pages.push_back(e.path());
    std::sort(pages.begin(), pages.end());
    for (const fs::path& p : pages)
      sources.other_pages.push_back(tiers::read_input(p.string()));
    fs::create_directories(out);
    for (const tiers::cli::man_page& page :
         tiers::cli::manual_pages(tiers::cli::describe(app), sources, date)) {
      std::ofstream file(fs::path(out) / (page.name + ".1"), std::ios::binary);
      file << page.text;
      if (!file.flush()) throw std::runtime_error("cannot write " + page.name + ".1");
    }
  } catch (const std::exception& e) {
    std::fprintf(stderr, "tiers-man: error: %s\n", e.what());
    return 1;
  }
  return 0;
}
