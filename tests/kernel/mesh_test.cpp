// SPDX-License-Identifier: GPL-3.0-or-later
// Plain mesh helpers.

#include "geom/kernel/mesh.hpp"

#include <catch2/catch.hpp>

#include "geom/base/error.hpp"
#include "geom/kernel/mass.hpp"
#include "geom/kernel/mesh_check.hpp"
#include "test_meshes.hpp"

using namespace trimwright;
using namespace trimwright::kernel;
using trimwright::kernel::test::box_mesh;

TEST_CASE("mesh: bounding box", "[kernel][mesh]") {
  const Box3 b = bounding_box(box_mesh({-1, 2, 3}, {4, 5, 6}));
  CHECK(b.min == Vec3{-1, 2, 3});
  CHECK(b.max == Vec3{4, 5, 6});
  const Box3 e = bounding_box(Mesh{});
  CHECK(e.min == Vec3{0, 0, 0});
  CHECK(e.max == Vec3{0, 0, 0});
}

TEST_CASE("mesh: transforms compose and quarter turns are exact", "[kernel][mesh]") {
  const Transform3 r = Transform3::rotate_z(90);
  CHECK(r.apply({1, 2, 3}) == Vec3{-2, 1, 3});
  const Transform3 moved = Transform3::translate({10, 0, 0}).after(r);  // rotate, then move
  CHECK(moved.apply({1, 2, 3}) == Vec3{8, 1, 3});
  const Transform3 other = r.after(Transform3::translate({10, 0, 0}));  // move, then rotate
  CHECK(other.apply({1, 2, 3}) == Vec3{-2, 11, 3});
  const Vec3 p = Transform3::rotate_z(30).after(Transform3::rotate_z(60)).apply({1, 0, 0});
  CHECK(p[0] == Approx(0).margin(1e-15));
  CHECK(p[1] == Approx(1).margin(1e-15));
  CHECK(Transform3::rotate_z(-90).apply({1, 0, 0}) == Vec3{0, -1, 0});
}

TEST_CASE("mesh: transformed keeps the mesh outward, even when mirrored", "[kernel][mesh]") {
  const Mesh box = box_mesh({0, 0, 0}, {1, 2, 3});
  const Mesh turned = transformed(box, Transform3::rotate_z(37));
  CHECK(inspect_mesh(turned).valid());
  Transform3 mirror;
  mirror.rotation = {{{-1, 0, 0}, {0, 1, 0}, {0, 0, 1}}};
  const Mesh mirrored = transformed(box, mirror);
  CHECK(inspect_mesh(mirrored).valid());
  CHECK(mass_properties(mirrored).volume_mm3 == Approx(6).epsilon(1e-12));
}

TEST_CASE("mesh: merged shifts the second mesh's indices", "[kernel][mesh]") {
  const Mesh a = box_mesh({0, 0, 0}, {1, 1, 1}), b = box_mesh({5, 0, 0}, {6, 1, 1});
  const Mesh m = merged(a, b);
  CHECK(m.vertices.size() == 16);
  CHECK(m.triangles.size() == 24);
  CHECK(m.triangles[12][0] == b.triangles[0][0] + 8);
  const MeshInspection in = inspect_mesh(m);
  CHECK(in.valid());
  CHECK(in.components == 2);
  CHECK(mass_properties(m).volume_mm3 == Approx(2).epsilon(1e-12));
}
