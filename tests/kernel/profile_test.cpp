// SPDX-License-Identifier: GPL-3.0-or-later
// Exact profiles: area moments against closed forms, Boolean operations, polygonisation.

#include "geom/kernel/profile.hpp"

#include <algorithm>
#include <catch2/catch.hpp>
#include <cmath>
#include <vector>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"

using namespace trimwright;
using namespace trimwright::kernel;

namespace {

/// Relative comparison helper for Catch's Approx.
Approx rel(double v, double eps = 1e-9) { return Approx(v).epsilon(eps).margin(0); }

double ring_area(const Ring& r) {
  double a = 0;
  for (std::size_t i = 0; i < r.points.size(); ++i) {
    const Vec2& p = r.points[i];
    const Vec2& q = r.points[(i + 1) % r.points.size()];
    a += p[0] * q[1] - q[0] * p[1];
  }
  return a / 2;
}

std::vector<Ring> all_rings(const std::vector<Region>& regions) {
  std::vector<Ring> out;
  for (const Region& r : regions) {
    out.push_back(r.outer);
    out.insert(out.end(), r.holes.begin(), r.holes.end());
  }
  return out;
}

/// Largest distance of any point on the polyline (sampled densely) from the circle.
double polyline_distance_from_circle(const Ring& r, Vec2 c, double radius) {
  double worst = 0;
  for (std::size_t i = 0; i < r.points.size(); ++i) {
    const Vec2& p = r.points[i];
    const Vec2& q = r.points[(i + 1) % r.points.size()];
    for (int k = 0; k <= 64; ++k) {
      const double s = k / 64.0;
      const double x = p[0] + s * (q[0] - p[0]) - c[0], y = p[1] + s * (q[1] - p[1]) - c[1];
      worst = std::max(worst, std::fabs(std::hypot(x, y) - radius));
    }
  }
  return worst;
}

}  // namespace

TEST_CASE("profile: circular segment area and centroid match the closed form",
          "[kernel][profile]") {
  // Circular segment, radius R, angle θ: A = R²(θ − sin θ)/2, centroid 4R·sin³(θ/2)/(3(θ − sin θ))
  // from the centre (CRC Standard Mathematical Tables; MathWorld "Circular Segment").
  const double r = 50, theta = deg_to_rad(120);
  const double area = r * r * (theta - std::sin(theta)) / 2;
  const double dist = 4 * r * std::pow(std::sin(theta / 2), 3) / (3 * (theta - std::sin(theta)));
  // The chord lies at R cos(θ/2) = 25 mm from the centre.
  const Profile seg = Profile::disc({0, 0}, r) * Profile::rectangle({42.5, 0}, 35, 120);
  const AreaMoments m = seg.moments();
  CHECK(m.area_mm2 == rel(area));
  CHECK(m.centroid()[0] == rel(dist));
  CHECK(std::fabs(m.centroid()[1]) < 1e-12);
  // The published check values (references.md): A = 1535.462 mm², centroid 35.2510 mm.
  CHECK(m.area_mm2 == Approx(1535.462).margin(5e-4));
  CHECK(m.centroid()[0] == Approx(35.2510).margin(5e-5));

  SECTION("turned by 30° and moved, the segment keeps its area and its centroid moves with it") {
    const Vec2 c{3, -7};
    const double a = deg_to_rad(30);
    const Vec2 mid{c[0] + 42.5 * std::cos(a), c[1] + 42.5 * std::sin(a)};
    const Profile turned = Profile::disc(c, r) * Profile::rectangle(mid, 35, 120, 30);
    const AreaMoments t = turned.moments();
    CHECK(t.area_mm2 == rel(area));
    CHECK(t.centroid()[0] == rel(c[0] + dist * std::cos(a)));
    CHECK(t.centroid()[1] == rel(c[1] + dist * std::sin(a)));
  }
}

TEST_CASE("profile: disc with an offset hole has the closed-form centroid", "[kernel][profile]") {
  // Disc radius R with an offset round hole a at distance d: A = π(R² − a²), x̄ = −π·a²·d/A
  // (references.md, "Mass properties"). Check: R 60, a 10, d 30 → x̄ = −0.857143 mm.
  const Profile p = Profile::disc({0, 0}, 60) - Profile::disc({30, 0}, 10);
  const AreaMoments m = p.moments();
  const double area = kPi * (60 * 60 - 10 * 10);
  CHECK(m.area_mm2 == rel(area));
  CHECK(m.centroid()[0] == rel(-kPi * 100 * 30 / area));
  CHECK(m.centroid()[0] == Approx(-0.857143).margin(5e-7));
  CHECK(p.piece_count() == 1);
  CHECK(p.hole_count() == 1);
}

