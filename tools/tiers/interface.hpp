// The command line's definitions (CLI11's) as plain data, for the generators that must say what
// `tiers --help` says: the manual pages (tiers-man) and the shell completion (`tiers
// completion`).
#pragma once

#include <CLI/CLI.hpp>
#include <string>
#include <vector>

namespace tiers::cli {

/// What an option's value is, for completion: none (a flag), a file name, a folder, or another
/// value (whose words, when it has a few, are the option's `choices`).
enum class value_kind { none, file, folder, other };

struct option_spec {
  std::vector<std::string> longs;   ///< "--profile", without other spellings' dashes
  std::vector<std::string> shorts;  ///< "-o"
  std::string value;  ///< the value's name in --help: FILE, N, FORMAT; empty for flags
  /// The values it accepts when it checks for a few (CLI::IsMember), else the library's names
  /// for a FORMAT or PROFILE (which a PROFILE file may stand in for).
  std::vector<std::string> choices;
  value_kind kind = value_kind::none;
  bool positional = false;
  bool repeatable = false;
  bool required = false;
  std::string help;
  std::string default_value;  ///< only when the definition records one

  /// Every spelling, short ones first: {"-o", "--output"}.
  std::vector<std::string> names() const;
};

struct command_spec {
  std::string name;  ///< "check"; "tiers" for the program itself
  std::string help;
  std::vector<option_spec> options;  ///< in the order --help lists them, --help first
};

struct interface_spec {
  command_spec program;                ///< tiers' own options (--help, --version)
  std::vector<command_spec> commands;  ///< in the order --help lists them
};

/// The definitions of `app` (as define_app sets it up), as data.
interface_spec describe(const CLI::App& app);

/// The words a value named FORMAT (or F) or PROFILE can be, from the library: the registry's
/// formats, the built-in profiles. Empty for any other name.
std::vector<std::string> known_values(const std::string& value_name);

}  // namespace tiers::cli
