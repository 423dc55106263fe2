// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Balance-quality grades and the permissible residual unbalance of ISO 21940-11 (formerly
/// ISO 1940-1): U_per = 1000·G·M/Ω = 9549·G·M/n g·mm, with G in mm/s, M in kg and n in rpm.

#include <string>
#include <vector>

namespace trimwright::solve {

/// One balance-quality grade of the standard's series and the rotors it is meant for.
struct BalanceGrade {
  double g_mm_s;            ///< the grade's value e·Ω, mm/s
  const char* name;         ///< "G6.3"
  const char* rotor_types;  ///< typical rotors
  bool from_memory;         ///< true: the rotor types are recalled, not checked against a source
};

/// The grades G0.4 … G4000, smallest first.
const std::vector<BalanceGrade>& balance_grades();

/// A grade written as "G6.3", "6.3", "G 2.5" or "g2.5" (spaces ignored) as its value in mm/s.
/// Throws InputError naming `where` (e.g. "job.toml:40: target.grade") when the text is not a
/// number with an optional G, or not one of the standard grades.
double parse_grade(const std::string& text, const std::string& where);

/// The grade's name, e.g. 6.3 → "G6.3", 1 → "G1".
std::string grade_name(double grade_mm_s);

/// Permissible residual unbalance of the whole rotor, g·mm: 1000·G·M/Ω with Ω = 2πn/60.
/// Throws InputError when a value is not above 0.
double permissible_unbalance_gmm(double grade_mm_s, double rotor_mass_kg, double speed_rpm);

/// Permissible residual specific unbalance (centre-of-mass eccentricity), µm: U_per / M.
double permissible_eccentricity_um(double grade_mm_s, double speed_rpm);

/// The whole-rotor tolerance shared among `planes` correction planes. `shares` gives each
/// plane's fraction (they must be > 0 and add to 1 within 1e-6); empty = equal shares (half each
/// for two planes, as for a rotor with its centre of mass midway). Throws InputError otherwise.
std::vector<double> share_tolerance(double permissible_gmm, int planes,
                                    const std::vector<double>& shares);

}  // namespace trimwright::solve
