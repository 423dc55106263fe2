// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/inserts.hpp"

#include <CLI/CLI.hpp>
#include <fmt/core.h>

#include <memory>
#include <nlohmann/json.hpp>

#include "geom/fixture/inserts.hpp"

namespace trimwright::cli {
namespace {

const char* shape_name(fixture::InsertShape s) {
  switch (s) {
    case fixture::InsertShape::kBall: return "ball";
    case fixture::InsertShape::kHexNut: return "hex-nut";
    case fixture::InsertShape::kWasher: return "washer";
    case fixture::InsertShape::kWeighed: return "weighed";
  }
  return "?";
}

}  // namespace

std::string inserts_listing(bool json) {
  const auto& list = fixture::insert_catalogue();
  if (json) {
    nlohmann::ordered_json a = nlohmann::ordered_json::array();
    for (const auto& k : list)
      a.push_back({{"name", k.name}, {"kind", shape_name(k.shape)}, {"mass_g", k.mass_g},
                   {"width_mm", k.width_mm}, {"height_mm", k.height_mm}, {"hole_mm", k.hole_mm},
                   {"density_g_cm3", k.density_g_cm3}, {"description", k.description}});
    return a.dump(2) + "\n";
  }
  std::string out = fmt::format("{:<11} {:>8} {:>9} {:>9}  {}\n", "name", "mass g", "width mm", "height mm", "what");
  for (const auto& k : list)
    out += fmt::format("{:<11} {:>8.4f} {:>9.2f} {:>9.2f}  {}\n", k.name, k.mass_g, k.width_mm, k.height_mm,
                       k.description);
  out += "\nwidth: ball diameter, nut across flats, washer outside diameter; height as it lies in the part.\n"
         "Masses from nominal sizes (nuts: hexagon prism less the thread, sharp corners, a few % heavy).\n"
         "Weigh your own part and name it as weighed:GRAMS:DIAMETERxHEIGHT, e.g. inserts = \"weighed:3.2:10x4\".\n"
         "Pockets are closed by printing over them: the report gives the layer to pause at.\n";
  return out;
}

void add_inserts_command(CLI::App& app, int& exit_code) {
  auto json = std::make_shared<bool>(false);
  CLI::App* sub = app.add_subcommand("inserts", "List the metal inserts a fixture can hold, with their masses");
  sub->add_flag("--json", *json, "Print the catalogue as JSON");
  sub->callback([json, &exit_code] {
    fmt::print("{}", inserts_listing(*json));
    exit_code = 0;
  });
}

}  // namespace trimwright::cli
