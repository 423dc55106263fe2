// SPDX-License-Identifier: GPL-3.0-or-later
// Static balancing on a knife-edge or roller stand. A free rotor settles with its total
// unbalance pointing straight down, so each run r with the rotor angle s_r at the bottom and
// trial weights T_r gives one linear equation in the unknown unbalance U0 (rotor frame):
//   Im(e^{−i·s_r}·(U0 + T_r)) = 0,
// with the stable side Re(e^{−i·s_r}·(U0 + T_r)) > 0. Two runs (without and with a trial)
// determine U0; more are fitted by least squares. For a trial at 3 o'clock (90° from the heavy
// spot) that turns the rotor by β this is U = m_t·r_t / tan β. docs/solver.md §6.
#include <Eigen/Dense>
#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/solve/conventions.hpp"
#include "geom/solve/detail.hpp"

namespace trimwright::solve::detail {

namespace {

/// A trial that turns the rotor less than this is hard to tell from stand friction; one that
/// turns it more than 90° − this dwarfs the unbalance (our choice: the error of U grows as
/// 1/(sin β·cos β), about 3× its minimum at these limits).
constexpr double kPoorTurnDeg = 10.0;

}  // namespace

std::vector<Cplx> solve_static(const Readings& readings, const SolveOptions& options,
                               SolveResult& result) {
  (void)options;
  const auto& runs = readings.runs;
  if (runs.size() < 2)
    fail_readings(readings, format("%zu run(s); expected 2 or more: the rotor settled without a "
                                   "trial (heavy spot at the bottom) and with a trial",
                                   runs.size()));
  bool any_trial = false;
  for (std::size_t i = 0; i < runs.size(); ++i) {
    validate_weights(readings, i, 1);
    if (!runs[i].settle_angle_deg || !std::isfinite(*runs[i].settle_angle_deg))
      fail_run(readings, i,
               "no settle angle; expected the rotor angle (from the reference mark, "
               "in the job's angle sense) at the bottom once the rotor came to rest");
    any_trial = any_trial || !runs[i].trial.empty();
  }
  if (!any_trial)
    fail_readings(readings,
                  "no run has a trial weight; expected a run with a trial mass placed "
                  "at 3 o'clock");

  // All angles on the rotor in the job's sense; the geometry is the same in either sense.
  const auto n = static_cast<Eigen::Index>(runs.size());
  Eigen::MatrixXd m(n, 2);
  Eigen::VectorXd y(n);
  double scale = 0;
  std::vector<Cplx> trials;
  for (Eigen::Index r = 0; r < n; ++r) {
    const Run& run = runs[static_cast<std::size_t>(r)];
    trials.push_back(run_weights(readings, run, 1, false)[0]);
    scale = std::max(scale, std::abs(trials.back()));
  }
  double gross = 0;
  for (const Run& run : runs) gross += run_trial_gmm(run);
  if (!(scale > 1e-9 * gross))
    fail_readings(readings,
                  "the trial weights cancel out in every run; expected a trial weight "
                  "that turns the rotor");
  for (Eigen::Index r = 0; r < n; ++r) {
    const double s = deg_to_rad(*runs[static_cast<std::size_t>(r)].settle_angle_deg);
    const Cplx t = trials[static_cast<std::size_t>(r)] / scale;
    // Im(e^{−is}·(x + iy)) = y·cos s − x·sin s.
    m(r, 0) = -std::sin(s);
    m(r, 1) = std::cos(s);
    y(r) = -(t.imag() * std::cos(s) - t.real() * std::sin(s));
  }
  Eigen::JacobiSVD<Eigen::MatrixXd> svd(m, Eigen::ComputeThinU | Eigen::ComputeThinV);
  const auto& sv = svd.singularValues();
  if (!(sv(1) > 1e-9 * sv(0))) {
    std::size_t trial_run = 0;
    while (runs[trial_run].trial.empty()) ++trial_run;
    fail_run(readings, trial_run,
             format("the trial changed nothing (the rotor settled at %g° with and without it, or "
                    "exactly opposite); expected a trial that turns the rotor, best by 30° to 60°",
                    *runs[trial_run].settle_angle_deg));
  }
  const Eigen::Vector2d x = svd.solve(y);
  const Cplx u0 = Cplx(x(0), x(1)) * scale;  // the rotor's unbalance, job's angle sense

  double sum_sq = 0;
  for (std::size_t r = 0; r < runs.size(); ++r) {
    const Cplx total = u0 + trials[r];
    const double settle = *runs[r].settle_angle_deg;
    const double fitted = angle_deg_of(total);
    if (!(std::abs(total) > 0) || std::cos(deg_to_rad(settle - fitted)) <= 0)
      fail_run(readings, r,
               format("settled at %g°, but the other runs put the heavy side at %.1f°; expected "
                      "the rotor angle at the bottom (check the angle sense and the trial's angle)",
                      settle, fitted));
    const double residual = wrap_deg_180(settle - fitted);
    sum_sq += residual * residual;
    result.settles.push_back(SettleFit{runs[r].name, wrap_deg_360(settle), fitted, residual});
    if (!runs[r].trial.empty()) {
      const double turn = angle_between_deg(fitted, angle_deg_of(u0));
      if (turn < kPoorTurnDeg || turn > 90.0 - kPoorTurnDeg)
        result.warnings.push_back(
            run_where(readings, r) +
            format(
                ": the trial turned the rotor %.1f° from its heavy spot; between %.0f° and %.0f° "
                "(best near 45°) the result is less sensitive to reading errors and stand friction",
                turn, kPoorTurnDeg, 90.0 - kPoorTurnDeg));
    }
  }
  result.redundancy = static_cast<int>(n - 2);
  result.residual_rms = std::sqrt(sum_sq / static_cast<double>(n));
  result.heavy_spot_deg = angle_deg_of(u0);
  return minus_kept(readings, {-u0});
}

}  // namespace trimwright::solve::detail
