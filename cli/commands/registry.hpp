// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// The list of subcommands main registers.

#include <vector>

#include "cli/commands/command.hpp"

namespace trimwright::cli {

/// Every subcommand's registration function, in the order `--help` lists them.
const std::vector<AddCommand>& all_commands();

}  // namespace trimwright::cli
