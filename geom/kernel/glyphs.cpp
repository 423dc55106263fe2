// SPDX-License-Identifier: GPL-3.0-or-later
// Text outlines for engraving through Cairo's toy text API (fontconfig + FreeType underneath):
// cairo_text_path + cairo_copy_path_flat give flattened glyph contours without hinting, which are
// scaled so that the font's digits are height_mm tall and placed by the centre of their ink box.

#include "geom/kernel/glyphs.hpp"

#include <cairo.h>

#include <algorithm>
#include <cmath>
#include <memory>
#include <string>
#include <vector>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"

#ifndef TRIMWRIGHT_FONT_FAMILY
#define TRIMWRIGHT_FONT_FAMILY "DejaVu Sans"
#endif

namespace trimwright::kernel {

namespace {

constexpr const char* kFontFamily = TRIMWRIGHT_FONT_FAMILY;
/// Font size in Cairo user units at which outlines are taken (large, so tolerances are fine).
constexpr double kFontSize = 1000.0;
/// Extra space between glyphs, as a fraction of the font size (em).
constexpr double kTracking = 0.05;
/// The characters whose ink height defines the digit height.
constexpr const char* kDigits = "0123456789";

struct CairoDeleter {
  void operator()(cairo_t* cr) const { cairo_destroy(cr); }
  void operator()(cairo_surface_t* s) const { cairo_surface_destroy(s); }
  void operator()(cairo_path_t* p) const { cairo_path_destroy(p); }
  void operator()(cairo_font_options_t* o) const { cairo_font_options_destroy(o); }
};

/// Flattened outline rings of `text` in font units (Cairo's y-down user space), origin at the
/// baseline start. Curves are flattened to within tolerance_units.
std::vector<Ring> raw_outline(const std::string& text, double tolerance_units) {
  std::unique_ptr<cairo_surface_t, CairoDeleter> surface(
      cairo_recording_surface_create(CAIRO_CONTENT_ALPHA, nullptr));
  std::unique_ptr<cairo_t, CairoDeleter> cr(cairo_create(surface.get()));
  cairo_select_font_face(cr.get(), kFontFamily, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_BOLD);
  cairo_set_font_size(cr.get(), kFontSize);
  std::unique_ptr<cairo_font_options_t, CairoDeleter> options(cairo_font_options_create());
  // Unhinted outlines scale exactly, so every height gets the same shapes.
  cairo_font_options_set_hint_style(options.get(), CAIRO_HINT_STYLE_NONE);
  cairo_font_options_set_hint_metrics(options.get(), CAIRO_HINT_METRICS_OFF);
  cairo_set_font_options(cr.get(), options.get());
  cairo_set_tolerance(cr.get(), tolerance_units);
  cairo_new_path(cr.get());
  // Glyphs are set one by one with a little extra spacing, so that neighbours never touch (some
  // letter pairs meet exactly at their advance, e.g. "AV"; touching outlines cannot be engraved).
  cairo_glyph_t* glyphs = nullptr;
  int glyph_count = 0;
  const cairo_status_t mapped = cairo_scaled_font_text_to_glyphs(
      cairo_get_scaled_font(cr.get()), 0, 0, text.c_str(), static_cast<int>(text.size()), &glyphs,
      &glyph_count, nullptr, nullptr, nullptr);
  if (mapped != CAIRO_STATUS_SUCCESS)
    throw FileError(std::string("font '") + kFontFamily + "' Bold: Cairo could not map \"" + text +
                    "\" to glyphs: " + cairo_status_to_string(mapped));
  for (int i = 0; i < glyph_count; ++i) glyphs[i].x += i * kTracking * kFontSize;
  cairo_glyph_path(cr.get(), glyphs, glyph_count);
  cairo_glyph_free(glyphs);
  std::unique_ptr<cairo_path_t, CairoDeleter> path(cairo_copy_path_flat(cr.get()));
  if (cairo_status(cr.get()) != CAIRO_STATUS_SUCCESS || path->status != CAIRO_STATUS_SUCCESS)
    throw FileError(std::string("font '") + kFontFamily + "' Bold: Cairo could not outline \"" +
                    text + "\": " + cairo_status_to_string(cairo_status(cr.get())));
  std::vector<Ring> rings;
  Ring current;
  auto flush = [&] {
    auto& p = current.points;
    while (p.size() > 1 && p.front() == p.back()) p.pop_back();
    if (p.size() >= 3) rings.push_back(current);
    p.clear();
  };
  for (int i = 0; i < path->num_data; i += path->data[i].header.length) {
    const cairo_path_data_t* d = &path->data[i];
    switch (d->header.type) {
      case CAIRO_PATH_MOVE_TO:
        flush();
        [[fallthrough]];
      case CAIRO_PATH_LINE_TO: {
        const Vec2 q{d[1].point.x, d[1].point.y};
        if (current.points.empty() || current.points.back() != q) current.points.push_back(q);
        break;
      }
      case CAIRO_PATH_CLOSE_PATH:
        flush();
        break;
      case CAIRO_PATH_CURVE_TO:  // not produced by a flattened path
        break;
    }
  }
  flush();
  return rings;
}

/// Ink box of rings: {min x, min y, max x, max y}.
std::array<double, 4> ink_box(const std::vector<Ring>& rings) {
  std::array<double, 4> b{HUGE_VAL, HUGE_VAL, -HUGE_VAL, -HUGE_VAL};
  for (const Ring& r : rings)
    for (const Vec2& p : r.points) {
      b[0] = std::min(b[0], p[0]);
      b[1] = std::min(b[1], p[1]);
      b[2] = std::max(b[2], p[0]);
      b[3] = std::max(b[3], p[1]);
    }
  return b;
}

bool has_ink_characters(const std::string& text) {
  return std::any_of(text.begin(), text.end(),
                     [](char c) { return !(c == ' ' || c == '\t' || c == '\n' || c == '\r'); });
}

[[noreturn]] void no_outlines(const std::string& text) {
  throw FileError(std::string("font '") + kFontFamily + "' Bold: no glyph outlines for \"" + text +
                  "\"; expected the engraving font (install fonts-dejavu-core)");
}

/// Ink height of the font's digits in font units (the tallest digit, overshoot included).
double digit_height_units() {
  static const double height = [] {
    const std::vector<Ring> rings = raw_outline(kDigits, 0.05);
    if (rings.empty()) no_outlines(kDigits);
    const auto b = ink_box(rings);
    return b[3] - b[1];
  }();
  return height;
}

double signed_area(const Ring& r) {
  double a = 0;
  const std::size_t n = r.points.size();
  for (std::size_t i = 0; i < n; ++i) {
    const Vec2& p = r.points[i];
    const Vec2& q = r.points[(i + 1) % n];
    a += p[0] * q[1] - q[0] * p[1];
  }
  return a / 2;
}

/// Thinnest stroke of one glyph's rings (font units): from sample points on every edge a ray goes
/// into the ink along the edge normal; where it leaves the ink through an edge facing back
/// (within 30°), the distance is a stroke width there. Rays that leave through a side wall
/// (corners, joins) do not measure a stroke and are ignored.
double thinnest_stroke(const std::vector<Ring>& rings) {
  struct Edge {
    Vec2 a, b, ink_normal;
  };
  std::vector<Edge> edges;
  for (const Ring& r : rings) {
    const std::size_t n = r.points.size();
    for (std::size_t i = 0; i < n; ++i) {
      const Vec2 a = r.points[i], b = r.points[(i + 1) % n];
      const double len = std::hypot(b[0] - a[0], b[1] - a[1]);
      if (len <= 0) continue;
      Vec2 nl{-(b[1] - a[1]) / len, (b[0] - a[0]) / len};
      const Vec2 probe{(a[0] + b[0]) / 2 + 1e-3 * nl[0], (a[1] + b[1]) / 2 + 1e-3 * nl[1]};
      if (!inside_even_odd(rings, probe)) nl = {-nl[0], -nl[1]};
      edges.push_back({a, b, nl});
    }
  }
  const double kFacing = std::cos(kPi / 6);
  double best = HUGE_VAL;
  for (std::size_t i = 0; i < edges.size(); ++i) {
    const Edge& e = edges[i];
    for (double s : {0.25, 0.5, 0.75}) {
      const Vec2 o{e.a[0] + s * (e.b[0] - e.a[0]), e.a[1] + s * (e.b[1] - e.a[1])};
      const Vec2 dir = e.ink_normal;
      double nearest = HUGE_VAL;
      std::size_t hit = edges.size();
      for (std::size_t j = 0; j < edges.size(); ++j) {
        if (j == i) continue;
        const Edge& f = edges[j];
        // Solve o + t·dir = f.a + u·(f.b − f.a), t > 0, 0 ≤ u ≤ 1.
        const double ex = f.b[0] - f.a[0], ey = f.b[1] - f.a[1];
        const double den = dir[0] * ey - dir[1] * ex;
        if (den == 0) continue;
        const double wx = f.a[0] - o[0], wy = f.a[1] - o[1];
        const double t = (wx * ey - wy * ex) / den;
        const double u = (wx * dir[1] - wy * dir[0]) / den;
        if (t > 1e-9 && u >= 0 && u <= 1 && t < nearest) {
          nearest = t;
          hit = j;
        }
      }
      if (hit == edges.size()) continue;
      const Vec2& n2 = edges[hit].ink_normal;
      if (n2[0] * dir[0] + n2[1] * dir[1] <= -kFacing) best = std::min(best, nearest);
    }
  }
  return best;
}

void check_height(const char* what, double height_mm) {
  if (!std::isfinite(height_mm) || height_mm <= 0)
    throw InternalError(std::string(what) + ": height_mm = " + std::to_string(height_mm) +
                        ", expected a finite value > 0");
}

}  // namespace

std::vector<Ring> text_outline(const std::string& text, const TextPlacement& where,
                               double tolerance_mm) {
  check_height("text_outline", where.height_mm);
  if (!std::isfinite(tolerance_mm) || tolerance_mm <= 0 || !std::isfinite(where.angle_deg) ||
      !std::isfinite(where.centre[0]) || !std::isfinite(where.centre[1]))
    throw InternalError("text_outline: tolerance_mm = " + std::to_string(tolerance_mm) +
                        ", expected a finite value > 0 and a finite placement");
  if (!has_ink_characters(text)) return {};
  const double k = where.height_mm / digit_height_units();  // mm per font unit
  std::vector<Ring> raw = raw_outline(text, tolerance_mm / k);
  if (raw.empty()) no_outlines(text);
  const auto box = ink_box(raw);
  const double mx = (box[0] + box[2]) / 2, my = (box[1] + box[3]) / 2;
  const double c = std::cos(deg_to_rad(where.angle_deg)), s = std::sin(deg_to_rad(where.angle_deg));
  const double min_step = 1e-9 * where.height_mm;
  std::vector<Ring> out;
  for (const Ring& r : raw) {
    Ring ring;
    for (const Vec2& p : r.points) {
      // Cairo's y axis points down: flip it so the text reads correctly seen from +z.
      const double u = (p[0] - mx) * k, v = -(p[1] - my) * k;
      const Vec2 q{where.centre[0] + c * u - s * v, where.centre[1] + s * u + c * v};
      if (ring.points.empty() ||
          std::hypot(q[0] - ring.points.back()[0], q[1] - ring.points.back()[1]) > min_step)
        ring.points.push_back(q);
    }
    while (ring.points.size() > 1 &&
           std::hypot(ring.points.front()[0] - ring.points.back()[0],
                      ring.points.front()[1] - ring.points.back()[1]) <= min_step)
      ring.points.pop_back();
    if (ring.points.size() >= 3 &&
        std::fabs(signed_area(ring)) > 1e-9 * where.height_mm * where.height_mm)
      out.push_back(std::move(ring));
  }
  if (out.empty()) no_outlines(text);
  return out;
}

Vec2 text_extent(const std::string& text, double height_mm) {
  check_height("text_extent", height_mm);
  if (!has_ink_characters(text)) return {0, 0};
  const std::vector<Ring> raw = raw_outline(text, 0.05);
  if (raw.empty()) no_outlines(text);
  const auto box = ink_box(raw);
  const double k = height_mm / digit_height_units();
  return {(box[2] - box[0]) * k, (box[3] - box[1]) * k};
}

double digit_stroke_fraction() {
  static const double fraction = [] {
    double thinnest = HUGE_VAL;
    for (const char* p = kDigits; *p != '\0'; ++p) {
      const std::vector<Ring> rings = raw_outline(std::string(1, *p), 0.2);
      if (rings.empty()) no_outlines(std::string(1, *p));
      thinnest = std::min(thinnest, thinnest_stroke(rings));
    }
    return thinnest / digit_height_units();
  }();
  return fraction;
}

}  // namespace trimwright::kernel
