// SPDX-License-Identifier: GPL-3.0-or-later
// Mass properties by the divergence theorem against closed forms.

#include "geom/kernel/mass.hpp"

#include <catch2/catch.hpp>
#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/kernel/part.hpp"
#include "test_meshes.hpp"

using namespace trimwright;
using namespace trimwright::kernel;
using trimwright::kernel::test::box_mesh;

namespace {
Approx rel(double v, double eps = 1e-12) { return Approx(v).epsilon(eps).margin(0); }
}  // namespace

TEST_CASE("mass: a box has the closed-form volume, centroid and inertia", "[kernel][mass]") {
  // Solid cuboid a × b × c about its centroid: I_xx = m(b² + c²)/12, I_yy = m(a² + c²)/12,
  // I_zz = m(a² + b²)/12, no products of inertia (Beer & Johnston, Vector Mechanics for Engineers:
  // Dynamics, table of mass moments of inertia of common solids — from memory).
  const double a = 4, b = 6, c = 10;
  const Mesh m = box_mesh({1, 2, 3}, {1 + a, 2 + b, 3 + c});
  const MassProperties p = mass_properties(m);
  const double v = a * b * c;
  CHECK(p.volume_mm3 == rel(v));
  CHECK(p.centroid_mm[0] == rel(1 + a / 2));
  CHECK(p.centroid_mm[1] == rel(2 + b / 2));
  CHECK(p.centroid_mm[2] == rel(3 + c / 2));
  CHECK(p.inertia_mm5[0][0] == rel(v * (b * b + c * c) / 12));
  CHECK(p.inertia_mm5[1][1] == rel(v * (a * a + c * c) / 12));
  CHECK(p.inertia_mm5[2][2] == rel(v * (a * a + b * b) / 12));
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
      if (i != j) CHECK(std::fabs(p.inertia_mm5[i][j]) < 1e-9);
}

TEST_CASE("mass: a tetrahedron's products of inertia", "[kernel][mass]") {
  // Right tetrahedron (0,0,0), (1,0,0), (0,1,0), (0,0,1): V = 1/6, centroid (1/4, 1/4, 1/4),
  // ∫x² dV = 1/60 and ∫xy dV = 1/120 by direct integration (F. Tonon, "Explicit exact formulas for
  // the 3-D tetrahedron inertia tensor in terms of its vertex coordinates", J. Math. Stat. 1(1),
  // 2005 — from memory). About the centroid: I_xx = 2/60 − (1/6)(2/16) = 1/80, and the product
  // −(1/120 − (1/6)(1/16)) = 1/480.
  Mesh m;
  m.vertices = {{0, 0, 0}, {1, 0, 0}, {0, 1, 0}, {0, 0, 1}};
  m.triangles = {{0, 2, 1}, {0, 1, 3}, {0, 3, 2}, {1, 2, 3}};
  const MassProperties p = mass_properties(m);
  CHECK(p.volume_mm3 == rel(1.0 / 6));
  for (int i = 0; i < 3; ++i) CHECK(p.centroid_mm[static_cast<std::size_t>(i)] == rel(0.25));
  for (int i = 0; i < 3; ++i) CHECK(p.inertia_mm5[i][i] == rel(1.0 / 80));
  CHECK(p.inertia_mm5[0][1] == rel(1.0 / 480));
  CHECK(p.inertia_mm5[1][2] == rel(1.0 / 480));
  CHECK(p.inertia_mm5[2][0] == rel(1.0 / 480));
}

TEST_CASE("mass: a cylinder part matches the solid cylinder's inertia", "[kernel][mass]") {
  // Solid cylinder radius r, height h: I_zz = m r²/2, I_xx = I_yy = m(3r² + h²)/12 (Beer &
  // Johnston, table of mass moments of inertia — from memory). The part's polygon keeps the exact
  // area; its second moment differs from the circle's by O(chord/r).
  const double r = 25, h = 6;
  PartSpec s;
  s.outline = Profile::disc({0, 0}, r);
  s.thickness_mm = h;
  s.chord_mm = 0.001;
  const MassProperties p = mass_properties(build_part(s));
  const double v = kPi * r * r * h;
  CHECK(p.volume_mm3 == rel(v, 1e-12));
  CHECK(p.centroid_mm[2] == rel(h / 2));
  CHECK(p.inertia_mm5[2][2] == Approx(v * r * r / 2).epsilon(1e-5));
  CHECK(p.inertia_mm5[0][0] == Approx(v * (3 * r * r + h * h) / 12).epsilon(1e-5));
  CHECK(p.inertia_mm5[1][1] == Approx(v * (3 * r * r + h * h) / 12).epsilon(1e-5));
  CHECK(std::fabs(p.inertia_mm5[0][1]) < 1e-9 * v * r * r);
}

TEST_CASE("mass: moving a part leaves volume and inertia unchanged", "[kernel][mass]") {
  PartSpec s;
  s.outline = Profile::disc({0, 0}, 30) - Profile::obround({-1, 0}, {7, 0}, 8.05);
  s.thickness_mm = 5;
  const Mesh m = build_part(s);
  const MassProperties p = mass_properties(m);
  const Vec3 shift{1000, -2500, 300};
  const MassProperties q = mass_properties(transformed(m, Transform3::translate(shift)));
  CHECK(q.volume_mm3 == rel(p.volume_mm3, 1e-12));
  for (std::size_t i = 0; i < 3; ++i)
    CHECK(q.centroid_mm[i] == Approx(p.centroid_mm[i] + shift[i]).margin(1e-9));
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
      CHECK(q.inertia_mm5[i][j] == Approx(p.inertia_mm5[i][j]).margin(1e-9 * p.inertia_mm5[2][2]));
  // A quarter turn about z swaps I_xx and I_yy.
  const MassProperties t = mass_properties(transformed(m, Transform3::rotate_z(90)));
  CHECK(t.inertia_mm5[0][0] == rel(p.inertia_mm5[1][1], 1e-12));
  CHECK(t.inertia_mm5[1][1] == rel(p.inertia_mm5[0][0], 1e-12));
  CHECK(t.centroid_mm[1] == Approx(p.centroid_mm[0]).margin(1e-12));
}

TEST_CASE("mass: empty, flat and inside-out meshes", "[kernel][mass]") {
  const MassProperties e = mass_properties(Mesh{});
  CHECK(e.volume_mm3 == 0);
  Mesh flat;
  flat.vertices = {{0, 0, 5}, {1, 0, 5}, {0, 1, 5}};
  flat.triangles = {{0, 1, 2}, {0, 2, 1}};
  const MassProperties f = mass_properties(flat);
  CHECK(f.volume_mm3 == Approx(0).margin(1e-15));
  CHECK(f.centroid_mm == Vec3{0, 0, 0});
  Mesh inside_out = box_mesh({0, 0, 0}, {1, 2, 3});
  for (auto& t : inside_out.triangles) std::swap(t[1], t[2]);
  CHECK(mass_properties(inside_out).volume_mm3 == rel(-6));
  CHECK(mass_g(1000, 1.24) == rel(1.24));
}
