// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// The balancing solver: vibration readings (or static-stand observations) to a correction per
/// plane, with the influence coefficients, residuals, warnings and the balance-grade verdict.
/// Methods and equations: design.md §5 and docs/solver.md. Everything is g·mm, degrees, rpm.

#include <optional>
#include <string>
#include <vector>

#include "geom/solve/influence.hpp"
#include "geom/solve/readings.hpp"
#include "geom/solve/severity.hpp"
#include "geom/solve/vectors.hpp"

namespace trimwright::solve {

/// What the solver needs beyond the readings (from [machine], [rotor] and [target]).
struct SolveOptions {
  double speed_rpm = 0;      ///< running speed; 0 = unknown (no severity, no tolerance)
  double rotor_mass_kg = 0;  ///< rotor mass; 0 = unknown (no tolerance, no trial-force check)
  std::optional<double> grade_mm_s;      ///< ISO 21940-11 grade (parse_grade); none = no verdict
  std::vector<double> tolerance_shares;  ///< fraction of the tolerance per plane; empty = equal
  /// Influence coefficients to use instead of fitting them (and instead of
  /// Readings::influence_file, which solve() loads when this is empty).
  std::optional<InfluenceSet> influence;
};

/// A correction in one plane: add this unbalance at this angle.
struct Correction {
  int plane = 1;             ///< 1-based
  double unbalance_gmm = 0;  ///< g·mm, ≥ 0
  double angle_deg = 0;      ///< from the reference mark in the job's angle sense, [0, 360)
  double radius_mm = 0;      ///< where mass_g is placed (Readings::correction_radius_mm; 0 = none)
  std::optional<double> mass_g;  ///< unbalance_gmm / radius_mm, when a radius is given
};

/// One reading (run × sensor) against the fitted model.
struct ReadingFit {
  std::string run;                         ///< the run's name
  int run_index = 0;                       ///< 0-based position in Readings::runs
  int sensor = 1;                          ///< 1-based
  double amplitude = 0;                    ///< measured, reading units
  std::optional<double> phase_deg;         ///< measured, job's phase sense
  double fitted_amplitude = 0;             ///< what the fitted model predicts
  std::optional<double> fitted_phase_deg;  ///< likewise (none for amplitude-only methods)
  double residual = 0;  ///< |measured − fitted| (vector difference when phase is known)
  std::optional<Severity> severity;  ///< velocity RMS and zone (known units and speed)
};

/// The vibration the model predicts at a sensor once the correction is added.
struct PredictedVibration {
  int sensor = 1;                    ///< 1-based
  double amplitude = 0;              ///< reading units
  double phase_deg = 0;              ///< job's phase sense, [0, 360)
  std::optional<Severity> severity;  ///< known units and speed
};

/// A two-plane correction split into its static and couple parts (in g·mm, so radii need not be
/// equal): plane 1 = S + C, plane 2 = S − C.
struct StaticCouple {
  Polar static_gmm;  ///< S = (W1 + W2)/2, added in each plane
  Polar couple_gmm;  ///< C = (W1 − W2)/2, added in plane 1 and opposite in plane 2
};

/// Index method: the reading split into the rotor's and the adapter's shares.
struct AdapterSplit {
  Polar rotor_reading;    ///< the rotor's share, reading units and phase (rotor at index 0)
  Polar adapter_reading;  ///< the adapter's share, reading units and phase
  /// The adapter's own unbalance as a correction on the adapter (angle from its mark, where the
  /// rotor's mark sits at index 0), when an influence coefficient is known.
  std::optional<Correction> adapter_correction;
};

/// Static stand: where a run settled against where the fitted unbalance says it should.
struct SettleFit {
  std::string run;          ///< the run's name
  double settle_deg = 0;    ///< measured: rotor angle at the bottom
  double fitted_deg = 0;    ///< predicted by the fitted unbalance
  double residual_deg = 0;  ///< signed difference measured − fitted, (−180, 180]
};

/// The balance-grade verdict.
struct ToleranceCheck {
  std::string grade;                          ///< "G6.3"
  double grade_mm_s = 0;                      ///< 6.3
  double permissible_gmm = 0;                 ///< whole rotor, ISO 21940-11
  std::vector<double> plane_permissible_gmm;  ///< each plane's share
  std::vector<double> present_gmm;  ///< unbalance on the rotor now, per plane (= correction size)
  bool met = false;                 ///< every plane within its share
};

/// Everything the solver found.
struct SolveResult {
  std::string method;  ///< "given", "trial", "four-run", "two-plane", "fit", "static", "index"
  /// What to add to the rotor as it is now, one per plane (plane order). With keep_trial, the
  /// rotor as it is now carries the last run's weights.
  std::vector<Correction> corrections;
  /// keep_trial only: the last run's weights and the addition as one weight per plane (to
  /// replace them); empty otherwise.
  std::vector<Correction> combined;
  /// The influence coefficients fitted (ready for save_influence) or used.
  std::optional<InfluenceSet> influence;
  std::vector<ReadingFit> readings;  ///< every reading against the model
  double residual_rms =
      0;  ///< RMS of the residuals: reading units (static: settle angles, degrees)
  int redundancy =
      0;  ///< equations beyond the unknowns (complex ones for phase methods; 0 = exact)
  std::optional<double> condition_number;     ///< of the influence matrix (two or more planes)
  std::optional<StaticCouple> static_couple;  ///< two planes
  std::vector<PredictedVibration> predicted;  ///< per sensor after the correction (phase methods)
  std::optional<double> consistency;        ///< four-run: |(cos φ, sin φ)|, 1 for consistent data
  std::optional<double> heavy_spot_deg;     ///< static: the rotor's heavy spot, job's angle sense
  std::vector<SettleFit> settles;           ///< static: each run's settle angle against the fit
  std::optional<AdapterSplit> adapter;      ///< index: rotor and adapter shares
  std::optional<ToleranceCheck> tolerance;  ///< when grade, rotor mass and speed are known
  std::vector<std::string> warnings;        ///< one complete line each
};

/// Solve the readings by their method. Throws InputError (one line naming the job file, line and
/// run) for degenerate input: a trial that changed nothing, too few runs, a missing phase, a
/// plane that does not exist, a singular influence matrix, four-run data without a real solution.
/// Loads Readings::influence_file (as given; the caller resolves relative paths) when
/// options.influence is empty; never writes a file.
SolveResult solve(const Readings& readings, const SolveOptions& options);

/// A known correction passed through for uniformity (method "given"): masses, tolerance and
/// the same result shape. Each correction's plane must be distinct and ≥ 1 and its unbalance
/// ≥ 0; `source` names the job file in messages.
SolveResult solve_given(const std::vector<Correction>& corrections, const SolveOptions& options,
                        const std::string& source = "");

/// The method's name as design.md §5 writes it ("trial", "four-run", …).
const char* method_name(Method method);

/// Unbalance on the rotor estimated from one amplitude and |α| of a single plane (g·mm):
/// U = amplitude / |α|. Throws InputError when |α| is not above 0.
double unbalance_from_reading(double amplitude, double influence_magnitude_per_gmm);

}  // namespace trimwright::solve
