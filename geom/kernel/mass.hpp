// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Mass properties of a closed triangle mesh by the divergence theorem (Mirtich 1996; Eberly,
/// "Polyhedral Mass Properties (Revisited)").

#include <array>

#include "geom/kernel/mesh.hpp"

namespace trimwright::kernel {

/// Volume, centroid and inertia of a closed, outward-oriented mesh.
struct MassProperties {
  double volume_mm3 = 0;
  Vec3 centroid_mm{0, 0, 0};
  /// Inertia tensor about the centroid for unit density, mm⁵ (multiply by g/mm³ for g·mm²):
  /// diagonal I_xx = ∫(y² + z²) dV …, off-diagonal products of inertia I_xy = −∫xy dV ….
  std::array<std::array<double, 3>, 3> inertia_mm5{};
};

/// Mass properties of a closed mesh. An inside-out mesh gives a negative volume. A mesh with
/// (near) zero volume (|V| ≤ 1e-12 × (largest bounding-box side)³) has centroid (0,0,0) and zero
/// inertia. Triangles with out-of-range indices are skipped.
MassProperties mass_properties(const Mesh& mesh);

/// Grams from mm³ and g/cm³.
inline double mass_g(double volume_mm3, double density_g_cm3) {
  return volume_mm3 * density_g_cm3 * 1e-3;
}

}  // namespace trimwright::kernel
