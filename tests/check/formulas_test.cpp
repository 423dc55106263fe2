// SPDX-License-Identifier: GPL-3.0-or-later
// The formulas behind the checks, against published values and independent closed forms.
#include <catch2/catch.hpp>

#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/check/check.hpp"

using namespace trimwright::check;
using trimwright::kPi;

TEST_CASE("check: solid spinning disc stress matches the published check value", "[check]") {
  // Steel, ρ 7800 kg/m³, ν 0.3, r_o 0.1 m, 6000 rpm → 12.70 MPa: σ = ρΩ²(3+ν)/8·r_o²
  // (Shigley & Mischke, Mechanical Engineering Design, rotating rings; Timoshenko & Goodier,
  // Theory of Elasticity; check value as in shared references.md "Rotating discs").
  CHECK(hoop_stress_solid_disc_mpa(7.8, 0.3, 100, 6000) == Approx(12.70).margin(0.005));
  // The solid disc's peak radial stress is the same centre value.
  CHECK(radial_stress_annulus_mpa(7.8, 0.3, 100, 0, 6000) ==
        Approx(hoop_stress_solid_disc_mpa(7.8, 0.3, 100, 6000)).epsilon(1e-12));
}

TEST_CASE("check: annular spinning disc hoop stress matches the published check value", "[check]") {
  // PLA annulus ρ 1240, ν 0.35, r_o 75 mm, r_i 8 mm, 5400 rpm → σ_t 1.872 MPa at the bore
  // (Shigley & Mischke, rotating rings: σ_t = ρΩ²(3+ν)/4·[r_o² + (1−ν)/(3+ν)·r_i²]; value as in
  // shared references.md "Rotating discs").
  CHECK(hoop_stress_annulus_mpa(1.24, 0.35, 75, 8, 5400) == Approx(1.872).margin(0.0005));
}

TEST_CASE("check: a thin spinning ring carries rho v squared", "[check]") {
  // A thin rotating ring: σ = ρ·v² (Shigley & Mischke, rotating rings, thin-ring limit; also
  // Timoshenko, Strength of Materials, part 1, "rotating ring"). The annulus formula must tend to
  // it as r_i → r_o.
  double v = 0.1 * 2 * kPi * 3000 / 60;  // r 0.1 m at 3000 rpm, m/s
  double expected_mpa = 1240 * v * v * 1e-6;
  CHECK(hoop_stress_annulus_mpa(1.24, 0.35, 100, 99.999, 3000) == Approx(expected_mpa).epsilon(1e-4));
  // The peak radial stress of a thin ring vanishes.
  CHECK(radial_stress_annulus_mpa(1.24, 0.35, 100, 99.999, 3000) < 1e-9);
}

TEST_CASE("check: annulus radial stress peak", "[check]") {
  // σ_r,max = ρΩ²(3+ν)/8·(r_o − r_i)² at r = √(r_i·r_o) (Timoshenko & Goodier, Theory of
  // Elasticity, rotating discs of uniform thickness). Compare with the full radial distribution
  // σ_r(r) = ρΩ²(3+ν)/8·(r_i² + r_o² − r_i²r_o²/r² − r²) evaluated at √(r_i·r_o).
  double rho = 1270, nu = 0.35, ri = 0.008, ro = 0.04, w = 4000 * 2 * kPi / 60;
  double r2 = ri * ro;
  double direct_mpa = rho * w * w * (3 + nu) / 8 * (ri * ri + ro * ro - ri * ri * ro * ro / r2 - r2) * 1e-6;
  CHECK(radial_stress_annulus_mpa(1.27, 0.35, 40, 8, 4000) == Approx(direct_mpa).epsilon(1e-12));
  // And it stays below the hoop peak, so the hoop stress is the governing one.
  CHECK(radial_stress_annulus_mpa(1.27, 0.35, 40, 8, 4000) < hoop_stress_annulus_mpa(1.27, 0.35, 40, 8, 4000));
}

