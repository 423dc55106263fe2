// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
// A deliberately separate binary-STL reader and volume/centroid integrator for tests: it shares
// no code with geom/io (the writer) or geom/kernel (the mass properties), so a part checked with
// it is checked independently. Volume and centroid by the divergence theorem over origin
// tetrahedra (Mirtich 1996; Eberly, "Polyhedral Mass Properties (Revisited)").
#include <array>
#include <cstdint>
#include <cstring>
#include <stdexcept>
#include <string>

namespace trimwright::test {

struct StlMass {
  std::size_t triangles = 0;
  double volume_mm3 = 0;
  std::array<double, 3> centroid_mm{0, 0, 0};
};

inline StlMass stl_mass(const std::string& bytes) {
  if (bytes.size() < 84) throw std::runtime_error("STL shorter than its header");
  std::uint32_t n = 0;
  std::memcpy(&n, bytes.data() + 80, 4);
  if (bytes.size() != 84 + 50ull * n) throw std::runtime_error("not a binary STL of its stated size");
  StlMass m;
  m.triangles = n;
  double v6 = 0, sx = 0, sy = 0, sz = 0;
  for (std::uint32_t i = 0; i < n; ++i) {
    const char* rec = bytes.data() + 84 + 50ull * i + 12;  // skip the normal
    float f[9];
    std::memcpy(f, rec, sizeof f);
    double a[3] = {f[0], f[1], f[2]}, b[3] = {f[3], f[4], f[5]}, c[3] = {f[6], f[7], f[8]};
    double det = a[0] * (b[1] * c[2] - b[2] * c[1]) - a[1] * (b[0] * c[2] - b[2] * c[0]) +
                 a[2] * (b[0] * c[1] - b[1] * c[0]);
    v6 += det;
    sx += det * (a[0] + b[0] + c[0]);
    sy += det * (a[1] + b[1] + c[1]);
    sz += det * (a[2] + b[2] + c[2]);
  }
  m.volume_mm3 = v6 / 6.0;
  m.centroid_mm = {sx / (4.0 * v6), sy / (4.0 * v6), sz / (4.0 * v6)};
  return m;
}

}  // namespace trimwright::test
