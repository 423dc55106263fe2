// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Plain geometry types that cross every module boundary. No CGAL here, ever.

#include <array>
#include <cstdint>
#include <vector>

namespace trimwright::kernel {

/// A 2D point or vector, mm.
using Vec2 = std::array<double, 2>;
/// A 3D point or vector, mm.
using Vec3 = std::array<double, 3>;

/// A closed polygonal ring (the last point is not repeated), mm.
struct Ring {
  std::vector<Vec2> points;
};

/// One connected polygonal region: outer ring counter-clockwise, holes clockwise.
struct Region {
  Ring outer;
  std::vector<Ring> holes;
};

/// An indexed triangle mesh in mm. Triangles are counter-clockwise seen from outside
/// (outward normals by the right-hand rule).
struct Mesh {
  std::vector<Vec3> vertices;
  std::vector<std::array<std::uint32_t, 3>> triangles;
};

/// Axis-aligned bounding box, mm.
struct Box3 {
  Vec3 min{0, 0, 0};
  Vec3 max{0, 0, 0};
};

/// Bounding box of a mesh's vertices (all zero for an empty mesh).
Box3 bounding_box(const Mesh& mesh);

/// A rigid transform: p' = rotation · p + translation (rotation row-major, orthonormal).
struct Transform3 {
  std::array<std::array<double, 3>, 3> rotation{{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}};
  Vec3 translation{0, 0, 0};
  /// Rotation by angle_deg about +z (counter-clockwise seen from +z); exact for multiples of 90°.
  static Transform3 rotate_z(double angle_deg);
  /// Pure translation.
  static Transform3 translate(const Vec3& t);
  /// This transform applied after `first`.
  Transform3 after(const Transform3& first) const;
  /// Apply to a point.
  Vec3 apply(const Vec3& p) const;
};

/// The mesh with every vertex transformed. A proper rotation keeps triangle orientation; a
/// reflection (determinant < 0) reverses every triangle so that normals stay outward.
Mesh transformed(const Mesh& mesh, const Transform3& t);

/// The two meshes as one (disjoint components; indices of `b` shifted). Throws InternalError if
/// the vertex count exceeds 32-bit indices.
Mesh merged(const Mesh& a, const Mesh& b);

/// Whether p lies inside the ring (crossing-number test; a point on the boundary may go
/// either way).
bool inside_ring(const Ring& ring, Vec2 p);

/// Whether p lies inside a set of rings under the even-odd rule.
bool inside_even_odd(const std::vector<Ring>& rings, Vec2 p);

}  // namespace trimwright::kernel
