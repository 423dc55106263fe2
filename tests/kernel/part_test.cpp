// SPDX-License-Identifier: GPL-3.0-or-later
// 2.5D parts: closed, outward, free of self-intersections, with the volume and centroid of their
// exact profiles; engravings and cavities; determinism; refusal of features that cross the outline.

#include "geom/kernel/part.hpp"

#include <algorithm>
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdio>
#include <ctime>
#include <random>
#include <string>
#include <vector>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/kernel/glyphs.hpp"
#include "geom/kernel/mass.hpp"
#include "geom/kernel/mesh_check.hpp"

using namespace trimwright;
using namespace trimwright::kernel;

namespace {

Approx rel(double v, double eps = 1e-9) { return Approx(v).epsilon(eps).margin(0); }

/// Volume and first moments of a spec from its exact profiles, layer by layer.
struct Expected {
  double volume = 0;
  Vec3 first{0, 0, 0};
  Vec3 centroid() const { return {first[0] / volume, first[1] / volume, first[2] / volume}; }
  void add(const AreaMoments& m, double z0, double z1, double sign) {
    const double h = z1 - z0;
    volume += sign * m.area_mm2 * h;
    first[0] += sign * m.sx_mm3 * h;
    first[1] += sign * m.sy_mm3 * h;
    first[2] += sign * m.area_mm2 * (z1 * z1 - z0 * z0) / 2;
  }
};

Expected expected_of(const PartSpec& s) {
  Expected e;
  e.add(s.outline.moments(), 0, s.thickness_mm, 1);
  if (!s.engraving.empty()) {
    AreaMoments m = polygon_moments(s.engraving);
    e.add(m, s.thickness_mm - s.engraving_depth_mm, s.thickness_mm, -1);
  }
  for (const Cavity& c : s.cavities) e.add(c.region.moments(), c.z0_mm, c.z1_mm, -1);
  return e;
}

std::vector<Ring> rings_of(const Profile& p, double chord = 0.01) {
  std::vector<Ring> out;
  for (const Region& r : p.polygonize(chord)) {
    out.push_back(r.outer);
    out.insert(out.end(), r.holes.begin(), r.holes.end());
  }
  return out;
}

/// Radial tick rectangles (w × len) starting at radius r0, every 360/n degrees.
std::vector<Ring> ticks(int n, double r0, double len, double w) {
  std::vector<Ring> out;
  for (int k = 0; k < n; ++k) {
    const double a = 360.0 * k / n, c = std::cos(deg_to_rad(a)), s = std::sin(deg_to_rad(a));
    const double rm = r0 + len / 2;
    for (Ring& r : rings_of(Profile::rectangle({rm * c, rm * s}, len, w, a))) out.push_back(r);
  }
  return out;
}

/// Numbers around a circle of radius r, upright along the tangent.
std::vector<Ring> numbers(int n, double r, double height) {
  std::vector<Ring> out;
  for (int k = 0; k < n; ++k) {
    const double a = 360.0 * k / n;
    const TextPlacement at{
        {r * std::cos(deg_to_rad(a)), r * std::sin(deg_to_rad(a))}, height, a - 90};
    for (Ring& ring : text_outline(std::to_string(5 * k), at)) out.push_back(ring);
  }
  return out;
}

/// The disc of the measurements: 60 mm, obround slot, 20 ticks, 8 engraved numbers.
PartSpec sample_disc() {
  PartSpec s;
  s.outline = Profile::disc({0, 0}, 30) - Profile::obround({-1, 0}, {7, 0}, 8.05);
  s.thickness_mm = 5;
  s.engraving = ticks(20, 26, 3, 0.6);
  for (Ring& r : numbers(8, 20.5, 3)) s.engraving.push_back(r);
  s.engraving_depth_mm = 0.6;
  s.chord_mm = 0.01;
  return s;
}

void check_solid(const Mesh& m, const PartSpec& s, double volume_eps = 1e-9,
                 double centroid_margin = 1e-9) {
  const MeshInspection in = inspect_mesh(m);
  CHECK(in.closed());
  CHECK(in.boundary_edges == 0);
  CHECK(in.nonmanifold_edges == 0);
  CHECK(in.misoriented_edges == 0);
  CHECK(in.degenerate_triangles == 0);
  CHECK_FALSE(in.self_intersects);
  CHECK(in.valid());
  const Expected e = expected_of(s);
  const MassProperties p = mass_properties(m);
  CHECK(p.volume_mm3 == rel(e.volume, volume_eps));
  CHECK(spec_volume_mm3(s) == rel(e.volume, 1e-12));
  CHECK(p.centroid_mm[0] == Approx(e.centroid()[0]).margin(centroid_margin));
  CHECK(p.centroid_mm[1] == Approx(e.centroid()[1]).margin(centroid_margin));
  CHECK(p.centroid_mm[2] == Approx(e.centroid()[2]).margin(centroid_margin));
}

}  // namespace

