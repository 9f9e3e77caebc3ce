// Entry point of the tiers tool: wires the subcommands and maps failures to exit statuses.
#include <csignal>
#include <cstdio>
#include <new>

#include "agree_command.hpp"
#include "check_command.hpp"
#include "cli_common.hpp"
#include "convert_command.hpp"
#include "derive_command.hpp"
#include "edit_command.hpp"
#include "info_command.hpp"
#include "merge_command.hpp"
#include "report_command.hpp"
#include "retime_command.hpp"
#include "tiers/io.hpp"
#include "tiers/version.hpp"

int main(int argc, char** argv) {
  using namespace tiers::cli;
  // A closed pipe (`tiers convert … | head`) is a write error we report, not a signal.
  std::signal(SIGPIPE, SIG_IGN);
  tiers::remove_partial_output_on_signals();

  CLI::App app("Convert, check, merge, compare and re-time time-aligned annotation tiers", "tiers");
  app.set_version_flag("--version", std::string(tiers::version()));
  app.require_subcommand(1);
  app.fallthrough(false);
  convert_options convert;
  info_options info;
  check_options check;
  merge_options merge;
  agree_options agree;
  derive_options_cli derive;
  retime_options_cli retime;
  edit_options edit;
  report_options report_opts;
  const CLI::App* convert_cmd = setup_convert(app, convert);
  const CLI::App* info_cmd = setup_info(app, info);
  const CLI::App* check_cmd = setup_check(app, check);
  const CLI::App* merge_cmd = setup_merge(app, merge);
  const CLI::App* agree_cmd = setup_agree(app, agree);
  const CLI::App* derive_cmd = setup_derive(app, derive);
  const CLI::App* retime_cmd = setup_retime(app, retime);
  const CLI::App* edit_cmd = setup_edit(app, edit);
  const CLI::App* report_cmd = setup_report(app, report_opts);

  try {
    app.parse(argc, argv);
    if (convert_cmd->parsed()) return run_convert(convert);
    if (info_cmd->parsed()) return run_info(info);
    if (check_cmd->parsed()) return run_check(check);
    if (merge_cmd->parsed()) return run_merge(merge);
    if (agree_cmd->parsed()) return run_agree(agree);
    if (derive_cmd->parsed()) return run_derive(derive);
    if (retime_cmd->parsed()) return run_retime(retime);
    if (edit_cmd->parsed()) return run_edit(edit);
    if (report_cmd->parsed()) return run_report(report_opts);
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
  return exit_ok;
}
