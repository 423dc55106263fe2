// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// `trimwright design JOB [--out DIR] [--family F] [--json]` and `trimwright demo [--out DIR]`:
/// the whole pipeline (design.md §7).

#include <string>

#include "cli/commands/command.hpp"

namespace trimwright::cli {

/// Options of `design`.
struct DesignCommandOptions {
  std::string job_path;
  std::string out_dir;      ///< empty: the job's [output] dir, relative to the job file
  std::string family;       ///< empty: the job's [fixture] family
  bool json = false;        ///< the report on stdout instead of the summary
  int plane = 1;            ///< which correction plane to build for (two-plane readings)
};

/// Register `design`.
void add_design_command(CLI::App& app, int& exit_code);
/// Register `demo`.
void add_demo_command(CLI::App& app, int& exit_code);

/// Run `design`; returns the exit code (1 when a check fails and is not accepted).
int run_design_command(const DesignCommandOptions& options);

}  // namespace trimwright::cli
