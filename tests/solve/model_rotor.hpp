// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
// A linear rotor model for tests: chosen unbalances and influence coefficients generate the
// readings a job would hold, in either convention. The conversions here are written out
// independently of geom/solve/conventions.hpp so that the solver is checked against them.

#include <cmath>
#include <complex>
#include <random>
#include <string>
#include <vector>

#include "geom/solve/readings.hpp"

namespace trimwright::solve::test {

using Cplx = std::complex<double>;

inline constexpr double kTestPi = 3.14159265358979323846;

/// Magnitude and angle (degrees) to a complex number.
inline Cplx polar_deg(double magnitude, double angle_deg) {
  return std::polar(magnitude, angle_deg * kTestPi / 180.0);
}

/// Angle of a complex number in degrees, [0, 360).
inline double deg_of(Cplx z) {
  double a = std::atan2(z.imag(), z.real()) * 180.0 / kTestPi;
  return a < 0 ? a + 360.0 : a;
}

/// Smallest difference between two angles, degrees.
inline double angle_diff(double a, double b) {
  double d = std::fmod(std::fabs(a - b), 360.0);
  return d > 180.0 ? 360.0 - d : d;
}

/// A rotor: its true unbalance per plane and the influence of each plane at each sensor, both in
/// the physical sense (weight angles against rotation, phase as lag), g·mm and units per g·mm.
struct ModelRotor {
  std::vector<Cplx> unbalance;           // per plane, g·mm
  std::vector<std::vector<Cplx>> alpha;  // [sensor][plane]
  PhaseSense phase = PhaseSense::kLag;
  AngleSense angles = AngleSense::kAgainstRotation;
  double noise = 0;  // relative amplitude of random reading errors
  mutable std::mt19937 random{12345};

  /// A weight as the job writes it (angle in the job's sense) in the physical sense.
  Cplx physical(const TrialWeight& w) const {
    const double a = angles == AngleSense::kAgainstRotation ? w.angle_deg : -w.angle_deg;
    return polar_deg(w.mass_g * w.radius_mm, a);
  }

  /// A run with these weights on the rotor, readings in the job's phase sense.
  Run run(const std::string& name, const std::vector<TrialWeight>& weights) const {
    Run r;
    r.name = name;
    r.trial = weights;
    std::normal_distribution<double> n(0.0, 1.0);
    for (const auto& row : alpha) {
      Cplx v = 0;
      for (std::size_t p = 0; p < row.size(); ++p) {
        Cplx w = unbalance[p];
        for (const auto& t : weights)
          if (t.plane == static_cast<int>(p) + 1) w += physical(t);
        v += row[p] * w;
      }
      if (noise > 0) v += noise * std::abs(v) * Cplx(n(random), n(random));
      const double phase_deg = phase == PhaseSense::kLag ? deg_of(v) : deg_of(std::conj(v));
      r.amplitude.push_back(std::abs(v));
      r.phase_deg.push_back(phase_deg);
    }
    return r;
  }

  /// The correction that cancels plane p's unbalance, in the job's angle sense (complex,
  /// argument = angle in the job's sense).
  Cplx expected_correction(std::size_t plane) const {
    const Cplx c = -unbalance[plane];
    return angles == AngleSense::kAgainstRotation ? c : std::conj(c);
  }

  /// Readings shell with the model's conventions.
  Readings readings(Method method) const {
    Readings r;
    r.method = method;
    r.phase = phase;
    r.angles = angles;
    r.units = "mm/s-pk";
    r.source = "model.toml";
    return r;
  }
};

/// A trial weight.
inline TrialWeight weight(int plane, double mass_g, double radius_mm, double angle_deg) {
  TrialWeight w;
  w.plane = plane;
  w.mass_g = mass_g;
  w.radius_mm = radius_mm;
  w.angle_deg = angle_deg;
  return w;
}

/// A run with one sensor typed in by hand.
inline Run typed_run(const std::string& name, double amplitude, double phase_deg,
                     std::vector<TrialWeight> weights = {}, int line = 0) {
  Run r;
  r.name = name;
  r.amplitude = {amplitude};
  r.phase_deg = {phase_deg};
  r.trial = std::move(weights);
  r.line = line;
  return r;
}

}  // namespace trimwright::solve::test
