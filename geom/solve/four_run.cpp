// SPDX-License-Identifier: GPL-3.0-or-later
// Four-run method (amplitudes only). With O the original amplitude and trial runs of unbalance
// u_k at angle θ_k reading A_k, the model |V0 + α·u_k·e^{iθ_k}| = A_k gives
//   A_k² − O² = a²·u_k² + Q·u_k·cos θ_k + R·u_k·sin θ_k,
// with a = |α|, Q = 2·O·a·cos δ, R = −2·O·a·sin δ, linear in (a², Q, R): exact for three trial
// positions, least squares for more. For equal trials at 0/120/240° it is the published formula
// (t² = mean(A_k²) − O², cos φ = (2/3)·Σ c_k cos θ_k, sin φ = −(2/3)·Σ c_k sin θ_k). The
// correction is O/a g·mm at 180° − δ; |(cos δ, sin δ)| measures how consistent the data are.
// docs/solver.md §4.
#include <Eigen/Dense>
#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/solve/conventions.hpp"
#include "geom/solve/detail.hpp"
#include "geom/solve/trial_advice.hpp"

namespace trimwright::solve::detail {

namespace {

/// Warn when |(cos δ, sin δ)| is further than this from 1 (our choice: about 5 % amplitude errors).
constexpr double kInconsistent = 0.10;

}  // namespace

std::vector<Cplx> solve_four_run(const Readings& readings, const SolveOptions& options,
                                 SolveResult& result) {
  const int sensors = validate_runs(readings, 1, false, "four-run");
  if (sensors != 1)
    fail_readings(readings, format("%d sensors; expected 1 (four-run is a single-plane, "
                                   "single-sensor method)",
                                   sensors));
  const auto& runs = readings.runs;
  if (!runs.front().trial.empty())
    fail_run(readings, 0, "has a trial weight; expected the original run (no weights) first");
  std::vector<std::size_t> trial_runs;
  for (std::size_t i = 1; i < runs.size(); ++i) {
    if (runs[i].trial.empty())
      fail_run(readings, i,
               "has no trial weight; expected every run after the first to carry "
               "the trial at a new position");
    trial_runs.push_back(i);
  }
  if (trial_runs.size() < 3)
    fail_readings(readings, format("%zu run(s); expected the original run and at least 3 trial "
                                   "runs (trial at three positions, e.g. 0°, 120°, 240°)",
                                   runs.size()));
  const double o = runs.front().amplitude[0];

  // Scale the trials to the largest one so the columns are of similar size.
  std::vector<Cplx> trials;
  double u_ref = 0;
  for (std::size_t i : trial_runs) {
    trials.push_back(run_weights(readings, runs[i], 1, false)[0]);
    if (!(std::abs(trials.back()) > 1e-9 * run_trial_gmm(runs[i])))
      fail_run(readings, i, "its trial weights cancel out; expected a trial weight");
    u_ref = std::max(u_ref, std::abs(trials.back()));
  }
  const auto n = static_cast<Eigen::Index>(trials.size());
  Eigen::MatrixXd m(n, 3);
  Eigen::VectorXd y(n);
  for (Eigen::Index k = 0; k < n; ++k) {
    const Cplx u = trials[static_cast<std::size_t>(k)] / u_ref;
    m(k, 0) = std::norm(u);
    m(k, 1) = u.real();
    m(k, 2) = u.imag();
    const double a_k = runs[trial_runs[static_cast<std::size_t>(k)]].amplitude[0];
    y(k) = a_k * a_k - o * o;
  }
  Eigen::JacobiSVD<Eigen::MatrixXd> svd(m, Eigen::ComputeThinU | Eigen::ComputeThinV);
  const auto& sv = svd.singularValues();
  if (!(sv(2) > 1e-9 * sv(0)))
    fail_readings(readings,
                  "the trial positions do not determine the solution; expected the "
                  "trial at three or more different angles (e.g. 0°, 120°, 240°)");
  const Eigen::Vector3d x = svd.solve(y);
  const double t2 = x(0);  // squared effect of the reference trial u_ref
  if (!(t2 > 0))
    fail_readings(readings, format("the amplitudes have no real solution (t² = %.4g ≤ 0: the trial "
                                   "runs read too low against the original %.4g); expected "
                                   "readings of the same machine state and speed, or re-measure",
                                   t2, o));
  const double t = std::sqrt(t2);
  const double a = t / u_ref;  // |α|, reading units per g·mm
  result.redundancy = static_cast<int>(n - 3);

  // Fitted amplitudes (exact for three trial positions).
  double sum_sq = 0;
  result.readings.push_back(ReadingFit{runs.front().name, 0, 1, o, std::nullopt, o, std::nullopt,
                                       0.0, severity_of(o, readings, options)});
  const Eigen::VectorXd fitted_sq = m * x;
  for (Eigen::Index k = 0; k < n; ++k) {
    const std::size_t i = trial_runs[static_cast<std::size_t>(k)];
    const double fit = std::sqrt(std::max(0.0, fitted_sq(k) + o * o));
    const double meas = runs[i].amplitude[0];
    result.readings.push_back(ReadingFit{runs[i].name, static_cast<int>(i), 1, meas, std::nullopt,
                                         fit, std::nullopt, std::fabs(meas - fit),
                                         severity_of(meas, readings, options)});
    sum_sq += (meas - fit) * (meas - fit);
  }
  result.residual_rms = std::sqrt(sum_sq / static_cast<double>(n + 1));

  InfluenceSet set;
  set.sensors = 1;
  set.planes = 1;
  set.units = readings.units;
  set.phase = readings.phase;
  set.speed_rpm = options.speed_rpm;
  set.correction_radius_mm = readings.correction_radius_mm;
  set.sensor_notes = readings.sensor_notes;
  set.method = "four-run";
  set.coefficients.push_back(InfluenceCoefficient{1, 1, a, std::nullopt});
  result.influence = set;

  // The trial's own effect against the original amplitude: the 30/30 rule for amplitudes alone.
  if (t < 0.3 * o)
    result.warnings.push_back(format(
        "the trial's effect (t = %.3g) is only %.0f %% of the original amplitude %.3g; the 30/30 "
        "rule asks for about 30 %%: the result is uncertain, a trial of about %.3g g·mm would "
        "be more trustworthy",
        t, 100.0 * t / o, o, u_ref * 0.3 * o / t));
  double a_max = 0;
  for (std::size_t i : trial_runs) a_max = std::max(a_max, runs[i].amplitude[0]);
  for (const std::string& w :
       trial_risk_warnings(u_ref, options.rotor_mass_kg, options.speed_rpm, o, a_max))
    result.warnings.push_back(w);

  if (!(o > 0)) {
    result.consistency = std::nullopt;
    result.warnings.push_back("the original amplitude is 0: nothing to correct");
    return minus_kept(readings, {Cplx(0, 0)});
  }
  const double cos_d = x(1) / (2.0 * o * t);
  const double sin_d = -x(2) / (2.0 * o * t);
  const double consistency = std::hypot(cos_d, sin_d);
  result.consistency = consistency;
  if (std::fabs(consistency - 1.0) > kInconsistent)
    result.warnings.push_back(format(
        "the four-run amplitudes are inconsistent: |(cos φ, sin φ)| = %.3f, 1 for consistent "
        "data; check the readings (same speed, same sensor spot) and the trial positions",
        consistency));
  const double delta_deg = rad_to_deg(std::atan2(sin_d, cos_d));
  const Cplx total = from_polar_deg(o / a, 180.0 - delta_deg);
  return minus_kept(readings, {total});
}

}  // namespace trimwright::solve::detail
