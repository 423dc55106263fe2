// SPDX-License-Identifier: GPL-3.0-or-later
// Printed parts as a 2.5D stack of profiles, meshed directly: caps from constrained Delaunay
// triangulations of the polygonised rings, walls from the ring edges. The result is closed and
// outward by construction; no 3D Boolean operation is involved (docs/kernel.md).

#include <CGAL/Constrained_Delaunay_triangulation_2.h>
#include <CGAL/Exact_predicates_inexact_constructions_kernel.h>
#include <CGAL/Triangulation_face_base_with_info_2.h>
#include <CGAL/Triangulation_vertex_base_with_info_2.h>

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <deque>
#include <limits>
#include <map>
#include <memory>
#include <string>
#include <utility>
#include <vector>

#include "geom/base/error.hpp"
#include "geom/kernel/part.hpp"

namespace trimwright::kernel {

namespace {

using K = CGAL::Exact_predicates_inexact_constructions_kernel;
using Vb = CGAL::Triangulation_vertex_base_with_info_2<std::uint32_t, K>;
using Fbb = CGAL::Triangulation_face_base_with_info_2<std::uint32_t, K>;
using Fb = CGAL::Constrained_triangulation_face_base_2<K, Fbb>;
using Tds = CGAL::Triangulation_data_structure_2<Vb, Fb>;
// Rings of a part never cross or touch: the triangulation refuses intersecting constraints, which
// is how crossings are found.
using Cdt =
    CGAL::Constrained_Delaunay_triangulation_2<K, Tds, CGAL::No_constraint_intersection_tag>;

constexpr std::uint32_t kUnset = std::numeric_limits<std::uint32_t>::max();

using Tri = std::array<std::uint32_t, 3>;

[[noreturn]] void fail(const std::string& what) { throw InternalError("build_part: " + what); }

std::string point_text(Vec2 p) {
  return "(" + std::to_string(p[0]) + ", " + std::to_string(p[1]) + ") mm";
}

/// Closed rings in one role (the outline, the engraving, one cavity), with their points numbered
/// once each in order of first appearance.
struct RingGroup {
  std::string name;
  std::vector<Vec2> points;
  std::vector<std::vector<std::uint32_t>> rings;
  bool empty() const { return rings.empty(); }
};

RingGroup make_group(std::string name, const std::vector<const Ring*>& rings) {
  RingGroup g;
  g.name = std::move(name);
  std::map<Vec2, std::uint32_t> index;
  for (std::size_t k = 0; k < rings.size(); ++k) {
    std::vector<std::uint32_t> ids;
    for (const Vec2& p : rings[k]->points) {
      if (!std::isfinite(p[0]) || !std::isfinite(p[1]))
        fail(g.name + " ring " + std::to_string(k) + " has a non-finite coordinate");
      auto [it, added] = index.emplace(p, static_cast<std::uint32_t>(g.points.size()));
      if (added) g.points.push_back(p);
      if (ids.empty() || ids.back() != it->second) ids.push_back(it->second);
    }
    while (ids.size() > 1 && ids.front() == ids.back()) ids.pop_back();
    if (ids.size() < 3)
      fail(g.name + " ring " + std::to_string(k) + " has " + std::to_string(ids.size()) +
           " distinct points, expected at least 3");
    g.rings.push_back(std::move(ids));
  }
  return g;
}

RingGroup group_of_regions(std::string name, const std::vector<Region>& regions) {
  std::vector<const Ring*> rings;
  for (const Region& r : regions) {
    rings.push_back(&r.outer);
    for (const Ring& h : r.holes) rings.push_back(&h);
  }
  return make_group(std::move(name), rings);
}

/// A constrained triangulation of several ring groups that knows, for every face, which groups'
/// even-odd interiors contain it. Throws InternalError when rings of any groups cross, overlap
/// or touch (rings within one group may share a vertex).
class Layer {
 public:
  Layer(std::vector<const RingGroup*> groups, const std::string& context)
      : groups_(std::move(groups)), context_(context) {
    std::uint32_t total = 0;
    for (const RingGroup* g : groups_) {
      offsets_.push_back(total);
      total += static_cast<std::uint32_t>(g->points.size());
    }
    handles_.reserve(total);
    group_of_.reserve(total);
    for (std::size_t gi = 0; gi < groups_.size(); ++gi)
      for (const Vec2& p : groups_[gi]->points) {
        const std::size_t before = cdt_.number_of_vertices();
        Cdt::Vertex_handle v = cdt_.insert(K::Point_2(p[0], p[1]));
        if (cdt_.number_of_vertices() == before)  // the point was there already
          fail(context_ + ": " + groups_[gi]->name + " touches " +
               groups_[group_of_[v->info()]]->name + " at " + point_text(p));
        v->info() = static_cast<std::uint32_t>(handles_.size());
        handles_.push_back(v);
        group_of_.push_back(static_cast<std::uint32_t>(gi));
      }
    for (std::size_t gi = 0; gi < groups_.size(); ++gi) {
      const RingGroup& g = *groups_[gi];
      for (std::size_t k = 0; k < g.rings.size(); ++k) {
        const auto& ring = g.rings[k];
        for (std::size_t i = 0; i < ring.size(); ++i) {
          Cdt::Vertex_handle a = handle(gi, ring[i]), b = handle(gi, ring[(i + 1) % ring.size()]);
          try {
            cdt_.insert_constraint(a, b);
          } catch (const Cdt::Intersection_of_constraints_exception&) {
            fail(context_ + ": " + g.name + " ring " + std::to_string(k) +
                 " crosses or overlaps a ring near " + point_text(g.points[ring[i]]));
          }
          if (!cdt_.is_edge(a, b))
            fail(context_ + ": a vertex lies on an edge of " + g.name + " ring " +
                 std::to_string(k) + " near " + point_text(g.points[ring[i]]));
        }
      }
    }
    if (cdt_.dimension() != 2) fail(context_ + ": the rings enclose no area");
    flood_fill();
  }

