// SPDX-License-Identifier: GPL-3.0-or-later
// The correction a design is built for: given in the job, or solved from its readings (typed,
// measured from recordings, or logged fixture settings while trimming).
#include <fmt/format.h>

#include <filesystem>

#include "cli/pipeline.hpp"
#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/base/vibration_units.hpp"
#include "geom/fixture/fixture.hpp"
#include "geom/signal/measure.hpp"
#include "geom/solve/tolerance.hpp"

namespace trimwright::cli {
namespace fs = std::filesystem;

namespace {

/// Paths in a job are relative to the job file's folder.
std::string resolve_path(const Job& job, const std::string& path) {
  fs::path p(path);
  if (p.is_absolute() || job.source.empty() || job.source[0] == '<') return p.string();
  return (fs::path(job.source).parent_path() / p).string();
}

std::string run_where(const Job& job, const solve::Run& run) {
  return fmt::format("{}:{}: run \"{}\"", job.source, run.line, run.name);
}

bool has_settings(const solve::Readings& r) {
  for (const auto& run : r.runs)
    if (run.setting) return true;
  return false;
}

/// Measures each run's recording into typed amplitude and phase.
void measure_recordings(const Job& job, solve::Readings& r, std::vector<std::string>& notes) {
  for (auto& run : r.runs) {
    if (run.recording.empty()) continue;
    signal::RecordingOptions o;
    o.nominal_rpm = job.machine.speed_rpm;
    if (!trimwright::find_vibration_unit(r.units))
      throw InputError(fmt::format("{}: readings.units = \"{}\": expected a known unit (g-pk, mm/s-pk, …) "
                                   "to measure recordings in", job.where("readings.units"), r.units));
    o.units = r.units;
    o.axis = run.axis;
    signal::Measurement m = signal::measure_recording(resolve_path(job, run.recording), o);
    run.amplitude = {m.amplitude};
    if (m.phase_deg) {
      // The measurement gives lag; a job that counts phase as lead reads the opposite sense.
      double p = r.phase == solve::PhaseSense::kLead ? wrap_deg_360(-*m.phase_deg) : *m.phase_deg;
      run.phase_deg = {p};
    } else {
      run.phase_deg = {std::nullopt};
    }
    notes.push_back(fmt::format("run \"{}\": {} measured {:.4g} {} at {:.0f} rpm{} ({} confidence)", run.name,
                                run.recording, m.amplitude, m.units, m.speed_rpm,
                                m.phase_deg ? fmt::format(", phase {:.1f}°", *m.phase_deg) : "",
                                m.confidence.level));
    for (const auto& w : m.warnings) notes.push_back(fmt::format("run \"{}\": {}", run.name, w));
  }
}

/// Turns each logged fixture setting into the weight it adds, from the printed fixture's mesh.
void settings_to_weights(const Job& job, solve::Readings& r, std::vector<std::string>& notes) {
  if (!has_settings(r)) return;
  if (!job.fixture.sized_for_gmm)
    throw InputError(fmt::format(
        "{}: [fixture] has no \"sized_for_gmm\": expected the correction the printed fixture was "
        "sized for (report.json fixture.sized_for_gmm), so that runs naming its setting use its "
        "real mass", job.where("fixture.family")));
  Correction sizing;
  sizing.unbalance_gmm = *job.fixture.sized_for_gmm;
  fixture::Request req = make_request(job, sizing, find_tolerance(job), {}, notes);
  fixture::Design printed = fixture::design_family(job.fixture.family, req);
  for (auto& run : r.runs) {
    if (!run.setting) continue;
    fixture::SettingWeight w = fixture::setting_weight(printed, req, run.setting->values, run_where(job, run));
    // As a weight at 1 mm, its mass in grams equals its unbalance in g·mm.
    run.trial.push_back({1, w.unbalance_gmm, 1.0, w.angle_deg});
  }
  // The fixture stays on the rotor: what it must give next is the last setting plus the addition.
  r.keep_trial = true;
}

solve::SolveOptions solve_options(const Job& job) {
  solve::SolveOptions o;
  o.speed_rpm = job.machine.speed_rpm;
  o.rotor_mass_kg = job.rotor.mass_kg;
  if (job.grade) o.grade_mm_s = solve::parse_grade(*job.grade, job.where("target.grade") + ": target.grade");
  return o;
}

}  // namespace

SolvedJob solve_job(const Job& job) {
  if (!job.readings) throw InternalError("solve_job: the job has no [readings]");
  SolvedJob out;
  solve::Readings r = *job.readings;
  if (!r.influence_file.empty()) r.influence_file = resolve_path(job, r.influence_file);
  measure_recordings(job, r, out.notes);
  settings_to_weights(job, r, out.notes);
  out.trimming = has_settings(r);
  out.result = solve::solve(r, solve_options(job));
  if (!r.save_influence.empty() && out.result.influence) {
    out.saved_influence = resolve_path(job, r.save_influence);
    solve::save_influence(out.saved_influence, *out.result.influence);
  }
  return out;
}

Correction find_correction(const Job& job, int plane) {
  Correction c;
  if (job.correction) {
    c.unbalance_gmm = job.correction->unbalance_gmm;
    c.angle_deg = wrap_deg_360(job.correction->angle_deg);
    c.method = "given";
    if (job.correction->mass_g && job.correction->radius_mm) {
      c.mass_g = job.correction->mass_g;
      c.radius_mm = job.correction->radius_mm;
    }
    return c;
  }
  SolvedJob solved = solve_job(job);
  const solve::SolveResult& res = solved.result;
  // Trimming with a fixture: the fixture replaces the last setting, so it must give the combined
  // weight; otherwise the correction is what to add.
  const auto& list = solved.trimming && !res.combined.empty() ? res.combined : res.corrections;
  const solve::Correction* pick = nullptr;
  for (const auto& k : list)
    if (k.plane == plane) pick = &k;
  if (!pick)
    throw InputError(fmt::format("{}: [readings]: no correction for plane {} (the readings give {} plane{})",
                                 job.source, plane, list.size(), list.size() == 1 ? "" : "s"));
  c.unbalance_gmm = pick->unbalance_gmm;
  c.angle_deg = pick->angle_deg;
  c.method = res.method;
  if (pick->mass_g && pick->radius_mm > 0) {
    c.mass_g = pick->mass_g;
    c.radius_mm = pick->radius_mm;
  }
  c.notes = solved.notes;
  for (const auto& w : res.warnings) c.notes.push_back(w);
  if (list.size() > 1)
    c.notes.push_back(fmt::format("this fixture corrects plane {} of {}; design the other plane's fixture with --plane",
                                  plane, list.size()));
  if (solved.trimming)
    c.notes.push_back("trimming: the new setting replaces the last logged one (the fixture's whole contribution)");
  if (c.unbalance_gmm <= 0)
    throw CannotMeetError(fmt::format("{}: the readings give no correction to make (0 g·mm)", job.source));
  return c;
}

}  // namespace trimwright::cli
