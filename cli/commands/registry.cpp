// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/registry.hpp"

// One include and one list entry per command.

namespace trimwright::cli {

const std::vector<AddCommand>& all_commands() {
  static const std::vector<AddCommand> commands = {
  };
  return commands;
}

}  // namespace trimwright::cli