  Layer(const Layer&) = delete;  // the vertex handles point into this triangulation
  Layer& operator=(const Layer&) = delete;

  /// True when the face lies inside the even-odd interior of group `g`.
  bool inside(Cdt::Face_handle f, std::size_t g) const {
    return inside_[f->info() * groups_.size() + g] != 0;
  }

  /// True when the interior of group `g` lies to the left of ring `k` as stored.
  bool interior_on_left(std::size_t g, std::size_t k) const {
    const auto& ring = groups_[g]->rings[k];
    Cdt::Vertex_handle a = handle(g, ring[0]), b = handle(g, ring[1]);
    Cdt::Face_handle f;
    int i = 0;
    if (!cdt_.is_edge(a, b, f, i)) fail(context_ + ": a ring edge is missing");
    if (f->vertex(Cdt::ccw(i)) != a) f = f->neighbor(i);
    return inside(f, g);
  }

  /// Counter-clockwise triangles (as (group, point) pairs) of every finite face `keep` accepts.
  template <class Keep>
  std::vector<std::array<std::pair<std::uint32_t, std::uint32_t>, 3>> faces(Keep keep) const {
    std::vector<std::array<std::pair<std::uint32_t, std::uint32_t>, 3>> out;
    for (Cdt::Face_handle f : cdt_.finite_face_handles()) {
      if (!keep(f)) continue;
      std::array<std::pair<std::uint32_t, std::uint32_t>, 3> t;
      for (int j = 0; j < 3; ++j) {
        const std::uint32_t id = f->vertex(j)->info();
        const std::uint32_t g = group_of_[id];
        t[static_cast<std::size_t>(j)] = {g, id - offsets_[g]};
      }
      out.push_back(t);
    }
    return out;
  }

  /// The 2D point of a (group, point) pair.
  Vec2 point(const std::pair<std::uint32_t, std::uint32_t>& v) const {
    return groups_[v.first]->points[v.second];
  }

 private:
  Cdt::Vertex_handle handle(std::size_t g, std::uint32_t i) const {
    return handles_[offsets_[g] + i];
  }

