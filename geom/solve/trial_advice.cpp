// SPDX-License-Identifier: GPL-3.0-or-later
#include "geom/solve/trial_advice.hpp"

#include <cmath>
#include <cstdio>
#include <limits>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/base/vibration_units.hpp"

namespace trimwright::solve {

namespace {

double omega_rad_s(double speed_rpm) { return 2.0 * kPi * speed_rpm / 60.0; }

void require_positive(double value, const char* what, const char* unit) {
  if (!(value > 0) || !std::isfinite(value)) {
    char buffer[160];
    std::snprintf(buffer, sizeof buffer, "trial advice: %s %g %s: expected a finite value above 0",
                  what, value, unit);
    throw InputError(buffer);
  }
}

}  // namespace

double centrifugal_force_n(double unbalance_gmm, double speed_rpm) {
  const double w = omega_rad_s(speed_rpm);
  return unbalance_gmm * 1e-6 * w * w;  // g·mm = 1e-6 kg·m
}

TrialSuggestion suggest_trial(double rotor_mass_kg, double radius_mm, double speed_rpm,
                              double force_fraction) {
  require_positive(rotor_mass_kg, "rotor mass", "kg");
  require_positive(radius_mm, "radius", "mm");
  require_positive(speed_rpm, "speed", "rpm");
  require_positive(force_fraction, "force fraction", "");
  const double w = omega_rad_s(speed_rpm);
  const double force_n = force_fraction * rotor_mass_kg * kStandardGravity_m_s2;
  const double unbalance_gmm = force_n / (w * w) * 1e6;
  return TrialSuggestion{unbalance_gmm, unbalance_gmm / radius_mm, force_n, force_fraction};
}

TrialEffect trial_effect(double amplitude0, std::optional<double> phase0_deg, double amplitude1,
                         std::optional<double> phase1_deg) {
  TrialEffect effect;
  effect.amplitude_change_percent =
      amplitude0 > 0 ? std::fabs(amplitude1 - amplitude0) / amplitude0 * 100.0
                     : (amplitude1 > 0 ? std::numeric_limits<double>::infinity() : 0.0);
  if (phase0_deg && phase1_deg)
    effect.phase_change_deg = angle_between_deg(*phase0_deg, *phase1_deg);
  effect.enough = effect.amplitude_change_percent >= kMinAmplitudeChangePercent ||
                  (effect.phase_change_deg && *effect.phase_change_deg >= kMinPhaseChangeDeg);
  return effect;
}

std::vector<std::string> trial_risk_warnings(double trial_gmm, double rotor_mass_kg,
                                             double speed_rpm, double amplitude0,
                                             double amplitude1) {
  std::vector<std::string> warnings;
  char buffer[320];
  if (rotor_mass_kg > 0 && speed_rpm > 0 && trial_gmm > 0) {
    const double fraction =
        centrifugal_force_n(trial_gmm, speed_rpm) / (rotor_mass_kg * kStandardGravity_m_s2);
    if (fraction > kRiskyForceFraction) {
      std::snprintf(buffer, sizeof buffer,
                    "the trial of %.4g g·mm pulls with %.0f %% of the rotor's weight at %.0f rpm; "
                    "a trial near %.0f %% is the usual size, a larger one loads the bearings and "
                    "must be fixed securely",
                    trial_gmm, fraction * 100.0, speed_rpm, kTrialForceFraction * 100.0);
      warnings.emplace_back(buffer);
    }
  }
  if (amplitude0 > 0 && amplitude1 > kRiskyAmplitudeRatio * amplitude0) {
    std::snprintf(buffer, sizeof buffer,
                  "the trial run's vibration (%.4g) is %.1f times the original (%.4g); a smaller "
                  "trial is safer for the next runs",
                  amplitude1, amplitude1 / amplitude0, amplitude0);
    warnings.emplace_back(buffer);
  }
  return warnings;
}

}  // namespace trimwright::solve
