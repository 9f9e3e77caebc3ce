// `tiers report`: one HTML page that draws files' tiers as lanes on a time axis, with the
// problems a check finds, the captions' lag and where two tiers agree. `tiers check --html`
// writes the same page.
#pragma once

#include <CLI/CLI.hpp>
#include <cstddef>
#include <memory>
#include <string>

#include "agree_command.hpp"
#include "check_command.hpp"

namespace tiers::cli {

/// The page asked for, beyond what is checked.
struct html_request {
  std::string output;
  std::string title = "tiers report";
  std::string ref_tier, cand_tier;  ///< compared as in `tiers agree`, in each file
  comparison_options compare;
};

struct report_options {
  check_options check;  ///< the files, profile, roles and reading options
  html_request page;
};

/// Files drawn at most; the problems of the rest are listed. A page of a few hundred hours of
/// dense tiers would be too heavy to open.
constexpr std::size_t html_drawn_files = 100;

/// Writes the page for what `run` found, atomically.
void write_html_page(const html_request& page, const check_run& run, const profile& p);

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_report(CLI::App& app, int& status);
int run_report(const report_options& options);

}  // namespace tiers::cli
