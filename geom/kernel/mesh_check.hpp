// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Validity of a triangle mesh from any source: closed, consistently oriented, outward, free of
/// self-intersections and degenerate triangles.

#include <cstddef>

#include "geom/kernel/mesh.hpp"

namespace trimwright::kernel {

/// What inspect_mesh found.
struct MeshInspection {
  std::size_t vertex_count = 0;
  std::size_t triangle_count = 0;
  std::size_t boundary_edges = 0;       ///< edges with one triangle (holes in the surface)
  std::size_t nonmanifold_edges = 0;    ///< edges with more than two triangles
  std::size_t misoriented_edges = 0;    ///< edges whose two triangles run the same way
  std::size_t degenerate_triangles = 0; ///< zero area (repeated or collinear vertices)
  std::size_t components = 0;           ///< connected pieces (by shared edges)
  bool self_intersects = false;         ///< any two non-adjacent triangles intersect
  bool self_intersection_checked = false;
  double volume_mm3 = 0;                ///< signed; positive for an outward closed mesh
  Box3 bounds;
  /// Closed (every edge shared by exactly two triangles).
  bool closed() const { return triangle_count > 0 && boundary_edges == 0 && nonmanifold_edges == 0; }
  /// Closed, consistently oriented, outward, no self-intersection or degenerate triangle.
  bool valid() const {
    return closed() && misoriented_edges == 0 && degenerate_triangles == 0 && !self_intersects &&
           self_intersection_checked && volume_mm3 > 0;
  }
};

/// Inspect a mesh (any soup: vertices at exactly equal positions are merged first, so a file
/// that repeats vertices per facet is read as connected). Triangles with an index out of range or
/// a non-finite vertex count as degenerate and are left out of the other checks.
/// `check_self_intersection` runs the (slower) exact triangle–triangle test; triangles may share
/// vertices and edges, and touching anywhere else counts as intersecting.
MeshInspection inspect_mesh(const Mesh& mesh, bool check_self_intersection = true);

}  // namespace trimwright::kernel
