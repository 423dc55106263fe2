// SPDX-License-Identifier: GPL-3.0-or-later
// Spectrum and polar plot of a measured recording, drawn once for SVG and PNG surfaces.
#include "geom/signal/plot.hpp"

#include <cairo-svg.h>
#include <cairo.h>
#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <filesystem>
#include <system_error>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/base/vibration_units.hpp"

namespace trimwright::signal {
namespace {

constexpr double kWidth = 900, kHeight = 400;
constexpr const char* kFont = "DejaVu Sans";

void text(cairo_t* cr, double x, double y, const std::string& s, double size, double align = 0.0) {
  cairo_set_font_size(cr, size);
  cairo_text_extents_t ext;
  cairo_text_extents(cr, s.c_str(), &ext);
  cairo_move_to(cr, x - align * (ext.width + ext.x_bearing), y);
  cairo_show_text(cr, s.c_str());
  cairo_new_path(cr);
}

void line(cairo_t* cr, double x0, double y0, double x1, double y1) {
  cairo_move_to(cr, x0, y0);
  cairo_line_to(cr, x1, y1);
  cairo_stroke(cr);
}

void dash(cairo_t* cr, double on, double off) {
  const double d[2] = {on, off};
  cairo_set_dash(cr, d, on > 0 ? 2 : 0, 0);
}

// A "nice" step (1, 2 or 5 × 10^k) that divides span into about `count` parts.
double nice_step(double span, int count) {
  const double raw = span / count;
  const double p = std::pow(10.0, std::floor(std::log10(raw)));
  for (double f : {1.0, 2.0, 5.0, 10.0})
    if (f * p >= raw) return f * p;
  return 10 * p;
}

void draw_spectrum(cairo_t* cr, const Measurement& m, double x0, double y0, double w, double h) {
  const auto unit = find_vibration_unit(m.units);
  const auto si = find_vibration_unit("m/s2-pk");
  const auto& amp = m.spectrum.amplitude_m_s2;
  const double bin = m.spectrum.bin_hz;
  const double f_max = bin * static_cast<double>(amp.size() > 0 ? amp.size() - 1 : 1);
  // Bins in the asked unit; velocity and displacement skip the lowest tenth of 1× (they blow up there).
  const double f_min_shown = unit && unit->quantity != VibrationQuantity::kAcceleration ? 0.1 * m.frequency_hz : bin;
  std::vector<std::pair<double, double>> pts;
  double a_max = 0, a_min = 1e300;
  for (size_t i = 1; i < amp.size(); ++i) {
    const double f = bin * static_cast<double>(i);
    if (f < f_min_shown) continue;
    const double a = unit && si ? convert_amplitude(amp[i], *si, *unit, f) : amp[i];
    if (!(a > 0)) continue;
    pts.emplace_back(f, a);
    a_max = std::max(a_max, a);
    a_min = std::min(a_min, a);
  }
  cairo_set_line_width(cr, 1.0);
  dash(cr, 0, 0);
  cairo_rectangle(cr, x0, y0, w, h);
  cairo_stroke(cr);
  if (pts.empty() || !(f_max > 0)) {
    text(cr, x0 + w / 2, y0 + h / 2, "no spectrum", 12, 0.5);
    return;
  }
  const double top = std::ceil(std::log10(a_max));
  const double bottom = std::max(top - 5, std::floor(std::log10(a_min)));
  auto xf = [&](double f) { return x0 + w * f / f_max; };
  auto ya = [&](double a) {
    const double l = std::clamp(std::log10(a), bottom, top);
    return y0 + h * (top - l) / (top - bottom);
  };
  // Grid and labels.
  cairo_set_line_width(cr, 0.4);
  dash(cr, 1, 3);
  for (double d = bottom; d <= top + 1e-9; d += 1) {
    line(cr, x0, ya(std::pow(10.0, d)), x0 + w, ya(std::pow(10.0, d)));
    text(cr, x0 - 4, ya(std::pow(10.0, d)) + 4, fmt::format("{:g}", std::pow(10.0, d)), 10, 1.0);
  }
  const double step = nice_step(f_max, 8);
  dash(cr, 0, 0);
  for (double f = 0; f <= f_max + 1e-9; f += step) {
    line(cr, xf(f), y0 + h, xf(f), y0 + h + 4);
    text(cr, xf(f), y0 + h + 16, fmt::format("{:g}", f), 10, 0.5);
  }
  text(cr, x0 + w / 2, y0 + h + 32, "frequency, Hz", 11, 0.5);
  cairo_save(cr);
  cairo_translate(cr, x0 - 48, y0 + h / 2);
  cairo_rotate(cr, -kPi / 2);
  text(cr, 0, 0, "amplitude, " + m.units, 11, 0.5);
  cairo_restore(cr);

  // Order lines (dashed) and mains lines (dotted), labelled.
  cairo_set_line_width(cr, 0.8);
  dash(cr, 5, 3);
  for (int k = 1; k * m.frequency_hz <= f_max; ++k) {
    const double x = xf(k * m.frequency_hz);
    line(cr, x, y0 + 14, x, y0 + h);
    text(cr, x, y0 + 11, fmt::format("{}\u00d7", k), 10, 0.5);
  }
  dash(cr, 1.5, 2.5);
  for (const auto& c : m.mains) {
    if (c.frequency_hz > f_max) continue;
    const double x = xf(c.frequency_hz);
    line(cr, x, y0 + 26, x, y0 + h);
    text(cr, x + 2, y0 + 24, fmt::format("{:g} Hz", c.frequency_hz), 9, 0.0);
  }
  // The spectrum itself.
  dash(cr, 0, 0);
  cairo_set_line_width(cr, 0.9);
  cairo_move_to(cr, xf(pts.front().first), ya(pts.front().second));
  for (const auto& [f, a] : pts) cairo_line_to(cr, xf(f), ya(a));
  cairo_stroke(cr);
}

void draw_polar(cairo_t* cr, const Measurement& m, double cx, double cy, double radius) {
  double a_max = m.amplitude;
  for (const auto& b : m.blocks) a_max = std::max(a_max, std::abs(b.vector));
  if (!(a_max > 0)) a_max = 1;
  const double step = nice_step(a_max, 3);
  const double outer = std::ceil(a_max / step) * step;
  // Lag counts clockwise from the top, where the reference edge is.
  auto pt = [&](double a, double lag_deg) {
    const double r = radius * a / outer, th = deg_to_rad(lag_deg);
    return std::pair<double, double>(cx + r * std::sin(th), cy - r * std::cos(th));
  };
  cairo_set_line_width(cr, 0.4);
  dash(cr, 1, 3);
  for (double a = step; a <= outer + 1e-12; a += step) {
    cairo_new_sub_path(cr);
    cairo_arc(cr, cx, cy, radius * a / outer, 0, 2 * kPi);
    cairo_stroke(cr);
    text(cr, cx + 3, cy - radius * a / outer - 2, fmt::format("{:g}", a), 9);
  }
  for (int d = 0; d < 360; d += 30) {
    auto [x, y] = pt(outer, d);
    line(cr, cx, cy, x, y);
    auto [lx, ly] = pt(outer * 1.12, d);
    text(cr, lx, ly + 4, fmt::format("{}\u00b0", d), 9, 0.5);
  }
  dash(cr, 0, 0);
  cairo_set_line_width(cr, 0.8);
  for (const auto& b : m.blocks) {
    auto [x, y] = pt(std::abs(b.vector), rad_to_deg(std::arg(b.vector)));
    cairo_new_sub_path(cr);
    cairo_arc(cr, x, y, 2.8, 0, 2 * kPi);
    cairo_stroke(cr);
  }
  // The mean 1× vector: a heavy arrow.
  const double lag = m.phase_deg.value_or(0);
  auto [tx, ty] = pt(m.amplitude, lag);
  cairo_set_line_width(cr, 2.2);
  line(cr, cx, cy, tx, ty);
  const double th = deg_to_rad(lag);
  const double ux = std::sin(th), uy = -std::cos(th);
  cairo_move_to(cr, tx, ty);
  cairo_line_to(cr, tx - 10 * ux + 4 * uy, ty - 10 * uy - 4 * ux);
  cairo_line_to(cr, tx - 10 * ux - 4 * uy, ty - 10 * uy + 4 * ux);
  cairo_close_path(cr);
  cairo_fill(cr);
  text(cr, cx, cy + radius + 40, "1\u00d7 per block (circles) and mean (arrow);", 10, 0.5);
  text(cr, cx, cy + radius + 53, "lag clockwise from the reference at the top", 10, 0.5);
}

void draw_block_amplitudes(cairo_t* cr, const Measurement& m, double x0, double y0, double w, double h) {
  cairo_set_line_width(cr, 1.0);
  dash(cr, 0, 0);
  cairo_rectangle(cr, x0, y0, w, h);
  cairo_stroke(cr);
  double a_max = m.amplitude;
  for (const auto& b : m.blocks) a_max = std::max(a_max, std::abs(b.vector));
  if (!(a_max > 0)) a_max = 1;
  const double step = nice_step(a_max, 4);
  const double top = std::ceil(a_max * 1.05 / step) * step;
  auto ya = [&](double a) { return y0 + h * (1 - a / top); };
  const size_t nb = std::max<size_t>(1, m.blocks.size());
  auto xb = [&](size_t i) { return x0 + w * (static_cast<double>(i) + 0.5) / static_cast<double>(nb); };
  cairo_set_line_width(cr, 0.4);
  dash(cr, 1, 3);
  for (double a = 0; a <= top + 1e-12; a += step) {
    line(cr, x0, ya(a), x0 + w, ya(a));
    text(cr, x0 - 4, ya(a) + 4, fmt::format("{:g}", a), 9, 1.0);
  }
  dash(cr, 5, 3);
  cairo_set_line_width(cr, 1.0);
  line(cr, x0, ya(m.amplitude), x0 + w, ya(m.amplitude));
  dash(cr, 0, 0);
  for (size_t i = 0; i < m.blocks.size(); ++i) {
    cairo_new_sub_path(cr);
    cairo_arc(cr, xb(i), ya(std::abs(m.blocks[i].vector)), 2.8, 0, 2 * kPi);
    cairo_stroke(cr);
  }
  text(cr, x0 + w / 2, y0 + h + 16, "block", 10, 0.5);
  text(cr, x0 + w / 2, y0 + h + 40, "1\u00d7 per block (circles) and mean (dashed);", 10, 0.5);
  text(cr, x0 + w / 2, y0 + h + 53, "no reference: amplitude only", 10, 0.5);
}

void draw(cairo_t* cr, const Measurement& m) {
  cairo_set_source_rgb(cr, 1, 1, 1);
  cairo_paint(cr);
  cairo_set_source_rgb(cr, 0, 0, 0);
  cairo_select_font_face(cr, kFont, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_BOLD);
  const std::string name = std::filesystem::path(m.source).filename().string();
  std::string head = fmt::format("{}: {:.0f} rpm, 1\u00d7 {:.4g} {}", name, m.speed_rpm, m.amplitude, m.units);
  if (m.phase_deg) head += fmt::format(" at {:.1f}\u00b0 lag", *m.phase_deg);
  head += fmt::format(", confidence {}", m.confidence.level);
  text(cr, 20, 24, head, 13);
  cairo_select_font_face(cr, kFont, CAIRO_FONT_SLANT_NORMAL, CAIRO_FONT_WEIGHT_NORMAL);
  text(cr, 20, 42,
       fmt::format("axis {}, speed from the {}{}, SNR {:.1f} dB, {} blocks of {:.0f} rev", m.axis, m.speed_source,
                   m.reference.empty() ? "" : " '" + m.reference + "'", m.confidence.snr_db, m.confidence.blocks,
                   m.confidence.revolutions_per_block),
       10);
  draw_spectrum(cr, m, 80, 62, 480, 270);
  if (m.phase_deg)
    draw_polar(cr, m, 745, 192, 118);
  else
    draw_block_amplitudes(cr, m, 650, 62, 220, 270);
}

void finish(cairo_surface_t* s, cairo_t* cr, const std::string& tmp, const std::string& path, bool png) {
  cairo_status_t st = cairo_status(cr);
  cairo_destroy(cr);
  if (png && st == CAIRO_STATUS_SUCCESS) st = cairo_surface_write_to_png(s, tmp.c_str());
  cairo_surface_finish(s);
  if (st == CAIRO_STATUS_SUCCESS) st = cairo_surface_status(s);
  cairo_surface_destroy(s);
  std::error_code ec;
  if (st != CAIRO_STATUS_SUCCESS) {
    std::filesystem::remove(tmp, ec);
    throw FileError(fmt::format("{}: cannot write the plot: {}", path, cairo_status_to_string(st)));
  }
  std::filesystem::rename(tmp, path, ec);
  if (ec) {
    std::filesystem::remove(tmp, ec);
    throw FileError(fmt::format("{}: cannot write the plot: {}", path, ec.message()));
  }
}

}  // namespace

std::vector<std::string> write_measurement_plots(const Measurement& measurement, const std::string& dir,
                                                 const std::string& stem) {
  std::error_code ec;
  std::filesystem::create_directories(dir, ec);
  if (ec || !std::filesystem::is_directory(dir))
    throw FileError(fmt::format("{}: cannot create the plot folder: {}", dir, ec ? ec.message() : "not a folder"));
  const std::string svg = (std::filesystem::path(dir) / (stem + ".svg")).string();
  const std::string png = (std::filesystem::path(dir) / (stem + ".png")).string();
  {
    const std::string tmp = svg + ".part";
    cairo_surface_t* s = cairo_svg_surface_create(tmp.c_str(), kWidth, kHeight);
    cairo_t* cr = cairo_create(s);
    draw(cr, measurement);
    cairo_show_page(cr);
    finish(s, cr, tmp, svg, false);
  }
  {
    const std::string tmp = png + ".part";
    const double scale = 1.5;
    cairo_surface_t* s = cairo_image_surface_create(CAIRO_FORMAT_RGB24, static_cast<int>(kWidth * scale),
                                                    static_cast<int>(kHeight * scale));
    cairo_t* cr = cairo_create(s);
    cairo_scale(cr, scale, scale);
    draw(cr, measurement);
    finish(s, cr, tmp, png, true);
  }
  return {svg, png};
}

}  // namespace trimwright::signal
