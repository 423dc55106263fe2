// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// `trimwright check FILE.stl|FILE.3mf|JOB [--json]`: mesh validity of any STL or 3MF, or a job's
/// design checks, without writing anything (design.md §7).

#include <string>

#include "cli/commands/command.hpp"

namespace trimwright::cli {

/// Options of `check`.
struct CheckCommandOptions {
  std::string path;
  bool json = false;
};

/// Register `check`.
void add_check_command(CLI::App& app, int& exit_code);

/// Run `check`; 0 when every mesh is valid or every check passes (or is accepted), else 1.
int run_check_command(const CheckCommandOptions& options);

}  // namespace trimwright::cli
