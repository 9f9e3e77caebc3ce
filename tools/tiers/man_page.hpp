// Manual pages in man(7) from the command line's definitions (interface.hpp) and the docs:
// tiers(1) and one page per command, tiers-check(1) …; written by tiers-man at build time.
#pragma once

#include <string>
#include <vector>

#include "interface.hpp"

namespace tiers::cli {

/// What the pages take from docs/: per command, the prose of its section of docs/cli.md and
/// the command lines of the docs' examples.
struct manual_sources {
  std::string cli_md;                    ///< docs/cli.md
  std::vector<std::string> other_pages;  ///< the other docs/*.md, in a fixed order
};

struct man_page {
  std::string name;  ///< "tiers-check"
  std::string text;  ///< the page, man(7)
};

/// Every page: tiers(1) first, then one per command of `spec`. `date` is the pages' date
/// (YYYY-MM-DD).
std::vector<man_page> manual_pages(const interface_spec& spec, const manual_sources& docs,
                                   const std::string& date);

/// Markdown prose (inline code, emphasis, links) as man(7) text: code and emphasis bold,
/// links by their text, characters beyond ASCII as \[uXXXX], lines starting with a dot or
/// quote guarded.
std::string roff_of_markdown(const std::string& text);

/// The command lines of `tiers COMMAND` in the fenced blocks of `markdown`: lines that start
/// with `$ tiers COMMAND` or `tiers COMMAND`, with their continuation lines.
std::vector<std::string> examples_of(const std::string& markdown, const std::string& command);

}  // namespace tiers::cli
