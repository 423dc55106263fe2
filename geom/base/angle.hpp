// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Angle helpers. Angles in the public interfaces are degrees; radians stay inside formulas.

#include <cmath>

namespace trimwright {

/// pi, for formulas (C++17 has no std::numbers).
inline constexpr double kPi = 3.14159265358979323846;

/// Degrees to radians.
inline double deg_to_rad(double deg) { return deg * kPi / 180.0; }
/// Radians to degrees.
inline double rad_to_deg(double rad) { return rad * 180.0 / kPi; }

/// An angle brought into [0, 360) degrees.
inline double wrap_deg_360(double deg) {
  double a = std::fmod(deg, 360.0);
  if (a < 0) a += 360.0;
  if (a >= 360.0) a -= 360.0;  // fmod of a tiny negative number can round to 360
  return a;
}

/// An angle brought into (-180, 180] degrees.
inline double wrap_deg_180(double deg) {
  double a = wrap_deg_360(deg);
  return a > 180.0 ? a - 360.0 : a;
}

/// Smallest absolute difference between two angles, in [0, 180] degrees.
inline double angle_between_deg(double a_deg, double b_deg) {
  return std::fabs(wrap_deg_180(a_deg - b_deg));
}

}  // namespace trimwright
