// Entry point of the tiers tool: wires the subcommands and maps failures to exit statuses.
#include <csignal>
#include <cstdio>
#include <new>

#include "app.hpp"
#include "cli_common.hpp"
#include "tiers/io.hpp"

int main(int argc, char** argv) {
  using namespace tiers::cli;
  // A closed pipe (`tiers convert … | head`) is a write error we report, not a signal.
  std::signal(SIGPIPE, SIG_IGN);
  tiers::remove_partial_output_on_signals();

  CLI::App app;
  int status = exit_ok;  // set by the command that runs
  define_app(app, status);

  try {
    app.parse(argc, argv);
  } catch (const CLI::CallForHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForAllHelp& e) {
    return app.exit(e);
  } catch (const CLI::CallForVersion& e) {
    return app.exit(e);
  } catch (const CLI::ParseError& e) {
    std::fprintf(stderr,
                 "tiers: error: %s\nRun 'tiers --help' or 'tiers COMMAND --help' for usage.\n",
                 e.what());
    return exit_usage;
  } catch (const usage_error& e) {
    std::fprintf(stderr, "tiers: error: %s\n", e.what());
    return exit_usage;
  } catch (const rejected&) {
    return exit_rejected;
  } catch (const tiers::error& e) {
    report(e.diag());
    return exit_rejected;
  } catch (const std::bad_alloc&) {
    std::fprintf(stderr, "tiers: error: out of memory\n");
    return exit_rejected;
  }
  return status;
}
