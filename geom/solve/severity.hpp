// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Vibration severity of a reading: its velocity RMS at running speed and the ISO 10816-1
/// class I zone (small machines). Solving works in any consistent unit; severity needs a known
/// unit (geom/base/vibration_units.hpp) and the running speed.

#include <optional>
#include <string>

namespace trimwright::solve {

/// ISO 10816-1 evaluation zone, best first.
enum class Zone { kA, kB, kC, kD };

/// Upper limit of zone A for class I machines, velocity RMS mm/s (ISO 10816-1).
inline constexpr double kZoneAB_mm_s = 0.71;
/// Upper limit of zone B for class I machines, velocity RMS mm/s (ISO 10816-1).
inline constexpr double kZoneBC_mm_s = 1.8;
/// Upper limit of zone C for class I machines, velocity RMS mm/s (ISO 10816-1); above is D.
inline constexpr double kZoneCD_mm_s = 4.5;

/// A reading's severity.
struct Severity {
  double velocity_rms_mm_s = 0;  ///< vibration velocity RMS at running speed, mm/s
  Zone zone = Zone::kA;          ///< class I zone
};

/// The class I zone of a velocity RMS (mm/s); a value on a boundary belongs to the better zone.
Zone zone_of(double velocity_rms_mm_s);

/// "A", "B", "C" or "D".
const char* zone_letter(Zone zone);

/// A short description of the zone (the usual reading of the zones, from memory).
const char* zone_note(Zone zone);

/// Velocity RMS in mm/s of an amplitude in a known unit at running speed (rpm), for a sinusoid
/// at the rotation frequency. Nothing when the unit is not a known one or speed_rpm is not above 0.
std::optional<double> velocity_rms_mm_s(double amplitude, const std::string& units,
                                        double speed_rpm);

/// Velocity RMS and zone of an amplitude; nothing when the unit is unknown or the speed is not
/// above 0.
std::optional<Severity> severity(double amplitude, const std::string& units, double speed_rpm);

}  // namespace trimwright::solve