TEST_CASE("part: a disc is a closed outward cylinder of the disc's volume", "[kernel][part]") {
  PartSpec s;
  s.outline = Profile::disc({2, -1}, 30);
  s.thickness_mm = 5;
  const Mesh m = build_part(s);
  check_solid(m, s);
  CHECK(mass_properties(m).volume_mm3 == rel(kPi * 900 * 5));
  const Box3 b = bounding_box(m);
  CHECK(b.min[2] == 0);
  CHECK(b.max[2] == 5);
  CHECK(inspect_mesh(m).components == 1);
}

TEST_CASE("part: slot, bore and pockets keep the exact volume and centroid", "[kernel][part]") {
  PartSpec s;
  s.outline = Profile::disc({0, 0}, 30) - Profile::obround({-1, 0}, {7, 0}, 8.05);
  for (double a : {150.0, 180.0, 210.0})
    s.outline = s.outline -
                Profile::disc({20 * std::cos(deg_to_rad(a)), 20 * std::sin(deg_to_rad(a))}, 3.2);
  s.thickness_mm = 5;
  const Mesh m = build_part(s);
  check_solid(m, s);
  // The slot is off centre: the centroid sits on −x by a few tenths of a millimetre.
  CHECK(mass_properties(m).centroid_mm[0] != Approx(0).margin(0.05));
}

TEST_CASE("part: several pieces and a slanted slot", "[kernel][part]") {
  PartSpec s;
  s.outline = (Profile::disc({0, 0}, 20) - Profile::obround({-3, -2}, {6, 4}, 3)) +
              Profile::rectangle({40, 0}, 10, 6, 15);
  s.thickness_mm = 3;
  const Mesh m = build_part(s);
  check_solid(m, s);
  CHECK(inspect_mesh(m).components == 2);
}

TEST_CASE("part: engraved digits and ticks", "[kernel][part]") {
  const PartSpec s = sample_disc();
  const Mesh m = build_part(s);
  check_solid(m, s);
  CHECK(inspect_mesh(m).components == 1);
  // The engraving floors sit at thickness − depth.
  std::size_t at_floor = 0;
  for (const Vec3& v : m.vertices)
    if (v[2] == s.thickness_mm - s.engraving_depth_mm) ++at_floor;
  CHECK(at_floor > 500);
}

TEST_CASE("part: engraving rings are oriented by nesting, not as given", "[kernel][part]") {
  PartSpec s;
  s.outline = Profile::disc({0, 0}, 20);
  s.thickness_mm = 4;
  s.engraving_depth_mm = 1;
  // A frame (outer ring and inner ring, both clockwise) with an island (counter-clockwise).
  auto square = [](double half, bool ccw) {
    Ring r{{{-half, -half}, {half, -half}, {half, half}, {-half, half}}};
    if (!ccw) std::reverse(r.points.begin(), r.points.end());
    return r;
  };
  s.engraving = {square(10, false), square(6, false), square(2, true)};
  const Mesh m = build_part(s);
  check_solid(m, s);
  CHECK(spec_volume_mm3(s) == rel(kPi * 400 * 4 - (400 - 144 + 16) * 1.0, 1e-12));
}

TEST_CASE("part: cavities are closed voids facing inward", "[kernel][part]") {
  PartSpec s = sample_disc();
  s.thickness_mm = 7;
  s.cavities.push_back({Profile::disc({-18, 0}, 3.1), 1.0, 4.0});
  s.cavities.push_back({Profile::disc({18, 8}, 2.5) - Profile::disc({18, 8}, 1), 2.0, 6.0});
  const Mesh m = build_part(s);
  check_solid(m, s);
  CHECK(inspect_mesh(m).components == 3);
  // Each void alone (as built into the part) has negative volume: it faces inward.
  PartSpec solid_only = s;
  solid_only.cavities.clear();
  const double without = mass_properties(build_part(solid_only)).volume_mm3;
  CHECK(mass_properties(m).volume_mm3 < without);
}

TEST_CASE("part: building twice gives the identical mesh", "[kernel][part]") {
  PartSpec s = sample_disc();
  s.cavities.push_back({Profile::disc({-18, 0}, 3.1), 1.0, 3.0});
  const Mesh a = build_part(s), b = build_part(s);
  CHECK(a.vertices == b.vertices);
  CHECK(a.triangles == b.triangles);
}

