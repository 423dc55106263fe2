// SPDX-License-Identifier: GPL-3.0-or-later
// Validity of any triangle soup (from our own parts or from broken STL files): an edge map for
// closedness, manifoldness and orientation; exact predicates for degenerate triangles and for
// self-intersections (box intersection plus exact triangle tests, which need no half-edge
// structure, so non-manifold input is fine).

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
using P2 = K::Point_2;
using Box =
    CGAL::Box_intersection_d::Box_with_info_d<double, 3, std::uint32_t,
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
  std::sort(order.begin(), order.end(),
            [&v](std::uint32_t a, std::uint32_t b) { return v[a] != v[b] ? v[a] < v[b] : a < b; });
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

/// Shared vertices of two triangles: count and the positions of the first two in each.
struct Sharing {
  int count = 0;
  int h[2] = {-1, -1};
  int g[2] = {-1, -1};
};

Sharing sharing(const Tri& h, const Tri& g) {
  Sharing s;
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
      if (h[static_cast<std::size_t>(i)] == g[static_cast<std::size_t>(j)]) {
        if (s.count < 2) {
          s.h[s.count] = i;
          s.g[s.count] = j;
        }
        ++s.count;
      }
  return s;
}

// Closed 2D intersection tests from orientation predicates alone (exact, and fast through the
// kernel's static filters; the library's constructive 2D intersection tests are slower).

bool segments_meet(const P2& p, const P2& q, const P2& r, const P2& s) {
  const CGAL::Orientation o1 = CGAL::orientation(p, q, r), o2 = CGAL::orientation(p, q, s);
  const CGAL::Orientation o3 = CGAL::orientation(r, s, p), o4 = CGAL::orientation(r, s, q);
  if (o1 != o2 && o3 != o4) return true;
  // Remaining touching cases: an end on the other (collinear) segment.
  return (o1 == CGAL::COLLINEAR && CGAL::collinear_are_ordered_along_line(p, r, q)) ||
         (o2 == CGAL::COLLINEAR && CGAL::collinear_are_ordered_along_line(p, s, q)) ||
         (o3 == CGAL::COLLINEAR && CGAL::collinear_are_ordered_along_line(r, p, s)) ||
         (o4 == CGAL::COLLINEAR && CGAL::collinear_are_ordered_along_line(r, q, s));
}

bool point_in_triangle(const P2& p, const P2 t[3]) {
  const CGAL::Orientation o = CGAL::orientation(t[0], t[1], t[2]), opposite = -o;
  return CGAL::orientation(t[0], t[1], p) != opposite &&
         CGAL::orientation(t[1], t[2], p) != opposite &&
         CGAL::orientation(t[2], t[0], p) != opposite;
}

bool segment_meets_triangle(const P2& p, const P2& q, const P2 t[3]) {
  return point_in_triangle(p, t) || point_in_triangle(q, t) || segments_meet(p, q, t[0], t[1]) ||
         segments_meet(p, q, t[1], t[2]) || segments_meet(p, q, t[2], t[0]);
}

bool triangles_meet(const P2 a[3], const P2 b[3]) {
  for (int i = 0; i < 3; ++i)
    for (int j = 0; j < 3; ++j)
      if (segments_meet(a[i], a[(i + 1) % 3], b[j], b[(j + 1) % 3])) return true;
  return point_in_triangle(a[0], b) || point_in_triangle(b[0], a);
}

/// Exact test for two triangles in one plane, given as 2D points. Shared edge: they overlap only
/// if their third corners lie on the same side. Shared corner: only if an opposite edge meets the
/// other triangle.
bool coplanar_triangles_intersect(const P2 h[3], const P2 g[3], const Sharing& s) {
  if (s.count == 2) {
    const P2& u = h[s.h[0]];
    const P2& v = h[s.h[1]];
    return CGAL::orientation(u, v, h[3 - s.h[0] - s.h[1]]) ==
           CGAL::orientation(u, v, g[3 - s.g[0] - s.g[1]]);
  }
  if (s.count == 1)
    return segment_meets_triangle(g[(s.g[0] + 1) % 3], g[(s.g[0] + 2) % 3], h) ||
           segment_meets_triangle(h[(s.h[0] + 1) % 3], h[(s.h[0] + 2) % 3], g);
  return triangles_meet(h, g);
}

/// The axis (0, 1, 2) to which the triangle's plane is perpendicular, exactly, or −1.
int flat_axis(const Tri& t, const std::vector<P3>& p) {
  for (int a = 2; a >= 0; --a)
    if (p[t[0]][a] == p[t[1]][a] && p[t[1]][a] == p[t[2]][a]) return a;
  return -1;
}

