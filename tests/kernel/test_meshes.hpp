// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
// Small hand-made meshes for the kernel tests.

#include <cstdint>

#include "geom/kernel/mesh.hpp"

namespace trimwright::kernel::test {

/// Axis-aligned box [x0, x1] × [y0, y1] × [z0, z1], 8 vertices, 12 outward triangles.
inline Mesh box_mesh(Vec3 lo, Vec3 hi) {
  Mesh m;
  for (int i = 0; i < 8; ++i)
    m.vertices.push_back(
        {(i & 1) ? hi[0] : lo[0], (i & 2) ? hi[1] : lo[1], (i & 4) ? hi[2] : lo[2]});
  // Quads counter-clockwise seen from outside; corner bits: x = 1, y = 2, z = 4.
  const int q[6][4] = {{0, 2, 3, 1}, {4, 5, 7, 6}, {0, 1, 5, 4},
                       {2, 6, 7, 3}, {0, 4, 6, 2}, {1, 3, 7, 5}};
  for (const auto& f : q) {
    m.triangles.push_back({std::uint32_t(f[0]), std::uint32_t(f[1]), std::uint32_t(f[2])});
    m.triangles.push_back({std::uint32_t(f[0]), std::uint32_t(f[2]), std::uint32_t(f[3])});
  }
  return m;
}

}  // namespace trimwright::kernel::test
