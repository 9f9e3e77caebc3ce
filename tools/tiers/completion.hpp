// Shell completion for bash, zsh and fish, written from the command line's own definitions
// (interface.hpp): `tiers completion SHELL` prints it, the build installs it.
#pragma once

#include <string>

#include "interface.hpp"

namespace tiers::cli {

std::string bash_completion(const interface_spec& spec);
std::string zsh_completion(const interface_spec& spec);
std::string fish_completion(const interface_spec& spec);

/// A help text cut to its first clause, for the one-line descriptions shells show.
std::string short_help(const std::string& help);

}  // namespace tiers::cli
