// `tiers estimate`: a machine tier's precision from a reviewed sample sheet.
#pragma once

#include <CLI/CLI.hpp>
#include <optional>
#include <string>
#include <vector>

#include "cli_common.hpp"
#include "table_output.hpp"

namespace tiers::cli {

struct estimate_options_cli {
  std::vector<std::string> sheets;
  double level = 0.95;
  std::optional<double> target_precision;
  std::string annotate;  ///< a document whose machine tier gets the estimate
  std::string to;
  bool allow_loss = false;
  input_options input;
  report_output out;
};

void setup_estimate(CLI::App& app, int& status);
int run_estimate(const estimate_options_cli& options);

}  // namespace tiers::cli
