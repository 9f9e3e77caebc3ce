// Every subcommand of tiers, in the order `tiers --help` lists them. Each lives in its own
// `*_command.{hpp,cpp}` pair, whose setup function owns its options and registers its run:
// adding a command adds its file pair and one declaration and one row here.
#pragma once

#include <CLI/CLI.hpp>

namespace tiers::cli {

void setup_convert(CLI::App& app, int& status);
void setup_info(CLI::App& app, int& status);
void setup_check(CLI::App& app, int& status);
void setup_merge(CLI::App& app, int& status);
void setup_agree(CLI::App& app, int& status);
void setup_cooccur(CLI::App& app, int& status);
void setup_sample(CLI::App& app, int& status);
void setup_estimate(CLI::App& app, int& status);
void setup_derive(CLI::App& app, int& status);
void setup_retime(CLI::App& app, int& status);
void setup_edit(CLI::App& app, int& status);
void setup_report(CLI::App& app, int& status);
void setup_dataset(CLI::App& app, int& status);
void setup_completion(CLI::App& app, int& status);

inline constexpr void (*all_commands[])(CLI::App&, int&) = {
    setup_convert, setup_info,   setup_check,    setup_merge,      setup_agree,
    setup_cooccur, setup_sample, setup_estimate, setup_derive,     setup_retime,
    setup_edit,    setup_report, setup_dataset,  setup_completion,
};

}  // namespace tiers::cli
