// SPDX-License-Identifier: GPL-3.0-or-later
// Exact 2D profiles on CGAL's circle-segment Boolean set operations. Every boundary curve is a line
// segment or a circular arc with exact (rational or one-root) endpoints; moments come from Green's
// theorem line integrals over those curves, and polylines are made only for meshing.

#include <CGAL/Boolean_set_operations_2.h>
#include <CGAL/Exact_predicates_exact_constructions_kernel.h>
#include <CGAL/General_polygon_set_2.h>
#include <CGAL/Gps_circle_segment_traits_2.h>

#include <algorithm>
#include <boost/variant.hpp>
#include <cmath>
#include <iterator>
#include <list>
#include <string>
#include <utility>
#include <vector>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/kernel/profile.hpp"

namespace trimwright::kernel {

namespace {

using K = CGAL::Exact_predicates_exact_constructions_kernel;
using FT = K::FT;
using KPoint = K::Point_2;
using Circle = K::Circle_2;
using Traits = CGAL::Gps_circle_segment_traits_2<K>;
using Gps = CGAL::General_polygon_set_2<Traits>;
using GPolygon = Traits::General_polygon_2;
using GPolygonWithHoles = Traits::General_polygon_with_holes_2;
using Curve = Traits::Curve_2;
using XCurve = Traits::X_monotone_curve_2;
using OPoint = Traits::Point_2;  // coordinates a0 + a1·sqrt(root)
using CoordNT = OPoint::CoordNT;

/// Largest number of polyline pieces one arc may become (guards against an absurd chord).
constexpr int kMaxPiecesPerArc = 200000;

[[noreturn]] void fail(const std::string& what) { throw InternalError("profile: " + what); }

bool finite(double v) { return std::isfinite(v); }

/// Exactly rounded double of a lazy exact number (the lazy interval midpoint is not).
double exact_double(const FT& x) { return CGAL::to_double(x.exact()); }

/// Double of a one-root number a0 + a1·sqrt(root), from exactly rounded parts.
double exact_double(const CoordNT& x) {
  if (!x.is_extended()) return exact_double(x.a0());
  return exact_double(x.a0()) + exact_double(x.a1()) * std::sqrt(exact_double(x.root()));
}

Vec2 to_vec(const OPoint& p) { return {exact_double(p.x()), exact_double(p.y())}; }

/// An exact unit vector (c² + s² = 1 in rational arithmetic) in the direction of (dx, dy), by the
/// tangent half-angle substitution. Exact for the axis directions; within ~1e-16 rad otherwise.
struct ExactUnit {
  FT c;
  FT s;
};

ExactUnit exact_unit(double dx, double dy) {
  if (dy == 0) return {FT(dx > 0 ? 1 : -1), FT(0)};
  if (dx == 0) return {FT(0), FT(dy > 0 ? 1 : -1)};
  const bool flip = dx < 0;
  if (flip) {
    dx = -dx;
    dy = -dy;
  }
  const FT t(dy / (std::hypot(dx, dy) + dx));  // tan(θ/2) with |θ| < 90°
  const FT d = FT(1) + t * t;
  ExactUnit u{(FT(1) - t * t) / d, FT(2) * t / d};
  if (flip) u = {-u.c, -u.s};
  return u;
}

ExactUnit exact_unit_deg(double angle_deg) {
  const double a = wrap_deg_360(angle_deg);
  if (a == 0) return {FT(1), FT(0)};
  if (a == 90) return {FT(0), FT(1)};
  if (a == 180) return {FT(-1), FT(0)};
  if (a == 270) return {FT(0), FT(-1)};
  return exact_unit(std::cos(deg_to_rad(a)), std::sin(deg_to_rad(a)));
}

/// Append the x-monotone pieces of `c` to `pgn` in traversal order.
void push_curve(GPolygon& pgn, const Curve& c) {
  Traits traits;
  std::list<boost::variant<OPoint, XCurve>> parts;
  traits.make_x_monotone_2_object()(c, std::back_inserter(parts));
  for (const auto& v : parts)
    if (const XCurve* xc = boost::get<XCurve>(&v)) pgn.push_back(*xc);
}

void push_segment(GPolygon& pgn, const KPoint& a, const KPoint& b) {
  if (a != b) push_curve(pgn, Curve(a, b));
}

/// Arc of the circle (centre, radius) from `from` to `to` in the given sense; both points lie
/// exactly on the circle.
void push_arc(GPolygon& pgn, const KPoint& centre, const FT& radius, const KPoint& from,
              const KPoint& to, CGAL::Orientation sense) {
  const Circle circle(centre, radius * radius, sense);
  push_curve(pgn, Curve(circle, OPoint(from.x(), from.y()), OPoint(to.x(), to.y())));
}

GPolygon circle_polygon(const KPoint& centre, const FT& radius) {
  GPolygon pgn;
  push_curve(pgn, Curve(Circle(centre, radius * radius, CGAL::COUNTERCLOCKWISE)));
  return pgn;
}

void check_radius(const char* what, double radius_mm) {
  if (!finite(radius_mm) || radius_mm <= 0)
    fail(std::string(what) + ": radius_mm = " + std::to_string(radius_mm) +
         ", expected a finite value > 0");
}

void check_point(const char* what, Vec2 p) {
  if (!finite(p[0]) || !finite(p[1])) fail(std::string(what) + ": a coordinate is not finite");
}

// ---------------------------------------------------------------------------------------------
// Moments by Green's theorem with one fixed set of fields for every curve:
//   A = ½∮(x dy − y dx), ∫x = ½∮x² dy, ∫y = −½∮y² dx, ∫x² = ⅓∮x³ dy, ∫y² = −⅓∮y³ dx,
//   ∫xy = ½∮x²y dy.
// Segments and arcs must use the same fields: per-edge values of different field choices differ,
// and only their sums over closed boundaries agree. Coordinates are taken relative to a reference
// point near the profile to avoid cancellation, and shifted back at the end.

void add_segment(AreaMoments& m, double x0, double y0, double x1, double y1) {
  const double dx = x1 - x0, dy = y1 - y0;
  m.area_mm2 += 0.5 * (x0 * y1 - x1 * y0);
  m.sx_mm3 += dy * (x0 * x0 + x0 * x1 + x1 * x1) / 6;
  m.sy_mm3 -= dx * (y0 * y0 + y0 * y1 + y1 * y1) / 6;
  m.ixx_mm4 += dy * (x0 + x1) * (x0 * x0 + x1 * x1) / 12;
  m.iyy_mm4 -= dx * (y0 + y1) * (y0 * y0 + y1 * y1) / 12;
  m.ixy_mm4 += dy *
               (3 * x0 * x0 * y0 + x0 * x0 * y1 + 2 * x0 * x1 * y0 + 2 * x0 * x1 * y1 +
                x1 * x1 * y0 + 3 * x1 * x1 * y1) /
               24;
}

/// Antiderivatives of the fields along x = cx + r cos t, y = cy + r sin t, given t, cos t, sin t.
AreaMoments arc_antiderivative(double cx, double cy, double r, double t, double c, double s) {
  const double s2 = 2 * s * c, c2 = c * c - s * s, s4 = 2 * s2 * c2;
  const double r2 = r * r, r3 = r2 * r, r4 = r3 * r;
  const double int_c2 = t / 2 + s2 / 4, int_s2 = t / 2 - s2 / 4;
  const double int_c3 = s - s * s * s / 3, int_s3 = -c + c * c * c / 3;
  AreaMoments f;
  f.area_mm2 = 0.5 * (cx * r * s - cy * r * c + r2 * t);
  f.sx_mm3 = 0.5 * (cx * cx * r * s + 2 * cx * r2 * int_c2 + r3 * int_c3);
  f.sy_mm3 = 0.5 * (-cy * cy * r * c + 2 * cy * r2 * int_s2 + r3 * int_s3);
  f.ixx_mm4 = (cx * cx * cx * r * s + 3 * cx * cx * r2 * int_c2 + 3 * cx * r3 * int_c3 +
               r4 * (3 * t / 8 + s2 / 4 + s4 / 32)) /
              3;
  f.iyy_mm4 = (-cy * cy * cy * r * c + 3 * cy * cy * r2 * int_s2 + 3 * cy * r3 * int_s3 +
               r4 * (3 * t / 8 - s2 / 4 + s4 / 32)) /
              3;
  f.ixy_mm4 = 0.5 * (cx * cx * cy * r * s + cx * cx * r2 * s * s / 2 + 2 * cx * cy * r2 * int_c2 -
                     2 * cx * r3 * c * c * c / 3 + cy * r3 * int_c3 - r4 * c * c * c * c / 4);
  return f;
}

/// An arc in doubles: centre, radius, start point and signed sweep (CCW > 0), with exactly rounded
/// endpoints (shared bit for bit with the neighbouring curves).
struct ArcGeometry {
  Vec2 centre;
  double radius = 0;
  Vec2 from;
  Vec2 to;
  double t0 = 0;
  double sweep = 0;
};

ArcGeometry arc_geometry(const XCurve& cv) {
  const Circle circle = cv.supporting_circle();
  ArcGeometry g;
  g.centre = {exact_double(circle.center().x()), exact_double(circle.center().y())};
  g.radius = std::sqrt(exact_double(circle.squared_radius()));
  g.from = to_vec(cv.source());
  g.to = to_vec(cv.target());
  g.t0 = std::atan2(g.from[1] - g.centre[1], g.from[0] - g.centre[0]);
  const double t1 = std::atan2(g.to[1] - g.centre[1], g.to[0] - g.centre[0]);
  g.sweep = t1 - g.t0;
  if (cv.orientation() == CGAL::COUNTERCLOCKWISE) {
    while (g.sweep <= 0) g.sweep += 2 * kPi;
  } else {
    while (g.sweep >= 0) g.sweep -= 2 * kPi;
  }
  return g;
}

void add_curve(AreaMoments& m, const XCurve& cv, Vec2 ref) {
  if (cv.is_linear()) {
    const Vec2 a = to_vec(cv.source()), b = to_vec(cv.target());
    add_segment(m, a[0] - ref[0], a[1] - ref[1], b[0] - ref[0], b[1] - ref[1]);
    return;
  }
  const ArcGeometry g = arc_geometry(cv);
  const double cx = g.centre[0] - ref[0], cy = g.centre[1] - ref[1], r = g.radius;
  // cos and sin at the ends from the endpoints themselves (on the circle to rounding).
  const double c0 = (g.from[0] - g.centre[0]) / r, s0 = (g.from[1] - g.centre[1]) / r;
  const double c1 = (g.to[0] - g.centre[0]) / r, s1 = (g.to[1] - g.centre[1]) / r;
  const AreaMoments fa = arc_antiderivative(cx, cy, r, 0, c0, s0);
  const AreaMoments fb = arc_antiderivative(cx, cy, r, g.sweep, c1, s1);
  m.area_mm2 += fb.area_mm2 - fa.area_mm2;
  m.sx_mm3 += fb.sx_mm3 - fa.sx_mm3;
  m.sy_mm3 += fb.sy_mm3 - fa.sy_mm3;
  m.ixx_mm4 += fb.ixx_mm4 - fa.ixx_mm4;
  m.iyy_mm4 += fb.iyy_mm4 - fa.iyy_mm4;
  m.ixy_mm4 += fb.ixy_mm4 - fa.ixy_mm4;
}

/// Moments about `ref` shifted to moments about the origin.
AreaMoments shifted_to_origin(const AreaMoments& m, Vec2 ref) {
  const double rx = ref[0], ry = ref[1], a = m.area_mm2;
  AreaMoments o;
  o.area_mm2 = a;
  o.sx_mm3 = m.sx_mm3 + rx * a;
  o.sy_mm3 = m.sy_mm3 + ry * a;
  o.ixx_mm4 = m.ixx_mm4 + 2 * rx * m.sx_mm3 + rx * rx * a;
  o.iyy_mm4 = m.iyy_mm4 + 2 * ry * m.sy_mm3 + ry * ry * a;
  o.ixy_mm4 = m.ixy_mm4 + rx * m.sy_mm3 + ry * m.sx_mm3 + rx * ry * a;
  return o;
}

// ---------------------------------------------------------------------------------------------
// Polygonisation that keeps each arc's area.

/// Largest distance between the arc (radius r, sweep |dt| split into n equal steps, ends on the
/// arc, inner vertices at radius rho) and its polyline.
double polyline_deviation(double r, double rho, double step, int n) {
  double dev = rho - r;  // inner vertices lie outside the arc
  if (n >= 3) dev = std::max(dev, r - rho * std::cos(step / 2));
  // End pieces: from (r, 0) to (rho cos step, rho sin step); nearest point to the centre.
  const double px = r, py = 0, qx = rho * std::cos(step), qy = rho * std::sin(step);
  const double ex = qx - px, ey = qy - py;
  const double u = std::clamp(-(px * ex + py * ey) / (ex * ex + ey * ey), 0.0, 1.0);
  const double near = std::hypot(px + u * ex, py + u * ey);
  return std::max(dev, r - near);
}

/// Radius of the inner vertices so that the fan (ends at r, n − 1 inner vertices at rho, equal
/// steps) has the sector's area: ½ sin(step)·(2 r rho + (n − 2) rho²) = ½ r² |sweep|.
double area_keeping_radius(double r, double sweep_abs, int n) {
  const double step = sweep_abs / n;
  const double a = (n - 2) * std::sin(step), b = 2 * r * std::sin(step), c = r * r * sweep_abs;
  // Root of a rho² + b rho − c = 0 without cancellation.
  return 2 * c / (b + std::sqrt(b * b + 4 * a * c));
}

/// Append the arc's polyline (without its end point) to `out`.
void append_arc_polyline(std::vector<Vec2>& out, const ArcGeometry& g, double chord_mm) {
  const double r = g.radius, sweep_abs = std::fabs(g.sweep);
  // Start from the inscribed count for this chord; area keeping needs about 0.8 of it.
  const double half = std::acos(std::max(-1.0, 1.0 - chord_mm / r));
  int n = std::max(2, static_cast<int>(std::ceil(sweep_abs / (2 * half) * 0.8)));
  double rho = area_keeping_radius(r, sweep_abs, n);
  while (polyline_deviation(r, rho, sweep_abs / n, n) > chord_mm) {
    if (++n > kMaxPiecesPerArc)
      fail("polygonize: chord_mm = " + std::to_string(chord_mm) + " needs more than " +
           std::to_string(kMaxPiecesPerArc) + " pieces for an arc of radius " + std::to_string(r) +
           " mm");
    rho = area_keeping_radius(r, sweep_abs, n);
  }
  out.push_back(g.from);
  for (int i = 1; i < n; ++i) {
    const double t = g.t0 + g.sweep * i / n;
    out.push_back({g.centre[0] + rho * std::cos(t), g.centre[1] + rho * std::sin(t)});
  }
}

/// Ring rotated to start at its lexicographically smallest vertex (canonical start).
Ring canonical(std::vector<Vec2> pts) {
  // Rounded endpoints of distinct exact points can coincide: drop repeats.
  std::vector<Vec2> clean;
  clean.reserve(pts.size());
  for (const Vec2& p : pts)
    if (clean.empty() || clean.back() != p) clean.push_back(p);
  while (clean.size() > 1 && clean.front() == clean.back()) clean.pop_back();
  auto first = std::min_element(clean.begin(), clean.end());
  std::rotate(clean.begin(), first, clean.end());
  return Ring{std::move(clean)};
}

Ring polygonize_boundary(const GPolygon& pgn, double chord_mm) {
  std::vector<Vec2> pts;
  const XCurve* prev = nullptr;
  for (auto it = pgn.curves_begin(); it != pgn.curves_end(); ++it) {
    if (prev != nullptr && prev->target() != it->source())
      fail("polygonize: boundary curves are not chained");
    prev = &*it;
    if (it->is_linear())
      pts.push_back(to_vec(it->source()));
    else
      append_arc_polyline(pts, arc_geometry(*it), chord_mm);
  }
  return canonical(std::move(pts));
}

double ring_signed_area(const Ring& r) {
  double a = 0;
  const std::size_t n = r.points.size();
  for (std::size_t i = 0; i < n; ++i) {
    const Vec2& p = r.points[i];
    const Vec2& q = r.points[(i + 1) % n];
    a += p[0] * q[1] - q[0] * p[1];
  }
  return a / 2;
}

AreaMoments ring_moments(const Ring& r, Vec2 ref) {
  AreaMoments m;
  const std::size_t n = r.points.size();
  for (std::size_t i = 0; i < n; ++i) {
    const Vec2& p = r.points[i];
    const Vec2& q = r.points[(i + 1) % n];
    add_segment(m, p[0] - ref[0], p[1] - ref[1], q[0] - ref[0], q[1] - ref[1]);
  }
  return m;
}

void accumulate(AreaMoments& into, const AreaMoments& m, double sign) {
  into.area_mm2 += sign * m.area_mm2;
  into.sx_mm3 += sign * m.sx_mm3;
  into.sy_mm3 += sign * m.sy_mm3;
  into.ixx_mm4 += sign * m.ixx_mm4;
  into.iyy_mm4 += sign * m.iyy_mm4;
  into.ixy_mm4 += sign * m.ixy_mm4;
}

}  // namespace

// ---------------------------------------------------------------------------------------------

struct Profile::Impl {
  Gps set;
  std::vector<GPolygonWithHoles> pieces() const {
    std::vector<GPolygonWithHoles> out;
    set.polygons_with_holes(std::back_inserter(out));
    return out;
  }
};

namespace {
std::shared_ptr<const Profile::Impl> make_impl(Gps set) {
  auto impl = std::make_shared<Profile::Impl>();
  impl->set = std::move(set);
  return impl;
}
std::shared_ptr<const Profile::Impl> make_impl(const GPolygon& pgn) { return make_impl(Gps(pgn)); }
}  // namespace

Profile::Profile() = default;
Profile::~Profile() = default;
Profile::Profile(const Profile&) = default;
Profile& Profile::operator=(const Profile&) = default;
Profile::Profile(Profile&&) noexcept = default;
Profile& Profile::operator=(Profile&&) noexcept = default;
Profile::Profile(std::shared_ptr<const Impl> impl) : impl_(std::move(impl)) {}

Profile Profile::disc(Vec2 centre, double radius_mm) {
  check_point("disc", centre);
  check_radius("disc", radius_mm);
  return Profile(make_impl(circle_polygon(KPoint(centre[0], centre[1]), FT(radius_mm))));
}

Profile Profile::obround(Vec2 a, Vec2 b, double radius_mm) {
  check_point("obround", a);
  check_point("obround", b);
  check_radius("obround", radius_mm);
  const double dx = b[0] - a[0], dy = b[1] - a[1];
  if (dx == 0 && dy == 0) return disc(a, radius_mm);
  // Built along an exact unit axis so that the straight sides meet the end arcs exactly; the far
  // centre lies within ~1e-16 relative of b (exactly on it for axis-parallel slots).
  const ExactUnit u = exact_unit(dx, dy);
  const FT length(std::hypot(dx, dy)), r(radius_mm);
  const KPoint pa(a[0], a[1]);
  const KPoint pb(pa.x() + length * u.c, pa.y() + length * u.s);
  const FT nx = -u.s * r, ny = u.c * r;  // left normal × r
  const KPoint a_right(pa.x() - nx, pa.y() - ny), a_left(pa.x() + nx, pa.y() + ny);
  const KPoint b_right(pb.x() - nx, pb.y() - ny), b_left(pb.x() + nx, pb.y() + ny);
  GPolygon pgn;
  push_segment(pgn, a_right, b_right);
  push_arc(pgn, pb, r, b_right, b_left, CGAL::COUNTERCLOCKWISE);
  push_segment(pgn, b_left, a_left);
  push_arc(pgn, pa, r, a_left, a_right, CGAL::COUNTERCLOCKWISE);
  return Profile(make_impl(pgn));
}

Profile Profile::polygon(const std::vector<Vec2>& points) {
  std::vector<KPoint> pts;
  pts.reserve(points.size());
  for (const Vec2& p : points) {
    check_point("polygon", p);
    KPoint q(p[0], p[1]);
    if (pts.empty() || pts.back() != q) pts.push_back(q);
  }
  while (pts.size() > 1 && pts.front() == pts.back()) pts.pop_back();
  if (pts.size() < 3)
    fail("polygon: " + std::to_string(pts.size()) + " distinct vertices, expected at least 3");
  CGAL::Polygon_2<K> poly(pts.begin(), pts.end());
  if (!poly.is_simple()) fail("polygon: the vertices form a self-intersecting polygon");
  if (poly.orientation() == CGAL::CLOCKWISE) poly.reverse_orientation();
  GPolygon pgn;
  for (std::size_t i = 0; i < poly.size(); ++i)
    push_segment(pgn, poly[static_cast<int>(i)], poly[static_cast<int>((i + 1) % poly.size())]);
  return Profile(make_impl(pgn));
}

Profile Profile::rectangle(Vec2 centre, double width_mm, double height_mm, double angle_deg) {
  check_point("rectangle", centre);
  if (!finite(width_mm) || !finite(height_mm) || width_mm <= 0 || height_mm <= 0 ||
      !finite(angle_deg))
    fail("rectangle: width_mm = " + std::to_string(width_mm) + ", height_mm = " +
         std::to_string(height_mm) + ", expected finite sizes > 0 and a finite angle");
  const ExactUnit u = exact_unit_deg(angle_deg);
  const FT hw = FT(width_mm) / 2, hh = FT(height_mm) / 2, cx(centre[0]), cy(centre[1]);
  auto corner = [&](const FT& a, const FT& b) {  // a along the width axis, b along the height
    return KPoint(cx + a * u.c - b * u.s, cy + a * u.s + b * u.c);
  };
  const KPoint q[4] = {corner(-hw, -hh), corner(hw, -hh), corner(hw, hh), corner(-hw, hh)};
  GPolygon pgn;
  for (int i = 0; i < 4; ++i) push_segment(pgn, q[i], q[(i + 1) % 4]);
  return Profile(make_impl(pgn));
}

Profile Profile::annular_sector(Vec2 centre, double r_in_mm, double r_out_mm, double a0_deg,
                                double a1_deg) {
  check_point("annular_sector", centre);
  check_radius("annular_sector (outer)", r_out_mm);
  if (!finite(r_in_mm) || r_in_mm < 0 || r_in_mm >= r_out_mm || !finite(a0_deg) ||
      !finite(a1_deg) || a1_deg <= a0_deg || a1_deg - a0_deg > 360)
    fail("annular_sector: r_in_mm = " + std::to_string(r_in_mm) +
         ", r_out_mm = " + std::to_string(r_out_mm) + ", a0_deg = " + std::to_string(a0_deg) +
         ", a1_deg = " + std::to_string(a1_deg) +
         ", expected 0 <= r_in < r_out and a0 < a1 <= a0 + 360");
  if (a1_deg - a0_deg == 360) {
    Profile outer = disc(centre, r_out_mm);
    return r_in_mm > 0 ? outer - disc(centre, r_in_mm) : outer;
  }
  const ExactUnit u0 = exact_unit_deg(a0_deg), u1 = exact_unit_deg(a1_deg);
  const KPoint c(centre[0], centre[1]);
  const FT ro(r_out_mm), ri(r_in_mm);
  auto at = [&](const FT& r, const ExactUnit& u) {
    return KPoint(c.x() + r * u.c, c.y() + r * u.s);
  };
  GPolygon pgn;
  push_segment(pgn, at(ri, u0), at(ro, u0));
  push_arc(pgn, c, ro, at(ro, u0), at(ro, u1), CGAL::COUNTERCLOCKWISE);
  push_segment(pgn, at(ro, u1), at(ri, u1));
  if (r_in_mm > 0) push_arc(pgn, c, ri, at(ri, u1), at(ri, u0), CGAL::CLOCKWISE);
  return Profile(make_impl(pgn));
}

Profile Profile::operator+(const Profile& other) const {
  if (!impl_) return other;
  if (!other.impl_) return *this;
  Gps s = impl_->set;
  s.join(other.impl_->set);
  return Profile(make_impl(std::move(s)));
}

Profile Profile::operator-(const Profile& other) const {
  if (!impl_ || !other.impl_) return *this;
  Gps s = impl_->set;
  s.difference(other.impl_->set);
  return Profile(make_impl(std::move(s)));
}

Profile Profile::operator*(const Profile& other) const {
  if (!impl_ || !other.impl_) return Profile();
  Gps s = impl_->set;
  s.intersection(other.impl_->set);
  return Profile(make_impl(std::move(s)));
}

bool Profile::empty() const { return !impl_ || impl_->set.is_empty(); }

AreaMoments Profile::moments() const {
  if (empty()) return {};
  const Box2 b = bounds();
  const Vec2 ref{(b.min[0] + b.max[0]) / 2, (b.min[1] + b.max[1]) / 2};
  AreaMoments m;
  for (const GPolygonWithHoles& pwh : impl_->pieces()) {
    for (auto it = pwh.outer_boundary().curves_begin(); it != pwh.outer_boundary().curves_end();
         ++it)
      add_curve(m, *it, ref);
    for (auto h = pwh.holes_begin(); h != pwh.holes_end(); ++h)
      for (auto it = h->curves_begin(); it != h->curves_end(); ++it) add_curve(m, *it, ref);
  }
  return shifted_to_origin(m, ref);
}

Box2 Profile::bounds() const {
  if (empty()) return {};
  Box2 b{{HUGE_VAL, HUGE_VAL}, {-HUGE_VAL, -HUGE_VAL}};
  auto grow = [&b](Vec2 p) {
    b.min = {std::min(b.min[0], p[0]), std::min(b.min[1], p[1])};
    b.max = {std::max(b.max[0], p[0]), std::max(b.max[1], p[1])};
  };
  auto add = [&](const XCurve& cv) {
    grow(to_vec(cv.source()));
    grow(to_vec(cv.target()));
    if (cv.is_linear()) return;
    // x-monotone arcs can only reach the circle's top or bottom point inside their span.
    const ArcGeometry g = arc_geometry(cv);
    for (int k = -6; k <= 6; ++k) {
      const double t = k * kPi / 2;
      const double lo = std::min(g.t0, g.t0 + g.sweep), hi = std::max(g.t0, g.t0 + g.sweep);
      if (t > lo && t < hi)
        grow({g.centre[0] + g.radius * std::cos(t), g.centre[1] + g.radius * std::sin(t)});
    }
  };
  for (const GPolygonWithHoles& pwh : impl_->pieces())
    for (auto it = pwh.outer_boundary().curves_begin(); it != pwh.outer_boundary().curves_end();
         ++it)
      add(*it);
  return b;
}

std::size_t Profile::piece_count() const {
  return empty() ? 0 : static_cast<std::size_t>(impl_->set.number_of_polygons_with_holes());
}

std::size_t Profile::hole_count() const {
  if (empty()) return 0;
  std::size_t n = 0;
  for (const GPolygonWithHoles& pwh : impl_->pieces())
    n += static_cast<std::size_t>(std::distance(pwh.holes_begin(), pwh.holes_end()));
  return n;
}

bool Profile::contains(Vec2 p) const {
  if (empty() || !finite(p[0]) || !finite(p[1])) return false;
  return impl_->set.oriented_side(OPoint(FT(p[0]), FT(p[1]))) == CGAL::ON_POSITIVE_SIDE;
}

std::vector<Region> Profile::polygonize(double chord_mm) const {
  if (!finite(chord_mm) || chord_mm <= 0)
    fail("polygonize: chord_mm = " + std::to_string(chord_mm) + ", expected a finite value > 0");
  std::vector<Region> out;
  if (empty()) return out;
  for (const GPolygonWithHoles& pwh : impl_->pieces()) {
    Region region;
    region.outer = polygonize_boundary(pwh.outer_boundary(), chord_mm);
    if (ring_signed_area(region.outer) < 0)
      std::reverse(region.outer.points.begin(), region.outer.points.end());
    for (auto h = pwh.holes_begin(); h != pwh.holes_end(); ++h) {
      Ring hole = polygonize_boundary(*h, chord_mm);
      if (ring_signed_area(hole) > 0) std::reverse(hole.points.begin(), hole.points.end());
      region.holes.push_back(canonical(std::move(hole.points)));
    }
    region.outer = canonical(std::move(region.outer.points));
    std::sort(region.holes.begin(), region.holes.end(),
              [](const Ring& a, const Ring& b) { return a.points.front() < b.points.front(); });
    out.push_back(std::move(region));
  }
  std::sort(out.begin(), out.end(), [](const Region& a, const Region& b) {
    return a.outer.points.front() < b.outer.points.front();
  });
  return out;
}

AreaMoments polygon_moments(const std::vector<Ring>& rings) {
  // Under the even-odd rule a ring nested inside k others adds its area when k is even and
  // removes it when k is odd, whatever its orientation. Rings must not cross each other.
  Box2 b{{HUGE_VAL, HUGE_VAL}, {-HUGE_VAL, -HUGE_VAL}};
  for (const Ring& r : rings)
    for (const Vec2& p : r.points) {
      b.min = {std::min(b.min[0], p[0]), std::min(b.min[1], p[1])};
      b.max = {std::max(b.max[0], p[0]), std::max(b.max[1], p[1])};
    }
  AreaMoments total;
  if (b.min[0] > b.max[0]) return total;
  const Vec2 ref{(b.min[0] + b.max[0]) / 2, (b.min[1] + b.max[1]) / 2};
  for (std::size_t i = 0; i < rings.size(); ++i) {
    if (rings[i].points.size() < 3) continue;
    std::size_t depth = 0;
    for (std::size_t j = 0; j < rings.size(); ++j)
      if (j != i && rings[j].points.size() >= 3 && inside_ring(rings[j], rings[i].points.front()))
        ++depth;
    const AreaMoments m = ring_moments(rings[i], ref);
    const double orient = m.area_mm2 < 0 ? -1.0 : 1.0;
    accumulate(total, m, (depth % 2 == 0 ? 1.0 : -1.0) * orient);
  }
  return shifted_to_origin(total, ref);
}

}  // namespace trimwright::kernel