TEST_CASE("check: surface speed matches the published check values", "[check]") {
  // v = π·D·n/60 000: 150 mm at 3450 rpm → 27.1 m/s; 8 in (203.2 mm) → 36.7 m/s (shared
  // references.md "Abrasive-wheel practice"; the formula as in OSHA 29 CFR 1910.215 surface feet
  // per minute, converted).
  CHECK(surface_speed_m_s(150, 3450) == Approx(27.1).margin(0.05));
  CHECK(surface_speed_m_s(203.2, 3450) == Approx(36.7).margin(0.05));
}

TEST_CASE("check: angular speed and centrifugal force", "[check]") {
  // Ω = 2πn/60; F = m·r·Ω² (elementary dynamics): 1 g at 100 mm and 1000 rpm → 1.0966 N.
  CHECK(angular_speed_rad_s(60) == Approx(2 * kPi));
  CHECK(centrifugal_force_n(1, 100, 1000) == Approx(0.001 * 0.1 * std::pow(1000 * 2 * kPi / 60, 2)));
  CHECK(centrifugal_force_n(1, 100, 1000) == Approx(1.0966).margin(0.0001));
}

TEST_CASE("check: torque-tension arithmetic", "[check]") {
  // T = K·F·d (Shigley & Mischke, Mechanical Engineering Design, bolt torque; K ≈ 0.2 dry):
  // 10 N·m on a 16 mm thread, K 0.2 → 10 / (0.2 × 0.016) = 3125 N.
  CHECK(nut_preload_n(10, 16, 0.2) == Approx(3125));
  CHECK(nut_torque_nm(3125, 16, 0.2) == Approx(10));
  // Oiled (K 0.15) the same torque gives more preload.
  CHECK(nut_preload_n(10, 16, 0.15) == Approx(4166.667).epsilon(1e-6));
}

TEST_CASE("check: rim load on a thin ring reproduces the spinning ring", "[check]") {
  // A ring of mass m spread on the rim pulls p = m·Ω²/(2π·t). Two independent checks:
  // (1) Barlow's thin-ring formula σ = p·r/w (hoop stress of a thin ring under pressure p, any
  //     strength-of-materials text): the Lamé form 2p·r_o²/(r_o² − r_i²) must tend to it.
  double p = 1.0, ro = 50, w = 0.01;
  CHECK(rim_load_hoop_stress_mpa(p, ro, ro - w) == Approx(p * ro / w).epsilon(1e-3));
  // (2) The disc being itself a thin ring of mass m, width w, thickness t, radius R: its own
  //     spinning stress ρv² (Shigley, thin rotating ring) equals the rim-load model's stress.
  double m_g = 10, t = 5, r = 40, width = 0.02, n = 6000;
  double rho_g_cm3 = m_g / (2 * kPi * r * width * t) * 1e3;  // g/mm³ → g/cm³
  double spin = hoop_stress_annulus_mpa(rho_g_cm3, 0.35, r + width / 2, r - width / 2, n);
  double model = rim_load_hoop_stress_mpa(rim_load_mpa(m_g, t, n), r + width / 2, r - width / 2);
  CHECK(model == Approx(spin).epsilon(2e-3));
  // A solid disc pulled evenly at its rim has σ = p everywhere (Lamé, r_i = 0).
  CHECK(rim_load_hoop_stress_mpa(0.7, 40, 0) == Approx(0.7));
  // Hand value: 10 g, 5 mm thick, 6000 rpm → 0.01 × (200π)² / (2π × 0.005) Pa = 0.12566 MPa.
  CHECK(rim_load_mpa(10, 5, 6000) == Approx(0.125664).epsilon(1e-5));
}

TEST_CASE("check: insert size and shear capacity", "[check]") {
  // 7.85 g of steel (7.85 g/cm³) is one cubic centimetre: a 10 mm cube.
  CHECK(equivalent_cube_side_mm(7.85, 7.85) == Approx(10));
  // Two shear planes 1.2 × 4 mm at half of 40 MPa: 2 × 4.8 × 20 = 192 N.
  CHECK(insert_shear_capacity_n(1.2, 4, 40) == Approx(192));
}
