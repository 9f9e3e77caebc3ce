// The HTML page of `tiers report` and `tiers check --html`: what is asked for, and writing it.
#pragma once

#include <cstddef>
#include <string>

#include "check_run.hpp"
#include "comparison.hpp"

namespace tiers::cli {

/// The page asked for, beyond what is checked.
struct html_request {
  std::string output;
  std::string title = "tiers report";
  std::string ref_tier, cand_tier;  ///< compared as in `tiers agree`, in each file
  comparison_options compare;
  std::string rate;  ///< --rate: what a step or collar in frames counts at, when a file has none
};

/// Files drawn at most; the problems of the rest are listed. A page of a few hundred hours of
/// dense tiers would be too heavy to open.
constexpr std::size_t html_drawn_files = 100;

/// Writes the page for what `run` found, atomically.
void write_html_page(const html_request& page, const check_run& run, const profile& p);

}  // namespace tiers::cli