TEST_CASE("profile: obround area is pi r^2 + 2 r L in any direction", "[kernel][profile]") {
  // Obround (stadium), end radius r, straight length L: A = π·r² + 2·r·L (references.md).
  const double r = 8.05;
  for (const auto& ab : std::vector<std::pair<Vec2, Vec2>>{
           {{-1, 0}, {7, 0}}, {{0, -4}, {0, 6}}, {{1, 2}, {10, 7}}, {{5, 5}, {-3, 1.5}}}) {
    const Vec2 a = ab.first, b = ab.second;
    const double len = std::hypot(b[0] - a[0], b[1] - a[1]);
    const AreaMoments m = Profile::obround(a, b, r).moments();
    CHECK(m.area_mm2 == rel(kPi * r * r + 2 * r * len));
    CHECK(m.centroid()[0] == Approx((a[0] + b[0]) / 2).margin(1e-12));
    CHECK(m.centroid()[1] == Approx((a[1] + b[1]) / 2).margin(1e-12));
  }
  CHECK(Profile::obround({2, 3}, {2, 3}, 4).moments().area_mm2 == rel(kPi * 16));
}

TEST_CASE("profile: regular polygon area is n/2 R^2 sin(2 pi/n)", "[kernel][profile]") {
  // Regular n-gon of circumradius R: A = (n/2)·R²·sin(2π/n) (references.md).
  for (int n : {3, 7, 64}) {
    const double r = 20;
    std::vector<Vec2> pts;
    for (int i = 0; i < n; ++i)
      pts.push_back({5 + r * std::cos(2 * kPi * i / n), -2 + r * std::sin(2 * kPi * i / n)});
    const AreaMoments m = Profile::polygon(pts).moments();
    CHECK(m.area_mm2 == rel(n / 2.0 * r * r * std::sin(2 * kPi / n)));
    CHECK(m.centroid()[0] == Approx(5).margin(1e-12));
    CHECK(m.centroid()[1] == Approx(-2).margin(1e-12));
    // Clockwise input gives the same region.
    std::reverse(pts.begin(), pts.end());
    CHECK(Profile::polygon(pts).moments().area_mm2 == rel(m.area_mm2));
  }
}

TEST_CASE("profile: second moments of a disc are pi R^4/4 about its centre", "[kernel][profile]") {
  // Disc: ∫x² dA = ∫y² dA = πR⁴/4 about the centre (polar moment πR⁴/2; any handbook's table of
  // plane areas, e.g. Roark's Formulas for Stress and Strain, table of section properties — from
  // memory); parallel-axis shift for an offset disc.
  const double r = 12.5;
  const AreaMoments m = Profile::disc({0, 0}, r).moments();
  CHECK(m.ixx_mm4 == rel(kPi * std::pow(r, 4) / 4));
  CHECK(m.iyy_mm4 == rel(kPi * std::pow(r, 4) / 4));
  CHECK(std::fabs(m.ixy_mm4) < 1e-9);
  const Vec2 c{7, -3};
  const AreaMoments o = Profile::disc(c, r).moments();
  const double a = kPi * r * r;
  CHECK(o.ixx_mm4 == rel(kPi * std::pow(r, 4) / 4 + a * c[0] * c[0]));
  CHECK(o.iyy_mm4 == rel(kPi * std::pow(r, 4) / 4 + a * c[1] * c[1]));
  CHECK(o.ixy_mm4 == rel(a * c[0] * c[1]));
}

