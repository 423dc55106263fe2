// SPDX-License-Identifier: GPL-3.0-or-later
// Mass properties of a closed triangle mesh by the divergence theorem. Each triangle and the
// reference point span a tetrahedron; the polynomial integrals of 1, x, y, z, x², y², z², xy, yz,
// zx over the solid are sums of exact per-triangle terms (D. Eberly, "Polyhedral Mass Properties
// (Revisited)", geometrictools.com, after B. Mirtich, J. Graphics Tools 1(2), 1996). The formulas
// are written out in docs/mass-properties.md.

#include "geom/kernel/mass.hpp"

#include <algorithm>
#include <cmath>

namespace trimwright::kernel {

namespace {

/// Eberly's subexpressions for one coordinate of the three corners.
struct Sub {
  double f1, f2, f3, g0, g1, g2;
};

Sub subexpressions(double w0, double w1, double w2) {
  const double t0 = w0 + w1;
  Sub s{};
  s.f1 = t0 + w2;
  const double t1 = w0 * w0;
  const double t2 = t1 + w1 * t0;
  s.f2 = t2 + w2 * s.f1;
  s.f3 = w0 * t1 + w1 * t2 + w2 * s.f2;
  s.g0 = s.f2 + w0 * (s.f1 + w0);
  s.g1 = s.f2 + w1 * (s.f1 + w1);
  s.g2 = s.f2 + w2 * (s.f1 + w2);
  return s;
}

}  // namespace

MassProperties mass_properties(const Mesh& mesh) {
  MassProperties out;
  const std::size_t nv = mesh.vertices.size();
  if (mesh.triangles.empty() || nv == 0) return out;
  // Work relative to the bounding-box centre: terms are then of the size of the part, not of its
  // distance from the origin, and the sums do not cancel.
  const Box3 box = bounding_box(mesh);
  const Vec3 ref{(box.min[0] + box.max[0]) / 2, (box.min[1] + box.max[1]) / 2,
                 (box.min[2] + box.max[2]) / 2};
  double in[10] = {0, 0, 0, 0, 0, 0, 0, 0, 0, 0};  // 1, x, y, z, x², y², z², xy, yz, zx
  for (const auto& tri : mesh.triangles) {
    if (tri[0] >= nv || tri[1] >= nv || tri[2] >= nv) continue;
    const Vec3& p0 = mesh.vertices[tri[0]];
    const Vec3& p1 = mesh.vertices[tri[1]];
    const Vec3& p2 = mesh.vertices[tri[2]];
    const double x0 = p0[0] - ref[0], y0 = p0[1] - ref[1], z0 = p0[2] - ref[2];
    const double x1 = p1[0] - ref[0], y1 = p1[1] - ref[1], z1 = p1[2] - ref[2];
    const double x2 = p2[0] - ref[0], y2 = p2[1] - ref[1], z2 = p2[2] - ref[2];
    // Unnormalised normal (edge cross product).
    const double a1 = x1 - x0, b1 = y1 - y0, c1 = z1 - z0;
    const double a2 = x2 - x0, b2 = y2 - y0, c2 = z2 - z0;
    const double d0 = b1 * c2 - b2 * c1, d1 = a2 * c1 - a1 * c2, d2 = a1 * b2 - a2 * b1;
    const Sub sx = subexpressions(x0, x1, x2);
    const Sub sy = subexpressions(y0, y1, y2);
    const Sub sz = subexpressions(z0, z1, z2);
    in[0] += d0 * sx.f1;
    in[1] += d0 * sx.f2;
    in[2] += d1 * sy.f2;
    in[3] += d2 * sz.f2;
    in[4] += d0 * sx.f3;
    in[5] += d1 * sy.f3;
    in[6] += d2 * sz.f3;
    in[7] += d0 * (y0 * sx.g0 + y1 * sx.g1 + y2 * sx.g2);
    in[8] += d1 * (z0 * sy.g0 + z1 * sy.g1 + z2 * sy.g2);
    in[9] += d2 * (x0 * sz.g0 + x1 * sz.g1 + x2 * sz.g2);
  }
  in[0] /= 6;
  for (int i = 1; i <= 3; ++i) in[i] /= 24;
  for (int i = 4; i <= 6; ++i) in[i] /= 60;
  for (int i = 7; i <= 9; ++i) in[i] /= 120;

  const double v = in[0];
  out.volume_mm3 = v;
  const double size =
      std::max({box.max[0] - box.min[0], box.max[1] - box.min[1], box.max[2] - box.min[2]});
  // A (near) flat or open-and-cancelling surface has no meaningful centroid or inertia.
  if (!(std::fabs(v) > 1e-12 * size * size * size)) return out;
  const double cx = in[1] / v, cy = in[2] / v, cz = in[3] / v;  // relative to ref
  out.centroid_mm = {ref[0] + cx, ref[1] + cy, ref[2] + cz};
  // Second moments about the centroid (parallel-axis shift from ref).
  const double xx = in[4] - v * cx * cx, yy = in[5] - v * cy * cy, zz = in[6] - v * cz * cz;
  const double xy = in[7] - v * cx * cy, yz = in[8] - v * cy * cz, zx = in[9] - v * cz * cx;
  out.inertia_mm5 = {{{yy + zz, -xy, -zx}, {-xy, xx + zz, -yz}, {-zx, -yz, xx + yy}}};
  return out;
}

}  // namespace trimwright::kernel
