// SPDX-License-Identifier: GPL-3.0-or-later
// A known correction passed through the solver's result shape.
#include <catch2/catch.hpp>

#include "geom/base/error.hpp"
#include "geom/solve/solve.hpp"

using namespace trimwright::solve;
using trimwright::InputError;

TEST_CASE("given: a known correction gets masses, the split and the grade verdict", "[solve]") {
  Correction a;
  a.plane = 2;
  a.unbalance_gmm = 40;
  a.angle_deg = -90;
  a.radius_mm = 50;
  Correction b;
  b.plane = 1;
  b.unbalance_gmm = 75;
  b.angle_deg = 212;
  SolveOptions o;
  o.speed_rpm = 3450;
  o.rotor_mass_kg = 0.72;
  o.grade_mm_s = 40;
  const SolveResult s = solve_given({a, b}, o, "job.toml");
  CHECK(s.method == "given");
  REQUIRE(s.corrections.size() == 2);
  CHECK(s.corrections[0].unbalance_gmm == 75);
  CHECK_FALSE(s.corrections[0].mass_g);
  CHECK(s.corrections[1].angle_deg == Approx(270));
  CHECK(s.corrections[1].mass_g.value() == Approx(0.8));
  REQUIRE(s.static_couple);
  REQUIRE(s.tolerance);
  // G40, 0.72 kg, 3450 rpm: U_per = 1000·40·0.72/Ω = 79.7 g·mm, half per plane (ISO 21940-11
  // formula; halves by default for two planes).
  CHECK(s.tolerance->plane_permissible_gmm[0] ==
        Approx(1000.0 * 40 * 0.72 / (3450 * 2 * 3.14159265358979 / 60) / 2));
  CHECK_FALSE(s.tolerance->met);  // 75 > 39.9

  b.plane = 2;
  CHECK_THROWS_WITH(solve_given({a, b}, o, "job.toml"), Catch::Contains("plane 2 given twice"));
  b.plane = 1;
  b.unbalance_gmm = -1;
  CHECK_THROWS_WITH(solve_given({a, b}, o, "job.toml"),
                    Catch::StartsWith("job.toml: correction: unbalance_gmm -1"));
  CHECK_THROWS_AS(solve_given({}, o), InputError);
}
