// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Exact 2D profiles bounded by line segments and circular arcs (CGAL's circle-segment Boolean
/// operations behind a private implementation). Area and moments come exactly from the arcs and
/// segments; polylines are made only for meshing, and they keep each circle's exact area.

#include <cstddef>
#include <memory>
#include <vector>

#include "geom/kernel/mesh.hpp"

namespace trimwright::kernel {

/// Area moments of a planar region: integrals of 1, x, y, x², y², xy over it (mm², mm³, mm⁴).
struct AreaMoments {
  double area_mm2 = 0;
  double sx_mm3 = 0;   ///< ∫x dA
  double sy_mm3 = 0;   ///< ∫y dA
  double ixx_mm4 = 0;  ///< ∫x² dA
  double iyy_mm4 = 0;  ///< ∫y² dA
  double ixy_mm4 = 0;  ///< ∫xy dA
  /// Centroid, mm (undefined for zero area).
  Vec2 centroid() const { return {sx_mm3 / area_mm2, sy_mm3 / area_mm2}; }
};

/// Axis-aligned 2D box, mm.
struct Box2 {
  Vec2 min{0, 0};
  Vec2 max{0, 0};
};

/// A closed planar region (possibly several pieces, with holes), bounded by exact segments and
/// circular arcs. Values are immutable and cheap to copy (shared implementation); a value must not
/// be used from two threads at once (exact numbers are evaluated lazily). Invalid construction
/// arguments (non-finite, radius ≤ 0, fewer than 3 vertices) throw InternalError.
class Profile {
 public:
  /// The empty region.
  Profile();
  ~Profile();
  Profile(const Profile&);
  Profile& operator=(const Profile&);
  Profile(Profile&&) noexcept;
  Profile& operator=(Profile&&) noexcept;

  /// Full disc: centre (mm), radius_mm > 0.
  static Profile disc(Vec2 centre, double radius_mm);
  /// Obround (stadium): all points within radius_mm of the segment a–b. a == b gives a disc.
  /// The axis is built on an exact rational direction: b is met exactly for axis-parallel slots and
  /// within ~1e-16 relative otherwise.
  static Profile obround(Vec2 a, Vec2 b, double radius_mm);
  /// Simple polygon from its vertices (either orientation; no self-intersection).
  static Profile polygon(const std::vector<Vec2>& points);
  /// Rectangle width × height (mm) centred at `centre`, turned by angle_deg counter-clockwise
  /// (width along the turned x axis). Exactly rectangular (rational rotation).
  static Profile rectangle(Vec2 centre, double width_mm, double height_mm, double angle_deg = 0);
  /// Annular sector between radii r_in < r_out around `centre`, from a0_deg to a1_deg
  /// counter-clockwise (a1 > a0, span ≤ 360). r_in = 0 gives a pie slice, a span of 360 an annulus.
  static Profile annular_sector(Vec2 centre, double r_in_mm, double r_out_mm, double a0_deg,
                                double a1_deg);

  /// Union.
  Profile operator+(const Profile& other) const;
  /// Difference.
  Profile operator-(const Profile& other) const;
  /// Intersection.
  Profile operator*(const Profile& other) const;

  /// True when the region has no area.
  bool empty() const;
  /// Exact area moments (from the arcs and segments themselves, not a polyline).
  AreaMoments moments() const;
  /// Bounding box (exact arcs).
  Box2 bounds() const;
  /// Number of connected pieces and of holes in all of them.
  std::size_t piece_count() const;
  std::size_t hole_count() const;
  /// True when the point lies strictly inside the region.
  bool contains(Vec2 p) const;

  /// Polygonal regions for meshing. Each arc becomes a polyline whose chord error is at most
  /// chord_mm and whose enclosed area equals the arc's segment area, so every full circle keeps
  /// its exact area and a symmetric feature keeps its exact centroid (an unsymmetric arc piece
  /// moves its first moment slightly: ~3e-5 mm of centroid at chord 0.01 mm on a 30 mm disc).
  /// Outer rings are counter-clockwise, holes clockwise. Deterministic: every ring starts at its
  /// lexicographically smallest vertex, holes and regions are sorted by that vertex.
  std::vector<Region> polygonize(double chord_mm) const;

  /// Private implementation (CGAL); defined only in geom/kernel/*.cpp.
  struct Impl;

 private:
  explicit Profile(std::shared_ptr<const Impl> impl);
  std::shared_ptr<const Impl> impl_;
};

/// Exact area moments of polygonal rings under the even-odd rule (shoelace / Green's theorem).
/// Rings may have any orientation but must not cross each other; a ring's sign comes from the
/// number of rings around it.
AreaMoments polygon_moments(const std::vector<Ring>& rings);

}  // namespace trimwright::kernel
