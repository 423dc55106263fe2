// SPDX-License-Identifier: GPL-3.0-or-later
// Index method: the rotor is read, turned on its adapter by ψ (180° as a rule), and read again.
// With the phase reference on the adapter (or spindle), a reading is
//   V = A + R·e^{iψ} (+ α·T·e^{iψ} for trial weights T on the rotor),
// with the reference on the rotor V = A·e^{−iψ} + R (+ α·T): A the adapter's share, R the
// rotor's (both as read at index 0). At 0° and 180° R = (V1 − V2)/2 and A = (V1 + V2)/2 with the
// reference on the adapter. Linear in (A, R, α): fitted by least squares. docs/solver.md §7.
#include <Eigen/Dense>
#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/solve/conventions.hpp"
#include "geom/solve/detail.hpp"

namespace trimwright::solve::detail {

std::vector<Cplx> solve_index(const Readings& readings, const SolveOptions& options,
                              const std::optional<InfluenceSet>& influence, SolveResult& result) {
  const int sensors = validate_runs(readings, 1, true, "index");
  if (sensors != 1)
    fail_readings(readings,
                  format("%d sensors; expected 1 (the index method reads one sensor)", sensors));
  const auto& runs = readings.runs;
  const bool on_adapter = readings.index_reference == IndexReference::kAdapter;
  bool fit_alpha = false;
  for (const Run& run : runs) fit_alpha = fit_alpha || !run.trial.empty();
  const Eigen::Index unknowns = fit_alpha ? 3 : 2;
  const auto n = static_cast<Eigen::Index>(runs.size());
  if (n < unknowns)
    fail_readings(readings, format("%zu run(s); expected at least %ld: the rotor read at two index "
                                   "positions (0° and 180°)%s",
                                   runs.size(), static_cast<long>(unknowns),
                                   fit_alpha ? " and a run with a trial weight" : ""));

  Eigen::MatrixXcd m(n, unknowns);
  Eigen::VectorXcd v(n);
  double t_scale = 0;
  std::vector<Cplx> trials;
  for (const Run& run : runs) {
    trials.push_back(run_weights(readings, run, 1, true)[0]);
    t_scale = std::max(t_scale, std::abs(trials.back()));
  }
  double gross = 0;
  for (const Run& run : runs) gross += run_trial_gmm(run);
  if (fit_alpha && !(t_scale > 1e-9 * gross))
    fail_readings(readings, "the trial weights cancel out in every run; expected a trial weight");
  for (Eigen::Index r = 0; r < n; ++r) {
    const Run& run = runs[static_cast<std::size_t>(r)];
    const double index = run.index_deg.value_or(0.0);
    if (!std::isfinite(index))
      fail_run(readings, static_cast<std::size_t>(r), "index_deg is not finite; expected degrees");
    const Cplx turn = weight_to_internal(1.0, index, readings.angles);  // e^{iψ}, internal sense
    v(r) = reading_to_internal(run.amplitude[0], *run.phase_deg[0], readings.phase);
    m(r, 0) = on_adapter ? Cplx(1, 0) : std::conj(turn);
    m(r, 1) = on_adapter ? turn : Cplx(1, 0);
    if (fit_alpha)
      m(r, 2) = trials[static_cast<std::size_t>(r)] / t_scale * (on_adapter ? turn : Cplx(1, 0));
  }
  Eigen::JacobiSVD<Eigen::MatrixXcd> svd(m, Eigen::ComputeThinU | Eigen::ComputeThinV);
  const auto& sv = svd.singularValues();
  if (!(sv(sv.size() - 1) > 1e-9 * sv(0)))
    fail_readings(readings, fit_alpha ? "the runs do not separate rotor, adapter and trial; "
                                        "expected runs at two index positions "
                                        "(0° and 180° are best) and a trial run"
                                      : "every run is at the same index position; expected the "
                                        "rotor read at two positions on "
                                        "its adapter (0° and 180° are best)");
  const Eigen::VectorXcd x = svd.solve(v);
  const Cplx adapter = x(0), rotor = x(1);

  double sum_sq = 0;
  const Eigen::VectorXcd fitted = m * x;
  for (Eigen::Index r = 0; r < n; ++r) {
    const Run& run = runs[static_cast<std::size_t>(r)];
    const Cplx fit_user = internal_to_phase_sense(fitted(r), readings.phase);
    const double residual = std::abs(v(r) - fitted(r));
    sum_sq += residual * residual;
    result.readings.push_back(ReadingFit{
        run.name, static_cast<int>(r), 1, run.amplitude[0], run.phase_deg[0], std::abs(fit_user),
        angle_deg_of(fit_user), residual, severity_of(run.amplitude[0], readings, options)});
  }
  result.redundancy = static_cast<int>(n - unknowns);
  result.residual_rms = std::sqrt(sum_sq / static_cast<double>(n));

  AdapterSplit split;
  const Cplx rotor_user = internal_to_phase_sense(rotor, readings.phase);
  const Cplx adapter_user = internal_to_phase_sense(adapter, readings.phase);
  split.rotor_reading = Polar{std::abs(rotor_user), angle_deg_of(rotor_user)};
  split.adapter_reading = Polar{std::abs(adapter_user), angle_deg_of(adapter_user)};

  std::optional<Cplx> alpha;
  if (fit_alpha) {
    alpha = x(2) / t_scale;
    InfluenceSet set;
    set.sensors = 1;
    set.planes = 1;
    set.units = readings.units;
    set.phase = readings.phase;
    set.speed_rpm = options.speed_rpm;
    set.correction_radius_mm = readings.correction_radius_mm;
    set.sensor_notes = readings.sensor_notes;
    set.method = "index";
    const Cplx a_user = internal_to_phase_sense(*alpha, readings.phase);
    set.coefficients.push_back(InfluenceCoefficient{1, 1, std::abs(a_user), angle_deg_of(a_user)});
    result.influence = set;
  } else if (influence) {
    const InfluenceCoefficient* c = influence->find(1, 1);
    if (influence->sensors != 1 || influence->planes != 1 || !c || !c->angle_deg)
      fail_readings(readings,
                    "the influence set needs one sensor, one plane and a phase for the "
                    "index method; expected a set fitted by a single-plane phase method");
    if (!influence->units.empty() && influence->units != readings.units)
      fail_readings(readings,
                    format("the influence set is in \"%s\"; expected the readings' units \"%s\"",
                           influence->units.c_str(), readings.units.c_str()));
    alpha = reading_to_internal(c->magnitude, *c->angle_deg, influence->phase);
    result.influence = influence;
  }
  if (!alpha || !(std::abs(*alpha) > 0)) {
    if (fit_alpha)
      fail_readings(readings,
                    "the trial changed nothing; expected a trial run whose reading differs");
    result.warnings.push_back(
        "no influence coefficient (no trial run and no saved set): the "
        "rotor's and the adapter's shares are given in reading units only");
    result.adapter = split;
    return {};
  }
  // Unbalances (internal sense): the rotor's in its own frame, the adapter's from its mark.
  const Cplx rotor_unbalance = rotor / *alpha;
  const Cplx adapter_unbalance = adapter / *alpha;
  split.adapter_correction =
      make_correction(1, internal_to_angle_sense(-adapter_unbalance, readings.angles),
                      readings.correction_radius_mm);
  result.adapter = split;
  return minus_kept(readings, {internal_to_angle_sense(-rotor_unbalance, readings.angles)});
}

}  // namespace trimwright::solve::detail
