// `tiers sample`: a sample of a machine tier's annotations for people to review, as a sheet and
// a review page, or (--plan) how many to review.
#pragma once

#include <CLI/CLI.hpp>
#include <cstdint>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "table_output.hpp"

namespace tiers::cli {

struct sample_options_cli {
  input_options input;
  std::vector<std::string> paths;
  std::string dataset;
  unsigned jobs = 0;
  std::string tier;
  std::uint64_t n = 0;
  std::uint64_t seed = 1;
  std::string strata;  ///< confidence limits: 0.5,0.7,0.9
  std::string by;      ///< confidence, label or file
  std::string allocation = "proportional";
  std::string context = "0";
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

/// A confidence level from (0, 1), or usage_error naming `option`.
void check_level(const char* option, double level);

}  // namespace tiers::cli
