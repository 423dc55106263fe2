// SPDX-License-Identifier: GPL-3.0-or-later
#include "geom/solve/solve.hpp"

#include <cmath>
#include <cstdarg>
#include <cstdio>

#include "geom/base/error.hpp"
#include "geom/solve/conventions.hpp"
#include "geom/solve/detail.hpp"
#include "geom/solve/tolerance.hpp"

namespace trimwright::solve {

namespace detail {

std::string format(const char* pattern, ...) {
  va_list args;
  va_start(args, pattern);
  va_list copy;
  va_copy(copy, args);
  const int size = std::vsnprintf(nullptr, 0, pattern, copy);
  va_end(copy);
  std::string out(size > 0 ? static_cast<std::size_t>(size) : 0, '\0');
  if (size > 0) std::vsnprintf(&out[0], out.size() + 1, pattern, args);
  va_end(args);
  return out;
}

namespace {

std::string location(const std::string& source, int line) {
  std::string where = source;
  if (line > 0) where += (where.empty() ? "line " : ":") + std::to_string(line);
  return where.empty() ? where : where + ": ";
}

}  // namespace

std::string run_where(const Readings& readings, std::size_t run_index) {
  const Run& run = readings.runs[run_index];
  const std::string name =
      run.name.empty() ? "run " + std::to_string(run_index + 1) : "run \"" + run.name + "\"";
  return location(readings.source, run.line) + name;
}

std::string readings_where(const Readings& readings) {
  const int line = readings.runs.empty() ? 0 : readings.runs.front().line;
  return location(readings.source, line) + "readings (" + method_name(readings.method) + ")";
}

void fail_run(const Readings& readings, std::size_t run_index, const std::string& what) {
  throw InputError(run_where(readings, run_index) + ": " + what);
}

void fail_readings(const Readings& readings, const std::string& what) {
  throw InputError(readings_where(readings) + ": " + what);
}

void validate_weights(const Readings& readings, std::size_t run_index, int planes) {
  const std::size_t i = run_index;
  for (const TrialWeight& w : readings.runs[i].trial) {
    if (w.plane < 1 || w.plane > planes)
      fail_run(
          readings, i,
          format("trial weight in plane %d, which does not exist; expected plane %s", w.plane,
                 planes == 1 ? "1 (the method has one plane)" : format("1 to %d", planes).c_str()));
    if (!std::isfinite(w.mass_g) || !(w.mass_g > 0))
      fail_run(readings, i, format("trial mass_g %g; expected a mass above 0 g", w.mass_g));
    if (!std::isfinite(w.radius_mm) || !(w.radius_mm > 0))
      fail_run(readings, i,
               format("trial radius_mm %g; expected a radius above 0 mm", w.radius_mm));
    if (!std::isfinite(w.angle_deg))
      fail_run(readings, i, "trial angle_deg is not finite; expected degrees");
  }
}

int validate_runs(const Readings& readings, int planes, bool need_phase, const char* method) {
  if (readings.runs.empty())
    fail_readings(readings, format("no runs; expected the runs that %s needs", method));
  const std::size_t sensors = readings.runs.front().amplitude.size();
  for (std::size_t i = 0; i < readings.runs.size(); ++i) {
    const Run& run = readings.runs[i];
    if (run.amplitude.empty()) {
      if (!run.recording.empty())
        fail_run(readings, i,
                 "recording \"" + run.recording +
                     "\" has not been measured; expected the amplitude and phase "
                     "measured from it before solving");
      fail_run(readings, i, "no amplitude; expected one amplitude per sensor");
    }
    if (run.amplitude.size() != sensors)
      fail_run(readings, i,
               format("%zu amplitudes; expected %zu, one per sensor as in the first run",
                      run.amplitude.size(), sensors));
    if (!run.phase_deg.empty() && run.phase_deg.size() != run.amplitude.size())
      fail_run(readings, i,
               format("%zu phases for %zu amplitudes; expected one phase per amplitude",
                      run.phase_deg.size(), run.amplitude.size()));
    for (std::size_t s = 0; s < run.amplitude.size(); ++s) {
      const double a = run.amplitude[s];
      if (!std::isfinite(a) || a < 0)
        fail_run(
            readings, i,
            format("amplitude %g (sensor %zu); expected a finite value of 0 or more", a, s + 1));
      const bool has_phase = s < run.phase_deg.size() && run.phase_deg[s].has_value();
      if (need_phase && !has_phase)
        fail_run(readings, i,
                 format("no phase for sensor %zu; the %s method needs a phase with every "
                        "amplitude (four-run works from amplitudes alone)",
                        s + 1, method));
      if (has_phase && !std::isfinite(*run.phase_deg[s]))
        fail_run(readings, i, format("phase (sensor %zu) is not finite; expected degrees", s + 1));
    }
    validate_weights(readings, i, planes);
  }
  return static_cast<int>(sensors);
}

std::vector<Cplx> run_weights(const Readings& readings, const Run& run, int planes, bool internal) {
  std::vector<Cplx> w(static_cast<std::size_t>(planes), Cplx(0, 0));
  for (const TrialWeight& t : run.trial) {
    if (t.plane < 1 || t.plane > planes) continue;  // validate_runs reports these
    w[static_cast<std::size_t>(t.plane - 1)] +=
        internal ? weight_to_internal(t.unbalance_gmm(), t.angle_deg, readings.angles)
                 : from_polar_deg(t.unbalance_gmm(), t.angle_deg);
  }
  return w;
}

double run_trial_gmm(const Run& run) {
  double sum = 0;
  for (const TrialWeight& t : run.trial) sum += t.unbalance_gmm();
  return sum;
}

std::vector<Cplx> minus_kept(const Readings& readings, const std::vector<Cplx>& total) {
  if (!readings.keep_trial || readings.runs.empty()) return total;
  const auto last =
      run_weights(readings, readings.runs.back(), static_cast<int>(total.size()), false);
  std::vector<Cplx> add = total;
  for (std::size_t p = 0; p < add.size(); ++p) add[p] -= last[p];
  return add;
}

Correction make_correction(int plane, Cplx unbalance_user, double radius_mm) {
  Correction c;
  c.plane = plane;
  c.unbalance_gmm = std::abs(unbalance_user);
  c.angle_deg = c.unbalance_gmm > 0 ? angle_deg_of(unbalance_user) : 0.0;
  c.radius_mm = radius_mm;
  if (radius_mm > 0) c.mass_g = c.unbalance_gmm / radius_mm;
  return c;
}

std::optional<Severity> severity_of(double amplitude, const Readings& readings,
                                    const SolveOptions& options) {
  return severity(amplitude, readings.units, options.speed_rpm);
}

}  // namespace detail

const char* method_name(Method method) {
  switch (method) {
    case Method::kTrial: return "trial";
    case Method::kFourRun: return "four-run";
    case Method::kTwoPlane: return "two-plane";
    case Method::kFit: return "fit";
    case Method::kStatic: return "static";
    case Method::kIndex: return "index";
  }
  return "unknown";
}

double unbalance_from_reading(double amplitude, double influence_magnitude_per_gmm) {
  if (!(influence_magnitude_per_gmm > 0) || !std::isfinite(influence_magnitude_per_gmm))
    throw InputError(detail::format("influence coefficient %g per g·mm: expected a value above 0",
                                    influence_magnitude_per_gmm));
  return amplitude / influence_magnitude_per_gmm;
}

namespace {

void add_tolerance(const SolveOptions& options, SolveResult& result) {
  if (!options.grade_mm_s || !(options.rotor_mass_kg > 0) || !(options.speed_rpm > 0)) return;
  if (result.corrections.empty()) return;
  ToleranceCheck t;
  t.grade_mm_s = *options.grade_mm_s;
  t.grade = grade_name(t.grade_mm_s);
  t.permissible_gmm =
      permissible_unbalance_gmm(t.grade_mm_s, options.rotor_mass_kg, options.speed_rpm);
  t.plane_permissible_gmm = share_tolerance(
      t.permissible_gmm, static_cast<int>(result.corrections.size()), options.tolerance_shares);
  t.met = true;
  for (std::size_t p = 0; p < result.corrections.size(); ++p) {
    t.present_gmm.push_back(result.corrections[p].unbalance_gmm);
    if (result.corrections[p].unbalance_gmm > t.plane_permissible_gmm[p]) t.met = false;
  }
  result.tolerance = t;
}

void fill_corrections(const Readings& readings, const std::vector<detail::Cplx>& add,
                      SolveResult& result) {
  const int planes = static_cast<int>(add.size());
  for (int p = 0; p < planes; ++p)
    result.corrections.push_back(detail::make_correction(p + 1, add[static_cast<std::size_t>(p)],
                                                         readings.correction_radius_mm));
  if (readings.keep_trial && !readings.runs.empty()) {
    const auto last = detail::run_weights(readings, readings.runs.back(), planes, false);
    for (int p = 0; p < planes; ++p) {
      const auto i = static_cast<std::size_t>(p);
      result.combined.push_back(
          detail::make_correction(p + 1, last[i] + add[i], readings.correction_radius_mm));
    }
  }
  if (planes == 2) {
    const detail::Cplx s = (add[0] + add[1]) / 2.0, c = (add[0] - add[1]) / 2.0;
    result.static_couple =
        StaticCouple{Polar{std::abs(s), angle_deg_of(s)}, Polar{std::abs(c), angle_deg_of(c)}};
  }
}

}  // namespace

SolveResult solve(const Readings& readings, const SolveOptions& options) {
  if (!std::isfinite(readings.correction_radius_mm) || readings.correction_radius_mm < 0)
    detail::fail_readings(
        readings,
        detail::format("correction_radius_mm %g; expected 0 (not given) or a radius above 0",
                       readings.correction_radius_mm));
  std::optional<InfluenceSet> influence = options.influence;
  if (!influence && !readings.influence_file.empty())
    influence = load_influence(readings.influence_file);
  if (influence && readings.correction_radius_mm == 0 && influence->correction_radius_mm > 0) {
    // Masses at the radius the saved coefficients were fitted for, unless the job gives one.
    Readings with_radius = readings;
    with_radius.correction_radius_mm = influence->correction_radius_mm;
    SolveOptions with_influence = options;
    with_influence.influence = influence;
    return solve(with_radius, with_influence);
  }

  SolveResult result;
  result.method = method_name(readings.method);
  std::vector<detail::Cplx> add;
  switch (readings.method) {
    case Method::kTrial:
    case Method::kTwoPlane:
    case Method::kFit: add = detail::solve_phase(readings, options, influence, result); break;
    case Method::kFourRun:
      if (influence)
        result.warnings.push_back(
            "four-run fits its own influence from amplitudes; the saved "
            "influence coefficients were not used");
      add = detail::solve_four_run(readings, options, result);
      break;
    case Method::kStatic:
      if (influence)
        result.warnings.push_back(
            "the static method needs no influence coefficients; the saved "
            "ones were not used");
      add = detail::solve_static(readings, options, result);
      break;
    case Method::kIndex: add = detail::solve_index(readings, options, influence, result); break;
  }
  fill_corrections(readings, add, result);
  add_tolerance(options, result);
  return result;
}

SolveResult solve_given(const std::vector<Correction>& corrections, const SolveOptions& options,
                        const std::string& source) {
  const std::string where = (source.empty() ? "" : source + ": ") + "correction: ";
  if (corrections.empty()) throw InputError(where + "none given; expected at least one plane");
  SolveResult result;
  result.method = "given";
  std::vector<Correction> sorted(corrections);
  for (std::size_t i = 0; i < sorted.size(); ++i) {
    const Correction& c = sorted[i];
    if (c.plane < 1 || c.plane > static_cast<int>(sorted.size()))
      throw InputError(where + detail::format("plane %d; expected planes numbered 1 to %zu",
                                              c.plane, sorted.size()));
    for (std::size_t j = 0; j < i; ++j)
      if (sorted[j].plane == c.plane)
        throw InputError(where +
                         detail::format("plane %d given twice; expected each plane once", c.plane));
    if (!std::isfinite(c.unbalance_gmm) || c.unbalance_gmm < 0)
      throw InputError(where +
                       detail::format("unbalance_gmm %g; expected a finite value of 0 or more",
                                      c.unbalance_gmm));
    if (!std::isfinite(c.angle_deg))
      throw InputError(where + "angle_deg is not finite; expected degrees");
    if (!std::isfinite(c.radius_mm) || c.radius_mm < 0)
      throw InputError(
          where +
          detail::format("radius_mm %g; expected 0 (not given) or a radius above 0", c.radius_mm));
  }
  result.corrections.resize(sorted.size());
  for (const Correction& c : sorted) {
    Correction out = c;
    out.angle_deg = wrap_deg_360(c.angle_deg);
    out.mass_g.reset();
    if (c.radius_mm > 0) out.mass_g = c.unbalance_gmm / c.radius_mm;
    result.corrections[static_cast<std::size_t>(c.plane - 1)] = out;
  }
  if (result.corrections.size() == 2) {
    const auto a =
        from_polar_deg(result.corrections[0].unbalance_gmm, result.corrections[0].angle_deg);
    const auto b =
        from_polar_deg(result.corrections[1].unbalance_gmm, result.corrections[1].angle_deg);
    const auto s = (a + b) / 2.0, k = (a - b) / 2.0;
    result.static_couple =
        StaticCouple{Polar{std::abs(s), angle_deg_of(s)}, Polar{std::abs(k), angle_deg_of(k)}};
  }
  add_tolerance(options, result);
  return result;
}

}  // namespace trimwright::solve
