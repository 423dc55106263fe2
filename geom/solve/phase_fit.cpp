// SPDX-License-Identifier: GPL-3.0-or-later
// Phase methods: trial, two-plane and fit share one linear model per sensor,
//   V[r][s] = V0[s] + Σ_p α[s][p]·W[r][p]   (internal sense, docs/solver.md §2),
// fitted by least squares; the correction minimises Σ_s |V0[s] + Σ_p α[s][p]·W[p]|².
#include <Eigen/Dense>
#include <algorithm>
#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/solve/conventions.hpp"
#include "geom/solve/detail.hpp"
#include "geom/solve/trial_advice.hpp"

namespace trimwright::solve::detail {

namespace {

/// Below this ratio of the smallest to the largest singular value a matrix counts as singular.
constexpr double kSingular = 1e-10;
/// Above this condition number the influence matrix is called ill-conditioned: a reading error
/// of 1 % may move the correction by this many per cent (our choice).
constexpr double kIllConditioned = 10.0;
/// A fit whose residual RMS exceeds this fraction of the RMS reading is flagged (our choice).
constexpr double kPoorFit = 0.10;
/// More correction planes than any rotor here could need: a typing error.
constexpr int kMaxPlanes = 16;
/// A saved influence measured at a speed differing by more than this fraction is flagged.
constexpr double kSpeedMismatch = 0.02;

struct PhaseData {
  int sensors = 0;
  int planes = 0;
  Eigen::MatrixXcd v;  ///< runs × sensors, internal
  Eigen::MatrixXcd w;  ///< runs × planes, internal g·mm
};

int planes_of(const Readings& readings, const std::optional<InfluenceSet>& influence) {
  switch (readings.method) {
    case Method::kTrial: return 1;
    case Method::kTwoPlane: return 2;
    default: break;
  }
  if (readings.planes < 0)
    fail_readings(readings,
                  format("planes = %d; expected 0 (from the runs) or more", readings.planes));
  if (readings.planes > kMaxPlanes)
    fail_readings(readings,
                  format("planes = %d; expected at most %d", readings.planes, kMaxPlanes));
  if (readings.planes > 0) return readings.planes;
  if (influence) return influence->planes;
  int planes = 0;
  for (const Run& run : readings.runs)
    for (const TrialWeight& w : run.trial) planes = std::max(planes, w.plane);
  if (planes > kMaxPlanes)
    fail_readings(readings,
                  format("a weight in plane %d; expected planes 1 to %d", planes, kMaxPlanes));
  if (planes == 0)
    fail_readings(readings, "no run has a weight; expected runs with weights in each plane");
  return planes;
}

PhaseData gather(const Readings& readings, int planes, const char* method) {
  PhaseData d;
  d.planes = planes;
  d.sensors = validate_runs(readings, planes, true, method);
  const auto runs = static_cast<Eigen::Index>(readings.runs.size());
  d.v.resize(runs, d.sensors);
  d.w.resize(runs, planes);
  for (Eigen::Index r = 0; r < runs; ++r) {
    const Run& run = readings.runs[static_cast<std::size_t>(r)];
    for (int s = 0; s < d.sensors; ++s) {
      const auto i = static_cast<std::size_t>(s);
      d.v(r, s) = reading_to_internal(run.amplitude[i], *run.phase_deg[i], readings.phase);
    }
    const auto w = run_weights(readings, run, planes, true);
    for (int p = 0; p < planes; ++p) d.w(r, p) = w[static_cast<std::size_t>(p)];
  }
  return d;
}

/// Influence matrix (sensors × planes, internal) from a saved set, checked against the readings.
Eigen::MatrixXcd matrix_from_set(const Readings& readings, const SolveOptions& options,
                                 const InfluenceSet& set, int sensors, int planes,
                                 std::vector<std::string>& warnings) {
  const std::string name = set.source.empty() ? "the given influence set" : set.source;
  if (set.sensors != sensors || set.planes != planes)
    fail_readings(readings,
                  format("%s has %d sensor(s) × %d plane(s); expected %d × %d as in the readings",
                         name.c_str(), set.sensors, set.planes, sensors, planes));
  if (!set.units.empty() && set.units != readings.units)
    fail_readings(readings, format("%s is in \"%s\"; expected the readings' units \"%s\"",
                                   name.c_str(), set.units.c_str(), readings.units.c_str()));
  if (set.speed_rpm > 0 && options.speed_rpm > 0 &&
      std::fabs(set.speed_rpm - options.speed_rpm) > kSpeedMismatch * options.speed_rpm)
    warnings.push_back(
        format("%s was measured at %.0f rpm, the machine runs at %.0f rpm; "
               "influence coefficients change with speed",
               name.c_str(), set.speed_rpm, options.speed_rpm));
  Eigen::MatrixXcd a(sensors, planes);
  for (int s = 0; s < sensors; ++s)
    for (int p = 0; p < planes; ++p) {
      const InfluenceCoefficient* c = set.find(s + 1, p + 1);
      if (!c)
        fail_readings(readings, format("%s lacks sensor %d, plane %d", name.c_str(), s + 1, p + 1));
      if (!c->angle_deg)
        fail_readings(readings, format("%s has no phase for sensor %d, plane %d (amplitude-only "
                                       "fit); expected coefficients fitted from phase readings",
                                       name.c_str(), s + 1, p + 1));
      a(s, p) = reading_to_internal(c->magnitude, *c->angle_deg, set.phase);
    }
  return a;
}

/// Method-specific shape checks before fitting (without a saved influence).
void check_shape(const Readings& readings, const PhaseData& d) {
  const auto runs = readings.runs.size();
  const std::size_t needed = static_cast<std::size_t>(d.planes) + 1;
  if (readings.method == Method::kTrial && runs != 2)
    fail_readings(readings, format("%zu run(s); expected 2 (the original run and one trial run; "
                                   "use method \"fit\" for more runs)",
                                   runs));
  if (readings.method == Method::kTwoPlane) {
    if (runs != 3)
      fail_readings(readings, format("%zu run(s); expected 3 (original, trial in plane 1, trial "
                                     "in plane 2; use method \"fit\" for more runs)",
                                     runs));
    if (d.sensors < 2)
      fail_readings(readings, format("%d sensor(s); expected 2 (one amplitude and phase per "
                                     "sensor in every run)",
                                     d.sensors));
  }
  if (runs < needed)
    fail_readings(readings, format("%zu run(s) for %d plane(s); expected at least %zu (one more "
                                   "than the planes)",
                                   runs, d.planes, needed));
}

/// Trial and two-plane: each trial run must change the readings; warn when the change is below
/// the 30/30 rule or the trial looks risky.
void check_trials(const Readings& readings, const SolveOptions& options, const PhaseData& d,
                  std::vector<std::string>& warnings) {
  const Run& original = readings.runs.front();
  const double scale = d.v.cwiseAbs().maxCoeff();
  for (std::size_t r = 1; r < readings.runs.size(); ++r) {
    const Run& run = readings.runs[r];
    const auto ri = static_cast<Eigen::Index>(r);
    const double change = (d.v.row(ri) - d.v.row(0)).cwiseAbs().maxCoeff();
    if (!(change > 1e-9 * scale)) {
      const std::string first =
          original.name.empty() ? "the first run" : "run \"" + original.name + "\"";
      fail_run(readings, r,
               format("the trial changed nothing (sensor 1 read %g at %g° as in %s); expected a "
                      "reading that differs from the original run",
                      run.amplitude[0], *run.phase_deg[0], first.c_str()));
    }
    bool enough = false;
    std::size_t best = 0;
    double best_change = -1;
    TrialEffect best_effect;
    for (std::size_t s = 0; s < run.amplitude.size(); ++s) {
      const TrialEffect e = trial_effect(original.amplitude[s], original.phase_deg[s],
                                         run.amplitude[s], run.phase_deg[s]);
      enough = enough || e.enough;
      const double c =
          std::abs(d.v(ri, static_cast<Eigen::Index>(s)) - d.v(0, static_cast<Eigen::Index>(s)));
      if (c > best_change) best_change = c, best = s, best_effect = e;
    }
    if (!enough) {
      // The trial that would change the reading by about 30 % of the original (linear model).
      const double v0 = std::abs(d.v(0, static_cast<Eigen::Index>(best)));
      const double suggested = run_trial_gmm(run) * 0.3 * v0 / best_change;
      warnings.push_back(run_where(readings, r) +
                         format(": the trial changed the reading by only %.0f %% and %.0f° "
                                "(sensor %zu); the 30/30 rule asks for 30 %% or 30°: the result "
                                "is uncertain, a trial of about %.3g g·mm would be more "
                                "trustworthy",
                                best_effect.amplitude_change_percent,
                                best_effect.phase_change_deg.value_or(0.0), best + 1, suggested));
    }
    for (const std::string& w :
         trial_risk_warnings(run_trial_gmm(run), options.rotor_mass_kg, options.speed_rpm,
                             original.amplitude[best], run.amplitude[best]))
      warnings.push_back(run_where(readings, r) + ": " + w);
  }
}

/// Throws when a plane's weights never change between runs (its effect cannot be fitted) or
/// when the runs' weights are linearly dependent.
void check_design(const Readings& readings, const Eigen::MatrixXcd& x) {
  Eigen::MatrixXcd scaled = x;
  for (Eigen::Index p = 1; p < x.cols(); ++p) {
    Eigen::VectorXcd col = x.col(p);
    const double spread = (col.array() - col(0)).abs().maxCoeff();
    if (!(spread > 0)) {
      if (readings.method == Method::kTrial)
        fail_run(readings, 1,
                 "has the same weights as the first run; expected a trial weight "
                 "added or moved between the two runs");
      fail_readings(readings, format("the weights in plane %ld are the same in every run; expected "
                                     "a run that adds or moves a weight in plane %ld",
                                     static_cast<long>(p), static_cast<long>(p)));
    }
    scaled.col(p) /= col.cwiseAbs().maxCoeff();
  }
  Eigen::JacobiSVD<Eigen::MatrixXcd> svd(scaled);
  const auto& sv = svd.singularValues();
  if (!(sv(sv.size() - 1) > kSingular * sv(0)))
    fail_readings(readings,
                  "the runs' weights do not separate the planes (one plane's weights "
                  "are a combination of the others' in every run); expected runs that "
                  "change each plane's weight independently");
}

}  // namespace

std::vector<Cplx> solve_phase(const Readings& readings, const SolveOptions& options,
                              const std::optional<InfluenceSet>& influence, SolveResult& result) {
  const int planes = planes_of(readings, influence);
  const char* method = method_name(readings.method);
  const PhaseData d = gather(readings, planes, method);
  const auto runs = static_cast<Eigen::Index>(readings.runs.size());
  const Eigen::Index sensors = d.sensors;

  if (!influence) check_shape(readings, d);
  if (d.sensors < d.planes)
    fail_readings(readings, format("%d sensor(s) for %d planes; expected at least as many sensors "
                                   "as planes",
                                   d.sensors, d.planes));
  Eigen::VectorXcd v0(sensors);
  Eigen::MatrixXcd a(sensors, planes);
  if (influence) {
    a = matrix_from_set(readings, options, *influence, d.sensors, planes, result.warnings);
    // Known α: each run gives V0 = V − α·W; least squares over the runs is their mean.
    const Eigen::MatrixXcd v0_runs = d.v - d.w * a.transpose();
    v0 = v0_runs.colwise().mean().transpose();
    result.redundancy = static_cast<int>((runs - 1) * sensors);
  } else {
    if (readings.method != Method::kFit) check_trials(readings, options, d, result.warnings);
    Eigen::MatrixXcd x(runs, planes + 1);
    x.col(0).setOnes();
    x.rightCols(planes) = d.w;
    check_design(readings, x);
    const Eigen::MatrixXcd b = x.colPivHouseholderQr().solve(d.v);  // (1 + planes) × sensors
    v0 = b.row(0).transpose();
    a = b.bottomRows(planes).transpose();
    result.redundancy = static_cast<int>((runs - planes - 1) * sensors);
  }

  // Fitted readings and residuals.
  const Eigen::MatrixXcd fitted = Eigen::MatrixXcd(d.w * a.transpose()).rowwise() + v0.transpose();
  double sum_sq = 0, sum_v = 0;
  for (Eigen::Index r = 0; r < runs; ++r) {
    const Run& run = readings.runs[static_cast<std::size_t>(r)];
    for (Eigen::Index s = 0; s < sensors; ++s) {
      const auto si = static_cast<std::size_t>(s);
      ReadingFit f;
      f.run = run.name;
      f.run_index = static_cast<int>(r);
      f.sensor = static_cast<int>(s) + 1;
      f.amplitude = run.amplitude[si];
      f.phase_deg = run.phase_deg[si];
      const Cplx fit_user = internal_to_phase_sense(fitted(r, s), readings.phase);
      f.fitted_amplitude = std::abs(fit_user);
      f.fitted_phase_deg = angle_deg_of(fit_user);
      f.residual = std::abs(d.v(r, s) - fitted(r, s));
      f.severity = severity_of(f.amplitude, readings, options);
      sum_sq += f.residual * f.residual;
      sum_v += std::norm(d.v(r, s));
      result.readings.push_back(f);
    }
  }
  const double count = static_cast<double>(runs * sensors);
  result.residual_rms = std::sqrt(sum_sq / count);
  if (result.redundancy > 0 && result.residual_rms > kPoorFit * std::sqrt(sum_v / count))
    result.warnings.push_back(format(
        "the readings do not fit one linear model well: residual RMS %.3g %s is %.0f %% of the "
        "RMS reading (noise, a changed speed, loose parts or a wrong weight entry); see the "
        "residual of each reading",
        result.residual_rms, readings.units.c_str(),
        100.0 * result.residual_rms / std::sqrt(sum_v / count)));

  // Influence coefficients in the job's phase sense.
  InfluenceSet set;
  if (influence) {
    set = *influence;
  } else {
    set.sensors = d.sensors;
    set.planes = planes;
    set.units = readings.units;
    set.phase = readings.phase;
    set.speed_rpm = options.speed_rpm;
    set.correction_radius_mm = readings.correction_radius_mm;
    set.sensor_notes = readings.sensor_notes;
    set.method = method;
    for (int s = 0; s < d.sensors; ++s)
      for (int p = 0; p < planes; ++p) {
        const Cplx c = internal_to_phase_sense(a(s, p), readings.phase);
        set.coefficients.push_back(
            InfluenceCoefficient{s + 1, p + 1, std::abs(c), angle_deg_of(c)});
      }
  }
  result.influence = set;

  // A plane whose weights moved but changed no reading (all its coefficients vanish).
  const double scale = d.v.cwiseAbs().maxCoeff();
  for (int p = 0; p < planes; ++p) {
    const double spread = (d.w.col(p).array() - d.w(0, p)).abs().maxCoeff();
    if (!influence && !(a.col(p).cwiseAbs().maxCoeff() * spread > 1e-9 * scale))
      fail_readings(readings, format("the weights in plane %d changed nothing (every reading is "
                                     "the same with and without them); expected runs whose "
                                     "readings respond to the weights",
                                     p + 1));
  }

  // The correction: least squares over the sensors (Goodman's method when sensors > planes).
  Eigen::JacobiSVD<Eigen::MatrixXcd> svd(a, Eigen::ComputeThinU | Eigen::ComputeThinV);
  const auto& sv = svd.singularValues();
  if (!(sv(0) > 0))
    fail_readings(readings,
                  "every influence coefficient is zero: the weights changed nothing; "
                  "expected trial runs whose readings differ from the original run");
  const double condition = sv(0) / sv(sv.size() - 1);
  if (planes > 1) {
    result.condition_number = condition;
    if (!(sv(sv.size() - 1) > kSingular * sv(0)))
      fail_readings(readings,
                    "the influence matrix is singular: the sensors cannot tell the "
                    "planes apart (their readings respond to each plane in the same "
                    "proportion); expected sensors nearer each plane or planes farther apart");
    if (condition > kIllConditioned)
      result.warnings.push_back(format(
          "the influence matrix is ill-conditioned (condition number %.1f): the planes are not "
          "independent as the sensors see them, and a 1 %% reading error may move the "
          "corrections by up to %.0f %%",
          condition, condition));
  }
  const Eigen::VectorXcd w_total = -svd.solve(v0);
  const Eigen::VectorXcd now =
      readings.keep_trial ? Eigen::VectorXcd(d.v.row(runs - 1).transpose()) : v0;
  const Eigen::VectorXcd w_add = readings.keep_trial ? Eigen::VectorXcd(-svd.solve(now)) : w_total;
  const Eigen::VectorXcd after = now + a * w_add;
  for (Eigen::Index s = 0; s < sensors; ++s) {
    const Cplx p = internal_to_phase_sense(after(s), readings.phase);
    result.predicted.push_back(PredictedVibration{static_cast<int>(s) + 1, std::abs(p),
                                                  angle_deg_of(p),
                                                  severity_of(std::abs(p), readings, options)});
  }
  std::vector<Cplx> add;
  for (int p = 0; p < planes; ++p)
    add.push_back(internal_to_angle_sense(w_add(p), readings.angles));
  return add;
}

}  // namespace trimwright::solve::detail
