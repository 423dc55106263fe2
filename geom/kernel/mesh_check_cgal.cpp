// SPDX-License-Identifier: GPL-3.0-or-later
// Validity of any triangle soup (from our own parts or from broken STL files): an edge map for
// closedness, manifoldness and orientation; exact predicates for degenerate triangles and for
// self-intersections (box intersection plus exact triangle tests, which need no half-edge structure,
// so non-manifold input is fine).

#include <CGAL/Exact_predicates_inexact_constructions_kernel.h>
#include <CGAL/box_intersection_d.h>
#include <CGAL/intersections.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <numeric>
#include <vector>

#include "geom/kernel/mesh_check.hpp"

namespace trimwright::kernel {

namespace {

using K = CGAL::Exact_predicates_inexact_constructions_kernel;
using P3 = K::Point_3;
using Box = CGAL::Box_intersection_d::Box_with_info_d<double, 3, std::uint32_t,
                                                      CGAL::Box_intersection_d::ID_FROM_BOX_ADDRESS>;
using Tri = std::array<std::uint32_t, 3>;

bool finite(const Vec3& p) {
  return std::isfinite(p[0]) && std::isfinite(p[1]) && std::isfinite(p[2]);
}

/// Vertex ids with exactly coincident positions merged (files often repeat vertices per facet).
/// Non-finite vertices keep ids of their own.
std::vector<std::uint32_t> welded_ids(const std::vector<Vec3>& v) {
  std::vector<std::uint32_t> order;
  order.reserve(v.size());
  for (std::uint32_t i = 0; i < v.size(); ++i)
    if (finite(v[i])) order.push_back(i);
  std::sort(order.begin(), order.end(), [&v](std::uint32_t a, std::uint32_t b) {
    return v[a] != v[b] ? v[a] < v[b] : a < b;
  });
  std::vector<std::uint32_t> id(v.size());
  std::iota(id.begin(), id.end(), 0u);
  for (std::size_t k = 1; k < order.size(); ++k)
    if (v[order[k]] == v[order[k - 1]]) id[order[k]] = id[order[k - 1]];
  return id;
}

struct UnionFind {
  std::vector<std::uint32_t> parent;
  explicit UnionFind(std::size_t n) : parent(n) { std::iota(parent.begin(), parent.end(), 0u); }
  std::uint32_t find(std::uint32_t x) {
    while (parent[x] != x) x = parent[x] = parent[parent[x]];
    return x;
  }
  void join(std::uint32_t a, std::uint32_t b) { parent[find(a)] = find(b); }
};

/// True when two non-degenerate triangles (welded ids) meet anywhere beyond the vertices or the
/// edge they share. Shared edge: they overlap only if coplanar and on the same side of it. Shared
/// vertex: they meet elsewhere only if an opposite edge meets the other triangle.
bool triangles_intersect(const Tri& h, const Tri& g, const std::vector<P3>& p) {
  int shared = 0, hi = -1, gj = -1, hi2 = -1, gj2 = -1;
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
      if (h[static_cast<std::size_t>(i)] == g[static_cast<std::size_t>(j)]) {
        if (shared == 0) {
          hi = i;
          gj = j;
        } else {
          hi2 = i;
          gj2 = j;
        }
        ++shared;
      }
  auto hp = [&](int i) -> const P3& { return p[h[static_cast<std::size_t>(i % 3)]]; };
  auto gp = [&](int j) -> const P3& { return p[g[static_cast<std::size_t>(j % 3)]]; };
  if (shared >= 3) return true;  // the same triangle twice
  if (shared == 2) {
    const int h_other = 3 - hi - hi2, g_other = 3 - gj - gj2;
    const P3& u = hp(hi);
    const P3& v = hp(hi2);
    return CGAL::coplanar(u, v, hp(h_other), gp(g_other)) &&
           CGAL::coplanar_orientation(u, v, hp(h_other), gp(g_other)) == CGAL::POSITIVE;
  }
  const K::Triangle_3 th(hp(0), hp(1), hp(2)), tg(gp(0), gp(1), gp(2));
  if (shared == 1)
    return CGAL::do_intersect(th, K::Segment_3(gp(gj + 1), gp(gj + 2))) ||
           CGAL::do_intersect(tg, K::Segment_3(hp(hi + 1), hp(hi + 2)));
  return CGAL::do_intersect(th, tg);
}

}  // namespace

MeshInspection inspect_mesh(const Mesh& mesh, bool check_self_intersection) {
  MeshInspection r;
  r.vertex_count = mesh.vertices.size();
  r.triangle_count = mesh.triangles.size();
  const std::size_t nv = mesh.vertices.size();

  bool any = false;
  for (const Vec3& q : mesh.vertices) {
    if (!finite(q)) continue;
    if (!any) r.bounds = {q, q};
    any = true;
    for (int i = 0; i < 3; ++i) {
      r.bounds.min[i] = std::min(r.bounds.min[i], q[i]);
      r.bounds.max[i] = std::max(r.bounds.max[i], q[i]);
    }
  }
  const Vec3 ref{(r.bounds.min[0] + r.bounds.max[0]) / 2, (r.bounds.min[1] + r.bounds.max[1]) / 2,
                 (r.bounds.min[2] + r.bounds.max[2]) / 2};

  const std::vector<std::uint32_t> weld = welded_ids(mesh.vertices);
  std::vector<P3> pts;
  pts.reserve(nv);
  for (const Vec3& q : mesh.vertices) pts.emplace_back(q[0], q[1], q[2]);

  // Classify triangles; welded, usable ones go on to the edge map and the intersection test.
  std::vector<Tri> tri(mesh.triangles.size());
  std::vector<char> usable(mesh.triangles.size(), 0);     // indices in range, finite
  std::vector<char> proper(mesh.triangles.size(), 0);     // usable and not degenerate
  double volume6 = 0;
  for (std::size_t k = 0; k < mesh.triangles.size(); ++k) {
    const auto& t = mesh.triangles[k];
    if (t[0] >= nv || t[1] >= nv || t[2] >= nv || !finite(mesh.vertices[t[0]]) ||
        !finite(mesh.vertices[t[1]]) || !finite(mesh.vertices[t[2]])) {
      ++r.degenerate_triangles;
      continue;
    }
    usable[k] = 1;
    tri[k] = {weld[t[0]], weld[t[1]], weld[t[2]]};
    const bool repeated = tri[k][0] == tri[k][1] || tri[k][1] == tri[k][2] || tri[k][0] == tri[k][2];
    if (repeated || CGAL::collinear(pts[tri[k][0]], pts[tri[k][1]], pts[tri[k][2]]))
      ++r.degenerate_triangles;
    else
      proper[k] = 1;
    const Vec3& a = mesh.vertices[t[0]];
    const Vec3& b = mesh.vertices[t[1]];
    const Vec3& c = mesh.vertices[t[2]];
    const double ax = a[0] - ref[0], ay = a[1] - ref[1], az = a[2] - ref[2];
    const double bx = b[0] - ref[0], by = b[1] - ref[1], bz = b[2] - ref[2];
    const double cx = c[0] - ref[0], cy = c[1] - ref[1], cz = c[2] - ref[2];
    volume6 += ax * (by * cz - bz * cy) - ay * (bx * cz - bz * cx) + az * (bx * cy - by * cx);
  }
  r.volume_mm3 = volume6 / 6;

  // Edge map: every directed edge of a usable triangle with two distinct ends, keyed by its
  // undirected ends.
  struct Use {
    std::uint64_t key;
    bool forward;  // runs from the smaller id to the larger
    std::uint32_t tri;
  };
  std::vector<Use> uses;
  uses.reserve(3 * mesh.triangles.size());
  for (std::size_t k = 0; k < tri.size(); ++k) {
    if (!usable[k]) continue;
    for (int e = 0; e < 3; ++e) {
      const std::uint32_t a = tri[k][static_cast<std::size_t>(e)];
      const std::uint32_t b = tri[k][static_cast<std::size_t>((e + 1) % 3)];
      if (a == b) continue;
      const std::uint64_t key = (static_cast<std::uint64_t>(std::min(a, b)) << 32) | std::max(a, b);
      uses.push_back({key, a < b, static_cast<std::uint32_t>(k)});
    }
  }
  std::sort(uses.begin(), uses.end(), [](const Use& x, const Use& y) {
    return x.key != y.key ? x.key < y.key : x.tri < y.tri;
  });
  UnionFind components(mesh.triangles.size());
  for (std::size_t i = 0; i < uses.size();) {
    std::size_t j = i;
    while (j < uses.size() && uses[j].key == uses[i].key) ++j;
    const std::size_t n = j - i;
    if (n == 1) ++r.boundary_edges;
    if (n > 2) ++r.nonmanifold_edges;
    if (n == 2 && uses[i].forward == uses[i + 1].forward) ++r.misoriented_edges;
    for (std::size_t k = i + 1; k < j; ++k) components.join(uses[i].tri, uses[k].tri);
    i = j;
  }
  std::vector<char> root(mesh.triangles.size(), 0);
  for (std::size_t k = 0; k < tri.size(); ++k)
    if (usable[k]) {
      const std::uint32_t c = components.find(static_cast<std::uint32_t>(k));
      if (!root[c]) {
        root[c] = 1;
        ++r.components;
      }
    }

  if (check_self_intersection) {
    r.self_intersection_checked = true;
    std::vector<Box> boxes;
    boxes.reserve(tri.size());
    for (std::size_t k = 0; k < tri.size(); ++k)
      if (proper[k])
        boxes.emplace_back(pts[tri[k][0]].bbox() + pts[tri[k][1]].bbox() + pts[tri[k][2]].bbox(),
                           static_cast<std::uint32_t>(k));
    bool found = false;
    CGAL::box_self_intersection_d(boxes.begin(), boxes.end(), [&](const Box& a, const Box& b) {
      if (!found && triangles_intersect(tri[a.info()], tri[b.info()], pts)) found = true;
    });
    r.self_intersects = found;
  }
  return r;
}

}  // namespace trimwright::kernel
