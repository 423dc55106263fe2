// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// `trimwright chart JOB --weighed PART=GRAMS … [--out DIR]`: redo the settings, card and report
/// with the printed parts' weighed masses (the centroid still comes from the geometry).

#include <string>
#include <vector>

#include "cli/commands/command.hpp"

namespace trimwright::cli {

/// Options of `chart`.
struct ChartCommandOptions {
  std::string job_path;
  std::vector<std::string> weighed;  ///< "PART=GRAMS"
  std::string out_dir;
  bool json = false;
};

/// Register `chart`.
void add_chart_command(CLI::App& app, int& exit_code);

/// Run `chart`; returns the exit code.
int run_chart_command(const ChartCommandOptions& options);

/// Parse "PART=GRAMS" (grams a finite number > 0). Throws InputError naming the option.
std::pair<std::string, double> parse_weighed(const std::string& text);

}  // namespace trimwright::cli
