// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Informational commands: `init [FILE]` (a commented job template) and `materials`.

#include "cli/commands/command.hpp"

namespace trimwright::cli {

/// Register `init`.
void add_init_command(CLI::App& app, int& exit_code);
/// Register `materials`.
void add_materials_command(CLI::App& app, int& exit_code);

}  // namespace trimwright::cli
