// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// How a subcommand is wired: each `cli/commands/<name>.{hpp,cpp}` holds an options struct, an
/// `add_<name>_command(CLI::App&, int& exit_code)` that registers it, and a `run_<name>` that does
/// the work and returns the exit code (or throws a trimwright::Error, caught only in main).

namespace CLI {
class App;
}

namespace trimwright::cli {

/// Signature of every command's registration function. The command's callback stores its exit
/// code in `exit_code`.
using AddCommand = void (*)(CLI::App& app, int& exit_code);

}  // namespace trimwright::cli
