// SPDX-License-Identifier: GPL-3.0-or-later
// The formulas behind the checks, SI inside; docs/safety.md gives each with its source.
#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/check/check.hpp"

namespace trimwright::check {
namespace {

constexpr double kMmToM = 1e-3;
constexpr double kGToKg = 1e-3;
constexpr double kPaToMpa = 1e-6;
/// g/cm³ to kg/m³.
constexpr double kGcm3ToKgm3 = 1e3;

}  // namespace

double angular_speed_rad_s(double speed_rpm) { return speed_rpm * 2.0 * kPi / 60.0; }

double surface_speed_m_s(double diameter_mm, double speed_rpm) {
  return kPi * diameter_mm * speed_rpm / 60000.0;
}

double hoop_stress_annulus_mpa(double density_g_cm3, double poisson, double outer_radius_mm,
                               double inner_radius_mm, double speed_rpm) {
  double rho = density_g_cm3 * kGcm3ToKgm3;
  double w = angular_speed_rad_s(speed_rpm);
  double ro = outer_radius_mm * kMmToM, ri = inner_radius_mm * kMmToM;
  double nu = poisson;
  return rho * w * w * (3 + nu) / 4 * (ro * ro + (1 - nu) / (3 + nu) * ri * ri) * kPaToMpa;
}

double hoop_stress_solid_disc_mpa(double density_g_cm3, double poisson, double outer_radius_mm,
                                  double speed_rpm) {
  double rho = density_g_cm3 * kGcm3ToKgm3;
  double w = angular_speed_rad_s(speed_rpm);
  double ro = outer_radius_mm * kMmToM;
  return rho * w * w * (3 + poisson) / 8 * ro * ro * kPaToMpa;
}

double radial_stress_annulus_mpa(double density_g_cm3, double poisson, double outer_radius_mm,
                                 double inner_radius_mm, double speed_rpm) {
  double rho = density_g_cm3 * kGcm3ToKgm3;
  double w = angular_speed_rad_s(speed_rpm);
  double span = (outer_radius_mm - inner_radius_mm) * kMmToM;
  return rho * w * w * (3 + poisson) / 8 * span * span * kPaToMpa;
}

double rim_load_mpa(double ring_mass_g, double thickness_mm, double speed_rpm) {
  // A ring of mass m at radius a pulls λ·a·Ω² = m·Ω²/(2π) newtons per metre of circumference.
  double w = angular_speed_rad_s(speed_rpm);
  double per_length_n_m = ring_mass_g * kGToKg * w * w / (2 * kPi);
  return per_length_n_m / (thickness_mm * kMmToM) * kPaToMpa;
}

double rim_load_hoop_stress_mpa(double rim_load, double outer_radius_mm, double inner_radius_mm) {
  if (inner_radius_mm <= 0) return rim_load;  // a solid disc pulled evenly at its rim: σ = p
  double ro2 = outer_radius_mm * outer_radius_mm, ri2 = inner_radius_mm * inner_radius_mm;
  return 2 * rim_load * ro2 / (ro2 - ri2);
}

double centrifugal_force_n(double mass_g, double radius_mm, double speed_rpm) {
  double w = angular_speed_rad_s(speed_rpm);
  return mass_g * kGToKg * radius_mm * kMmToM * w * w;
}

double nut_preload_n(double torque_nm, double thread_diameter_mm, double nut_factor) {
  return torque_nm / (nut_factor * thread_diameter_mm * kMmToM);
}

double nut_torque_nm(double preload_n, double thread_diameter_mm, double nut_factor) {
  return nut_factor * preload_n * thread_diameter_mm * kMmToM;
}

double equivalent_cube_side_mm(double mass_g, double density_g_cm3) {
  return std::cbrt(mass_g / (density_g_cm3 * 1e-3));  // g/cm³ → g/mm³
}

double insert_shear_capacity_n(double wall_mm, double loaded_height_mm, double tensile_mpa) {
  return 2 * wall_mm * loaded_height_mm * kShearFraction * tensile_mpa;  // mm² × MPa = N
}

}  // namespace trimwright::check
