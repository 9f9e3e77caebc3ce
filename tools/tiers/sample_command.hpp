// `tiers sample`: a sample of a machine tier's annotations for people to review, as a sheet and
// a review page, or (--plan) how many to review.
#pragma once

#include <CLI/CLI.hpp>
#include <cstdint>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "table_output.hpp"
#include "tiers/review.hpp"

namespace tiers::cli {

struct sample_options_cli : sample_settings {
  input_options input;
  std::vector<std::string> paths;
  std::string dataset;
  unsigned jobs = 0;
  std::string page;
  std::string title;
  bool plan = false;
  double margin = 0.05;
  double level = 0.95;
  double review_rate = 250;
  report_output out;
};

void setup_sample(CLI::App& app, int& status);
int run_sample(const sample_options_cli& options);

}  // namespace tiers::cli