TEST_CASE("profile: rectangle moments follow its rotation", "[kernel][profile]") {
  // Rectangle w × h about its centre: ∫u² = h·w³/12, ∫v² = w·h³/12 (standard section property);
  // turned by θ: ∫x² = cos²θ ∫u² + sin²θ ∫v².
  const double w = 6, h = 2, th = deg_to_rad(30);
  const AreaMoments m = Profile::rectangle({0, 0}, w, h, 30).moments();
  const double iuu = h * w * w * w / 12, ivv = w * h * h * h / 12;
  CHECK(m.area_mm2 == rel(w * h));
  CHECK(m.ixx_mm4 == rel(std::cos(th) * std::cos(th) * iuu + std::sin(th) * std::sin(th) * ivv));
  CHECK(m.iyy_mm4 == rel(std::sin(th) * std::sin(th) * iuu + std::cos(th) * std::cos(th) * ivv));
  CHECK(m.ixy_mm4 == rel(std::sin(th) * std::cos(th) * (iuu - ivv)));
  CHECK(Profile::rectangle({1, 1}, 4, 3, 90).moments().area_mm2 == rel(12));
}

TEST_CASE("profile: annular sector area and centroid", "[kernel][profile]") {
  // Annular sector R_o, R_i, half-angle α: A = α(R_o² − R_i²), centroid on the bisector at
  // 2(R_o³ − R_i³)·sin α/(3α(R_o² − R_i²)) (the circular-sector centroid 2R sin α/(3α) of CRC
  // Standard Mathematical Tables applied to both radii — from memory).
  struct Case {
    double ri, ro, a0, a1;
  };
  for (const Case& c :
       {Case{10, 25, 20, 80}, Case{0, 25, -30, 30}, Case{5, 25, 0, 270}, Case{12, 20, 45, 225}}) {
    const double alpha = deg_to_rad(c.a1 - c.a0) / 2, mid = deg_to_rad(c.a0 + c.a1) / 2;
    const double area = alpha * (c.ro * c.ro - c.ri * c.ri);
    const double dist = 2 * (std::pow(c.ro, 3) - std::pow(c.ri, 3)) * std::sin(alpha) /
                        (3 * alpha * (c.ro * c.ro - c.ri * c.ri));
    const AreaMoments m = Profile::annular_sector({1, 2}, c.ri, c.ro, c.a0, c.a1).moments();
    CHECK(m.area_mm2 == rel(area));
    CHECK(m.centroid()[0] == Approx(1 + dist * std::cos(mid)).margin(1e-9));
    CHECK(m.centroid()[1] == Approx(2 + dist * std::sin(mid)).margin(1e-9));
  }
  const AreaMoments full = Profile::annular_sector({0, 0}, 5, 9, 10, 370).moments();
  CHECK(full.area_mm2 == rel(kPi * (81 - 25)));
}

TEST_CASE("profile: Booleans of two discs match the lens formula", "[kernel][profile]") {
  // Two equal circles radius R, centres d apart: lens area 2R²·acos(d/2R) − (d/2)·sqrt(4R² − d²)
  // (MathWorld "Circle-Circle Intersection" — from memory; follows from two circular segments).
  const double r = 10, d = 12;
  const double lens = 2 * r * r * std::acos(d / (2 * r)) - d / 2 * std::sqrt(4 * r * r - d * d);
  const Profile a = Profile::disc({0, 0}, r), b = Profile::disc({d, 0}, r);
  CHECK((a * b).moments().area_mm2 == rel(lens));
  CHECK((a + b).moments().area_mm2 == rel(2 * kPi * r * r - lens));
  CHECK((a - b).moments().area_mm2 == rel(kPi * r * r - lens));
  CHECK((a * b).moments().centroid()[0] == rel(d / 2));
  CHECK((a + b).piece_count() == 1);
  const Profile apart = a + Profile::disc({30, 0}, 3);
  CHECK(apart.piece_count() == 2);
  CHECK(apart.hole_count() == 0);
  CHECK((a - Profile::disc({0, 0}, 20)).empty());
  CHECK((a * Profile::disc({50, 0}, 3)).empty());
}

TEST_CASE("profile: the empty profile", "[kernel][profile]") {
  const Profile e;
  CHECK(e.empty());
  CHECK(e.moments().area_mm2 == 0);
  CHECK(e.polygonize(0.01).empty());
  CHECK(e.piece_count() == 0);
  CHECK_FALSE(e.contains({0, 0}));
  const Profile d = Profile::disc({0, 0}, 1);
  CHECK((e + d).moments().area_mm2 == rel(kPi));
  CHECK((d - e).moments().area_mm2 == rel(kPi));
  CHECK((d * e).empty());
  CHECK((e - d).empty());
}

