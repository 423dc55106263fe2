// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/solve.hpp"

#include <CLI/CLI.hpp>
#include <fmt/core.h>

#include <memory>

#include "cli/job.hpp"
#include "cli/pipeline.hpp"
#include "geom/base/error.hpp"
#include "geom/io/json.hpp"
#include "geom/solve/solve.hpp"
#include "geom/solve/tolerance.hpp"
#include "geom/solve/trial_advice.hpp"

namespace trimwright::cli {
namespace {

using io::Json;
using io::json_number;

Json correction_json(const solve::Correction& c) {
  Json j;
  j["plane"] = c.plane;
  j["unbalance_gmm"] = json_number(c.unbalance_gmm, "unbalance");
  j["angle_deg"] = json_number(c.angle_deg, "angle");
  j["mass_g"] = c.mass_g ? json_number(*c.mass_g, "mass") : Json(nullptr);
  j["radius_mm"] = c.radius_mm > 0 ? json_number(c.radius_mm, "radius") : Json(nullptr);
  return j;
}

Json polar_json(const solve::Polar& p, const char* unit_key) {
  return {{unit_key, json_number(p.magnitude, unit_key)}, {"angle_deg", json_number(p.angle_deg, "angle")}};
}

Json severity_json(const std::optional<solve::Severity>& s) {
  if (!s) return nullptr;
  return {{"velocity_rms_mm_s", json_number(s->velocity_rms_mm_s, "velocity")}, {"zone", solve::zone_letter(s->zone)}};
}

Json solved_json(const Job& job, const SolvedJob& solved) {
  const solve::SolveResult& r = solved.result;
  Json j;
  j["method"] = r.method;
  Json corr = Json::array();
  for (const auto& c : r.corrections) corr.push_back(correction_json(c));
  j["corrections"] = corr;
  if (!r.combined.empty()) {
    Json comb = Json::array();
    for (const auto& c : r.combined) comb.push_back(correction_json(c));
    j["combined"] = comb;
  }
  if (r.influence) {
    Json inf;
    inf["units"] = r.influence->units;
    inf["sensors"] = r.influence->sensors;
    inf["planes"] = r.influence->planes;
    Json coeffs = Json::array();
    for (const auto& c : r.influence->coefficients)
      coeffs.push_back({{"sensor", c.sensor}, {"plane", c.plane},
                        {"magnitude_per_gmm", json_number(c.magnitude, "influence")},
                        {"angle_deg", c.angle_deg ? json_number(*c.angle_deg, "influence angle") : Json(nullptr)}});
    inf["coefficients"] = coeffs;
    if (!solved.saved_influence.empty()) inf["saved_to"] = solved.saved_influence;
    j["influence"] = inf;
  } else {
    j["influence"] = nullptr;
  }
  Json res;
  res["rms"] = json_number(r.residual_rms, "residual");
  res["redundancy"] = r.redundancy;
  Json readings = Json::array();
  for (const auto& f : r.readings)
    readings.push_back({{"run", f.run}, {"sensor", f.sensor}, {"amplitude", json_number(f.amplitude, "amplitude")},
                        {"phase_deg", f.phase_deg ? json_number(*f.phase_deg, "phase") : Json(nullptr)},
                        {"fitted_amplitude", json_number(f.fitted_amplitude, "fit")},
                        {"fitted_phase_deg", f.fitted_phase_deg ? json_number(*f.fitted_phase_deg, "fit") : Json(nullptr)},
                        {"residual", json_number(f.residual, "residual")},
                        {"severity", severity_json(f.severity)}});
  res["readings"] = readings;
  j["residual"] = res;
  Json pred = Json::array();
  for (const auto& p : r.predicted)
    pred.push_back({{"sensor", p.sensor}, {"amplitude", json_number(p.amplitude, "predicted")},
                    {"phase_deg", json_number(p.phase_deg, "predicted")}, {"severity", severity_json(p.severity)}});
  j["predicted"] = pred;
  if (!r.settles.empty()) {
    Json settles = Json::array();
    for (const auto& f : r.settles)
      settles.push_back({{"run", f.run}, {"settle_deg", json_number(f.settle_deg, "settle")},
                         {"fitted_deg", json_number(f.fitted_deg, "settle")},
                         {"residual_deg", json_number(f.residual_deg, "settle")}});
    j["settles"] = settles;
  }
  if (r.condition_number) j["condition_number"] = json_number(*r.condition_number, "condition");
  if (r.static_couple)
    j["static_couple"] = {{"static", polar_json(r.static_couple->static_gmm, "unbalance_gmm")},
                          {"couple", polar_json(r.static_couple->couple_gmm, "unbalance_gmm")}};
  if (r.consistency) j["consistency"] = json_number(*r.consistency, "consistency");
  if (r.heavy_spot_deg) j["heavy_spot_deg"] = json_number(*r.heavy_spot_deg, "heavy spot");
  if (r.adapter) {
    Json a;
    a["rotor_reading"] = polar_json(r.adapter->rotor_reading, "amplitude");
    a["adapter_reading"] = polar_json(r.adapter->adapter_reading, "amplitude");
    a["adapter_correction"] = r.adapter->adapter_correction ? correction_json(*r.adapter->adapter_correction) : Json(nullptr);
    j["adapter"] = a;
  }
  if (r.tolerance) {
    Json shares = Json::array();
    for (double s : r.tolerance->plane_permissible_gmm) shares.push_back(json_number(s, "tolerance"));
    j["tolerance"] = {{"grade", r.tolerance->grade},
                      {"permissible_gmm", json_number(r.tolerance->permissible_gmm, "tolerance")},
                      {"plane_permissible_gmm", shares},
                      {"met", r.tolerance->met}};
  }
  Json warnings = solved.notes;
  for (const auto& w : r.warnings) warnings.push_back(w);
  j["warnings"] = warnings;
  j["job"] = job.source;
  return j;
}

std::string solved_text(const Job& job, const SolvedJob& solved) {
  const solve::SolveResult& r = solved.result;
  std::string s = fmt::format("trimwright {} · {} · method {}\n", TRIMWRIGHT_VERSION, job.source, r.method);
  for (const auto& c : r.corrections)
    s += fmt::format("  plane {}: add {:.2f} g·mm at {:.1f}°{}\n", c.plane, c.unbalance_gmm, c.angle_deg,
                     c.mass_g ? fmt::format(" ({:.3f} g at {:g} mm)", *c.mass_g, c.radius_mm) : "");
  for (const auto& c : r.combined)
    s += fmt::format("  plane {} with the last run's weights, as one: {:.2f} g·mm at {:.1f}°\n", c.plane,
                     c.unbalance_gmm, c.angle_deg);
  if (r.static_couple)
    s += fmt::format("  static {:.2f} g·mm at {:.1f}°, couple {:.2f} g·mm at {:.1f}°\n",
                     r.static_couple->static_gmm.magnitude, r.static_couple->static_gmm.angle_deg,
                     r.static_couple->couple_gmm.magnitude, r.static_couple->couple_gmm.angle_deg);
  if (r.heavy_spot_deg) s += fmt::format("  heavy spot at {:.1f}°\n", *r.heavy_spot_deg);
  if (r.consistency) s += fmt::format("  four-run consistency {:.3f} (1 = consistent)\n", *r.consistency);
  if (r.condition_number) s += fmt::format("  influence matrix condition number {:.1f}\n", *r.condition_number);
  if (!r.readings.empty())
    s += fmt::format("  residual RMS {:.3g} {} over {} reading{} ({} redundant)\n", r.residual_rms,
                     job.readings->units, r.readings.size(), r.readings.size() == 1 ? "" : "s", r.redundancy);
  for (const auto& f : r.settles)
    s += fmt::format("  run \"{}\": settled at {:.1f}°, the fit says {:.1f}° ({:+.1f}°)\n", f.run, f.settle_deg,
                     f.fitted_deg, f.residual_deg);
  for (const auto& p : r.predicted)
    s += fmt::format("  predicted after correction, sensor {}: {:.3g} {}{}\n", p.sensor, p.amplitude,
                     job.readings->units,
                     p.severity ? fmt::format(" ({:.2f} mm/s RMS, zone {})", p.severity->velocity_rms_mm_s,
                                              solve::zone_letter(p.severity->zone))
                                : "");
  if (r.tolerance)
    s += fmt::format("  tolerance {}: {:.2f} g·mm for the rotor; {}\n", r.tolerance->grade,
                     r.tolerance->permissible_gmm, r.tolerance->met ? "met now" : "not met yet: correct it");
  if (!solved.saved_influence.empty()) s += fmt::format("  influence coefficients saved to {}\n", solved.saved_influence);
  for (const auto& n : solved.notes) s += fmt::format("  note        {}\n", n);
  for (const auto& w : r.warnings) s += fmt::format("  warning     {}\n", w);
  return s;
}

}  // namespace

std::string solve_json(const std::string& job_path) {
  Job job = load_job(job_path);
  if (!job.readings)
    throw InputError(fmt::format("{}: no [readings]: expected readings to solve (a [correction] is already solved)", job.source));
  return io::dump_json(solved_json(job, solve_job(job)));
}

void add_solve_command(CLI::App& app, int& exit_code) {
  auto path = std::make_shared<std::string>();
  auto json = std::make_shared<bool>(false);
  CLI::App* sub = app.add_subcommand("solve", "Solve a job's readings: correction, residuals and tolerance");
  sub->add_option("job", *path, "Job file (TOML) with [readings]")->required();
  sub->add_flag("--json", *json, "Print the result as JSON");
  sub->callback([path, json, &exit_code] {
    Job job = load_job(*path);
    if (!job.readings)
      throw InputError(fmt::format("{}: no [readings]: expected readings to solve (a [correction] is already solved)", job.source));
    SolvedJob solved = solve_job(job);
    fmt::print("{}", *json ? io::dump_json(solved_json(job, solved)) : solved_text(job, solved));
    exit_code = 0;
  });
}

void add_grade_command(CLI::App& app, int& exit_code) {
  auto mass = std::make_shared<double>(0);
  auto rpm = std::make_shared<double>(0);
  auto grade = std::make_shared<std::string>();
  auto json = std::make_shared<bool>(false);
  CLI::App* sub = app.add_subcommand("grade", "Permissible residual unbalance (ISO 21940-11) for a rotor");
  sub->add_option("--mass-kg", *mass, "Rotor mass, kg")->required()->check(CLI::PositiveNumber);
  sub->add_option("--rpm", *rpm, "Running speed, rpm")->required()->check(CLI::PositiveNumber);
  sub->add_option("--grade", *grade, "Balance grade, e.g. G6.3 (default: list every grade)");
  sub->add_flag("--json", *json, "Print the result as JSON");
  sub->callback([=, &exit_code] {
    std::vector<double> grades;
    if (!grade->empty()) grades.push_back(solve::parse_grade(*grade, "--grade"));
    else
      for (const auto& g : solve::balance_grades()) grades.push_back(g.g_mm_s);
    Json list = Json::array();
    std::string text = fmt::format("rotor {:g} kg at {:g} rpm (ISO 21940-11: U_per = 9549·G·M/n)\n", *mass, *rpm);
    for (double g : grades) {
      double u = solve::permissible_unbalance_gmm(g, *mass, *rpm);
      double e = solve::permissible_eccentricity_um(g, *rpm);
      std::string types;
      for (const auto& bg : solve::balance_grades())
        if (bg.g_mm_s == g) types = bg.rotor_types;
      list.push_back({{"grade", solve::grade_name(g)}, {"permissible_gmm", json_number(u, "U_per")},
                      {"eccentricity_um", json_number(e, "e_per")}, {"rotor_types", types}});
      text += fmt::format("  {:<7} {:>12.4g} g·mm  {:>10.4g} µm  {}\n", solve::grade_name(g), u, e, types);
    }
    if (*json) {
      Json j = grades.size() == 1 ? list[0] : Json{{"grades", list}};
      j["mass_kg"] = json_number(*mass, "mass");
      j["speed_rpm"] = json_number(*rpm, "speed");
      fmt::print("{}", io::dump_json(j));
    } else {
      fmt::print("{}", text);
    }
    exit_code = 0;
  });
}

}  // namespace trimwright::cli
