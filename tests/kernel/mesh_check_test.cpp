// SPDX-License-Identifier: GPL-3.0-or-later
// Mesh inspection on hand-made broken meshes.

#include "geom/kernel/mesh_check.hpp"

#include <catch2/catch.hpp>
#include <algorithm>
#include <cmath>
#include <random>

#include "test_meshes.hpp"

using namespace trimwright::kernel;
using trimwright::kernel::test::box_mesh;

TEST_CASE("mesh_check: a closed box is valid", "[kernel][mesh_check]") {
  const MeshInspection in = inspect_mesh(box_mesh({0, 0, 0}, {1, 2, 3}));
  CHECK(in.vertex_count == 8);
  CHECK(in.triangle_count == 12);
  CHECK(in.boundary_edges == 0);
  CHECK(in.nonmanifold_edges == 0);
  CHECK(in.misoriented_edges == 0);
  CHECK(in.degenerate_triangles == 0);
  CHECK(in.components == 1);
  CHECK(in.self_intersection_checked);
  CHECK_FALSE(in.self_intersects);
  CHECK(in.volume_mm3 == Approx(6).epsilon(1e-14));
  CHECK(in.bounds.max == Vec3{1, 2, 3});
  CHECK(in.valid());
  const MeshInspection quick = inspect_mesh(box_mesh({0, 0, 0}, {1, 2, 3}), false);
  CHECK_FALSE(quick.self_intersection_checked);
  CHECK_FALSE(quick.valid());  // valid() needs the self-intersection test
  CHECK(quick.closed());
}

TEST_CASE("mesh_check: a missing triangle leaves three boundary edges", "[kernel][mesh_check]") {
  Mesh m = box_mesh({0, 0, 0}, {1, 1, 1});
  m.triangles.pop_back();
  const MeshInspection in = inspect_mesh(m);
  CHECK(in.boundary_edges == 3);
  CHECK_FALSE(in.closed());
  CHECK_FALSE(in.valid());
}

TEST_CASE("mesh_check: a flipped triangle gives three misoriented edges", "[kernel][mesh_check]") {
  Mesh m = box_mesh({0, 0, 0}, {1, 1, 1});
  std::swap(m.triangles[4][1], m.triangles[4][2]);
  const MeshInspection in = inspect_mesh(m);
  CHECK(in.misoriented_edges == 3);
  CHECK(in.closed());
  CHECK_FALSE(in.valid());
}

TEST_CASE("mesh_check: an inside-out box has negative volume", "[kernel][mesh_check]") {
  Mesh m = box_mesh({0, 0, 0}, {1, 1, 1});
  for (auto& t : m.triangles) std::swap(t[1], t[2]);
  const MeshInspection in = inspect_mesh(m);
  CHECK(in.misoriented_edges == 0);
  CHECK(in.volume_mm3 == Approx(-1).epsilon(1e-14));
  CHECK_FALSE(in.valid());
}

TEST_CASE("mesh_check: two intersecting boxes self-intersect", "[kernel][mesh_check]") {
  const Mesh m = merged(box_mesh({0, 0, 0}, {2, 2, 2}), box_mesh({1, 1, 1}, {3, 3, 3}));
  const MeshInspection in = inspect_mesh(m);
  CHECK(in.closed());
  CHECK(in.components == 2);
  CHECK(in.self_intersects);
  CHECK_FALSE(in.valid());
}

TEST_CASE("mesh_check: boxes apart are valid, boxes sharing a face are not",
          "[kernel][mesh_check]") {
  const MeshInspection apart =
      inspect_mesh(merged(box_mesh({0, 0, 0}, {1, 1, 1}), box_mesh({2, 0, 0}, {3, 1, 1})));
  CHECK(apart.valid());
  CHECK(apart.components == 2);
  // Touching along a face (coplanar, overlapping): the surfaces meet.
  const MeshInspection touching = inspect_mesh(
      merged(box_mesh({0, 0, 0}, {1, 1, 1}), box_mesh({1, 0.25, 0.25}, {2, 0.75, 0.75})));
  CHECK(touching.self_intersects);
  // A box sitting inside another one: no triangles meet, but that is not one solid either...
  const MeshInspection nested =
      inspect_mesh(merged(box_mesh({0, 0, 0}, {4, 4, 4}), box_mesh({1, 1, 1}, {2, 2, 2})));
  CHECK_FALSE(nested.self_intersects);
  CHECK(nested.components == 2);
}

