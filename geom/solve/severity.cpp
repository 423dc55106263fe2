// SPDX-License-Identifier: GPL-3.0-or-later
#include "geom/solve/severity.hpp"

#include <cmath>

#include "geom/base/vibration_units.hpp"

namespace trimwright::solve {

Zone zone_of(double velocity_rms_mm_s) {
  if (velocity_rms_mm_s <= kZoneAB_mm_s) return Zone::kA;
  if (velocity_rms_mm_s <= kZoneBC_mm_s) return Zone::kB;
  if (velocity_rms_mm_s <= kZoneCD_mm_s) return Zone::kC;
  return Zone::kD;
}

const char* zone_letter(Zone zone) {
  switch (zone) {
    case Zone::kA: return "A";
    case Zone::kB: return "B";
    case Zone::kC: return "C";
    case Zone::kD: return "D";
  }
  return "?";
}

const char* zone_note(Zone zone) {
  switch (zone) {
    case Zone::kA: return "as expected of a newly commissioned machine";
    case Zone::kB: return "acceptable for unrestricted long-term running";
    case Zone::kC: return "unsatisfactory for long-term running; fine for a limited time";
    case Zone::kD: return "severe enough to cause damage";
  }
  return "";
}

std::optional<double> velocity_rms_mm_s(double amplitude, const std::string& units,
                                        double speed_rpm) {
  const auto from = find_vibration_unit(units);
  const auto to = find_vibration_unit("mm/s-rms");
  if (!from || !to || !(speed_rpm > 0) || !std::isfinite(speed_rpm)) return std::nullopt;
  return convert_amplitude(amplitude, *from, *to, speed_rpm / 60.0);
}

std::optional<Severity> severity(double amplitude, const std::string& units, double speed_rpm) {
  const auto v = velocity_rms_mm_s(amplitude, units, speed_rpm);
  if (!v) return std::nullopt;
  return Severity{*v, zone_of(*v)};
}

}  // namespace trimwright::solve
