// SPDX-License-Identifier: GPL-3.0-or-later
// The built-in demo job, the `init` template and the material presets.
#include "cli/job.hpp"

namespace trimwright::cli {

const std::vector<MaterialSpec>& material_presets() {
  // Densities: typical filament values (references.md, "Printing plastics"). Strengths: printed
  // in-plane tensile strength is roughly 30–60 MPa and varies by brand and settings; the values
  // below sit at the cautious end of that range (our own choice). Service limits: a little below
  // the softening temperatures listed there. Use a [material] table with the filament maker's
  // data for anything better.
  static const std::vector<MaterialSpec> presets = {
      {"PLA", 1.24, 40, 0.35, 50, "softens at 50–60 °C and creeps under load; not for warm machines"},
      {"PETG", 1.27, 35, 0.35, 65, "softens near 70 °C; tough; a good default"},
      {"ABS", 1.04, 30, 0.35, 85, "softens near 95 °C; light, so parts are larger"},
      {"ASA", 1.07, 30, 0.35, 85, "softens near 95 °C; like ABS, weather resistant"},
      {"PA12", 1.02, 35, 0.35, 80, "nylon; tough; absorbs water, which changes its mass"},
      {"PC", 1.20, 45, 0.35, 105, "softens near 115 °C; strong; needs a hot printer"},
  };
  return presets;
}

const std::string& demo_job_text() {
  // Our own sample scenario: a 150 mm wheel on a 5/8-inch bench-grinder spindle.
  static const std::string text = R"(# trimwright demo: a 150 mm grinding wheel on a 5/8-inch bench-grinder spindle.
title = "Demo 150 mm wheel"

[machine]
speed_rpm = 3450
rotation = "ccw"
spindle_diameter_mm = 15.875
free_thread_mm = 20
nut_height_mm = 9.5
flange_diameter_mm = 63.5
max_fixture_diameter_mm = 100

[rotor]
kind = "grinding-wheel"
diameter_mm = 150
width_mm = 20
bore_mm = 15.875
mass_kg = 0.72
max_speed_rpm = 4140

[correction]
unbalance_gmm = 75
angle_deg = 212

[fixture]
family = "slide-disc"
mount = "outboard"
material = "PETG"
max_diameter_mm = 80
max_thickness_mm = 6
margin = 1.5

[print]
nozzle_mm = 0.4
layer_mm = 0.2
clearance_mm = 0.2

[target]
grade = "G6.3"
)";
  return text;
}

std::string job_template() {
  return R"(# trimwright job file. Units are in the key names: _mm, _g, _kg, _gmm, _rpm, _deg.
# Angles count from the rotor's reference mark (a pen mark, or the mark the phase sensor sees).
# Run:  trimwright design THIS_FILE --out out
title = "My wheel"                 # names the output files
# include = "shop-grinder.toml"    # a shared machine file; keys here override it

[machine]
speed_rpm = 3450                   # running speed
rotation = "ccw"                   # cw | ccw, seen facing the side the fixture goes on
spindle_diameter_mm = 15.875       # 5/8 inch
free_thread_mm = 20                # thread left past the wheel's own nut, tightened
nut_height_mm = 9.5                # the nut that will hold the fixture (default 0.8 × spindle)
flange_diameter_mm = 63.5          # outer flange
max_fixture_diameter_mm = 100      # room inside the guard, clear of the work

[rotor]
kind = "grinding-wheel"            # grinding-wheel | buffing-wheel | pulley | fan | faceplate | other
diameter_mm = 150
width_mm = 20
bore_mm = 15.875
mass_kg = 0.72
max_speed_rpm = 4140               # as marked on the wheel: never run above it
bore_clearance_mm = 0.0            # measured radial slop of the bore on the spindle

[correction]                       # a known correction: add this much unbalance at this angle
unbalance_gmm = 75                 # or: mass_g = 1.25 with radius_mm = 60
angle_deg = 212
# angles = "against-rotation"      # against-rotation (default) | with-rotation

# Instead of [correction], give readings and let trimwright solve (see docs/solver.md):
# [readings]
# method = "trial"                 # trial | four-run | two-plane | fit | static | index
# units = "mm/s-pk"
# phase = "lag"                    # lag | lead
# angles = "against-rotation"
# correction_radius_mm = 60
# [[readings.run]]
# name = "as found"
# amplitude = 2.4
# phase_deg = 318
# [[readings.run]]
# name = "trial at mark"
# amplitude = 1.6
# phase_deg = 265
# trial = [{ plane = 1, mass_g = 0.5, radius_mm = 60, angle_deg = 0 }]

[fixture]
family = "slide-disc"              # slide-disc | disc-pair | clamp-weights | bore-sleeve | auto
mount = "outboard"                 # outboard (its own nut) | under-nut
material = "PETG"                  # see `trimwright materials`, or add a [material] table
max_diameter_mm = 80               # default: machine.max_fixture_diameter_mm
max_thickness_mm = 6
margin = 1.5                       # reachable range / needed correction
# inserts = "nut-M5"               # metal in closed pockets (see `trimwright inserts`)
# rim_diameter_mm = 80             # clamp-weights: the rim they clip onto ...
# rim_thickness_mm = 4             # ... and its thickness
# positions_deg = [0, 60, 120]     # clamp-weights: only these places on the rim (a split)
# sized_for_gmm = 75               # a fixture already printed: keep its parts (from report.json)

[print]
nozzle_mm = 0.4
layer_mm = 0.2
infill_percent = 100
clearance_mm = 0.2                 # added to mating diameters

[target]
grade = "G6.3"                     # ISO 21940-11 balance grade

[checks]
accept = []                        # failed checks you knowingly accept (never "speed")

[output]
dir = "out"
formats = ["stl", "3mf", "pdf", "svg", "png", "csv", "json"]
paper = "a4"                       # a4 | letter
png_dpi = 100                      # chart.png resolution (a preview; print the PDF)
)";
}

}  // namespace trimwright::cli