TEST_CASE("mesh_check: a degenerate triangle is counted", "[kernel][mesh_check]") {
  Mesh m = box_mesh({0, 0, 0}, {1, 1, 1});
  const auto base = static_cast<std::uint32_t>(m.vertices.size());
  m.vertices.push_back({5, 5, 5});
  m.vertices.push_back({6, 6, 6});
  m.vertices.push_back({7, 7, 7});  // collinear
  m.triangles.push_back({base, base + 1, base + 2});
  m.triangles.push_back({0, 0, 1});  // repeated vertex
  const MeshInspection in = inspect_mesh(m);
  CHECK(in.degenerate_triangles == 2);
  CHECK_FALSE(in.valid());
}

TEST_CASE("mesh_check: a non-manifold edge is counted", "[kernel][mesh_check]") {
  Mesh m = box_mesh({0, 0, 0}, {1, 1, 1});
  // A fin on the edge from vertex 0 (0,0,0) to vertex 1 (1,0,0).
  m.vertices.push_back({0.5, -1, -1});
  m.triangles.push_back({0, 1, 8});
  const MeshInspection in = inspect_mesh(m);
  CHECK(in.nonmanifold_edges == 1);
  CHECK(in.boundary_edges == 2);
  CHECK_FALSE(in.closed());
}

TEST_CASE("mesh_check: an unwelded soup (one vertex triple per facet) is welded",
          "[kernel][mesh_check]") {
  const Mesh box = box_mesh({0, 0, 0}, {1, 1, 1});
  Mesh soup;
  for (const auto& t : box.triangles) {
    const auto base = static_cast<std::uint32_t>(soup.vertices.size());
    for (auto i : t) soup.vertices.push_back(box.vertices[i]);
    soup.triangles.push_back({base, base + 1, base + 2});
  }
  const MeshInspection in = inspect_mesh(soup);
  CHECK(in.vertex_count == 36);
  CHECK(in.valid());
  CHECK(in.components == 1);
}

TEST_CASE("mesh_check: empty and corrupt meshes do not crash", "[kernel][mesh_check]") {
  const MeshInspection empty = inspect_mesh(Mesh{});
  CHECK(empty.triangle_count == 0);
  CHECK(empty.components == 0);
  CHECK(empty.volume_mm3 == 0);
  CHECK_FALSE(empty.closed());
  CHECK_FALSE(empty.valid());
  Mesh bad = box_mesh({0, 0, 0}, {1, 1, 1});
  bad.vertices[7] = {NAN, 0, 0};
  bad.triangles.push_back({0, 1, 99});  // index out of range
  const MeshInspection in = inspect_mesh(bad);
  CHECK(in.degenerate_triangles >= 1 + 3);  // the stray triangle and those touching the NaN vertex
  CHECK_FALSE(in.valid());
  CHECK(std::isfinite(in.volume_mm3));
  CHECK(in.bounds.max == Vec3{1, 1, 1});
}

namespace {
/// Whether the triangle (0,0,0), (4,0,0), (0,4,0) and `other` intersect beyond shared corners.
bool meets_base(std::array<Vec3, 3> other) {
  Mesh m;
  m.vertices = {{0, 0, 0}, {4, 0, 0}, {0, 4, 0}, other[0], other[1], other[2]};
  m.triangles = {{0, 1, 2}, {3, 4, 5}};
  return inspect_mesh(m).self_intersects;
}
}  // namespace

