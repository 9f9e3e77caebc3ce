// `tiers report`: one HTML page that draws files' tiers as lanes on a time axis, with the
// problems a check finds, the captions' lag and where two tiers agree. `tiers check --html`
// writes the same page.
#pragma once

#include <CLI/CLI.hpp>
#include <cstddef>
#include <memory>
#include <string>

#include "check_run.hpp"
#include "html_page.hpp"

namespace tiers::cli {

struct report_options {
  check_options check;  ///< the files, profile, roles and reading options
  html_request page;
  std::string output_dir;  ///< with --dataset: a page per recording and an index
};

/// Adds the subcommand to `app` with its options; when it is the one given, it runs after
/// parsing and its exit status lands in `status`.
void setup_report(CLI::App& app, int& status);
int run_report(const report_options& options);

}  // namespace tiers::cli
