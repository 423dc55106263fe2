// SPDX-License-Identifier: GPL-3.0-or-later
// Every check of a design (design.md §6). Each yields a value, a limit, a verdict and a one-line
// note that, on failure, says what would fix it. Unknown inputs fail with a note asking for them:
// a check never passes on a number it does not have. docs/safety.md gives formulas and sources.
#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <optional>

#include "geom/base/error.hpp"
#include "geom/check/check.hpp"

namespace trimwright::check {
namespace {

using fixture::Design;
using fixture::Part;

using Point2 = std::array<double, 2>;

/// Lengths within this of their limit count as meeting it: a design sized exactly to a limit
/// must not fail on floating-point rounding. A tenth of a micrometre is far below any printer's
/// resolution.
constexpr double kLengthTolerance_mm = 1e-4;

CheckResult result(std::string name, double value, double limit, std::string unit, bool ok,
                   std::string note, std::string subject = {}) {
  CheckResult r;
  r.name = std::move(name);
  r.value = value;
  r.limit = limit;
  r.unit = std::move(unit);
  r.ok = ok;
  r.note = std::move(note);
  r.subject = std::move(subject);
  return r;
}

bool positive(double v) { return std::isfinite(v) && v > 0; }

std::optional<double> setting_value(const Design& d, const std::string& key) {
  for (const auto& s : d.setting)
    if (s.key == key) return s.value;
  return std::nullopt;
}

/// Where the spindle axis can sit in a part's frame (design.md §3). A family with a sliding
/// setting (`spindle_x_mm`) is checked at its current setting and at both ends of its range, so
/// that every setting on the chart is covered; other families have the axis at the origin.
std::vector<Point2> spindle_positions(const Design& d, const Part& p) {
  std::optional<double> sx = setting_value(d, "spindle_x_mm");
  if (!sx) return {{0, 0}};
  std::vector<Point2> out{{*sx, 0}};
  if (d.parts.size() == 1 && positive(p.mass_g) && positive(d.range_max_gmm)) {
    double cx = p.centroid_mm[0];
    out.push_back({cx, 0});                            // neutral: no offset
    out.push_back({cx - d.range_max_gmm / p.mass_g, 0});  // the largest offset
  }
  return out;
}

double farthest_mm(const std::vector<Point2>& axes, double x, double y) {
  double r = 0;
  for (const auto& a : axes) r = std::max(r, std::hypot(x - a[0], y - a[1]));
  return r;
}

bool is_warm_machine(const std::string& kind) {
  return kind == "grinding-wheel" || kind == "buffing-wheel";
}

// ---- 1. speed and surface speed ----------------------------------------------------------------

CheckResult check_speed(const Context& c) {
  const double n = c.speed_rpm;
  if (!c.rotor_max_speed_rpm || !positive(*c.rotor_max_speed_rpm)) {
    CheckResult r = result(
        "speed", n, 0, "rpm", false,
        fmt::format("the rotor's marked maximum speed is unknown: read it off the {} and set "
                    "rotor.max_speed_rpm; never run a rotor faster than its marked speed",
                    c.rotor_kind.empty() ? "rotor" : c.rotor_kind));
    // Every abrasive wheel is marked: there is no excuse to run one without knowing it.
    r.acceptable = !is_warm_machine(c.rotor_kind);
    return r;
  }
  const double max = *c.rotor_max_speed_rpm;
  if (n <= max)
    return result("speed", n, max, "rpm", true,
                  fmt::format("running {:.0f} rpm, within the rotor's marked {:.0f} rpm", n, max));
  CheckResult r = result(
      "speed", n, max, "rpm", false,
      fmt::format("running {:.0f} rpm is over the rotor's marked {:.0f} rpm: use a rotor marked for "
                  "at least {:.0f} rpm or a slower machine; this can never be accepted",
                  n, max, n));
  r.acceptable = false;
  return r;
}

std::optional<CheckResult> check_surface_speed(const Context& c) {
  if (!positive(c.rotor_diameter_mm)) return std::nullopt;
  double v = surface_speed_m_s(c.rotor_diameter_mm, c.speed_rpm);
  if (c.rotor_max_speed_rpm && positive(*c.rotor_max_speed_rpm)) {
    double v_max = surface_speed_m_s(c.rotor_diameter_mm, *c.rotor_max_speed_rpm);
    return result("surface-speed", v, v_max, "m/s", true,
                  fmt::format("rim speed {:.1f} m/s (Ø{:g} mm at {:.0f} rpm); at the marked "
                              "{:.0f} rpm it would be {:.1f} m/s (information)",
                              v, c.rotor_diameter_mm, c.speed_rpm, *c.rotor_max_speed_rpm, v_max));
  }
  return result("surface-speed", v, v, "m/s", true,
                fmt::format("rim speed {:.1f} m/s (Ø{:g} mm at {:.0f} rpm) (information)", v,
                            c.rotor_diameter_mm, c.speed_rpm));
}

// ---- 2. disc stress ----------------------------------------------------------------------------

struct DiscStress {
  double hoop_mpa = 0;
  double radial_mpa = 0;
  double insert_mpa = 0;  ///< the inserts' share of hoop_mpa
  std::string problem;    ///< non-empty: the stress could not be computed, and why
};

DiscStress disc_stress(const Part& p, const Context& c, double proof_rpm) {
  DiscStress s;
  const auto& sh = p.shape;
  double rho = positive(p.density_g_cm3) ? p.density_g_cm3 : c.material.density_g_cm3;
  double ro = sh.outer_radius_mm, ri = sh.inner_radius_mm;
  double nu = c.material.poisson;
  if (!positive(rho)) {
    s.problem = "the material's density is unknown: set material.density_g_cm3";
  } else if (!positive(ro)) {
    s.problem = "the part's outer radius is not known to the checks";
  } else if (!(ri >= 0) || ri >= ro) {
    s.problem = fmt::format("its bore radius {:g} mm is not inside its outer radius {:g} mm", ri, ro);
  } else if (!(nu >= 0 && nu < 0.5)) {
    s.problem = fmt::format("Poisson's ratio {:g} is not in [0, 0.5): set material.poisson", nu);
  }
  if (!s.problem.empty()) return s;
  s.hoop_mpa = ri > 0 ? hoop_stress_annulus_mpa(rho, nu, ro, ri, proof_rpm)
                      : hoop_stress_solid_disc_mpa(rho, nu, ro, proof_rpm);
  s.radial_mpa = radial_stress_annulus_mpa(rho, nu, ro, ri, proof_rpm);
  double insert_g = 0;
  for (const auto& ins : p.inserts) insert_g += ins.mass_g;
  if (insert_g > 0) {
    if (!positive(sh.thickness_mm)) {
      s.problem = "the part's thickness is unknown, so its inserts' load cannot be checked";
      return s;
    }
    // The inserts as a ring at the rim: for a given mass that is the worst place (docs/safety.md).
    double p_mpa = rim_load_mpa(insert_g, sh.thickness_mm, proof_rpm);
    s.insert_mpa = rim_load_hoop_stress_mpa(p_mpa, ro, ri);
    s.hoop_mpa += s.insert_mpa;
    s.radial_mpa += p_mpa;
  }
  return s;
}

std::optional<CheckResult> check_disc_stress(const Design& d, const Context& c) {
  // Clamp weights are not discs about the spindle: their clamp and pocket walls carry the load
  // (clamp, insert-retention).
  if (d.family == "clamp-weights" || d.parts.empty()) return std::nullopt;
  const double proof_rpm = c.speed_rpm * c.overspeed_factor;
  const double tensile = c.material.tensile_mpa;
  if (!positive(tensile))
    return result("disc-stress", 0, 0, "MPa", false,
                  "the material's tensile strength is unknown: set material.tensile_mpa from the "
                  "filament maker's data");
  const double allowed = tensile / kPlasticSafetyFactor;
  std::optional<CheckResult> worst;
  double worst_ratio = -1;
  for (const auto& p : d.parts) {
    DiscStress s = disc_stress(p, c, proof_rpm);
    if (!s.problem.empty())
      return result("disc-stress", 0, allowed, "MPa", false,
                    fmt::format("{}: cannot compute its stress: {}", p.name, s.problem), p.name);
    double ratio = s.hoop_mpa / allowed;
    if (!(ratio <= worst_ratio)) {  // NaN replaces too: it must fail
      worst_ratio = ratio;
      bool ok = s.hoop_mpa <= allowed;
      std::string inserts =
          s.insert_mpa > 0 ? fmt::format(" (inserts {:.2f} MPa of it)", s.insert_mpa) : std::string();
      std::string base = fmt::format(
          "{}: peak hoop stress {:.2f} MPa{}, radial {:.2f} MPa, at {:.0f} rpm ({:g} × running), "
          "Ø{:.1f} mm reach; allowed {:g} MPa ({} {:g} MPa / {:g})",
          p.name, s.hoop_mpa, inserts, s.radial_mpa, proof_rpm, c.overspeed_factor,
          2 * p.shape.outer_radius_mm, allowed, c.material.name, tensile, kPlasticSafetyFactor);
      if (!ok)
        base += ": fix: a smaller fixture diameter, a lower speed, or a stronger material";
      worst = result("disc-stress", s.hoop_mpa, allowed, "MPa", ok, base, p.name);
    }
  }
  return worst;
}

// ---- 3. insert retention -----------------------------------------------------------------------

std::optional<CheckResult> check_insert_retention(const Design& d, const Context& c) {
  const double proof_rpm = c.speed_rpm * c.overspeed_factor;
  const double tensile = c.material.tensile_mpa;
  std::optional<CheckResult> worst;
  double worst_ratio = -1;
  for (const auto& p : d.parts) {
    if (p.inserts.empty()) continue;
    std::vector<Point2> axes = spindle_positions(d, p);
    const double wall = p.shape.min_wall_mm;
    for (const auto& ins : p.inserts) {
      std::string subject = fmt::format("{} {}", p.name, ins.kind);
      if (!positive(tensile))
        return result("insert-retention", 0, 0, "N", false,
                      "the material's tensile strength is unknown: set material.tensile_mpa", subject);
      if (!positive(wall))
        return result("insert-retention", 0, 0, "N", false,
                      fmt::format("{}: the wall around its pocket is not known to the checks", subject),
                      subject);
      double r = farthest_mm(axes, ins.position_mm[0], ins.position_mm[1]);
      double force = centrifugal_force_n(ins.mass_g, r, proof_rpm);
      double cube = equivalent_cube_side_mm(ins.mass_g, kInsertSizingDensity_g_cm3);
      double height = positive(p.shape.thickness_mm) ? std::min(cube, p.shape.thickness_mm) : cube;
      double capacity = insert_shear_capacity_n(wall, height, tensile);
      double allowed = capacity / kPlasticSafetyFactor;
      double ratio = force / allowed;
      if (ratio <= worst_ratio) continue;
      worst_ratio = ratio;
      bool ok = force <= allowed;
      std::string note = fmt::format(
          "{}: {:.2f} g at up to {:.1f} mm from the axis pulls {:.1f} N at {:.0f} rpm; the {:.2f} mm "
          "wall shears out at {:.0f} N (2 × {:.2f} × {:.2f} mm² × {:g} × {:g} MPa), allowed {:.1f} N (/ {:g})",
          subject, ins.mass_g, r, force, proof_rpm, wall, capacity, wall, height, kShearFraction,
          tensile, allowed, kPlasticSafetyFactor);
      if (!ok) {
        double wall_needed = wall * ratio;
        note += fmt::format(": fix: a wall of at least {:.1f} mm toward the rim, a lighter insert, "
                            "the pocket nearer the axis, or a lower speed",
                            wall_needed);
      }
      worst = result("insert-retention", force, allowed, "N", ok, note, subject);
    }
  }
  return worst;
}

// ---- 4. clamp ----------------------------------------------------------------------------------

/// Torque, N·m. For a spindle nut: rounded up to 0.5 N·m steps and no less than
/// kMinAdvisedTorque_nm. For a small screw (under 6 mm, e.g. a clamp weight's M3 set screw in
/// plastic) that floor would strip the plastic: rounded up to 0.1 N·m, no less than
/// kMinAdvisedScrewTorque_nm.
double advised_torque_nm(double needed_nm, double thread_mm) {
  if (thread_mm < 6.0) return std::max(kMinAdvisedScrewTorque_nm, std::ceil(needed_nm / 0.1 - 1e-9) * 0.1);
  return std::max(kMinAdvisedTorque_nm, std::ceil(needed_nm / 0.5 - 1e-9) * 0.5);
}

std::optional<CheckResult> check_clamp(const Design& d, const Context& c) {
  // A bore sleeve is held by the wheel's own flanges and adds no eccentric mass to clamp.
  if (d.parts.empty() || d.family == "bore-sleeve") return std::nullopt;
  const double proof_rpm = c.speed_rpm * c.overspeed_factor;
  const bool weights = d.family == "clamp-weights";
  const double thread_mm = weights ? c.clamp_screw_diameter_mm.value_or(0) : c.spindle_diameter_mm;
  const double mu = c.friction, k = c.nut_factor;

  // Force that would slide the fixture: for clamp weights, the worst single weight (each has its
  // own screw); otherwise every part under the one nut together, each at its worst setting.
  double force = 0;
  std::string subject;
  for (const auto& p : d.parts) {
    std::vector<Point2> axes = spindle_positions(d, p);
    double e = farthest_mm(axes, p.centroid_mm[0], p.centroid_mm[1]);
    double f = centrifugal_force_n(p.mass_g, e, proof_rpm);
    if (weights) {
      if (f > force) { force = f; subject = p.name; }
    } else {
      force += f;
    }
  }
  if (!weights) {
    double u_gmm = std::max(d.achieved_gmm, d.range_max_gmm);
    force = std::max(force, centrifugal_force_n(u_gmm, 1.0, proof_rpm));
  }

  if (!positive(thread_mm))
    return result("clamp", force, 0, "N", false,
                  weights ? "the clamp screw's diameter is unknown: the checks need it to size the "
                            "clamp (clamp_screw_diameter_mm)"
                          : "the spindle's thread diameter is unknown: set machine.spindle_diameter_mm",
                  subject);
  if (!positive(mu) || !positive(k))
    return result("clamp", force, 0, "N", false,
                  fmt::format("friction {:g} and nut factor {:g} must both be positive", mu, k), subject);

  const double needed_preload = kClampSafetyFactor * force / (mu * kClampFrictionFaces);
  const double needed_nm = nut_torque_nm(needed_preload, thread_mm, k);
  const double advised = advised_torque_nm(needed_nm, thread_mm);
  const double torque = c.nut_torque_nm ? *c.nut_torque_nm : std::min(advised, kModestTorque_nm);
  const double preload = nut_preload_n(torque, thread_mm, k);
  const double friction_n = mu * kClampFrictionFaces * preload;
  const double allowed = friction_n / kClampSafetyFactor;
  const bool ok = force <= allowed;
  std::string note = fmt::format(
      "{:.1f} N centrifugal at {:.0f} rpm against {:.0f} N friction ({} faces × μ {:g} × {:.0f} N "
      "preload from {:g} N·m on a {:g} mm thread, K {:g}), allowed {:.0f} N (/ {:g})",
      force, proof_rpm, friction_n, kClampFrictionFaces, mu, preload, torque, thread_mm, k, allowed,
      kClampSafetyFactor);
  if (ok && torque > kModestTorque_nm) {
    note += fmt::format(": {:g} N·m is more than a modest {:g} N·m: printed plastic creeps and can "
                        "crack under it; re-check the nut after the first runs",
                        torque, kModestTorque_nm);
  } else if (ok) {
    note += fmt::format(": tighten to about {:g} N·m; printed plastic creeps under preload, so "
                        "re-check the nut after the first runs",
                        std::max(torque, advised));
  } else if (!c.nut_torque_nm || needed_nm > kModestTorque_nm) {
    note += fmt::format(": it needs about {:.1f} N·m, more than a modest {:g} N·m on printed plastic: "
                        "fix: a smaller correction per part, a lower speed, or a larger thread",
                        needed_nm, kModestTorque_nm);
  } else {
    note += fmt::format(": fix: tighten to about {:g} N·m", advised);
  }
  return result("clamp", force, allowed, "N", ok, note, subject);
}

// ---- 5. thread ---------------------------------------------------------------------------------

std::optional<CheckResult> check_thread(const Design& d, const Context& c) {
  // Clamp weights hold on a rim by their own screws and a bore sleeve sits inside the wheel's
  // bore: neither takes thread from the spindle.
  if (d.family == "clamp-weights" || d.family == "bore-sleeve") return std::nullopt;
  const double stack = d.stack_height_mm;
  const bool under = c.mount == "under-nut";
  const std::string whose = under ? "the wheel's own nut" : "the fixture's nut";
  if (!positive(stack))
    return result("thread", c.free_thread_mm.value_or(0), 0, "mm", false,
                  "the fixture's stack height is not known to the checks");
  if (!c.free_thread_mm)
    return result("thread", 0, stack, "mm", false,
                  fmt::format("free thread unknown: measure the thread left past the wheel's "
                              "tightened nut and set machine.free_thread_mm; {} needs {:.1f} mm",
                              under ? "the disc under the nut" : "the fixture, washer and nut",
                              stack));
  const double free = *c.free_thread_mm;
  const bool ok = free >= stack - kLengthTolerance_mm;
  std::string what = under ? fmt::format("the disc under the nut pushes {} out by {:.1f} mm", whose, stack)
                           : fmt::format("fixture, washer and nut take {:.1f} mm", stack);
  std::string note = fmt::format("free thread {:.1f} mm; {}", free, what);
  note += ok ? fmt::format(": {} is fully engaged", whose)
             : fmt::format(": {} would not be fully engaged: fix: a thinner fixture or nut, or a "
                           "spindle with more free thread",
                           whose);
  return result("thread", free, stack, "mm", ok, note);
}

// ---- 6. envelope -------------------------------------------------------------------------------

CheckResult check_envelope(const Design& d, const Context& c) {
  const double swept = d.swept_diameter_mm;
  std::optional<double> limit;
  std::string basis;
  if (positive(c.max_diameter_mm)) {
    limit = c.max_diameter_mm;
    basis = fmt::format("room {:g} mm", c.max_diameter_mm);
  }
  if (positive(c.rotor_diameter_mm)) {
    double clear = c.rotor_diameter_mm - 2 * kWorkClearance_mm;
    std::string b = fmt::format("rotor Ø{:g} mm less {:g} mm each side", c.rotor_diameter_mm,
                                kWorkClearance_mm);
    if (!limit || clear < *limit) {
      limit = clear;
      basis = b;
    }
  }
  if (!limit)
    return result("envelope", swept, 0, "mm", false,
                  "neither the room for the fixture nor the rotor's diameter is known: set "
                  "machine.max_fixture_diameter_mm and rotor.diameter_mm");
  if (!positive(swept))
    return result("envelope", swept, *limit, "mm", false,
                  "the fixture's swept diameter is not known to the checks");
  const bool ok = swept <= *limit + kLengthTolerance_mm;
  std::string note = fmt::format("swept Ø{:.1f} mm within Ø{:.1f} mm ({})", swept, *limit, basis);
  if (!ok)
    note = fmt::format("swept Ø{:.1f} mm exceeds Ø{:.1f} mm ({}): fix: a smaller max_diameter_mm "
                       "(a denser material or inserts keep the range)",
                       swept, *limit, basis);
  return result("envelope", swept, *limit, "mm", ok, note);
}

// ---- 7. temperature and creep ------------------------------------------------------------------

CheckResult check_temperature(const Context& c) {
  const bool measured = c.service_temp_c.has_value();
  const double t = measured ? *c.service_temp_c
                            : (is_warm_machine(c.rotor_kind) ? kWarmMachineTemp_c : kOtherMachineTemp_c);
  const double limit = c.material.max_temp_c;
  const std::string basis = measured ? "as given" : "assumed for a " + (c.rotor_kind.empty() ? std::string("rotor") : c.rotor_kind);
  if (!positive(limit))
    return result("material-temperature", t, 0, "°C", false,
                  "the material's service temperature is unknown: set material.max_temp_c");
  const bool ok = t <= limit;
  std::string note = fmt::format("flange {:.0f} °C ({}) against {} rated to {:.0f} °C", t, basis,
                                 c.material.name, limit);
  if (!ok) note += ": fix: a material rated hotter (PETG, ASA, PC)";
  return result("material-temperature", t, limit, "°C", ok, note);
}

CheckResult check_creep(const Design& d, const Context& c) {
  if (c.mount != "under-nut")
    return result("creep", 0, 0, "parts", true,
                  "no printed part carries the wheel's clamping load (outboard, on its own nut)");
  return result(
      "creep", static_cast<double>(d.parts.size()), 0, "parts", false,
      "a printed part under the wheel's nut carries the wheel's clamping load: the plastic creeps "
      "(PLA even when cool), the nut loses its grip and the wheel can slip; fix: mount = "
      "\"outboard\"; if you accept it, re-torque the wheel's nut after the first runs and at every "
      "wheel check");
}

// ---- 8. printability ---------------------------------------------------------------------------

/// The part with the smallest `field` among those `applies` selects; nullptr when none.
template <typename Field, typename Applies>
const Part* thinnest(const Design& d, Field field, Applies applies) {
  const Part* best = nullptr;
  for (const auto& p : d.parts)
    if (applies(p) && (!best || !(field(p) >= field(*best)))) best = &p;
  return best;
}

void check_printability(const Design& d, const Context& c, std::vector<CheckResult>& out) {
  // Walls: two extrusion lines at least.
  if (const Part* p = thinnest(d, [](const Part& q) { return q.shape.min_wall_mm; },
                               [](const Part&) { return true; })) {
    double v = p->shape.min_wall_mm, lim = 2 * c.nozzle_mm;
    bool ok = v >= lim - kLengthTolerance_mm;
    std::string note = fmt::format("{}: thinnest wall {:.2f} mm, at least 2 lines of the {:g} mm nozzle",
                                   p->name, v, c.nozzle_mm);
    if (!ok) note += ": fix: a smaller nozzle, or a design with thicker walls (larger disc, narrower slot)";
    out.push_back(result("print-wall", v, lim, "mm", ok, note, p->name));
  }
  auto engraved = [](const Part& q) { return q.shape.engraving_depth_mm > 0; };
  if (const Part* p = thinnest(d, [](const Part& q) { return q.shape.min_feature_mm; }, engraved)) {
    double v = p->shape.min_feature_mm, lim = c.nozzle_mm;
    bool ok = v >= lim - kLengthTolerance_mm;
    std::string note = fmt::format("{}: narrowest engraved stroke {:.2f} mm against the {:g} mm nozzle",
                                   p->name, v, c.nozzle_mm);
    if (!ok) note += ": fix: a smaller nozzle; the marks would not print";
    out.push_back(result("print-feature", v, lim, "mm", ok, note, p->name));
  }
  if (const Part* p = thinnest(d, [](const Part& q) { return q.shape.engraving_depth_mm; }, engraved)) {
    double v = p->shape.engraving_depth_mm, lim = 2 * c.layer_mm;
    bool ok = v >= lim - kLengthTolerance_mm;
    std::string note = fmt::format("{}: engraving {:.2f} mm deep, at least 2 layers of {:g} mm",
                                   p->name, v, c.layer_mm);
    if (!ok) note += ": fix: thinner layers; the marks would be lost";
    out.push_back(result("print-engraving", v, lim, "mm", ok, note, p->name));
  }
  if (const Part* p = thinnest(d, [](const Part& q) { return q.shape.pocket_cover_mm; },
                               [](const Part& q) { return q.shape.pocket_cover_mm > 0; })) {
    double v = p->shape.pocket_cover_mm, lim = 3 * c.layer_mm;
    bool ok = v >= lim - kLengthTolerance_mm;
    std::string note = fmt::format("{}: {:.2f} mm printed over the insert pockets, at least 3 layers of {:g} mm",
                                   p->name, v, c.layer_mm);
    if (!ok) note += ": fix: thinner layers or a thicker cover; a thin cover can sag or split";
    out.push_back(result("print-cover", v, lim, "mm", ok, note, p->name));
  }
  {
    double v = c.infill_percent;
    bool ok = v >= 100;
    std::string note = ok ? std::string("solid parts (100 % infill), as the mass model and the strength checks assume")
                          : fmt::format("infill {:g} %: the mass model and the strength checks assume solid "
                                        "parts: fix: print at 100 %; if you accept it, weigh every part and "
                                        "run `chart --weighed`",
                                        v);
    out.push_back(result("print-infill", v, 100, "%", ok, note));
  }
}

/// Checks whose value must reach its limit (enough thread, thick enough walls, solid infill);
/// every other check's value must stay within its limit.
bool must_reach_limit(const std::string& name) {
  return name == "thread" || name.rfind("print-", 0) == 0;
}

void validate(const Context& c) {
  if (!positive(c.speed_rpm))
    throw InputError(fmt::format("machine.speed_rpm: {} is not a running speed; expected a positive "
                                 "number of rpm", c.speed_rpm));
  if (!(c.overspeed_factor >= 1) || !std::isfinite(c.overspeed_factor))
    throw InputError(fmt::format("checks: overspeed factor {} is below 1; expected the proof speed "
                                 "over the running speed, 1.5 by default", c.overspeed_factor));
  if (c.mount != "outboard" && c.mount != "under-nut")
    throw InputError(fmt::format("fixture.mount: \"{}\"; expected \"outboard\" or \"under-nut\"", c.mount));
}

}  // namespace

std::vector<CheckResult> run_checks(const fixture::Design& design, const Context& context) {
  validate(context);
  std::vector<CheckResult> out;
  auto add = [&out](std::optional<CheckResult> r) {
    if (r) out.push_back(std::move(*r));
  };
  out.push_back(check_speed(context));
  add(check_surface_speed(context));
  add(check_disc_stress(design, context));
  add(check_insert_retention(design, context));
  add(check_clamp(design, context));
  add(check_thread(design, context));
  out.push_back(check_envelope(design, context));
  out.push_back(check_temperature(context));
  out.push_back(check_creep(design, context));
  check_printability(design, context, out);
  for (auto& r : out) {
    r.at_least = must_reach_limit(r.name);
    if (r.ok || !r.acceptable) continue;
    r.accepted = std::find(context.accept.begin(), context.accept.end(), r.name) != context.accept.end();
  }
  return out;
}

std::vector<std::string> blocking_failures(const std::vector<CheckResult>& checks) {
  std::vector<std::string> names;
  for (const auto& r : checks) {
    if (r.ok || (r.accepted && r.acceptable)) continue;
    if (std::find(names.begin(), names.end(), r.name) == names.end()) names.push_back(r.name);
  }
  return names;
}

const std::vector<std::string>& check_names() {
  static const std::vector<std::string> names = {
      "speed",          "surface-speed", "disc-stress",          "insert-retention",
      "clamp",          "thread",        "envelope",             "material-temperature",
      "creep",          "print-wall",    "print-feature",        "print-engraving",
      "print-cover",    "print-infill"};
  return names;
}

}  // namespace trimwright::check