TEST_CASE("mesh_check: triangles touching a flat triangle are decided exactly",
          "[kernel][mesh_check]") {
  // One corner resting on the plane, inside and outside the triangle.
  CHECK(meets_base({Vec3{1, 1, 0}, {1, 1, 2}, {2, 1, 2}}));
  CHECK_FALSE(meets_base({Vec3{5, 5, 0}, {5, 5, 2}, {6, 5, 2}}));
  // An edge lying in the plane, across and beside the triangle; on its boundary.
  CHECK(meets_base({Vec3{-1, 1, 0}, {3, 1, 0}, {1, 1, 3}}));
  CHECK_FALSE(meets_base({Vec3{-1, -1, 0}, {-2, 5, 0}, {-1, 2, 3}}));
  CHECK(meets_base({Vec3{-1, 0, 0}, {5, 0, 0}, {2, 0, 3}}));
  // Sharing the corner (0,0,0): an edge into the triangle's angle, away from it, along its side.
  CHECK(meets_base({Vec3{0, 0, 0}, {1, 1, 0}, {1, 1, 2}}));
  CHECK_FALSE(meets_base({Vec3{0, 0, 0}, {-1, -1, 0}, {-1, -1, 2}}));
  CHECK(meets_base({Vec3{0, 0, 0}, {2, 0, 0}, {2, 0, 3}}));
  CHECK_FALSE(meets_base({Vec3{0, 0, 0}, {-2, 0, 0}, {-2, 0, 3}}));
  // Sharing the edge (0,0,0)–(4,0,0): a wall, a coplanar overlap, a coplanar neighbour.
  CHECK_FALSE(meets_base({Vec3{0, 0, 0}, {4, 0, 0}, {2, 0, 3}}));
  CHECK(meets_base({Vec3{0, 0, 0}, {4, 0, 0}, {2, 2, 0}}));
  CHECK_FALSE(meets_base({Vec3{0, 0, 0}, {4, 0, 0}, {2, -2, 0}}));
  // Crossing the plane inside and outside the triangle.
  CHECK(meets_base({Vec3{1, 1, -1}, {1, 1, 1}, {2, 1, 1}}));
  CHECK_FALSE(meets_base({Vec3{5, 1, -1}, {5, 1, 1}, {6, 1, 1}}));
  // Coplanar and apart from shared corners: inside, overlapping an edge, far away.
  CHECK(meets_base({Vec3{1, 1, 0}, {2, 1, 0}, {1, 2, 0}}));
  CHECK(meets_base({Vec3{3, -1, 0}, {5, -1, 0}, {3, 3, 0}}));
  CHECK_FALSE(meets_base({Vec3{10, 10, 0}, {11, 10, 0}, {10, 11, 0}}));
  // The same questions in a slanted plane go through the general 3D test.
  Mesh slanted;
  slanted.vertices = {{0, 0, 0}, {4, 0, 1}, {0, 4, 2}, {1, 1, 0.75}, {1, 1, 3}, {2, 1, 3}};
  slanted.triangles = {{0, 1, 2}, {3, 4, 5}};
  CHECK(inspect_mesh(slanted).self_intersects);  // (1,1,0.75) lies on the slanted triangle
  slanted.vertices[3] = {1, 1, 0.8};
  CHECK_FALSE(inspect_mesh(slanted).self_intersects);
}

TEST_CASE("mesh_check: random soups on a coarse grid give order-independent answers",
          "[kernel][mesh_check]") {
  // Integer corners on a 4 × 4 × 4 grid make shared corners, coplanar, collinear and touching
  // triangles common. The answer must not depend on the order of the triangles, on which corner a
  // triangle starts at, on an exact shift of all coordinates or on an exact rotation; nothing may
  // crash.
  std::mt19937 rng(7);
  std::uniform_int_distribution<int> coord(0, 3);
  int intersecting = 0;
  for (int iter = 0; iter < 300; ++iter) {
    Mesh m;
    for (int i = 0; i < 40; ++i)
      m.vertices.push_back({double(coord(rng)), double(coord(rng)), double(coord(rng))});
    std::uniform_int_distribution<std::uint32_t> pick(0, 39);
    for (int t = 0; t < 6; ++t) m.triangles.push_back({pick(rng), pick(rng), pick(rng)});
    const MeshInspection a = inspect_mesh(m);
    Mesh b = m;
    std::shuffle(b.triangles.begin(), b.triangles.end(), rng);
    for (auto& t : b.triangles) t = {t[1], t[2], t[0]};
    for (auto& v : b.vertices) v = {v[0] + 1024, v[1] - 512, v[2] + 64};
    const MeshInspection c = inspect_mesh(b);
    // An exact similarity (15 × the rotation of the quaternion (1, 1, 2, 3), integer entries) turns
    // the axis-parallel planes oblique, so the general 3D test decides what the 2D one did.
    Mesh d = m;
    for (auto& v : d.vertices)
      v = {-11 * v[0] - 2 * v[1] + 10 * v[2], 10 * v[0] - 5 * v[1] + 10 * v[2],
           2 * v[0] + 14 * v[1] + 5 * v[2]};
    INFO("soup " << iter);
    CHECK(a.self_intersects == c.self_intersects);
    CHECK(a.self_intersects == inspect_mesh(d).self_intersects);
    CHECK(a.degenerate_triangles == c.degenerate_triangles);
    CHECK(a.boundary_edges == c.boundary_edges);
    CHECK(a.misoriented_edges == c.misoriented_edges);
    CHECK(a.components == c.components);
    CHECK(a.degenerate_triangles <= a.triangle_count);
    intersecting += a.self_intersects;
  }
  // The sample has both answers.
  CHECK(intersecting > 10);
  CHECK(intersecting < 290);
}