  // Breadth-first walk from the infinite face; crossing a ring edge flips that ring's group.
  // Rings do not cross, so the parity is the same along every path.
  void flood_fill() {
    std::uint32_t n = 0;
    for (Cdt::Face_handle f : cdt_.all_face_handles()) f->info() = n++;
    const std::size_t ng = groups_.size();
    inside_.assign(static_cast<std::size_t>(n) * ng, 0);
    std::vector<char> seen(n, 0);
    std::deque<Cdt::Face_handle> queue{cdt_.infinite_face()};
    seen[cdt_.infinite_face()->info()] = 1;
    while (!queue.empty()) {
      Cdt::Face_handle f = queue.front();
      queue.pop_front();
      for (int i = 0; i < 3; ++i) {
        Cdt::Face_handle nb = f->neighbor(i);
        if (seen[nb->info()]) continue;
        seen[nb->info()] = 1;
        for (std::size_t g = 0; g < ng; ++g)
          inside_[nb->info() * ng + g] = inside_[f->info() * ng + g];
        if (f->is_constrained(i)) {
          const std::uint32_t id = f->vertex(Cdt::ccw(i))->info();
          inside_[nb->info() * ng + group_of_[id]] ^= 1;
        }
        queue.push_back(nb);
      }
    }
  }

