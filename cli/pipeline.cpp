// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/pipeline.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/io/files.hpp"
#include "geom/solve/conventions.hpp"
#include "geom/solve/tolerance.hpp"

namespace trimwright::cli {
namespace {

/// Clamping washer proportions for a spindle of diameter d: outer diameter 2·d and thickness
/// 0.18·d, close to the ISO 7089 normal series (M5 5.3 × 10 × 1, M8 8.4 × 16 × 1.6; references.md).
constexpr double kWasherDiameterRatio = 2.0;
constexpr double kWasherThicknessRatio = 0.18;
/// The fixture's own nut when the job does not say: 0.8 × the spindle diameter (design.md §3a).
constexpr double kNutHeightRatio = 0.8;
/// Without any stated room, the fixture stays within half the rotor's diameter.
constexpr double kDefaultDiameterRatio = 0.5;

}  // namespace

fixture::Request make_request(const Job& job, const Correction& corr,
                              const std::optional<Tolerance>& tol, const DesignOptions& options,
                              std::vector<std::string>& warnings) {
  fixture::Request r;
  r.need.unbalance_gmm = corr.unbalance_gmm;
  r.need.angle_deg = corr.angle_deg;
  if (tol) r.need.permissible_gmm = tol->permissible_gmm;
  r.need.sized_for_gmm = job.fixture.sized_for_gmm;
  const MachineSpec& m = job.machine;
  fixture::MachineLimits& l = r.machine;
  l.speed_rpm = m.speed_rpm;
  l.spindle_diameter_mm = m.spindle_diameter_mm;
  l.free_thread_mm = m.free_thread_mm;
  l.nut_height_mm = m.nut_height_mm.value_or(kNutHeightRatio * m.spindle_diameter_mm);
  l.washer_diameter_mm = kWasherDiameterRatio * m.spindle_diameter_mm;
  l.washer_thickness_mm = std::max(1.0, kWasherThicknessRatio * m.spindle_diameter_mm);
  if (job.fixture.max_diameter_mm) {
    l.max_diameter_mm = *job.fixture.max_diameter_mm;
    if (m.max_fixture_diameter_mm && l.max_diameter_mm > *m.max_fixture_diameter_mm)
      throw InputError(fmt::format(
          "{}: fixture.max_diameter_mm = {:g}: expected at most machine.max_fixture_diameter_mm ({:g} mm, the room in the guard)",
          job.where("fixture.max_diameter_mm"), l.max_diameter_mm, *m.max_fixture_diameter_mm));
    if (l.max_diameter_mm <= m.spindle_diameter_mm)
      throw InputError(fmt::format(
          "{}: fixture.max_diameter_mm = {:g}: expected more than the spindle diameter ({:g} mm)",
          job.where("fixture.max_diameter_mm"), l.max_diameter_mm, m.spindle_diameter_mm));
  } else if (m.max_fixture_diameter_mm) {
    l.max_diameter_mm = *m.max_fixture_diameter_mm;
  } else {
    l.max_diameter_mm = kDefaultDiameterRatio * job.rotor.diameter_mm;
    warnings.push_back(fmt::format(
        "no fixture.max_diameter_mm or machine.max_fixture_diameter_mm: the fixture is kept within "
        "{:g} mm, half the rotor's diameter; measure the room in the guard and set it",
        l.max_diameter_mm));
  }
  l.max_thickness_mm = job.fixture.max_thickness_mm;
  l.mount = job.fixture.mount;
  l.flange_diameter_mm = m.flange_diameter_mm;
  l.rim_diameter_mm = job.fixture.rim_diameter_mm;
  l.rim_thickness_mm = job.fixture.rim_thickness_mm;
  r.positions_deg = job.fixture.positions_deg;
  l.rotor_mass_kg = job.rotor.mass_kg;
  l.rotor_bore_mm = job.rotor.bore_mm;
  l.rotor_width_mm = job.rotor.width_mm;
  l.bore_clearance_mm = job.rotor.bore_clearance_mm;
  r.print.nozzle_mm = job.print.nozzle_mm;
  r.print.layer_mm = job.print.layer_mm;
  r.print.clearance_mm = job.print.clearance_mm;
  r.print.infill_percent = job.print.infill_percent;
  r.print.material = job.material.name;
  r.print.density_g_cm3 = job.material.density_g_cm3;
  r.margin = job.fixture.margin;
  r.inserts = job.fixture.inserts;
  r.weighed_g = options.weighed_g;
  r.source = job.source;
  r.angles_ccw_from_fixture_side = solve::angles_count_ccw_seen_from_fixture(
      job.angles, job.machine.rotation == "cw" ? solve::Rotation::kCw : solve::Rotation::kCcw);
  return r;
}

namespace {

check::Context make_check_context(const Job& job, const fixture::Request& req) {
  check::Context c;
  c.speed_rpm = job.machine.speed_rpm;
  c.rotor_max_speed_rpm = job.rotor.max_speed_rpm;
  c.rotor_kind = job.rotor.kind;
  c.rotor_diameter_mm = job.rotor.diameter_mm;
  c.rotor_mass_kg = job.rotor.mass_kg;
  c.material = {job.material.name, job.material.density_g_cm3, job.material.tensile_mpa,
                job.material.poisson, job.material.max_temp_c};
  c.mount = job.fixture.mount;
  c.free_thread_mm = job.machine.free_thread_mm;
  c.nut_height_mm = req.machine.nut_height_mm;
  c.spindle_diameter_mm = job.machine.spindle_diameter_mm;
  c.max_diameter_mm = req.machine.max_diameter_mm;
  c.flange_diameter_mm = job.machine.flange_diameter_mm;
  c.nozzle_mm = job.print.nozzle_mm;
  c.layer_mm = job.print.layer_mm;
  c.infill_percent = job.print.infill_percent;
  c.accept = job.accept;
  return c;
}

}  // namespace

std::optional<Tolerance> find_tolerance(const Job& job) {
  if (!job.grade) return std::nullopt;
  double g = solve::parse_grade(*job.grade, job.where("target.grade") + ": target.grade");
  Tolerance t;
  t.grade = solve::grade_name(g);
  t.permissible_gmm = solve::permissible_unbalance_gmm(g, job.rotor.mass_kg, job.machine.speed_rpm);
  return t;
}

DesignRun run_design(const Job& job, const DesignOptions& options) {
  DesignRun run;
  run.job = job;
  run.correction = find_correction(job, options.plane);
  run.tolerance = find_tolerance(job);
  fixture::Request req = make_request(job, run.correction, run.tolerance, options, run.warnings);
  std::string family = options.family.value_or(job.fixture.family);
  run.design = fixture::design_family(family, req);
  check::Context context = make_check_context(job, req);
  context.clamp_screw_diameter_mm = run.design.clamp_screw_diameter_mm;
  run.checks = check::run_checks(run.design, context);
  // Mounting slop: a rotor that can sit e off the axis carries up to M·e by itself (U = M·e,
  // M in kg → g with 1000), whatever the fixture does; say so when that alone exceeds the grade.
  const double slop_mm = job.rotor.bore_clearance_mm > 0 ? job.rotor.bore_clearance_mm
                         : job.rotor.bore_mm ? (*job.rotor.bore_mm - job.machine.spindle_diameter_mm) / 2
                                             : 0.0;
  const double slop_gmm = job.rotor.mass_kg * 1000.0 * slop_mm;
  if (run.tolerance && slop_gmm > run.tolerance->permissible_gmm)
    run.warnings.push_back(fmt::format(
        "mounting slop: the rotor can sit {:.2f} mm off the axis, up to {:.1f} g·mm of unbalance by "
        "itself, more than the {} tolerance of {:.1f} g·mm{}",
        slop_mm, slop_gmm, run.tolerance->grade, run.tolerance->permissible_gmm,
        run.design.family == "bore-sleeve"
            ? ": the bore sleeve takes most of it up"
            : ": take up the slop first (family = \"bore-sleeve\", or centre the rotor as it will run)"));
  run.file_stem = io::sanitize_file_stem(job.title, "trimwright");
  for (const auto& n : run.correction.notes) run.warnings.push_back(n);
  for (const auto& w : run.design.warnings) run.warnings.push_back(w);
  return run;
}

}  // namespace trimwright::cli
