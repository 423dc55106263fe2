// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/registry.hpp"

// One include and one list entry per command.
#include "cli/commands/chart.hpp"
#include "cli/commands/check.hpp"
#include "cli/commands/design.hpp"
#include "cli/commands/info.hpp"
#include "cli/commands/inserts.hpp"
#include "cli/commands/solve.hpp"
#include "cli/commands/listen.hpp"

namespace trimwright::cli {

const std::vector<AddCommand>& all_commands() {
  static const std::vector<AddCommand> commands = {
      &add_demo_command,
      &add_design_command,
      &add_solve_command,
      &add_grade_command,
      &add_chart_command,
      &add_check_command,
      &add_init_command,
      &add_materials_command,
      &add_inserts_command,
      &add_listen_command,
  };
  return commands;
}

}  // namespace trimwright::cli
