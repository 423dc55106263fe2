// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Safety and printability checks (design.md §6). Each returns a value, a limit, a verdict and a
/// one-line note; a failed check stops `design` (exit 1) unless the job accepts it by name.

#include <optional>
#include <string>
#include <vector>

#include "geom/fixture/fixture.hpp"

namespace trimwright::check {

/// The result of one check.
struct CheckResult {
  std::string name;        ///< stable identifier, used in [checks] accept, e.g. "disc-stress"
  double value = 0;        ///< what was found, in `unit`
  double limit = 0;        ///< what is allowed, in `unit`
  std::string unit;        ///< e.g. "MPa", "rpm", "mm"
  bool at_least = false;   ///< false: value must be ≤ limit; true: value must be ≥ limit
  bool ok = true;          ///< verdict
  bool acceptable = true;  ///< false: no job may accept this failure (e.g. over the marked speed)
  bool accepted = false;   ///< failed, but the job lists it under [checks] accept
  std::string note;        ///< one line: what was compared, and on failure what would fix it
};

/// The material of the printed parts.
struct Material {
  std::string name;
  double density_g_cm3 = 0;
  double tensile_mpa = 0;   ///< in-plane tensile strength of printed parts
  double poisson = 0.35;
  double max_temp_c = 0;    ///< service temperature limit
};

/// Everything the checks look at besides the design itself.
struct Context {
  double speed_rpm = 0;
  std::optional<double> rotor_max_speed_rpm;  ///< as marked on the rotor
  std::string rotor_kind;                     ///< grinding-wheel | buffing-wheel | …
  double rotor_diameter_mm = 0;
  double rotor_mass_kg = 0;
  double overspeed_factor = 1.5;              ///< proof speed / running speed
  Material material;
  std::string mount = "outboard";             ///< outboard | under-nut
  std::optional<double> free_thread_mm;
  double nut_height_mm = 0;
  double spindle_diameter_mm = 0;
  double max_diameter_mm = 0;                 ///< room for the fixture (guard, work)
  std::optional<double> flange_diameter_mm;
  double nozzle_mm = 0.4;
  double layer_mm = 0.2;
  double infill_percent = 100;
  std::vector<std::string> accept;            ///< [checks] accept
};

/// Run every check on a design. Failed checks named in `context.accept` (and acceptable) are
/// marked accepted.
std::vector<CheckResult> run_checks(const fixture::Design& design, const Context& context);

/// Names of the failed checks that are not accepted (empty: the design may be used).
std::vector<std::string> blocking_failures(const std::vector<CheckResult>& checks);

/// The usual cautions for the terminal, chart, report and README.
const std::vector<std::string>& cautions();

}  // namespace trimwright::check
