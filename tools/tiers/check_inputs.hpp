// Checking many files on a pool of threads.
#pragma once

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "check_run.hpp"
#include "dataset_inputs.hpp"
#include "tiers/check.hpp"

namespace tiers::cli {

/// What check_files does with each report as soon as it is made, so that a run over an
/// archive holds only what the summary and the dataset rules need: `render` (on the worker's
/// thread) turns a report into text and may shrink it; `write` gets those texts in the order
/// of the files.
struct report_stream {
  std::function<std::string(std::size_t, file_report&)> render;
  std::function<void(const std::string&)> write;
};

/// Checks every file (or, with `dataset`, every recording of it, `files` holding their ids) on
/// `jobs` threads (a progress bar on standard error when it is a
/// terminal) and returns the reports in the order of `files`; the files are compared with one
/// another (dataset rules) when `whole_dataset`. With `docs`, the documents of the first
/// `keep` files are kept there too (index for index; none for a file that could not be read),
/// for drawing them. With `stream`, each report goes through it first.
std::vector<file_report> check_files(const std::vector<std::string>& files, const check_options& o,
                                     const profile& p, const check_context& roles,
                                     bool whole_dataset,
                                     std::vector<std::optional<document>>* docs = nullptr,
                                     std::size_t keep = 0, const report_stream* stream = nullptr,
                                     const opened_dataset* dataset = nullptr);

}  // namespace tiers::cli
