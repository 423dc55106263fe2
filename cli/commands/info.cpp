// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/info.hpp"

#include <CLI/CLI.hpp>
#include <fmt/core.h>

#include <filesystem>
#include <memory>

#include "cli/job.hpp"
#include "geom/base/error.hpp"
#include "geom/io/output_set.hpp"

namespace trimwright::cli {

void add_init_command(CLI::App& app, int& exit_code) {
  auto file = std::make_shared<std::string>();
  auto force = std::make_shared<bool>(false);
  CLI::App* sub = app.add_subcommand("init", "Write a commented job template (to FILE, or print it)");
  sub->add_option("file", *file, "Where to write the template (default: print it)");
  sub->add_flag("--force", *force, "Overwrite FILE if it exists");
  sub->callback([file, force, &exit_code] {
    if (file->empty()) {
      fmt::print("{}", job_template());
    } else {
      if (std::filesystem::exists(*file) && !*force)
        throw InputError(fmt::format("{}: exists; expected a new file name (or --force to overwrite)", *file));
      io::write_file_atomic(*file, job_template());
      fmt::print("wrote {}\n", *file);
    }
    exit_code = 0;
  });
}

void add_materials_command(CLI::App& app, int& exit_code) {
  CLI::App* sub = app.add_subcommand("materials", "List the built-in material presets");
  sub->callback([&exit_code] {
    fmt::print("{:<6} {:>8} {:>9} {:>8} {:>9}  {}\n", "name", "g/cm³", "tensile", "poisson", "max °C", "note");
    for (const auto& m : material_presets())
      fmt::print("{:<6} {:>8.2f} {:>5.0f} MPa {:>8.2f} {:>9.0f}  {}\n", m.name, m.density_g_cm3,
                 m.tensile_mpa, m.poisson, m.max_temp_c, m.note);
    fmt::print("\nTypical values for printed parts at 100 % infill; strength varies by brand and settings.\n"
               "For a filament of your own, add a [material] table with its maker's data.\n");
    exit_code = 0;
  });
}

}  // namespace trimwright::cli
