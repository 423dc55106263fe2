// SPDX-License-Identifier: GPL-3.0-or-later
// ISO 21940-11 permissible residual unbalance and grade parsing.
#include "geom/solve/tolerance.hpp"

#include <catch2/catch.hpp>

#include "geom/base/error.hpp"

using namespace trimwright::solve;
using trimwright::InputError;

TEST_CASE("tolerance: permissible residual unbalance against a catalogue check value", "[solve]") {
  // ISO 21940-11 U_per = 9549·G·M/n; check value 2 kg, G6.3, 10 000 rpm → 12.03 g·mm (WIDIA
  // tooling catalogue, balancing page; references.md).
  CHECK(permissible_unbalance_gmm(6.3, 2.0, 10000) == Approx(12.03).margin(0.005));
  // The 9549 form of the same formula (ISO 21940-11 as quoted in references.md).
  CHECK(permissible_unbalance_gmm(2.5, 0.72, 3450) ==
        Approx(9549.0 * 2.5 * 0.72 / 3450).epsilon(1e-4));
  // e_per = U_per / M, µm.
  CHECK(permissible_eccentricity_um(6.3, 10000) == Approx(12.03 / 2).margin(0.003));
  CHECK_THROWS_WITH(permissible_unbalance_gmm(6.3, 0, 3450), Catch::Contains("rotor mass 0 kg"));
  CHECK_THROWS_AS(permissible_unbalance_gmm(6.3, 1, -5), InputError);
}

TEST_CASE("tolerance: grade strings", "[solve]") {
  CHECK(parse_grade("G6.3", "job.toml:40: target.grade") == 6.3);
  CHECK(parse_grade("6.3", "") == 6.3);
  CHECK(parse_grade("G 2.5", "") == 2.5);
  CHECK(parse_grade(" g1 ", "") == 1.0);
  CHECK(parse_grade("G0.4", "") == 0.4);
  CHECK(parse_grade("G4000", "") == 4000);
  CHECK_THROWS_WITH(parse_grade("G7", "job.toml:40: target.grade"),
                    Catch::StartsWith("job.toml:40: target.grade: grade \"G7\": not a grade of ISO "
                                      "21940-11; expected one of G0.4, G1, G2.5"));
  CHECK_THROWS_WITH(parse_grade("fine", "x"), Catch::Contains("not a balance grade"));
  CHECK_THROWS_WITH(parse_grade("G6.3mm", "x"), Catch::Contains("not a balance grade"));
  CHECK_THROWS_AS(parse_grade("", "x"), InputError);
  CHECK(grade_name(6.3) == "G6.3");
  CHECK(grade_name(1) == "G1");
}

TEST_CASE("tolerance: the grade table and its cited rotor types", "[solve]") {
  const auto& grades = balance_grades();
  REQUIRE(grades.size() == 11);
  // Each grade 2.5 times the one before, rounded (0.4, 1, 2.5, 6.3, 16, 40, …).
  for (std::size_t i = 1; i < grades.size(); ++i)
    CHECK(grades[i].g_mm_s / grades[i - 1].g_mm_s == Approx(2.5).epsilon(0.04));
  // Bloch & Geitner, Machinery Component Maintenance and Repair, Table 6-5 (references.md):
  // G6.3 fans; G1 grinding-machine drives.
  for (const auto& g : grades) {
    if (g.g_mm_s == 6.3) CHECK(std::string(g.rotor_types).find("fans") != std::string::npos);
    if (g.g_mm_s == 1)
      CHECK(std::string(g.rotor_types).find("grinding-machine drives") != std::string::npos);
    if (g.g_mm_s > 6.3) CHECK(g.from_memory);
  }
}

TEST_CASE("tolerance: shared between planes", "[solve]") {
  const auto half = share_tolerance(12.0, 2, {});
  CHECK(half == std::vector<double>{6.0, 6.0});
  const auto shares = share_tolerance(12.0, 2, {0.25, 0.75});
  CHECK(shares[0] == Approx(3.0));
  CHECK(shares[1] == Approx(9.0));
  CHECK_THROWS_WITH(share_tolerance(12.0, 2, {0.5, 0.6}), Catch::Contains("add up to 1.1"));
  CHECK_THROWS_AS(share_tolerance(12.0, 2, {1.0}), InputError);
  CHECK_THROWS_AS(share_tolerance(12.0, 2, {-0.5, 1.5}), InputError);
}
