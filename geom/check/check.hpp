// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Safety and printability checks (design.md §6). Each returns a value, a limit, a verdict and a
/// one-line note; a failed check stops `design` (exit 1) unless the job accepts it by name.
/// The formulas, sources, assumptions and safety factors are in docs/safety.md.

#include <optional>
#include <string>
#include <vector>

#include "geom/fixture/fixture.hpp"

namespace trimwright::check {

/// The result of one check.
struct CheckResult {
  std::string name;        ///< stable identifier, used in [checks] accept, e.g. "disc-stress"
  double value = 0;        ///< what was found, in `unit`
  double limit = 0;        ///< what is allowed, in `unit`
  std::string unit;        ///< e.g. "MPa", "rpm", "mm"
  bool at_least = false;   ///< false: value must be ≤ limit; true: value must be ≥ limit
  bool ok = true;          ///< verdict
  bool acceptable = true;  ///< false: no job may accept this failure (e.g. over the marked speed)
  bool accepted = false;   ///< failed, but the job lists it under [checks] accept
  std::string note;        ///< one line: what was compared, and on failure what would fix it
  std::string subject;     ///< the part or insert the value belongs to; empty: the whole fixture
};

/// The material of the printed parts.
struct Material {
  std::string name;         ///< e.g. "PETG", shown in notes
  double density_g_cm3 = 0; ///< used when a part carries no density of its own
  double tensile_mpa = 0;   ///< in-plane tensile strength of printed parts; 0: unknown (fails)
  double poisson = 0.35;    ///< Poisson's ratio, [0, 0.5)
  double max_temp_c = 0;    ///< service temperature limit; 0: unknown (fails)
};

/// Everything the checks look at besides the design itself.
struct Context {
  double speed_rpm = 0;                       ///< running speed, > 0
  std::optional<double> rotor_max_speed_rpm;  ///< as marked on the rotor
  std::string rotor_kind;                     ///< grinding-wheel | buffing-wheel | …
  double rotor_diameter_mm = 0;               ///< 0: unknown
  double rotor_mass_kg = 0;                   ///< for the report; no check uses it yet
  double overspeed_factor = 1.5;              ///< proof speed / running speed, ≥ 1
  Material material;                          ///< the printed parts' material
  std::string mount = "outboard";             ///< outboard | under-nut
  std::optional<double> free_thread_mm;       ///< thread past the wheel's tightened nut, mm
  double nut_height_mm = 0;                   ///< the fixture's nut, mm (in the design's stack)
  double spindle_diameter_mm = 0;             ///< the thread the clamping nut runs on
  double max_diameter_mm = 0;                 ///< room for the fixture (guard, work); 0: unknown
  std::optional<double> flange_diameter_mm;   ///< outer flange, mm
  double nozzle_mm = 0.4;                     ///< printer nozzle (line width), mm
  double layer_mm = 0.2;                      ///< layer height, mm
  double infill_percent = 100;                ///< 0–100; below 100 fails print-infill
  std::vector<std::string> accept;            ///< [checks] accept
  /// Flange temperature in service, °C, when the user knows it; otherwise the checks assume
  /// kWarmMachineTemp_c for grinders and buffers, kOtherMachineTemp_c for other rotors.
  std::optional<double> service_temp_c;
  /// Torque the clamping nut is tightened to, N·m; default: the least that holds, in 0.5 N·m
  /// steps from kMinAdvisedTorque_nm, never above kModestTorque_nm.
  std::optional<double> nut_torque_nm;
  /// Thread that clamps a clamp-weights part onto its rim, mm (the weight's own screw); without
  /// it the clamp check of that family fails and asks for it.
  std::optional<double> clamp_screw_diameter_mm;
  double nut_factor = 0.2;                    ///< K in T = K·F·d (0.2 dry, 0.15 oiled)
  double friction = 0.2;                      ///< μ between printed plastic and steel
};

// ---- Assumptions (our own choices, justified in docs/safety.md) ---------------------------------

/// Safety factor on the printed material's strength (disc stress, insert retention).
inline constexpr double kPlasticSafetyFactor = 4.0;
/// Shear strength of printed plastic as a fraction of its in-plane tensile strength (low end of
/// the usual 0.5–0.6).
inline constexpr double kShearFraction = 0.5;
/// Safety factor on clamp friction against the fixture's centrifugal force.
inline constexpr double kClampSafetyFactor = 2.0;
/// Friction faces that hold a clamped part: the face toward the wheel and the washer.
inline constexpr int kClampFrictionFaces = 2;
/// A modest hand torque on a nut clamping printed plastic, N·m (firm, with a short spanner).
inline constexpr double kModestTorque_nm = 5.0;
/// Least torque the checks advise, N·m: below this a nut can work loose.
inline constexpr double kMinAdvisedTorque_nm = 2.0;
/// Least torque advised for a small screw in printed plastic (thread under 6 mm), N·m (our choice:
/// snug by hand with a small key).
inline constexpr double kMinAdvisedScrewTorque_nm = 0.2;
/// Assumed flange temperature of bench grinders and buffers in service, °C.
inline constexpr double kWarmMachineTemp_c = 60.0;
/// Assumed flange temperature of other machines in service, °C.
inline constexpr double kOtherMachineTemp_c = 45.0;
/// Radial room a fixture keeps inside the rotor's rim, mm, so it never reaches the work.
inline constexpr double kWorkClearance_mm = 5.0;
/// Density used to size an insert from its mass for the retention check, g/cm³ (tungsten, the
/// densest usual insert metal: the smallest, hence most conservative, insert for a mass).
inline constexpr double kInsertSizingDensity_g_cm3 = 19.3;

// ---- Formulas (SI inside, the project's units outside) -----------------------------------------

/// Angular speed, rad/s, of a speed in rpm.
double angular_speed_rad_s(double speed_rpm);

/// Surface (peripheral) speed v = π·D·n / 60 000, m/s, of a diameter in mm at n rpm.
double surface_speed_m_s(double diameter_mm, double speed_rpm);

/// Peak hoop stress, MPa, of a spinning annular disc of uniform thickness (at the bore):
/// σ_t = ρΩ²(3+ν)/4·[r_o² + (1−ν)/(3+ν)·r_i²]. Radii in mm, 0 ≤ r_i < r_o.
double hoop_stress_annulus_mpa(double density_g_cm3, double poisson, double outer_radius_mm,
                               double inner_radius_mm, double speed_rpm);

/// Peak (centre) stress, MPa, of a spinning solid disc of uniform thickness: ρΩ²(3+ν)/8·r_o²,
/// hoop and radial alike.
double hoop_stress_solid_disc_mpa(double density_g_cm3, double poisson, double outer_radius_mm,
                                  double speed_rpm);

/// Peak radial stress, MPa, of a spinning annular disc, at r = √(r_i·r_o):
/// σ_r = ρΩ²(3+ν)/8·(r_o − r_i)². For r_i = 0 it is the solid disc's centre stress.
double radial_stress_annulus_mpa(double density_g_cm3, double poisson, double outer_radius_mm,
                                 double inner_radius_mm, double speed_rpm);

/// Radial pull, MPa, on a disc's rim of thickness t from a ring of mass m spread around it:
/// p = m·Ω²/(2π·t) (independent of the ring's radius).
double rim_load_mpa(double ring_mass_g, double thickness_mm, double speed_rpm);

/// Peak hoop stress, MPa, at the bore of a disc pulled by a rim load p (Lamé, plane stress):
/// 2·p·r_o²/(r_o² − r_i²) for an annulus, p for a solid disc (r_i = 0).
double rim_load_hoop_stress_mpa(double rim_load_mpa, double outer_radius_mm, double inner_radius_mm);

/// Centrifugal force, N, on a mass in g at a radius in mm: F = m·r·Ω².
double centrifugal_force_n(double mass_g, double radius_mm, double speed_rpm);

/// Nut preload, N, from a torque: F = T / (K·d), T in N·m, d the thread diameter in mm.
double nut_preload_n(double torque_nm, double thread_diameter_mm, double nut_factor);

/// Nut torque, N·m, for a preload: T = K·F·d, F in N, d in mm.
double nut_torque_nm(double preload_n, double thread_diameter_mm, double nut_factor);

/// Side of a cube of the given mass and density, mm: the insert size the retention check uses.
double equivalent_cube_side_mm(double mass_g, double density_g_cm3);

/// Load, N, that shears an insert out through the wall toward the rim: two shear planes, each as
/// long as the wall is thick and as deep as the loaded height, at kShearFraction × tensile.
double insert_shear_capacity_n(double wall_mm, double loaded_height_mm, double tensile_mpa);

// ---- Checks ------------------------------------------------------------------------------------

/// Run every check on a design. Failed checks named in `context.accept` (and acceptable) are
/// marked accepted. Throws InputError when the context is unusable (speed ≤ 0, overspeed factor
/// < 1, an unknown mount).
std::vector<CheckResult> run_checks(const fixture::Design& design, const Context& context);

/// Names of the failed checks that are not accepted (empty: the design may be used), each once,
/// in check order.
std::vector<std::string> blocking_failures(const std::vector<CheckResult>& checks);

/// Every stable check name, in the order run_checks reports them (for validating [checks] accept).
const std::vector<std::string>& check_names();

/// The usual cautions for the terminal, chart, report and README.
const std::vector<std::string>& cautions();

}  // namespace trimwright::check
