// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Hand-made test meshes (closed, outward, counter-clockwise seen from outside) and their exact
/// volumes, built without the kernel so that writer tests do not depend on it.

#include <cmath>
#include <cstdint>

#include "geom/kernel/mesh.hpp"

namespace trimwright::test {

/// Axis-aligned cube of edge `size_mm` with its minimum corner at `origin`: 8 vertices,
/// 12 triangles.
inline kernel::Mesh cube_mesh(double size_mm, kernel::Vec3 origin = {0, 0, 0}) {
  kernel::Mesh m;
  for (int i = 0; i < 8; ++i) {
    m.vertices.push_back({origin[0] + ((i & 1) ? size_mm : 0.0),
                          origin[1] + ((i & 2) ? size_mm : 0.0),
                          origin[2] + ((i & 4) ? size_mm : 0.0)});
  }
  // Vertex i has x = bit 0, y = bit 1, z = bit 2. Two triangles per face, outward.
  m.triangles = {{0, 2, 3}, {0, 3, 1},   // z = 0, normal −z
                 {4, 5, 7}, {4, 7, 6},   // z = s, normal +z
                 {0, 1, 5}, {0, 5, 4},   // y = 0, normal −y
                 {2, 6, 7}, {2, 7, 3},   // y = s, normal +y
                 {0, 4, 6}, {0, 6, 2},   // x = 0, normal −x
                 {1, 3, 7}, {1, 7, 5}};  // x = s, normal +x
  return m;
}

/// The tetrahedron (0,0,0), (a,0,0), (0,a,0), (0,0,a): 4 vertices, 4 triangles, volume a³/6.
inline kernel::Mesh tetrahedron_mesh(double a_mm) {
  kernel::Mesh m;
  m.vertices = {{0, 0, 0}, {a_mm, 0, 0}, {0, a_mm, 0}, {0, 0, a_mm}};
  m.triangles = {{0, 2, 1}, {0, 1, 3}, {0, 3, 2}, {1, 2, 3}};
  return m;
}

/// A closed prism over a regular `segments`-gon inscribed in a circle of `radius_mm` about the
/// z axis, from z = 0 to `height_mm`, with centre vertices on both caps: 2·segments + 2
/// vertices, 4·segments triangles. Its first vertex is at angle `phase_deg`.
inline kernel::Mesh cylinder_mesh(double radius_mm, double height_mm, int segments,
                                  double phase_deg = 0) {
  kernel::Mesh m;
  const double kPi = std::acos(-1.0);
  const auto n = static_cast<std::uint32_t>(segments);
  for (std::uint32_t i = 0; i < n; ++i) {
    const double a = (phase_deg / 180.0 + 2.0 * i / segments) * kPi;
    m.vertices.push_back({radius_mm * std::cos(a), radius_mm * std::sin(a), 0.0});
  }
  for (std::uint32_t i = 0; i < n; ++i) {
    const kernel::Vec3 b = m.vertices[i];
    m.vertices.push_back({b[0], b[1], height_mm});
  }
  const std::uint32_t bottom = 2 * n, top = 2 * n + 1;
  m.vertices.push_back({0, 0, 0});
  m.vertices.push_back({0, 0, height_mm});
  for (std::uint32_t i = 0; i < n; ++i) {
    const std::uint32_t j = (i + 1) % n;
    m.triangles.push_back({bottom, j, i});       // bottom cap, normal −z
    m.triangles.push_back({top, n + i, n + j});  // top cap, normal +z
    m.triangles.push_back({i, j, n + j});        // wall, outward
    m.triangles.push_back({i, n + j, n + i});
  }
  return m;
}

/// Exact volume of cylinder_mesh: regular n-gon area (n/2)·R²·sin(2π/n) times the height.
inline double cylinder_mesh_volume_mm3(double radius_mm, double height_mm, int segments) {
  const double kPi = std::acos(-1.0);
  return 0.5 * segments * radius_mm * radius_mm * std::sin(2 * kPi / segments) * height_mm;
}

/// Signed volume by the divergence theorem (sum of origin tetrahedra), mm³; positive for a
/// closed outward mesh.
inline double signed_volume_mm3(const kernel::Mesh& m) {
  double v = 0;
  for (const auto& t : m.triangles) {
    const kernel::Vec3& a = m.vertices[t[0]];
    const kernel::Vec3& b = m.vertices[t[1]];
    const kernel::Vec3& c = m.vertices[t[2]];
    v += a[0] * (b[1] * c[2] - b[2] * c[1]) - a[1] * (b[0] * c[2] - b[2] * c[0]) +
         a[2] * (b[0] * c[1] - b[1] * c[0]);
  }
  return v / 6.0;
}

/// The mesh with every coordinate rounded to float, as STL and 3MF store it.
inline kernel::Mesh float_rounded(kernel::Mesh m) {
  for (auto& v : m.vertices) {
    for (double& c : v) c = static_cast<double>(static_cast<float>(c));
  }
  return m;
}

}  // namespace trimwright::test
