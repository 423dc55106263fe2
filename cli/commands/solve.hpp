// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// `trimwright solve JOB [--json]`: readings to correction, residual and tolerance only, and
/// `trimwright grade --mass-kg M --rpm N [--grade G] [--json]`: the permissible residual
/// unbalance of ISO 21940-11 (design.md §7).

#include <string>

#include "cli/commands/command.hpp"

namespace trimwright::cli {

/// Register `solve`.
void add_solve_command(CLI::App& app, int& exit_code);
/// Register `grade`.
void add_grade_command(CLI::App& app, int& exit_code);

/// The JSON of `solve --json` (design.md §8) for a job with [readings].
std::string solve_json(const std::string& job_path);

}  // namespace trimwright::cli
