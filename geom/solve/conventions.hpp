// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Angle and phase conventions (design.md §3). Internally every weight angle counts against
/// rotation and every phase counts as lag, so that a reading is linear in the weights:
/// V = V0 + α·W with V, α, W complex. A job that counts weight angles with rotation has its
/// weights conjugated on the way in and its corrections conjugated on the way out; a job that
/// reads phase as lead has its readings conjugated. docs/solver.md derives this with an example.

#include <cmath>
#include <complex>

#include "geom/base/angle.hpp"
#include "geom/solve/readings.hpp"

namespace trimwright::solve {

/// A complex number from a magnitude and an angle in degrees.
inline std::complex<double> from_polar_deg(double magnitude, double angle_deg) {
  return std::polar(magnitude, deg_to_rad(angle_deg));
}

/// The angle of a complex number in degrees, in [0, 360).
inline double angle_deg_of(std::complex<double> z) { return wrap_deg_360(rad_to_deg(std::arg(z))); }

/// A reading (amplitude in the job's units, phase in degrees in the job's phase sense) as an
/// internal complex vibration (phase as lag).
inline std::complex<double> reading_to_internal(double amplitude, double phase_deg,
                                                PhaseSense sense) {
  const std::complex<double> v = from_polar_deg(amplitude, phase_deg);
  return sense == PhaseSense::kLag ? v : std::conj(v);
}

/// An internal complex vibration (or influence coefficient) back in the job's phase sense:
/// its argument is the phase in degrees as the job counts it.
inline std::complex<double> internal_to_phase_sense(std::complex<double> v, PhaseSense sense) {
  return sense == PhaseSense::kLag ? v : std::conj(v);
}

/// An unbalance (g·mm) at an angle in the job's angle sense as an internal complex weight
/// (angles against rotation).
inline std::complex<double> weight_to_internal(double unbalance_gmm, double angle_deg,
                                               AngleSense sense) {
  const std::complex<double> w = from_polar_deg(unbalance_gmm, angle_deg);
  return sense == AngleSense::kAgainstRotation ? w : std::conj(w);
}

/// An internal complex weight back in the job's angle sense: its argument is the angle as the
/// job counts it, its magnitude the unbalance in g·mm.
inline std::complex<double> internal_to_angle_sense(std::complex<double> w, AngleSense sense) {
  return sense == AngleSense::kAgainstRotation ? w : std::conj(w);
}

/// Sense of rotation of the spindle, seen looking at the fixture side (job key machine.rotation).
enum class Rotation { kCw, kCcw };

/// Whether the job's weight angles count counterclockwise as the user sees the fixture side.
/// Angles against a clockwise rotation count counterclockwise, and so on; the solver itself
/// never needs this (both senses are tied to the rotation), the charts and scales do.
inline bool angles_count_ccw_seen_from_fixture(AngleSense angles, Rotation rotation) {
  const bool against = angles == AngleSense::kAgainstRotation;
  return rotation == Rotation::kCw ? against : !against;
}

}  // namespace trimwright::solve
