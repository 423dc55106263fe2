// SPDX-License-Identifier: GPL-3.0-or-later
// Plain mesh helpers: bounding box, rigid transforms, merging.

#include "geom/kernel/mesh.hpp"

#include <algorithm>
#include <cmath>
#include <limits>
#include <string>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"

namespace trimwright::kernel {

Box3 bounding_box(const Mesh& mesh) {
  if (mesh.vertices.empty()) return {};
  Box3 b{mesh.vertices.front(), mesh.vertices.front()};
  for (const Vec3& p : mesh.vertices)
    for (int i = 0; i < 3; ++i) {
      b.min[i] = std::min(b.min[i], p[i]);
      b.max[i] = std::max(b.max[i], p[i]);
    }
  return b;
}

Transform3 Transform3::rotate_z(double angle_deg) {
  // Exact for multiples of 90° so that quarter turns keep coordinates bit for bit.
  const double a = wrap_deg_360(angle_deg);
  double c = std::cos(deg_to_rad(a)), s = std::sin(deg_to_rad(a));
  if (a == 0) c = 1, s = 0;
  if (a == 90) c = 0, s = 1;
  if (a == 180) c = -1, s = 0;
  if (a == 270) c = 0, s = -1;
  Transform3 t;
  t.rotation = {{{c, -s, 0}, {s, c, 0}, {0, 0, 1}}};
  return t;
}

Transform3 Transform3::translate(const Vec3& t) {
  Transform3 out;
  out.translation = t;
  return out;
}

Transform3 Transform3::after(const Transform3& first) const {
  // (this ∘ first)(p) = R (R1 p + t1) + t = (R R1) p + (R t1 + t)
  Transform3 out;
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j) {
      double v = 0;
      for (int k = 0; k < 3; ++k) v += rotation[i][k] * first.rotation[k][j];
      out.rotation[i][j] = v;
    }
  out.translation = apply(first.translation);
  return out;
}

Vec3 Transform3::apply(const Vec3& p) const {
  Vec3 q;
  for (int i = 0; i < 3; ++i)
    q[i] = rotation[i][0] * p[0] + rotation[i][1] * p[1] + rotation[i][2] * p[2] + translation[i];
  return q;
}

Mesh transformed(const Mesh& mesh, const Transform3& t) {
  Mesh out;
  out.vertices.reserve(mesh.vertices.size());
  for (const Vec3& p : mesh.vertices) out.vertices.push_back(t.apply(p));
  out.triangles = mesh.triangles;
  // A reflection (determinant < 0) would turn the surface inside out: reverse every triangle so
  // that normals stay outward.
  const auto& r = t.rotation;
  const double det = r[0][0] * (r[1][1] * r[2][2] - r[1][2] * r[2][1]) -
                     r[0][1] * (r[1][0] * r[2][2] - r[1][2] * r[2][0]) +
                     r[0][2] * (r[1][0] * r[2][1] - r[1][1] * r[2][0]);
  if (det < 0)
    for (auto& tri : out.triangles) std::swap(tri[1], tri[2]);
  return out;
}

Mesh merged(const Mesh& a, const Mesh& b) {
  const std::size_t n = a.vertices.size() + b.vertices.size();
  if (n > std::numeric_limits<std::uint32_t>::max())
    throw InternalError("merged: " + std::to_string(n) + " vertices exceed 32-bit indices");
  Mesh out = a;
  const auto offset = static_cast<std::uint32_t>(a.vertices.size());
  out.vertices.insert(out.vertices.end(), b.vertices.begin(), b.vertices.end());
  out.triangles.reserve(a.triangles.size() + b.triangles.size());
  for (const auto& t : b.triangles)
    out.triangles.push_back({t[0] + offset, t[1] + offset, t[2] + offset});
  return out;
}

bool inside_ring(const Ring& ring, Vec2 p) {
  bool in = false;
  const std::size_t n = ring.points.size();
  for (std::size_t i = 0, j = n - 1; i < n; j = i++) {
    const Vec2& a = ring.points[i];
    const Vec2& b = ring.points[j];
    if ((a[1] > p[1]) != (b[1] > p[1]) && p[0] < (b[0] - a[0]) * (p[1] - a[1]) / (b[1] - a[1]) + a[0])
      in = !in;
  }
  return in;
}

bool inside_even_odd(const std::vector<Ring>& rings, Vec2 p) {
  bool in = false;
  for (const Ring& r : rings) in = in != inside_ring(r, p);
  return in;
}

}  // namespace trimwright::kernel
