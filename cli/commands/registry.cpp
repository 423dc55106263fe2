// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/registry.hpp"

// One include and one list entry per command.
#include "cli/commands/design.hpp"
#include "cli/commands/info.hpp"
#include "cli/commands/listen.hpp"

namespace trimwright::cli {

const std::vector<AddCommand>& all_commands() {
  static const std::vector<AddCommand> commands = {
      &add_demo_command,
      &add_design_command,
      &add_init_command,
      &add_materials_command,
      &add_listen_command,
  };
  return commands;
}

}  // namespace trimwright::cli
