// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// `trimwright inserts [--json]`: the metal insert catalogue with masses and pocket sizes.

#include <string>

#include "cli/commands/command.hpp"

namespace trimwright::cli {

/// Register `inserts`.
void add_inserts_command(CLI::App& app, int& exit_code);

/// The catalogue as a table for people (`json` false) or as a JSON array of
/// {"name", "kind", "mass_g", "width_mm", "height_mm", "hole_mm", "density_g_cm3", "description"}.
std::string inserts_listing(bool json);

}  // namespace trimwright::cli
