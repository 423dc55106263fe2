// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Small vector helpers for placing a correction with fixed hardware: splitting a weight between
/// two fixed positions (law of sines) and the resultant of two equal eccentric masses.
/// Amounts may be grams or g·mm (the helpers are linear); angles are degrees in any one sense.

#include <cmath>
#include <cstddef>
#include <optional>
#include <utility>
#include <vector>

#include "geom/base/angle.hpp"

namespace trimwright::solve {

/// A magnitude at an angle.
struct Polar {
  double magnitude = 0;  ///< same unit as the inputs (g or g·mm), ≥ 0
  double angle_deg = 0;  ///< degrees, [0, 360)
};

/// Two amounts at two fixed positions whose vector sum is a wanted one.
struct SplitWeights {
  double w1 = 0;  ///< amount at the first position (negative: the sum is outside the pair's sector)
  double w2 = 0;  ///< amount at the second position (negative likewise)
};

/// Split `amount` at `angle_deg` between fixed positions at `angle1_deg` and `angle2_deg` by the
/// law of sines: w1 = W·sin(θ2 − θ)/sin(θ2 − θ1), w2 = W·sin(θ − θ1)/sin(θ2 − θ1). Both are
/// ≥ 0 when θ lies in the sector (less than 180°) from θ1 to θ2. Nothing when the two positions
/// are in line (the same or opposite angles), where no split exists.
inline std::optional<SplitWeights> split_between(double amount, double angle_deg, double angle1_deg,
                                                 double angle2_deg) {
  const double s = std::sin(deg_to_rad(angle2_deg - angle1_deg));
  if (std::fabs(s) < 1e-9) return std::nullopt;
  return SplitWeights{amount * std::sin(deg_to_rad(angle2_deg - angle_deg)) / s,
                      amount * std::sin(deg_to_rad(angle_deg - angle1_deg)) / s};
}

/// A split onto two of several fixed positions (fan blades, holes on a pitch circle).
struct PositionSplit {
  std::size_t index1 = 0;  ///< first position used (index into the list)
  std::size_t index2 = 0;  ///< second position used (equal to index1 when one position suffices)
  double w1 = 0;           ///< amount at index1, ≥ 0
  double w2 = 0;           ///< amount at index2, ≥ 0
};

/// Split `amount` at `angle_deg` onto the two neighbouring positions of `positions_deg` that
/// bracket it (law of sines). Nothing when fewer than two positions are given, or when the
/// bracketing pair spans 180° or more (the amount cannot be made from non-negative parts).
inline std::optional<PositionSplit> split_among(double amount, double angle_deg,
                                                const std::vector<double>& positions_deg) {
  if (positions_deg.empty()) return std::nullopt;
  const double target = wrap_deg_360(angle_deg);
  // The position at or just below the target going one way round, and the next one after it.
  std::size_t below = 0, above = 0;
  double best_below = 1e9, best_above = 1e9;
  for (std::size_t i = 0; i < positions_deg.size(); ++i) {
    const double back = wrap_deg_360(target - positions_deg[i]);  // from position up to target
    const double ahead = wrap_deg_360(positions_deg[i] - target);
    if (back < best_below) best_below = back, below = i;
    if (ahead < best_above) best_above = ahead, above = i;
  }
  if (best_below < 1e-9) return PositionSplit{below, below, amount, 0};
  if (best_above < 1e-9) return PositionSplit{above, above, amount, 0};
  if (below == above || best_below + best_above >= 180.0 - 1e-9) return std::nullopt;
  auto split = split_between(amount, target, positions_deg[below], positions_deg[above]);
  if (!split) return std::nullopt;
  return PositionSplit{below, above, split->w1, split->w2};
}

/// The resultant of two equal eccentric masses `each` at angles a and b:
/// 2u·cos((a − b)/2) at the bisector (a + b)/2 (pointing the other way when that is negative).
inline Polar equal_pair_resultant(double each, double a_deg, double b_deg) {
  const double half = deg_to_rad(a_deg - b_deg) / 2.0;
  double magnitude = 2.0 * each * std::cos(half);
  double angle = (a_deg + b_deg) / 2.0;
  if (magnitude < 0) magnitude = -magnitude, angle += 180.0;
  return Polar{magnitude, wrap_deg_360(angle)};
}

/// The two angles (a, b) = θ ± acos(U/(2u)) at which equal masses `each` give `magnitude` at
/// `angle_deg`; a is the one turned the positive way. Nothing when magnitude > 2·each or
/// each ≤ 0.
inline std::optional<std::pair<double, double>> equal_pair_angles(double each, double magnitude,
                                                                  double angle_deg) {
  if (!(each > 0) || magnitude < 0 || magnitude > 2.0 * each) return std::nullopt;
  const double half_deg = rad_to_deg(std::acos(magnitude / (2.0 * each)));
  return std::make_pair(wrap_deg_360(angle_deg + half_deg), wrap_deg_360(angle_deg - half_deg));
}

/// The vector sum of two magnitudes at angles.
inline Polar add_polar(Polar a, Polar b) {
  const double x = a.magnitude * std::cos(deg_to_rad(a.angle_deg)) +
                   b.magnitude * std::cos(deg_to_rad(b.angle_deg));
  const double y = a.magnitude * std::sin(deg_to_rad(a.angle_deg)) +
                   b.magnitude * std::sin(deg_to_rad(b.angle_deg));
  return Polar{std::hypot(x, y), wrap_deg_360(rad_to_deg(std::atan2(y, x)))};
}

}  // namespace trimwright::solve
