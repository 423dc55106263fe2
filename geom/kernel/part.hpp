// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Printed parts as 2.5D solids: an outline extruded along z, with engravings sunk into the top
/// face and closed cavities (insert pockets printed over). Built directly as a stack of profiles,
/// so the mesh is closed and outward by construction, with no 3D Booleans.

#include <string>
#include <vector>

#include "geom/kernel/mesh.hpp"
#include "geom/kernel/profile.hpp"

namespace trimwright::kernel {

/// A closed cavity inside the part: `region` extruded from z0_mm to z1_mm (0 < z0 < z1 < thickness).
/// It must lie strictly inside the outline, below the floor of any engraving above it
/// (z1 < thickness − depth), and apart from other cavities (no overlap where their z ranges meet).
/// Its boundary must not cross or touch the outline, the engraving or another cavity in plan.
struct Cavity {
  Profile region;
  double z0_mm = 0;
  double z1_mm = 0;
};

/// What the part is made of, geometrically, in the part frame (design.md §3): z ≥ 0, the face
/// toward the wheel at z = 0, engravings on the outer face z = thickness, read from +z.
struct PartSpec {
  Profile outline;                 ///< the part seen from +z
  double thickness_mm = 0;         ///< extrusion height
  std::vector<Ring> engraving;     ///< polygonal rings, any orientation, even-odd fill, not
                                   ///< crossing each other, strictly inside the top face
  double engraving_depth_mm = 0;   ///< depth of every engraving, < thickness
  std::vector<Cavity> cavities;    ///< closed voids (insert pockets)
  double chord_mm = 0.01;          ///< max chord error of polylined arcs
};

/// The closed, outward-oriented triangle mesh of a part. Vertices are numbered deterministically
/// (same spec, same mesh, byte for byte): the outline rings at z = 0 then at z = thickness, the
/// engraving rings at z = thickness then at the floor, each cavity's rings at z0 then z1.
/// Each cavity is a separate closed shell facing into the void. Throws InternalError when the
/// engraving or a cavity crosses, touches or leaves the outline, when engraving rings cross or
/// share an edge, or when the numbers are out of range (callers lay features out with clearance;
/// that is a bug, not bad input).
Mesh build_part(const PartSpec& spec);

/// Volume of the spec from its profiles alone (outline area × thickness − engraving area × depth −
/// cavities), mm³: the exact-arc reference that the mesh volume is tested against.
double spec_volume_mm3(const PartSpec& spec);

}  // namespace trimwright::kernel
