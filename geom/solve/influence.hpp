// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Influence coefficients: how much a reading changes per g·mm of unbalance in a plane. A fitted
/// set can be saved to a TOML file and reused, so that after dressing or changing a wheel a
/// single reading gives the next correction.

#include <optional>
#include <string>
#include <vector>

#include "geom/solve/readings.hpp"

namespace trimwright::solve {

/// One coefficient α[sensor][plane]: the reading that 1 g·mm at the plane's reference mark (0°)
/// adds at the sensor. Moving the weight turns the reading by the same angle in the internal
/// sense (design.md §3, docs/solver.md).
struct InfluenceCoefficient {
  int sensor = 1;                   ///< 1-based
  int plane = 1;                    ///< 1-based
  double magnitude = 0;             ///< reading units per g·mm, ≥ 0
  std::optional<double> angle_deg;  ///< phase in the set's phase sense, [0, 360); none when
                                    ///< only amplitudes were measured (four-run)
};

/// A full set of influence coefficients with what is needed to reuse it safely.
struct InfluenceSet {
  int sensors = 0;                                 ///< number of sensors
  int planes = 0;                                  ///< number of correction planes
  std::vector<InfluenceCoefficient> coefficients;  ///< sensors × planes, sensor-major
  std::string units;                               ///< the reading unit label, e.g. "mm/s-pk"
  PhaseSense phase = PhaseSense::kLag;             ///< sense of angle_deg
  double speed_rpm = 0;                   ///< running speed they were measured at (0 = unknown)
  double correction_radius_mm = 0;        ///< the job's correction radius (0 = not given)
  std::vector<std::string> sensor_notes;  ///< where each sensor sat
  std::string method;                     ///< how they were found ("trial", "fit", …)
  std::string note;                       ///< free text (rotor, date)
  std::string source;                     ///< file it was loaded from (empty if fitted)

  /// The coefficient of a sensor and plane (1-based), or nullptr.
  const InfluenceCoefficient* find(int sensor, int plane) const;
};

/// Write the set as TOML to `path`, atomically (a temporary file renamed into place).
/// Throws FileError when the file cannot be written.
void save_influence(const std::string& path, const InfluenceSet& set);

/// Read a set written by save_influence. Throws FileError when the file cannot be read and
/// InputError ("file:line: key: …") when it is not a valid influence file.
InfluenceSet load_influence(const std::string& path);

/// The set as TOML text (what save_influence writes).
std::string influence_to_toml(const InfluenceSet& set);

/// Parse TOML text written by influence_to_toml; `source` names it in messages.
InfluenceSet influence_from_toml(const std::string& text, const std::string& source);

}  // namespace trimwright::solve
