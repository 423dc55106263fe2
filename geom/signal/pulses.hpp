// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Once-per-revolution reference pulses: edge detection with an automatic threshold, edge and
/// hold-off, and the smoothing of pulse times that turns them into a shaft angle (docs/recordings.md).

#include <optional>
#include <string>
#include <vector>

namespace trimwright::signal {

/// Which edge of the reference pulse marks 0°.
enum class Edge { kAuto, kRising, kFalling };

/// The edge's name ("auto", "rising", "falling").
const char* edge_name(Edge edge);

/// How to find the pulses. Unset fields are chosen from the signal.
struct PulseOptions {
  std::optional<double> threshold;  ///< level in the reference column's own units
  Edge edge = Edge::kAuto;          ///< kAuto: the edge that leaves the resting level
};

/// Pulses found in a reference signal.
struct Pulses {
  std::vector<double> times_s;  ///< edge times, s, interpolated between samples at the threshold
  double threshold = 0;         ///< level used, reference units
  double hysteresis = 0;        ///< the signal must come back this far past the threshold to re-arm
  double holdoff_s = 0;         ///< edges closer than this after a pulse are ignored (ringing), s
  Edge edge = Edge::kRising;    ///< the edge used
  double low = 0;               ///< lowest value of the reference signal
  double high = 0;              ///< highest value of the reference signal
  double resting = 0;           ///< median of the reference signal (the level between pulses)
  /// Most edges jump from the resting level to the pulse level between two samples (no sample
  /// on the slope between 10 % and 90 % of the excursion): edge times are then only known to
  /// within a sample interval.
  bool sharp_edges = false;
};

/// Find reference edges. Automatic choices: the resting level is the median, the pulse goes to
/// whichever extreme lies farther from it (rising edge when it goes up), the threshold is halfway
/// to that extreme with a hysteresis of 20 % of that excursion, and when the edge intervals are
/// irregular (ringing, bounce) a hold-off of half the longest regular interval is applied.
/// A constant signal, or a threshold outside the signal's range, gives no pulses.
Pulses detect_pulses(const std::vector<double>& time_s, const std::vector<double>& reference,
                     const PulseOptions& options);

/// Pulse times smoothed by a local quadratic least-squares fit of time against revolution number
/// over ±half_window pulses (fewer at the ends), which removes the jitter of sampling the edge
/// while following slow speed changes. Needs at least 3 pulses (returned unchanged otherwise).
std::vector<double> smooth_pulse_times(const std::vector<double>& times_s, int half_window);

}  // namespace trimwright::signal