TEST_CASE("profile: bounds and containment use the exact arcs", "[kernel][profile]") {
  const Profile p = Profile::disc({1, 2}, 5) - Profile::disc({1, 2}, 2);
  const Box2 b = p.bounds();
  CHECK(b.min[0] == Approx(-4).margin(1e-12));
  CHECK(b.max[0] == Approx(6).margin(1e-12));
  CHECK(b.min[1] == Approx(-3).margin(1e-12));
  CHECK(b.max[1] == Approx(7).margin(1e-12));
  CHECK(p.contains({4.5, 2}));
  CHECK_FALSE(p.contains({1, 2}));  // in the hole
  CHECK_FALSE(p.contains({6, 2}));  // on the boundary: not strictly inside
  CHECK_FALSE(p.contains({9, 9}));
  // A quarter sector reaches its arc's top only if the top lies inside its span.
  const Box2 q = Profile::annular_sector({0, 0}, 0, 10, 30, 120).bounds();
  CHECK(q.max[1] == Approx(10).margin(1e-12));
  CHECK(q.min[1] == Approx(0).margin(1e-12));
  CHECK(q.min[0] == Approx(10 * std::cos(deg_to_rad(120))).margin(1e-12));
  CHECK(q.max[0] == Approx(10 * std::cos(deg_to_rad(30))).margin(1e-12));
}

TEST_CASE("profile: invalid shapes are internal errors", "[kernel][profile]") {
  CHECK_THROWS_AS(Profile::disc({0, 0}, 0), InternalError);
  CHECK_THROWS_AS(Profile::disc({0, NAN}, 1), InternalError);
  CHECK_THROWS_AS(Profile::obround({0, 0}, {1, 0}, -1), InternalError);
  CHECK_THROWS_AS(Profile::polygon({{0, 0}, {1, 1}}), InternalError);
  CHECK_THROWS_AS(Profile::polygon({{0, 0}, {2, 2}, {2, 0}, {0, 2}}), InternalError);  // bow tie
  CHECK_THROWS_AS(Profile::rectangle({0, 0}, 0, 1), InternalError);
  CHECK_THROWS_AS(Profile::annular_sector({0, 0}, 5, 4, 0, 10), InternalError);
  CHECK_THROWS_AS(Profile::annular_sector({0, 0}, 1, 4, 0, 400), InternalError);
  CHECK_THROWS_AS(Profile::disc({0, 0}, 1).polygonize(0), InternalError);
}

TEST_CASE("profile: polygonize keeps a full circle's area and centroid exactly",
          "[kernel][profile]") {
  for (double chord : {0.1, 0.01, 0.001}) {
    const Vec2 c{3.25, -1.5};
    const double r = 30;
    const auto regions = Profile::disc(c, r).polygonize(chord);
    REQUIRE(regions.size() == 1);
    REQUIRE(regions[0].holes.empty());
    const Ring& ring = regions[0].outer;
    CHECK(ring_area(ring) == rel(kPi * r * r, 1e-12));
    const AreaMoments m = polygon_moments({ring});
    CHECK(m.centroid()[0] == Approx(c[0]).margin(1e-12));
    CHECK(m.centroid()[1] == Approx(c[1]).margin(1e-12));
    CHECK(polyline_distance_from_circle(ring, c, r) <= chord * (1 + 1e-9));
    // Not grossly over-refined: within the count an inscribed polygon of the same chord needs.
    const double inscribed = kPi / std::acos(1 - chord / r);
    CHECK(ring.points.size() <= static_cast<std::size_t>(std::ceil(inscribed)) + 2);
  }
}