  std::vector<const RingGroup*> groups_;
  std::string context_;
  Cdt cdt_;
  std::vector<std::uint32_t> offsets_;
  std::vector<Cdt::Vertex_handle> handles_;
  std::vector<std::uint32_t> group_of_;
  std::vector<std::uint8_t> inside_;
};

/// Triangle with its smallest index first (orientation kept).
Tri rotated_min_first(Tri t) {
  while (t[0] > t[1] || t[0] > t[2]) t = {t[1], t[2], t[0]};
  return t;
}

/// Cap triangles in a canonical order, so that equal specs give byte-identical meshes.
void append_sorted(std::vector<Tri>& out, std::vector<Tri> tris) {
  for (Tri& t : tris) t = rotated_min_first(t);
  std::sort(tris.begin(), tris.end());
  out.insert(out.end(), tris.begin(), tris.end());
}

/// Ring `k` of group `g` in the sense that has the group's interior on its left.
std::vector<std::uint32_t> ring_interior_left(const Layer& layer, const RingGroup& group,
                                              std::size_t g, std::size_t k) {
  std::vector<std::uint32_t> ring = group.rings[k];
  if (!layer.interior_on_left(g, k)) std::reverse(ring.begin(), ring.end());
  return ring;
}

void check_finite_positive(const char* key, double v) {
  if (!std::isfinite(v) || v <= 0)
    fail(std::string(key) + " = " + std::to_string(v) + ", expected a finite value > 0");
}

struct CavityRings {
  RingGroup group;
  double z0_mm = 0;
  double z1_mm = 0;
};

}  // namespace

Mesh build_part(const PartSpec& spec) {
  const double t = spec.thickness_mm, d = spec.engraving_depth_mm;
  check_finite_positive("thickness_mm", t);
  check_finite_positive("chord_mm", spec.chord_mm);
  if (spec.outline.empty()) fail("the outline is empty");
  const bool engraved = !spec.engraving.empty();
  if (engraved && (!std::isfinite(d) || d <= 0 || d >= t))
    fail("engraving_depth_mm = " + std::to_string(d) +
         ", expected 0 < depth < thickness_mm = " + std::to_string(t));

  const RingGroup outline = group_of_regions("outline", spec.outline.polygonize(spec.chord_mm));
  std::vector<const Ring*> engraving_rings;
  for (const Ring& r : spec.engraving) engraving_rings.push_back(&r);
  const RingGroup engraving = make_group("engraving", engraving_rings);

  std::vector<CavityRings> cavities;
  for (std::size_t k = 0; k < spec.cavities.size(); ++k) {
    const Cavity& c = spec.cavities[k];
    const std::string name = "cavity " + std::to_string(k);
    if (!(std::isfinite(c.z0_mm) && std::isfinite(c.z1_mm) && 0 < c.z0_mm && c.z0_mm < c.z1_mm &&
          c.z1_mm < t))
      fail(name + ": z0_mm = " + std::to_string(c.z0_mm) + ", z1_mm = " + std::to_string(c.z1_mm) +
           ", expected 0 < z0 < z1 < thickness_mm = " + std::to_string(t));
    if (c.region.empty()) fail(name + ": the region is empty");
    cavities.push_back(
        {group_of_regions(name, c.region.polygonize(spec.chord_mm)), c.z0_mm, c.z1_mm});
  }

  // Triangulations: the bottom face, the top face with the engraving, and one per cavity (which
  // also proves the cavity lies inside the outline). Extra layers only check clearances.
  const Layer bottom({&outline}, "outline");
  std::unique_ptr<Layer> engraved_top;
  if (engraved)
    engraved_top = std::make_unique<Layer>(std::vector<const RingGroup*>{&outline, &engraving},
                                           "engraving in the outline");
  const Layer& top = engraved ? *engraved_top : bottom;  // without engraving the faces are the same
  if (engraved) {
    const auto stray =
        top.faces([&](Cdt::Face_handle f) { return top.inside(f, 1) && !top.inside(f, 0); });
    if (!stray.empty())
      fail("the engraving reaches outside the outline near " +
           point_text(top.point(stray.front()[0])));
  }
  std::vector<std::unique_ptr<Layer>> cavity_layers;
  for (std::size_t k = 0; k < cavities.size(); ++k) {
    const CavityRings& c = cavities[k];
    cavity_layers.push_back(std::make_unique<Layer>(
        std::vector<const RingGroup*>{&outline, &c.group}, c.group.name + " in the outline"));
    const Layer& layer = *cavity_layers.back();
    const auto stray =
        layer.faces([&](Cdt::Face_handle f) { return layer.inside(f, 1) && !layer.inside(f, 0); });
    if (!stray.empty())
      fail(c.group.name + " reaches outside the outline near " +
           point_text(layer.point(stray.front()[0])));
    if (engraved && c.z1_mm >= t - d) {
      const Layer both({&engraving, &c.group}, c.group.name + " under the engraving");
      if (!both.faces([&](Cdt::Face_handle f) { return both.inside(f, 0) && both.inside(f, 1); })
               .empty())
        fail(c.group.name + " reaches z1_mm = " + std::to_string(c.z1_mm) +
             " under the engraving, whose floor is at " + std::to_string(t - d) + " mm");
    }
    for (std::size_t j = 0; j < k; ++j) {
      const CavityRings& o = cavities[j];
      if (c.z1_mm < o.z0_mm || o.z1_mm < c.z0_mm) continue;  // apart in z
      const Layer both({&o.group, &c.group}, o.group.name + " and " + c.group.name);
      if (!both.faces([&](Cdt::Face_handle f) { return both.inside(f, 0) && both.inside(f, 1); })
               .empty())
        fail(o.group.name + " and " + c.group.name + " overlap");
    }
  }

  // Vertex blocks: outline at z = 0 and z = t, engraving at z = t and at its floor, each cavity at
  // its z0 and z1. Every block lists its group's points in ring order.
  Mesh mesh;
  auto add_block = [&mesh](const RingGroup& g, double z) {
    const auto base = static_cast<std::uint32_t>(mesh.vertices.size());
    for (const Vec2& p : g.points) mesh.vertices.push_back({p[0], p[1], z});
    return base;
  };
  const std::uint32_t ob = add_block(outline, 0), ot = add_block(outline, t);
  const std::uint32_t et = add_block(engraving, t), ef = add_block(engraving, t - d);
  std::vector<std::pair<std::uint32_t, std::uint32_t>> cavity_blocks;
  for (const CavityRings& c : cavities)
    cavity_blocks.emplace_back(add_block(c.group, c.z0_mm), add_block(c.group, c.z1_mm));
  if (mesh.vertices.size() >= kUnset) fail("too many vertices for 32-bit indices");

  // Bottom face, facing down.
  {
    std::vector<Tri> tris;
    for (const auto& f : bottom.faces([&](Cdt::Face_handle h) { return bottom.inside(h, 0); }))
      tris.push_back({ob + f[0].second, ob + f[2].second, ob + f[1].second});
    append_sorted(mesh.triangles, std::move(tris));
  }
  // Outline walls, 0 → t, facing away from the material (which lies left of each ring).
  for (std::size_t k = 0; k < outline.rings.size(); ++k) {
    const auto ring = ring_interior_left(bottom, outline, 0, k);
    for (std::size_t i = 0; i < ring.size(); ++i) {
      const std::uint32_t a = ring[i], b = ring[(i + 1) % ring.size()];
      mesh.triangles.push_back({ob + a, ob + b, ot + b});
      mesh.triangles.push_back({ob + a, ot + b, ot + a});
    }
  }
  // Top face without the engraving, facing up.
  {
    std::vector<Tri> tris;
    auto top_id = [&](const std::pair<std::uint32_t, std::uint32_t>& v) {
      return v.first == 0 ? ot + v.second : et + v.second;
    };
    for (const auto& f : top.faces([&](Cdt::Face_handle h) {
           return top.inside(h, 0) && !(engraved && top.inside(h, 1));
         }))
      tris.push_back({top_id(f[0]), top_id(f[1]), top_id(f[2])});
    append_sorted(mesh.triangles, std::move(tris));
  }
  if (engraved) {
    // Engraving walls, t − d → t, facing into the recess (which lies left of each ring).
    for (std::size_t k = 0; k < engraving.rings.size(); ++k) {
      const auto ring = ring_interior_left(top, engraving, 1, k);
      for (std::size_t i = 0; i < ring.size(); ++i) {
        const std::uint32_t a = ring[i], b = ring[(i + 1) % ring.size()];
        mesh.triangles.push_back({ef + a, et + a, et + b});
        mesh.triangles.push_back({ef + a, et + b, ef + b});
      }
    }
    // Engraving floors, facing up.
    std::vector<Tri> tris;
    for (const auto& f :
         top.faces([&](Cdt::Face_handle h) { return top.inside(h, 0) && top.inside(h, 1); })) {
      for (const auto& v : f)
        if (v.first != 1) fail("an outline vertex lies inside the engraving");
      tris.push_back({ef + f[0].second, ef + f[1].second, ef + f[2].second});
    }
    append_sorted(mesh.triangles, std::move(tris));
  }
  // Cavities: closed shells facing into the void.
  for (std::size_t k = 0; k < cavities.size(); ++k) {
    const Layer& layer = *cavity_layers[k];
    const auto [c0, c1] = cavity_blocks[k];
    std::vector<Tri> floor_tris, roof_tris;
    for (const auto& f : layer.faces([&](Cdt::Face_handle h) { return layer.inside(h, 1); })) {
      for (const auto& v : f)
        if (v.first != 1) fail("an outline vertex lies inside " + cavities[k].group.name);
      floor_tris.push_back({c0 + f[0].second, c0 + f[1].second, c0 + f[2].second});
      roof_tris.push_back({c1 + f[0].second, c1 + f[2].second, c1 + f[1].second});
    }
    append_sorted(mesh.triangles, std::move(floor_tris));
    append_sorted(mesh.triangles, std::move(roof_tris));
    for (std::size_t r = 0; r < cavities[k].group.rings.size(); ++r) {
      const auto ring = ring_interior_left(layer, cavities[k].group, 1, r);
      for (std::size_t i = 0; i < ring.size(); ++i) {
        const std::uint32_t a = ring[i], b = ring[(i + 1) % ring.size()];
        mesh.triangles.push_back({c0 + a, c1 + a, c1 + b});
        mesh.triangles.push_back({c0 + a, c1 + b, c0 + b});
      }
    }
  }
  return mesh;
}

double spec_volume_mm3(const PartSpec& spec) {
  double v = spec.outline.moments().area_mm2 * spec.thickness_mm;
  if (!spec.engraving.empty())
    v -= std::fabs(polygon_moments(spec.engraving).area_mm2) * spec.engraving_depth_mm;
  for (const Cavity& c : spec.cavities) v -= c.region.moments().area_mm2 * (c.z1_mm - c.z0_mm);
  return v;
}

}  // namespace trimwright::kernel
