// SPDX-License-Identifier: GPL-3.0-or-later
// Weight splitting and equal-mass pairs.
#include "geom/solve/vectors.hpp"

#include <catch2/catch.hpp>

using namespace trimwright::solve;

TEST_CASE("vectors: law-of-sines split between two fixed positions", "[solve]") {
  // Law of sines (references.md): 1.5 g at 37° into 0° and 60° → 0.6768 g and 1.0424 g.
  const auto s = split_between(1.5, 37, 0, 60);
  REQUIRE(s);
  CHECK(s->w1 == Approx(0.6768).margin(0.00005));
  CHECK(s->w2 == Approx(1.0424).margin(0.00005));
  // The two parts add back to the whole.
  const Polar sum = add_polar({s->w1, 0}, {s->w2, 60});
  CHECK(sum.magnitude == Approx(1.5));
  CHECK(sum.angle_deg == Approx(37));
  // In line: no split. Outside the sector: one part is negative.
  CHECK_FALSE(split_between(1, 10, 0, 180));
  CHECK(split_between(1, 90, 0, 60)->w1 < 0);
}

TEST_CASE("vectors: split onto the neighbouring positions of several", "[solve]") {
  const std::vector<double> blades = {0, 72, 144, 216, 288};
  const auto s = split_among(2.0, 100, blades);
  REQUIRE(s);
  CHECK(s->index1 == 1);
  CHECK(s->index2 == 2);
  const Polar sum = add_polar({s->w1, 72}, {s->w2, 144});
  CHECK(sum.magnitude == Approx(2.0));
  CHECK(sum.angle_deg == Approx(100));
  // Across 0°.
  const auto wrap = split_among(1.0, 350, blades);
  REQUIRE(wrap);
  CHECK(wrap->index1 == 4);
  CHECK(wrap->index2 == 0);
  CHECK(add_polar({wrap->w1, 288}, {wrap->w2, 0}).angle_deg == Approx(350));
  // On a position: all of it there.
  const auto on = split_among(1.0, 144, blades);
  CHECK(on->index1 == 2);
  CHECK(on->w1 == 1.0);
  CHECK(on->w2 == 0.0);
  // Two opposite holes cannot make a sideways correction.
  CHECK_FALSE(split_among(1.0, 90, {0, 180}));
}

TEST_CASE("vectors: two equal masses", "[solve]") {
  // Two equal eccentric masses u at a, b: resultant 2u·cos((a − b)/2) at (a + b)/2
  // (references.md).
  const Polar r = equal_pair_resultant(3.0, 100, 40);
  CHECK(r.magnitude == Approx(2 * 3.0 * 0.8660254));
  CHECK(r.angle_deg == Approx(70));
  // Opposite: nothing; more than 180° apart: the resultant points the other way.
  CHECK(equal_pair_resultant(3.0, 0, 180).magnitude == Approx(0).margin(1e-12));
  const Polar far = equal_pair_resultant(1.0, 0, 240);
  CHECK(far.magnitude == Approx(1.0));
  CHECK(far.angle_deg == Approx(300));
  // Inverse: the angles that give a wanted resultant.
  const auto ab = equal_pair_angles(3.0, r.magnitude, r.angle_deg);
  REQUIRE(ab);
  CHECK(ab->first == Approx(100));
  CHECK(ab->second == Approx(40));
  CHECK_FALSE(equal_pair_angles(1.0, 2.5, 0));
}
