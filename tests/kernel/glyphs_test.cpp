// SPDX-License-Identifier: GPL-3.0-or-later
// Engraving text from the system font through Cairo.

#include "geom/kernel/glyphs.hpp"

#include <cairo.h>

#include <algorithm>
#include <catch2/catch.hpp>
#include <cmath>
#include <string>
#include <vector>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/kernel/mesh_check.hpp"
#include "geom/kernel/part.hpp"
#include "geom/kernel/profile.hpp"

using namespace trimwright;
using namespace trimwright::kernel;

namespace {

std::array<double, 4> box_of(const std::vector<Ring>& rings) {
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

}  // namespace

TEST_CASE("glyphs: digits are set at the digit height, centred on the placement",
          "[kernel][glyphs]") {
  const double h = 4;
  const Vec2 ext = text_extent("0123456789", h);
  CHECK(ext[1] == Approx(h).epsilon(1e-9));
  CHECK(ext[0] > 5 * h);
  const auto rings = text_outline("0123456789", {{10, -5}, h, 0}, 0.005);
  const auto b = box_of(rings);
  CHECK((b[0] + b[2]) / 2 == Approx(10).margin(1e-9));
  CHECK((b[1] + b[3]) / 2 == Approx(-5).margin(1e-9));
  CHECK(b[3] - b[1] == Approx(h).margin(0.01));
  CHECK(b[2] - b[0] == Approx(ext[0]).margin(0.01));
  // A single digit keeps the font's proportions: "1" is narrower than "0", as tall.
  CHECK(text_extent("1", h)[0] < text_extent("0", h)[0]);
  CHECK(text_extent("1", h)[1] <= h);
}

TEST_CASE("glyphs: text reads correctly seen from +z and turns with its angle",
          "[kernel][glyphs]") {
  const double h = 10;
  const auto rings = text_outline("7", {{0, 0}, h, 0}, 0.01);
  // "7": a bar across the top, a stroke down to the lower left.
  double top_min = HUGE_VAL, top_max = -HUGE_VAL, bottom_sum = 0;
  int bottom_n = 0;
  for (const Ring& r : rings)
    for (const Vec2& p : r.points) {
      if (p[1] > 0.4 * h) top_min = std::min(top_min, p[0]), top_max = std::max(top_max, p[0]);
      if (p[1] < -0.3 * h) bottom_sum += p[0], ++bottom_n;
    }
  const double width = text_extent("7", h)[0];
  CHECK(top_max - top_min > 0.8 * width);
  REQUIRE(bottom_n > 0);
  CHECK(bottom_sum / bottom_n < 0);  // not mirrored
  // Turned by 90°: the bar is now on the −x side, the foot on −y... i.e. the box swaps.
  const auto turned = text_outline("7", {{0, 0}, h, 90}, 0.01);
  const auto tb = box_of(turned);
  CHECK(tb[2] - tb[0] == Approx(text_extent("7", h)[1]).margin(0.02));
  CHECK(tb[3] - tb[1] == Approx(width).margin(0.02));
  double left = 0;
  for (const Ring& r : turned)
    for (const Vec2& p : r.points)
      if (p[0] < -0.4 * h) left += 1;
  CHECK(left > 0);  // the top bar now lies toward −x
}

TEST_CASE("glyphs: counters are separate rings under the even-odd rule", "[kernel][glyphs]") {
  const auto zero = text_outline("0", {{0, 0}, 5, 0});
  CHECK(zero.size() == 2);
  const auto eight = text_outline("8", {{0, 0}, 5, 0});
  CHECK(eight.size() == 3);
  const double ink = polygon_moments(zero).area_mm2;
  CHECK(ink > 0);
  const auto b = box_of(zero);
  CHECK(ink < 0.8 * (b[2] - b[0]) * (b[3] - b[1]));
  // Flattening to a finer tolerance changes the ink area by less than the tolerance allows.
  const double fine = polygon_moments(text_outline("0", {{0, 0}, 5, 0}, 0.001)).area_mm2;
  CHECK(fine == Approx(ink).epsilon(0.01));
}

TEST_CASE("glyphs: empty text has no outline, bad sizes are internal errors", "[kernel][glyphs]") {
  CHECK(text_outline("", {{0, 0}, 3, 0}).empty());
  CHECK(text_outline("  ", {{0, 0}, 3, 0}).empty());
  CHECK(text_extent("", 3) == Vec2{0, 0});
  CHECK_THROWS_AS(text_outline("1", {{0, 0}, 0, 0}), InternalError);
  CHECK_THROWS_AS(text_outline("1", {{0, 0}, 3, 0}, -1), InternalError);
  CHECK_THROWS_AS(text_extent("1", -2), InternalError);
}

TEST_CASE("glyphs: the digits' thinnest stroke holds against a raster measurement",
          "[kernel][glyphs]") {
  const double f = digit_stroke_fraction();
  // A bold sans face: strokes between a tenth and a third of the digit height (common practice,
  // no source).
  CHECK(f > 0.1);
  CHECK(f < 0.33);
  // Independent check on Cairo's own rasteriser: render each digit 400 px tall and erode the ink
  // by a disc. Strokes at least f thick survive erosion by a disc of diameter 0.8·f·height in
  // every digit (each keeps ink); a disc of 1.6·f·height wipes out some stroke, so at least one
  // digit loses a larger share of its ink than the thick strokes alone would.
  const int size = 600;
  const double px_h = 400;
  const double k = px_h / text_extent("0123456789", 1.0)[1];  // px per unit digit height
  auto eroded_share = [&](char digit, double diameter_px) {
    cairo_surface_t* s = cairo_image_surface_create(CAIRO_FORMAT_A8, size, size);
    cairo_t* cr = cairo_create(s);
    cairo_select_font_face(cr, "DejaVu Sans", CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_BOLD);
    cairo_set_font_size(cr, k);
    const char text[2] = {digit, 0};
    cairo_move_to(cr, 100, 500);
    cairo_show_text(cr, text);
    cairo_surface_flush(s);
    const unsigned char* data = cairo_image_surface_get_data(s);
    const int stride = cairo_image_surface_get_stride(s);
    std::vector<char> ink(static_cast<std::size_t>(size * size));
    int total = 0;
    for (int y = 0; y < size; ++y)
      for (int x = 0; x < size; ++x) {
        ink[static_cast<std::size_t>(y * size + x)] = data[y * stride + x] >= 128;
        total += data[y * stride + x] >= 128;
      }
    cairo_destroy(cr);
    cairo_surface_destroy(s);
    const int rad = static_cast<int>(std::floor(diameter_px / 2));
    std::vector<std::pair<int, int>> disc;
    for (int dy = -rad; dy <= rad; ++dy)
      for (int dx = -rad; dx <= rad; ++dx)
        if (dx * dx + dy * dy <= rad * rad) disc.emplace_back(dx, dy);
    int kept = 0;
    for (int y = rad; y < size - rad; ++y)
      for (int x = rad; x < size - rad; ++x) {
        if (!ink[static_cast<std::size_t>(y * size + x)]) continue;
        bool all = true;
        for (const auto& d : disc)
          if (!ink[static_cast<std::size_t>((y + d.second) * size + x + d.first)]) {
            all = false;
            break;
          }
        kept += all;
      }
    return total > 0 ? static_cast<double>(kept) / total : 0.0;
  };
  const double stroke_px = f * px_h;
  double min_kept_thin = 1, min_kept_thick = 1;
  for (char d = '0'; d <= '9'; ++d) {
    const double thin = eroded_share(d, 0.8 * stroke_px);
    INFO("digit " << d << " keeps " << thin << " of its ink after erosion by 0.8 stroke");
    CHECK(thin > 0);
    min_kept_thin = std::min(min_kept_thin, thin);
    min_kept_thick = std::min(min_kept_thick, eroded_share(d, 1.6 * stroke_px));
  }
  CHECK(min_kept_thick < 0.5 * min_kept_thin);
}

TEST_CASE("glyphs: neighbouring glyphs never touch, so any label can be engraved",
          "[kernel][glyphs]") {
  // Some letter pairs meet exactly at their advance ("AV"); glyphs are set slightly apart.
  std::vector<std::string> labels{"HEAVY", "AVAV", "LIGHT", "-12.5", "g\xC2\xB7mm", "90\xC2\xB0"};
  for (int n = 0; n < 100; ++n) labels.push_back(std::to_string(n));
  for (const std::string& label : labels) {
    PartSpec s;
    s.outline = Profile::rectangle({0, 0}, 60, 10);
    s.thickness_mm = 2;
    s.engraving_depth_mm = 0.4;
    s.engraving = text_outline(label, {{0, 0}, 3, 0});
    INFO("label " << label);
    CHECK(inspect_mesh(build_part(s)).valid());
  }
}
