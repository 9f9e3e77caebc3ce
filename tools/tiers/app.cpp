#include "app.hpp"

#include <string>

#include "commands.hpp"
#include "tiers/version.hpp"

namespace tiers::cli {

void define_app(CLI::App& app, int& status) {
  app.description("Convert, check, merge, compare and re-time time-aligned annotation tiers");
  app.name("tiers");
  // What a bug report needs: the program's version and the libraries it runs with.
  app.set_version_flag("--version", "tiers " + std::string(tiers::version()) + "\nlibtiers " +
                                        std::string(tiers::version()) + " with " +
                                        tiers::dependency_versions());
  app.require_subcommand(1);
  app.fallthrough(false);
  for (auto setup : all_commands)
    setup(app, status);
}

}  // namespace tiers::cli
