// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Trial-weight advice: a starting size before the trial run, and after it a check that the
/// trial changed the reading enough to trust and not so much as to be risky.

#include <optional>
#include <string>
#include <vector>

namespace trimwright::solve {

/// A trial whose centrifugal force is this fraction of the rotor's weight is the usual starting
/// size (common practice, no source).
inline constexpr double kTrialForceFraction = 0.10;
/// Above this fraction of the rotor's weight a trial's centrifugal force is called risky (our
/// choice: the trial alone would pull harder than the rotor weighs).
inline constexpr double kRiskyForceFraction = 1.0;
/// The "30/30" rule: a trial should change the amplitude by at least 30 % or the phase by at
/// least 30° to be trusted.
inline constexpr double kMinAmplitudeChangePercent = 30.0;
/// See kMinAmplitudeChangePercent.
inline constexpr double kMinPhaseChangeDeg = 30.0;
/// A trial run whose amplitude exceeds the original run's by this factor is called risky (our
/// choice).
inline constexpr double kRiskyAmplitudeRatio = 2.0;

/// A suggested trial weight.
struct TrialSuggestion {
  double unbalance_gmm = 0;   ///< trial unbalance, g·mm
  double mass_g = 0;          ///< trial mass at the given radius, g
  double force_n = 0;         ///< its centrifugal force at running speed, N
  double force_fraction = 0;  ///< that force over the rotor's weight
};

/// The trial whose centrifugal force at speed_rpm is `force_fraction` of the rotor's weight:
/// U = f·M·g/Ω² (g·mm), mass = U / radius. Throws InputError when a value is not above 0.
TrialSuggestion suggest_trial(double rotor_mass_kg, double radius_mm, double speed_rpm,
                              double force_fraction = kTrialForceFraction);

/// Centrifugal force of an unbalance at a speed, N: F = U·Ω² (U in kg·m).
double centrifugal_force_n(double unbalance_gmm, double speed_rpm);

/// What a trial run changed, seen by one sensor.
struct TrialEffect {
  double amplitude_change_percent = 0;     ///< |A1 − A0| / A0 × 100 (A0 = 0: infinite)
  std::optional<double> phase_change_deg;  ///< smallest angle between the phases, [0, 180]
  bool enough = false;                     ///< at least 30 % or 30° (the 30/30 rule)
};

/// The change between an original reading (amplitude, optional phase) and a trial reading.
TrialEffect trial_effect(double amplitude0, std::optional<double> phase0_deg, double amplitude1,
                         std::optional<double> phase1_deg);

/// Warnings about a trial before or after its run: `trial_gmm` the trial's unbalance,
/// rotor_mass_kg and speed_rpm (0 = unknown: that check is skipped), and the original and
/// trial amplitudes of the strongest sensor (0 = not run yet). Empty when all is well.
std::vector<std::string> trial_risk_warnings(double trial_gmm, double rotor_mass_kg,
                                             double speed_rpm, double amplitude0,
                                             double amplitude1);

}  // namespace trimwright::solve