/// General test in 3D. Shared edge: they overlap only if coplanar and on the same side of it.
/// Shared vertex: they meet elsewhere only if an opposite edge meets the other triangle.
bool triangles_intersect_3d(const Tri& h, const Tri& g, const Sharing& s,
                            const std::vector<P3>& p) {
  auto hp = [&](int i) -> const P3& { return p[h[static_cast<std::size_t>(i % 3)]]; };
  auto gp = [&](int j) -> const P3& { return p[g[static_cast<std::size_t>(j % 3)]]; };
  if (s.count == 2) {
    const int h_other = 3 - s.h[0] - s.h[1], g_other = 3 - s.g[0] - s.g[1];
    const P3& u = hp(s.h[0]);
    const P3& v = hp(s.h[1]);
    // Quick exact decision first: if some axis projection puts the third corners strictly on
    // opposite sides of the shared edge, the triangles meet only along it. (Neighbouring wall
    // triangles are exactly coplanar, where the 3D test below needs exact arithmetic.)
    for (int drop = 2; drop >= 0; --drop) {
      const int a = drop == 0 ? 1 : 0, b = drop == 2 ? 1 : 2;
      auto flat = [a, b](const P3& q) { return P2(q[a], q[b]); };
      const CGAL::Orientation oh = CGAL::orientation(flat(u), flat(v), flat(hp(h_other)));
      const CGAL::Orientation og = CGAL::orientation(flat(u), flat(v), flat(gp(g_other)));
      if (oh != CGAL::COLLINEAR && og != CGAL::COLLINEAR) {
        if (oh != og) return false;
        break;
      }
    }
    return CGAL::coplanar(u, v, hp(h_other), gp(g_other)) &&
           CGAL::coplanar_orientation(u, v, hp(h_other), gp(g_other)) == CGAL::POSITIVE;
  }
  const K::Triangle_3 th(hp(0), hp(1), hp(2)), tg(gp(0), gp(1), gp(2));
  if (s.count == 1)
    return CGAL::do_intersect(th, K::Segment_3(gp(s.g[0] + 1), gp(s.g[0] + 2))) ||
           CGAL::do_intersect(tg, K::Segment_3(hp(s.h[0] + 1), hp(s.h[0] + 2)));
  return CGAL::do_intersect(th, tg);
}

/// True when two non-degenerate triangles (welded ids) meet anywhere beyond the vertices or the
/// edge they share. Triangles in axis-parallel planes (the caps and floors of parts) are decided
/// in 2D, where exact predicates rarely meet the degenerate (zero) cases that make the 3D tests
/// slow: a triangle resting on such a plane touches it in a point or an edge, compared in 2D.
bool triangles_intersect(Tri h, Tri g, const std::vector<P3>& p) {
  Sharing s = sharing(h, g);
  if (s.count >= 3) return true;  // the same triangle twice
  int axis = flat_axis(h, p);
  if (axis < 0) {
    axis = flat_axis(g, p);
    if (axis >= 0) {
      std::swap(h, g);
      s = sharing(h, g);
    }
  }
  if (axis < 0) return triangles_intersect_3d(h, g, s, p);
  const double level = p[h[0]][axis];
  int below = 0, above = 0;
  int on[3];
  int n_on = 0;
  for (int j = 0; j < 3; ++j) {
    const double c = p[g[static_cast<std::size_t>(j)]][axis];
    if (c < level)
      ++below;
    else if (c > level)
      ++above;
    else
      on[n_on++] = j;
  }
  if (below > 0 && above > 0) return triangles_intersect_3d(h, g, s, p);  // crosses the plane
  if (n_on == 0) return false;
  const int u = axis == 0 ? 1 : 0, v = axis == 2 ? 1 : 2;
  auto flat = [&](std::uint32_t id) { return P2(p[id][u], p[id][v]); };
  const P2 h2[3] = {flat(h[0]), flat(h[1]), flat(h[2])};
  if (n_on == 3) {
    const P2 g2[3] = {flat(g[0]), flat(g[1]), flat(g[2])};
    return coplanar_triangles_intersect(h2, g2, s);
  }
  auto corner_of_h = [&](std::uint32_t id) {
    for (int i = 0; i < 3; ++i)
      if (h[static_cast<std::size_t>(i)] == id) return i;
    return -1;
  };
  const std::uint32_t q0 = g[static_cast<std::size_t>(on[0])];
  if (n_on == 1) {  // g touches the plane at one corner
    if (corner_of_h(q0) >= 0) return false;
    return point_in_triangle(flat(q0), h2);
  }
  // g rests on the plane along its edge q0–q1.
  const std::uint32_t q1 = g[static_cast<std::size_t>(on[1])];
  const int c0 = corner_of_h(q0), c1 = corner_of_h(q1);
  if (c0 >= 0 && c1 >= 0) return false;  // the shared edge
  if (c0 < 0 && c1 < 0) return segment_meets_triangle(flat(q0), flat(q1), h2);
  // One end is a corner of h: the edge enters h iff its other end lies in h's closed angle there.
  const int c = c0 >= 0 ? c0 : c1;
  const P2 q = flat(c0 >= 0 ? q1 : q0);
  const P2& pc = h2[c];
  const P2& a = h2[(c + 1) % 3];
  const P2& b = h2[(c + 2) % 3];
  const CGAL::Orientation o = CGAL::orientation(pc, a, b);
  const CGAL::Orientation oa = CGAL::orientation(pc, a, q), ob = CGAL::orientation(pc, q, b);
  return (oa == o || oa == CGAL::COLLINEAR) && (ob == o || ob == CGAL::COLLINEAR) &&
         !(oa == CGAL::COLLINEAR && ob == CGAL::COLLINEAR);
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
  std::vector<char> usable(mesh.triangles.size(), 0);  // indices in range, finite
  std::vector<char> proper(mesh.triangles.size(), 0);  // usable and not degenerate
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
    const bool repeated =
        tri[k][0] == tri[k][1] || tri[k][1] == tri[k][2] || tri[k][0] == tri[k][2];
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
    // Boxes are passed by pointer: the algorithm copies its input, and box ids come from addresses.
    std::vector<const Box*> handles;
    handles.reserve(boxes.size());
    for (const Box& b : boxes) handles.push_back(&b);
    bool found = false;
    CGAL::box_self_intersection_d(handles.begin(), handles.end(), [&](const Box* a, const Box* b) {
      if (!found && a->info() != b->info() &&
          triangles_intersect(tri[a->info()], tri[b->info()], pts))
        found = true;
    });
    r.self_intersects = found;
  }
  return r;
}

}  // namespace trimwright::kernel