TEST_CASE("part: features that cross or leave the outline are internal errors", "[kernel][part]") {
  PartSpec base;
  base.outline = Profile::disc({0, 0}, 20) - Profile::disc({0, 0}, 4);
  base.thickness_mm = 5;
  base.engraving_depth_mm = 0.5;
  auto square_at = [](double x, double y, double half) {
    return Ring{
        {{x - half, y - half}, {x + half, y - half}, {x + half, y + half}, {x - half, y + half}}};
  };
  SECTION("an engraving across the rim") {
    PartSpec s = base;
    s.engraving = {square_at(19.5, 0, 1)};
    CHECK_THROWS_AS(build_part(s), InternalError);
  }
  SECTION("an engraving inside the bore") {
    PartSpec s = base;
    s.engraving = {square_at(0, 0, 1)};
    CHECK_THROWS_AS(build_part(s), InternalError);
  }
  SECTION("an engraving around the bore") {
    PartSpec s = base;
    s.engraving = {square_at(0, 0, 10)};
    CHECK_THROWS_AS(build_part(s), InternalError);
  }
  SECTION("an engraving touching the rim at a vertex") {
    PartSpec s = base;
    s.engraving = {Ring{{{20, 0}, {15, -2}, {15, 2}}}};
    CHECK_THROWS_AS(build_part(s), InternalError);
  }
  SECTION("two crossing engraving rings") {
    PartSpec s = base;
    s.engraving = {square_at(10, 0, 2), square_at(11, 1, 2)};
    CHECK_THROWS_AS(build_part(s), InternalError);
  }
  SECTION("an engraving as deep as the part") {
    PartSpec s = base;
    s.engraving = {square_at(10, 0, 2)};
    s.engraving_depth_mm = 5;
    CHECK_THROWS_AS(build_part(s), InternalError);
  }
  SECTION("a cavity across the rim") {
    PartSpec s = base;
    s.cavities.push_back({Profile::disc({19, 0}, 3), 1, 2});
    CHECK_THROWS_AS(build_part(s), InternalError);
  }
  SECTION("a cavity below the floor of an engraving it underlies") {
    PartSpec s = base;
    s.engraving = {square_at(10, 0, 2)};
    s.cavities.push_back({Profile::disc({10, 0}, 3), 1, 4.6});
    CHECK_THROWS_AS(build_part(s), InternalError);
    s.cavities.back().z1_mm = 4.0;  // clear of the floor at 4.5: fine
    check_solid(build_part(s), s);
  }
  SECTION("two overlapping cavities") {
    PartSpec s = base;
    s.cavities.push_back({Profile::disc({10, 0}, 3), 1, 3});
    s.cavities.push_back({Profile::disc({12, 0}, 3), 2, 4});
    CHECK_THROWS_AS(build_part(s), InternalError);
    s.cavities.back().z0_mm = 3.5;  // stacked apart in z: fine
    check_solid(build_part(s), s);
  }
  SECTION("a cavity outside 0 < z0 < z1 < thickness") {
    PartSpec s = base;
    s.cavities.push_back({Profile::disc({10, 0}, 3), 0, 3});
    CHECK_THROWS_AS(build_part(s), InternalError);
    s.cavities.back() = {Profile::disc({10, 0}, 3), 2, 5};
    CHECK_THROWS_AS(build_part(s), InternalError);
  }
  SECTION("an empty outline or no thickness") {
    PartSpec s = base;
    s.outline = Profile();
    CHECK_THROWS_AS(build_part(s), InternalError);
    s = base;
    s.thickness_mm = 0;
    CHECK_THROWS_AS(build_part(s), InternalError);
  }
}

