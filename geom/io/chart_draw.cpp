// SPDX-License-Identifier: GPL-3.0-or-later
// The chart's drawing layer: Cairo text in millimetres, wrapping and shrinking, small shapes.
#include "geom/io/chart_draw.hpp"

#include <fmt/core.h>

#include <algorithm>
#include <cmath>

#include "geom/base/angle.hpp"

#ifndef TRIMWRIGHT_FONT_FAMILY
#define TRIMWRIGHT_FONT_FAMILY "DejaVu Sans"
#endif

namespace trimwright::io::chart_detail {
namespace {

constexpr const char* kEllipsis = "\xE2\x80\xA6";  // …
// Widths computed as (a + b) − b can differ from a by an ulp: text that was measured to fit
// must still fit.
constexpr double kFitSlackMm = 1e-6;

// Index into Pen::faces_: bit 0 bold, bit 1 italic.
int face_index(const Font& f) { return (f.bold ? 1 : 0) | (f.italic ? 2 : 0); }

}  // namespace

std::string format_trimmed(double value, int max_decimals) {
  std::string s = fmt::format("{:.{}f}", value, std::max(0, max_decimals));
  if (s.find('.') != std::string::npos) {
    while (s.back() == '0') s.pop_back();
    if (s.back() == '.') s.pop_back();
  }
  return s == "-0" ? "0" : s;
}

std::size_t utf8_char_length(const std::string& s, std::size_t i) {
  const auto c = static_cast<unsigned char>(s[i]);
  std::size_t n = 1;
  if (c >= 0xF0 && c < 0xF8) {
    n = 4;
  } else if (c >= 0xE0) {
    n = c < 0xF0 ? 3 : 1;
  } else if (c >= 0xC0) {
    n = 2;
  }
  if (i + n > s.size()) return 1;
  for (std::size_t k = 1; k < n; ++k) {
    if ((static_cast<unsigned char>(s[i + k]) & 0xC0) != 0x80) return 1;
  }
  return n;
}

Pen::Pen(cairo_t* cr, bool paint) : cr_(cr), paint_(paint), faces_{} {
  for (int i = 0; i < 4; ++i) {
    faces_[i] = cairo_toy_font_face_create(
        TRIMWRIGHT_FONT_FAMILY, (i & 2) ? CAIRO_FONT_SLANT_ITALIC : CAIRO_FONT_SLANT_NORMAL,
        (i & 1) ? CAIRO_FONT_WEIGHT_BOLD : CAIRO_FONT_WEIGHT_NORMAL);
  }
  // Unhinted metrics: text widths are then the same in the PDF, the SVG and the PNG, so one
  // layout serves every surface.
  cairo_font_options_t* opts = cairo_font_options_create();
  cairo_font_options_set_hint_metrics(opts, CAIRO_HINT_METRICS_OFF);
  cairo_font_options_set_hint_style(opts, CAIRO_HINT_STYLE_NONE);
  cairo_set_font_options(cr_, opts);
  cairo_font_options_destroy(opts);
  set_font(Font{});
}

Pen::~Pen() {
  for (auto* f : faces_) cairo_font_face_destroy(f);
}

void Pen::set_font(const Font& font) {
  font_ = font;
  cairo_set_font_face(cr_, faces_[face_index(font)]);
  cairo_set_font_size(cr_, font.size_mm);
}

double Pen::width(const std::string& text) const {
  if (text.empty()) return 0;
  cairo_text_extents_t e;
  cairo_text_extents(cr_, text.c_str(), &e);
  // The ink of a slanted or overhanging glyph can reach past the advance.
  return std::max(e.x_advance, e.x_bearing + e.width);
}

double Pen::ascent() const {
  cairo_font_extents_t e;
  cairo_font_extents(cr_, &e);
  return e.ascent;
}

double Pen::descent() const {
  cairo_font_extents_t e;
  cairo_font_extents(cr_, &e);
  return e.descent;
}

double Pen::line_height() const { return 1.22 * font_.size_mm; }

void Pen::text(double x, double baseline_y, const std::string& s, Align align) {
  if (!paint_ || s.empty()) return;
  double w = 0;
  if (align != Align::kLeft) w = width(s);
  const double x0 = align == Align::kLeft ? x : align == Align::kCentre ? x - w / 2 : x - w;
  cairo_move_to(cr_, x0, baseline_y);
  cairo_show_text(cr_, s.c_str());
  cairo_new_path(cr_);  // show_text leaves a current point that the next arc would join
}

void Pen::colour(Rgb c) { cairo_set_source_rgb(cr_, c.r, c.g, c.b); }

void Pen::line(double x0, double y0, double x1, double y1, double w_mm) {
  if (!paint_) return;
  cairo_set_line_width(cr_, w_mm);
  cairo_move_to(cr_, x0, y0);
  cairo_line_to(cr_, x1, y1);
  cairo_stroke(cr_);
}

void Pen::fill_rect(double x, double y, double w, double h) {
  if (!paint_) return;
  cairo_rectangle(cr_, x, y, w, h);
  cairo_fill(cr_);
}

std::vector<std::string> Pen::wrap(const std::string& text, double width_mm) const {
  std::vector<std::string> lines;
  std::size_t start = 0;
  while (true) {  // hard breaks first
    const std::size_t nl = text.find('\n', start);
    const std::string para = text.substr(start, nl == std::string::npos ? nl : nl - start);
    std::string line;
    std::size_t i = 0;
    while (i < para.size()) {
      while (i < para.size() && para[i] == ' ') ++i;
      if (i >= para.size()) break;
      std::size_t j = para.find(' ', i);
      if (j == std::string::npos) j = para.size();
      std::string word = para.substr(i, j - i);
      i = j;
      const std::string candidate = line.empty() ? word : line + " " + word;
      if (width(candidate) <= width_mm + kFitSlackMm) {
        line = candidate;
        continue;
      }
      if (!line.empty()) lines.push_back(line);
      line.clear();
      // A word wider than the line on its own is broken between characters.
      while (width(word) > width_mm + kFitSlackMm) {
        std::size_t cut = 0;
        while (cut < word.size()) {
          const std::size_t next = cut + utf8_char_length(word, cut);
          if (cut > 0 && width(word.substr(0, next)) > width_mm + kFitSlackMm) break;
          cut = next;
        }
        lines.push_back(word.substr(0, cut));
        word = word.substr(cut);
      }
      line = word;
    }
    lines.push_back(line);
    if (nl == std::string::npos) break;
    start = nl + 1;
  }
  return lines;
}

std::string Pen::ellipsize(const std::string& text, double width_mm) const {
  if (width(text) <= width_mm + kFitSlackMm) return text;
  // Longest prefix (whole characters) that still fits with the ellipsis, by bisection over
  // the character boundaries.
  std::vector<std::size_t> ends;
  for (std::size_t i = 0; i < text.size(); i += utf8_char_length(text, i)) {
    ends.push_back(i + utf8_char_length(text, i));
  }
  const auto candidate = [&](std::size_t n) {  // the first n characters and "…"
    std::string p = text.substr(0, n == 0 ? 0 : ends[n - 1]);
    while (!p.empty() && p.back() == ' ') p.pop_back();
    return p + kEllipsis;
  };
  std::size_t lo = 0, hi = ends.size();
  while (lo < hi) {
    const std::size_t mid = (lo + hi + 1) / 2;
    if (width(candidate(mid)) <= width_mm + kFitSlackMm) {
      lo = mid;
    } else {
      hi = mid - 1;
    }
  }
  const std::string out = candidate(lo);
  return width(out) <= width_mm + kFitSlackMm ? out : std::string();
}

FittedText fit_text(Pen& pen, const std::string& text, Font font, double width_mm,
                    double min_factor, std::size_t max_lines) {
  const double nominal = font.size_mm;
  FittedText out;
  // Shrink in 4 % steps until one line fits.
  for (double f = 1.0; f >= min_factor - 1e-9; f -= 0.04) {
    font.size_mm = nominal * f;
    pen.set_font(font);
    if (pen.width(text) <= width_mm && text.find('\n') == std::string::npos) {
      out.font = font;
      out.lines = {text};
      return out;
    }
  }
  font.size_mm = nominal * min_factor;
  pen.set_font(font);
  out.font = font;
  out.lines = pen.wrap(text, width_mm);
  if (out.lines.size() > max_lines) {
    std::string rest;
    for (std::size_t i = max_lines - 1; i < out.lines.size(); ++i) {
      rest += (rest.empty() ? "" : " ") + out.lines[i];
    }
    out.lines.resize(max_lines);
    out.lines.back() = pen.ellipsize(rest, width_mm);
  }
  return out;
}

double draw_lines(Pen& pen, double x, double top_y, const FittedText& block, Align align) {
  pen.set_font(block.font);
  const double asc = pen.ascent();
  const double lh = pen.line_height();
  double y = top_y + asc;
  for (const auto& line : block.lines) {
    pen.text(x, y, line, align);
    y += lh;
  }
  if (block.lines.empty()) return 0;
  return (static_cast<double>(block.lines.size()) - 1) * lh + asc + pen.descent();
}

double footer_height(Pen& pen, double scale) {
  pen.set_font(Font{2.3 * std::max(scale, 0.85)});
  return pen.ascent() + pen.descent() + 2.5;
}

double draw_footer(Pen& pen, const ChartOptions& options, int page, int pages, double scale) {
  const PageSize ps = page_size(options.paper);
  const double h = footer_height(pen, scale);
  pen.set_font(Font{2.3 * std::max(scale, 0.85)});
  const double baseline = ps.height_mm - kChartMarginMm - pen.descent();
  const double x0 = kChartMarginMm;
  const double x1 = ps.width_mm - kChartMarginMm;
  pen.colour(kRule);
  pen.line(x0, baseline - pen.ascent() - 1.2, x1, baseline - pen.ascent() - 1.2, 0.15);
  pen.colour(kGrey);
  const std::string right = fmt::format("page {} of {}", page, pages);
  pen.text(x1, baseline, right, Align::kRight);
  const std::string version =
      options.tool_version.empty() ? "trimwright" : "trimwright " + options.tool_version;
  const std::string left = "A printed part is not a certified component. \xC2\xB7 " + version;
  pen.colour(kDark);
  pen.text(x0, baseline, pen.ellipsize(left, x1 - x0 - pen.width(right) - 4), Align::kLeft);
  return h;
}

PagePoint polar_point(double cx, double cy, double r_mm, double phi_deg) {
  const double a = deg_to_rad(phi_deg);
  return {cx + r_mm * std::sin(a), cy - r_mm * std::cos(a)};
}

void text_rotated(Pen& pen, double x, double y, double phi_deg, const std::string& text) {
  if (!pen.painting()) return;
  cairo_t* cr = pen.cr();
  cairo_save(cr);
  cairo_translate(cr, x, y);
  cairo_rotate(cr, deg_to_rad(phi_deg));
  cairo_text_extents_t e;
  cairo_text_extents(cr, text.c_str(), &e);
  // Centre the ink box on the point.
  cairo_move_to(cr, -(e.x_bearing + e.width / 2), -(e.y_bearing + e.height / 2));
  cairo_show_text(cr, text.c_str());
  cairo_new_path(cr);
  cairo_restore(cr);
}

void arrow_head(cairo_t* cr, double x, double y, double dir_x, double dir_y, double length_mm,
                double width_mm) {
  const double n = std::hypot(dir_x, dir_y);
  if (n <= 0) return;
  const double ux = dir_x / n, uy = dir_y / n;
  const double bx = x - ux * length_mm, by = y - uy * length_mm;
  cairo_move_to(cr, x, y);
  cairo_line_to(cr, bx - uy * width_mm / 2, by + ux * width_mm / 2);
  cairo_line_to(cr, bx + uy * width_mm / 2, by - ux * width_mm / 2);
  cairo_close_path(cr);
  cairo_fill(cr);
}

void curved_arrow(cairo_t* cr, double cx, double cy, double r_mm, double phi0_deg,
                  double phi1_deg, double line_mm, double head_mm) {
  // Page angles run clockwise from the top; Cairo's arc angles run clockwise from +x (y down).
  const bool clockwise = phi1_deg > phi0_deg;
  // Stop the stroke short of the tip so the line does not poke through the head.
  const double head_deg = rad_to_deg(head_mm * 0.8 / r_mm);
  const double stop = clockwise ? phi1_deg - head_deg : phi1_deg + head_deg;
  const double a0 = deg_to_rad(phi0_deg - 90), a1 = deg_to_rad(stop - 90);
  cairo_new_path(cr);
  cairo_set_line_width(cr, line_mm);
  if (clockwise) {
    cairo_arc(cr, cx, cy, r_mm, a0, a1);
  } else {
    cairo_arc_negative(cr, cx, cy, r_mm, a0, a1);
  }
  cairo_stroke(cr);
  const PagePoint tip = polar_point(cx, cy, r_mm, phi1_deg);
  // Tangent at the tip in the direction of travel.
  const double t = deg_to_rad(phi1_deg);
  const double sgn = clockwise ? 1.0 : -1.0;
  arrow_head(cr, tip.x, tip.y, sgn * std::cos(t), sgn * std::sin(t), head_mm, head_mm * 0.8);
}

}  // namespace trimwright::io::chart_detail
