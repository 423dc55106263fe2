// SPDX-License-Identifier: GPL-3.0-or-later
// trimwright's entry point: parses the command line and maps errors to exit codes (design.md §7).
// This is the only place that catches.
#include <CLI/CLI.hpp>
#include <fmt/core.h>

#include <exception>
#include <new>

#include "cli/commands/registry.hpp"
#include "geom/base/error.hpp"

int main(int argc, char** argv) {
  using trimwright::ExitCode;
  CLI::App app{
      "trimwright: printed adjustable counterweights for balancing small rotors.\n"
      "Turns a correction or vibration readings into a sized, checked part (STL, 3MF),\n"
      "a setting chart and a report."};
  app.set_version_flag("--version", std::string("trimwright ") + TRIMWRIGHT_VERSION);
  app.require_subcommand(1);
  int exit_code = 0;
  for (auto add : trimwright::cli::all_commands()) add(app, exit_code);
  try {
    app.parse(argc, argv);
  } catch (const CLI::Success& e) {
    return app.exit(e);
  } catch (const CLI::ParseError& e) {
    // CLI11 prints usage problems itself; exit 2 for any bad command line (design.md §7).
    app.exit(e);
    return static_cast<int>(ExitCode::kBadInput);
  } catch (const trimwright::Error& e) {
    fmt::print(stderr, "trimwright: {}\n", e.what());
    return static_cast<int>(e.code());
  } catch (const std::bad_alloc&) {
    fmt::print(stderr, "trimwright: out of memory\n");
    return static_cast<int>(ExitCode::kCannotMeet);
  } catch (const std::exception& e) {
    fmt::print(stderr, "trimwright: internal error: {} (please report this)\n", e.what());
    return static_cast<int>(ExitCode::kCannotMeet);
  }
  return exit_code;
}
