// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Vibration amplitude units of design.md §3a and conversions between them at one frequency.
/// Standard gravity 9.806 65 m/s² (CGPM); at frequency f: v = a/(2πf), d = a/(2πf)²;
/// peak = √2 × RMS; peak-to-peak = 2 × peak (sinusoidal vibration).

#include <cmath>
#include <optional>
#include <string>

#include "geom/base/angle.hpp"

namespace trimwright {

/// Standard gravity, m/s² (3rd CGPM, 1901).
inline constexpr double kStandardGravity_m_s2 = 9.80665;

/// What a known unit measures.
enum class VibrationQuantity { kAcceleration, kVelocity, kDisplacement };
/// How the amplitude of a sinusoid is stated.
enum class AmplitudeForm { kPeak, kPeakToPeak, kRms };

/// A known amplitude unit: quantity, form and the factor to SI (m/s², m/s or m).
struct VibrationUnit {
  std::string label;          ///< as written in job files, e.g. "mm/s-rms"
  VibrationQuantity quantity;
  AmplitudeForm form;
  double to_si;               ///< multiply a value in this unit by this to get SI (of its form)
};

/// The known unit for a label (g-pk, g-pp, g-rms, m/s2-pk, m/s2-rms, mm/s-pk, mm/s-rms, in/s-pk,
/// um-pp, mil-pp), or nothing for any other label (still usable for solving, in its own unit).
inline std::optional<VibrationUnit> find_vibration_unit(const std::string& label) {
  using Q = VibrationQuantity;
  using F = AmplitudeForm;
  static const VibrationUnit kUnits[] = {
      {"g-pk", Q::kAcceleration, F::kPeak, kStandardGravity_m_s2},
      {"g-pp", Q::kAcceleration, F::kPeakToPeak, kStandardGravity_m_s2},
      {"g-rms", Q::kAcceleration, F::kRms, kStandardGravity_m_s2},
      {"m/s2-pk", Q::kAcceleration, F::kPeak, 1.0},
      {"m/s2-rms", Q::kAcceleration, F::kRms, 1.0},
      {"mm/s-pk", Q::kVelocity, F::kPeak, 1e-3},
      {"mm/s-rms", Q::kVelocity, F::kRms, 1e-3},
      {"in/s-pk", Q::kVelocity, F::kPeak, 0.0254},
      {"um-pp", Q::kDisplacement, F::kPeakToPeak, 1e-6},
      {"mil-pp", Q::kDisplacement, F::kPeakToPeak, 0.0254e-3},
  };
  for (const auto& u : kUnits)
    if (u.label == label) return u;
  return std::nullopt;
}

/// Factor from a value of this form to its peak value (sinusoid).
inline double to_peak_factor(AmplitudeForm form) {
  switch (form) {
    case AmplitudeForm::kPeak: return 1.0;
    case AmplitudeForm::kPeakToPeak: return 0.5;
    case AmplitudeForm::kRms: return std::sqrt(2.0);
  }
  return 1.0;
}

/// Convert an amplitude between two known units for a sinusoid at frequency_hz (> 0).
inline double convert_amplitude(double value, const VibrationUnit& from, const VibrationUnit& to,
                                double frequency_hz) {
  const double omega = 2.0 * kPi * frequency_hz;
  // Bring to peak SI acceleration, then out to the target.
  double peak_si = value * from.to_si * to_peak_factor(from.form);
  double accel = peak_si;
  if (from.quantity == VibrationQuantity::kVelocity) accel = peak_si * omega;
  if (from.quantity == VibrationQuantity::kDisplacement) accel = peak_si * omega * omega;
  double out = accel;
  if (to.quantity == VibrationQuantity::kVelocity) out = accel / omega;
  if (to.quantity == VibrationQuantity::kDisplacement) out = accel / (omega * omega);
  return out / to_peak_factor(to.form) / to.to_si;
}

}  // namespace trimwright