TEST_CASE("profile: polygonize keeps arc areas and chord error for Boolean results",
          "[kernel][profile]") {
  // Arcs cut at one-root intersection points, concave arcs (holes) and an obround slot.
  const Profile p = (Profile::disc({0, 0}, 30) - Profile::disc({28, 5}, 9) -
                     Profile::obround({-1, 0}, {7, 0}, 8.05) - Profile::disc({-20, 3}, 3.2)) +
                    Profile::annular_sector({0, 0}, 29, 34, 150, 200);
  const double chord = 0.01;
  const auto regions = p.polygonize(chord);
  const AreaMoments exact = p.moments();
  const AreaMoments poly = polygon_moments(all_rings(regions));
  CHECK(poly.area_mm2 == rel(exact.area_mm2, 1e-12));
  // The first moment of an unsymmetric arc piece is not kept exactly (the polyline lies outside
  // the arc mid-way and inside near its pinned ends); the centroid moves by far less than the
  // chord.
  CHECK(poly.centroid()[0] == Approx(exact.centroid()[0]).margin(1e-4));
  CHECK(poly.centroid()[1] == Approx(exact.centroid()[1]).margin(1e-4));
  for (const Region& r : regions) {
    CHECK(ring_area(r.outer) > 0);
    for (const Ring& h : r.holes) CHECK(ring_area(h) < 0);
  }
  // Every vertex of the outline on the untouched part of the big circle (−150° to −20°) stays
  // within the chord of it.
  double worst = 0;
  std::size_t seen = 0;
  for (const Vec2& q : regions[0].outer.points) {
    const double ang = rad_to_deg(std::atan2(q[1], q[0]));
    if (ang > -150 && ang < -20) {
      worst = std::max(worst, std::fabs(std::hypot(q[0], q[1]) - 30));
      ++seen;
    }
  }
  CHECK(seen > 20);
  CHECK(worst <= chord);
}

TEST_CASE("profile: polygonize keeps a slot's centroid (symmetric arcs)", "[kernel][profile]") {
  const Profile p = Profile::disc({0, 0}, 30) - Profile::obround({-1, 0}, {7, 0}, 8.05) -
                    Profile::disc({-20, 0}, 3.2);
  const AreaMoments exact = p.moments();
  const AreaMoments poly = polygon_moments(all_rings(p.polygonize(0.01)));
  CHECK(poly.area_mm2 == rel(exact.area_mm2, 1e-12));
  CHECK(poly.centroid()[0] == Approx(exact.centroid()[0]).margin(1e-11));
  CHECK(std::fabs(poly.centroid()[1]) < 1e-11);
}

TEST_CASE("profile: polygonize is deterministic and starts rings canonically",
          "[kernel][profile]") {
  auto make = [] {
    return (Profile::disc({0, 0}, 20) - Profile::disc({5, 5}, 4)) + Profile::disc({40, 0}, 5);
  };
  const auto a = make().polygonize(0.02), b = make().polygonize(0.02);
  REQUIRE(a.size() == b.size());
  for (std::size_t i = 0; i < a.size(); ++i) {
    CHECK(a[i].outer.points == b[i].outer.points);
    REQUIRE(a[i].holes.size() == b[i].holes.size());
    for (std::size_t j = 0; j < a[i].holes.size(); ++j)
      CHECK(a[i].holes[j].points == b[i].holes[j].points);
  }
  for (const Ring& r : all_rings(a))
    CHECK(r.points.front() == *std::min_element(r.points.begin(), r.points.end()));
  CHECK(a.size() == 2);
  CHECK(a[0].outer.points.front()[0] < a[1].outer.points.front()[0]);
}

TEST_CASE("profile: polygon_moments applies the even-odd rule whatever the orientation",
          "[kernel][profile]") {
  auto square = [](double cx, double cy, double s, bool ccw) {
    Ring r{{{cx - s, cy - s}, {cx + s, cy - s}, {cx + s, cy + s}, {cx - s, cy + s}}};
    if (!ccw) std::reverse(r.points.begin(), r.points.end());
    return r;
  };
  // 10 × 10 square, a 4 × 4 hole, a 2 × 2 island in the hole; all rings drawn the same way.
  const std::vector<Ring> rings{square(0, 0, 5, true), square(1, 0, 2, true),
                                square(1.5, 0, 1, false)};
  const AreaMoments m = polygon_moments(rings);
  CHECK(m.area_mm2 == rel(100 - 16 + 4));
  CHECK(m.sx_mm3 == rel(0 - 16 * 1 + 4 * 1.5));
  CHECK(std::fabs(m.sy_mm3) < 1e-12);
  // Same as the exact profile of the same region.
  const Profile p = Profile::rectangle({0, 0}, 10, 10) - Profile::rectangle({1, 0}, 4, 4) +
                    Profile::rectangle({1.5, 0}, 2, 2);
  const AreaMoments e = p.moments();
  CHECK(m.ixx_mm4 == rel(e.ixx_mm4));
  CHECK(m.iyy_mm4 == rel(e.iyy_mm4));
  CHECK(polygon_moments({}).area_mm2 == 0);
}
