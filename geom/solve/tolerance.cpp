// SPDX-License-Identifier: GPL-3.0-or-later
#include "geom/solve/tolerance.hpp"

#include <cctype>
#include <cmath>
#include <cstdio>
#include <cstdlib>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"

namespace trimwright::solve {

const std::vector<BalanceGrade>& balance_grades() {
  // G0.4, G1, G2.5 and G6.3 with their first rotor types: ISO 21940-11:2016 as reproduced in
  // Bloch & Geitner, Machinery Component Maintenance and Repair, Table 6-5. The rest of each
  // description and the other grades are recalled from the standard's table, not checked.
  static const std::vector<BalanceGrade> kGrades = {
      {0.4, "G0.4", "precision-grinder spindles; also (from memory) gyroscopes", false},
      {1, "G1",
       "grinding-machine drives; also (from memory) tape-recorder and record-player drives, "
       "small electric armatures with special requirements",
       false},
      {2.5, "G2.5",
       "machine-tool drives; also (from memory) gas and steam turbines, turbo-compressors, "
       "turbine-driven pumps, small electric armatures",
       false},
      {6.3, "G6.3",
       "fans, general machinery, machine-tool parts; also (from memory) pump impellers, "
       "flywheels, centrifuge drums, paper-machine rolls, electric armatures",
       false},
      {16, "G16",
       "drive shafts with special requirements, parts of crushing and agricultural machinery, "
       "single parts of vehicle engines",
       true},
      {40, "G40", "car wheels and rims, wheel sets, drive shafts", true},
      {100, "G100", "complete vehicle engines, crankshaft drives of fast diesel engines", true},
      {250, "G250", "crankshaft drives of rigidly mounted fast four-cylinder diesel engines", true},
      {630, "G630", "crankshaft drives of large rigidly mounted four-stroke engines", true},
      {1600, "G1600", "crankshaft drives of large rigidly mounted two-stroke engines", true},
      {4000, "G4000",
       "crankshaft drives of slow rigidly mounted marine diesel engines with an odd number of "
       "cylinders",
       true},
  };
  return kGrades;
}

namespace {

std::string grade_list() {
  std::string list;
  for (const auto& g : balance_grades()) list += (list.empty() ? "" : ", ") + std::string(g.name);
  return list;
}

}  // namespace

double parse_grade(const std::string& text, const std::string& where) {
  std::string compact;
  for (char c : text)
    if (!std::isspace(static_cast<unsigned char>(c))) compact += c;
  std::string number = compact;
  if (!number.empty() && (number[0] == 'G' || number[0] == 'g')) number.erase(0, 1);
  const std::string prefix = (where.empty() ? "" : where + ": ") + "grade \"" + text + "\": ";
  char* end = nullptr;
  const double value = number.empty() ? 0.0 : std::strtod(number.c_str(), &end);
  if (number.empty() || end != number.c_str() + number.size() || !std::isfinite(value))
    throw InputError(prefix +
                     "not a balance grade; expected a grade such as \"G6.3\" or \"2.5\" (" +
                     grade_list() + ")");
  for (const auto& g : balance_grades())
    if (std::fabs(g.g_mm_s - value) <= 1e-9 * g.g_mm_s) return g.g_mm_s;
  throw InputError(prefix + "not a grade of ISO 21940-11; expected one of " + grade_list());
}

std::string grade_name(double grade_mm_s) {
  char buffer[32];
  std::snprintf(buffer, sizeof buffer, "G%g", grade_mm_s);
  return buffer;
}

double permissible_unbalance_gmm(double grade_mm_s, double rotor_mass_kg, double speed_rpm) {
  auto require_positive = [](double value, const char* what, const char* unit) {
    if (!(value > 0) || !std::isfinite(value)) {
      char buffer[160];
      std::snprintf(buffer, sizeof buffer, "%s %g %s: expected a finite value above 0", what, value,
                    unit);
      throw InputError(buffer);
    }
  };
  require_positive(grade_mm_s, "balance grade", "mm/s");
  require_positive(rotor_mass_kg, "rotor mass", "kg");
  require_positive(speed_rpm, "speed", "rpm");
  const double omega_rad_s = 2.0 * kPi * speed_rpm / 60.0;
  // e_per [µm] = G [mm/s] · 1000 / Ω; U_per [g·mm] = e_per [µm] · M [kg] (µm·kg = g·mm).
  return 1000.0 * grade_mm_s * rotor_mass_kg / omega_rad_s;
}

double permissible_eccentricity_um(double grade_mm_s, double speed_rpm) {
  return permissible_unbalance_gmm(grade_mm_s, 1.0, speed_rpm);
}

std::vector<double> share_tolerance(double permissible_gmm, int planes,
                                    const std::vector<double>& shares) {
  if (planes < 1)
    throw InputError("tolerance shared among " + std::to_string(planes) +
                     " planes: expected 1 plane or more");
  if (shares.empty())
    return std::vector<double>(static_cast<std::size_t>(planes), permissible_gmm / planes);
  if (shares.size() != static_cast<std::size_t>(planes))
    throw InputError("tolerance shares: " + std::to_string(shares.size()) + " given for " +
                     std::to_string(planes) + " planes; expected one per plane");
  double sum = 0;
  for (double s : shares) {
    if (!(s > 0) || !std::isfinite(s)) {
      char buffer[120];
      std::snprintf(buffer, sizeof buffer, "tolerance share %g: expected a fraction above 0", s);
      throw InputError(buffer);
    }
    sum += s;
  }
  if (std::fabs(sum - 1.0) > 1e-6) {
    char buffer[120];
    std::snprintf(buffer, sizeof buffer, "tolerance shares add up to %g: expected 1", sum);
    throw InputError(buffer);
  }
  std::vector<double> out;
  for (double s : shares) out.push_back(permissible_gmm * s);
  return out;
}

}  // namespace trimwright::solve