TEST_CASE("part: random discs with slots, pockets and engravings are all valid",
          "[kernel][part][slow]") {
  std::mt19937 rng(20261202);
  auto uni = [&rng](double lo, double hi) {
    return std::uniform_real_distribution<double>(lo, hi)(rng);
  };
  int built = 0;
  for (int iter = 0; iter < 300; ++iter) {
    const double r = uni(15, 45), t = uni(2, 8);
    const double slot_r = uni(2, r / 5), slot_len = uni(0, r / 3), slot_x = uni(-r / 10, r / 10);
    const double slot_angle = iter % 3 == 0 ? 0 : uni(0, 180);
    const double ca = std::cos(deg_to_rad(slot_angle)), sa = std::sin(deg_to_rad(slot_angle));
    PartSpec s;
    s.chord_mm = iter % 2 == 0 ? 0.01 : uni(0.005, 0.05);
    const Vec2 a{slot_x - ca * slot_len / 2, -sa * slot_len / 2},
        b{slot_x + ca * slot_len / 2, sa * slot_len / 2};
    s.outline = Profile::disc({0, 0}, r) - Profile::obround(a, b, slot_r);
    s.thickness_mm = t;
    // Pockets on a ring between the slot and the scale, spaced apart.
    const double inner = slot_len / 2 + std::fabs(slot_x) + slot_r;
    // Neighbours 40° apart stay 1 mm clear of each other; pockets stay 1 mm inside the rim.
    const double pocket_r = uni(1, 3);
    const double ring_r =
        std::max(inner + pocket_r + uni(1, 2), (2 * pocket_r + 1) / (2 * std::sin(deg_to_rad(20))));
    const int pockets = ring_r + pocket_r + 1 < r ? static_cast<int>(uni(0, 4)) : 0;
    const double scale_r0 = ring_r + pocket_r + 1.5;
    for (int k = 0; k < pockets; ++k) {
      const double ang = deg_to_rad(120 + 40 * k);
      const Vec2 c{ring_r * std::cos(ang), ring_r * std::sin(ang)};
      if (k % 2 == 0)
        s.outline = s.outline - Profile::disc(c, pocket_r);
      else
        s.cavities.push_back({Profile::disc(c, pocket_r), t * 0.2, t * 0.6});
    }
    if (scale_r0 + 3 < r - 1) {
      s.engraving_depth_mm = std::min(0.6, t / 4);
      s.engraving = ticks(static_cast<int>(uni(8, 24)), r - 3.5, 2.5, 0.5);
      const double text_h = std::min(2.5, (r - 4 - scale_r0) * 0.8);
      if (text_h > 1) {
        const double text_r = (scale_r0 + r - 4) / 2;
        for (Ring& ring : text_outline(std::to_string(iter), {{-text_r, 0}, text_h, 90}))
          s.engraving.push_back(ring);
      }
    }
    INFO("iteration " << iter << ", R " << r << ", slot " << slot_r << " x " << slot_len);
    const Mesh m = build_part(s);
    const MeshInspection in = inspect_mesh(m);
    REQUIRE(in.valid());
    const Expected e = expected_of(s);
    const MassProperties p = mass_properties(m);
    REQUIRE(p.volume_mm3 == rel(e.volume, 1e-9));
    REQUIRE(p.centroid_mm[0] == Approx(e.centroid()[0]).margin(1e-9 * r));
    REQUIRE(p.centroid_mm[1] == Approx(e.centroid()[1]).margin(1e-9 * r));
    REQUIRE(p.centroid_mm[2] == Approx(e.centroid()[2]).margin(1e-9 * r));
    ++built;
  }
  CHECK(built == 300);
}

TEST_CASE("part: timing of build, inspection and mass properties", "[kernel][part][slow]") {
  // Process CPU time (std::clock), so that other jobs on a shared machine inflate it less than
  // wall time.
  const PartSpec s = sample_disc();
  auto median_ms = [](std::vector<double> v) {
    std::sort(v.begin(), v.end());
    return v[v.size() / 2];
  };
  auto ms_since = [](std::clock_t t0) {
    return 1000.0 * double(std::clock() - t0) / CLOCKS_PER_SEC;
  };
  std::vector<double> build_ms, inspect_ms, mass_ms;
  Mesh m;
  MeshInspection in;
  for (int i = 0; i < 15; ++i) {
    std::clock_t t0 = std::clock();
    m = build_part(s);
    build_ms.push_back(ms_since(t0));
    t0 = std::clock();
    in = inspect_mesh(m);
    inspect_ms.push_back(ms_since(t0));
    t0 = std::clock();
    const MassProperties p = mass_properties(m);
    mass_ms.push_back(ms_since(t0));
    CHECK(p.volume_mm3 > 0);
  }
  std::printf(
      "kernel timing (CPU, median of 15): build_part %.2f ms, inspect_mesh %.2f ms, "
      "mass_properties %.3f ms; %zu vertices, %zu triangles\n",
      median_ms(build_ms), median_ms(inspect_ms), median_ms(mass_ms), m.vertices.size(),
      m.triangles.size());
  CHECK(in.valid());
  // Generous bounds (a loaded 2-core machine): the targets are a few milliseconds each.
  CHECK(median_ms(build_ms) < 50);
  CHECK(median_ms(inspect_ms) < 100);
  CHECK(median_ms(mass_ms) < 10);
}
