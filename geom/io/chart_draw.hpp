// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Private to the chart writer: a thin drawing layer over Cairo in page millimetres (text
/// measuring, wrapping, shrinking, simple shapes) and the two page painters. Not installed, not
/// included outside geom/io/chart*.cpp.

#include <cairo.h>

#include <cstddef>
#include <string>
#include <vector>

#include "geom/io/chart.hpp"

namespace trimwright::io::chart_detail {

/// An sRGB colour, components in [0, 1].
struct Rgb {
  double r, g, b;
};

// Restrained palette: greys plus one accent that still reads as a dark grey in black and white.
inline constexpr Rgb kInk{0.0, 0.0, 0.0};
inline constexpr Rgb kDark{0.22, 0.22, 0.22};
inline constexpr Rgb kGrey{0.42, 0.42, 0.42};
inline constexpr Rgb kRule{0.62, 0.62, 0.62};
inline constexpr Rgb kShade{0.86, 0.86, 0.86};
inline constexpr Rgb kPale{0.94, 0.94, 0.94};
inline constexpr Rgb kWhite{1.0, 1.0, 1.0};
inline constexpr Rgb kAccent{0.72, 0.13, 0.05};

/// A font: size in mm (the em size), weight and slant of DejaVu Sans.
struct Font {
  double size_mm = 3.0;
  bool bold = false;
  bool italic = false;
};

/// Horizontal alignment of a text run relative to its x.
enum class Align { kLeft, kCentre, kRight };

/// Text and shapes on one Cairo context in page millimetres. In measuring mode nothing is
/// painted, but every measurement is the same, so layout code runs unchanged for both.
class Pen {
 public:
  /// `cr` must already map 1 user unit to 1 mm. `paint` false: measure only.
  Pen(cairo_t* cr, bool paint);
  ~Pen();
  Pen(const Pen&) = delete;
  Pen& operator=(const Pen&) = delete;

  /// The Cairo context, for shapes drawn directly (only when painting()).
  cairo_t* cr() const { return cr_; }
  /// True when painting, false when only measuring.
  bool painting() const { return paint_; }

  /// Selects `font` for the following text calls.
  void set_font(const Font& font);
  /// The selected font.
  const Font& font() const { return font_; }
  /// Advance width of `text` in the selected font, mm.
  double width(const std::string& text) const;
  /// Ascent of the selected font above the baseline, mm.
  double ascent() const;
  /// Descent of the selected font below the baseline, mm.
  double descent() const;
  /// Line pitch of the selected font, mm.
  double line_height() const;

  /// Paints `text` with its baseline at y; leaves no current point.
  void text(double x, double baseline_y, const std::string& text, Align align = Align::kLeft);
  /// Sets the colour of the following paint calls.
  void colour(Rgb c);
  /// A straight line of width w_mm.
  void line(double x0, double y0, double x1, double y1, double w_mm);
  /// A filled axis-aligned rectangle.
  void fill_rect(double x, double y, double w, double h);

  /// Splits `text` into lines no wider than width_mm at the selected font: words, then
  /// characters for words that are too long on their own. "\n" forces a break.
  std::vector<std::string> wrap(const std::string& text, double width_mm) const;
  /// `text`, cut at a character boundary and ended with "…" when wider than width_mm.
  std::string ellipsize(const std::string& text, double width_mm) const;

 private:
  cairo_t* cr_;
  bool paint_;
  Font font_;
  cairo_font_face_t* faces_[4];
};

/// A text block fitted to a width: the font it ended at and its lines.
struct FittedText {
  Font font;
  std::vector<std::string> lines;
};

/// Fits `text` into width_mm on at most max_lines lines: first shrinks `font` down to
/// min_factor × its size, then wraps, and as a last resort cuts the last line with "…".
FittedText fit_text(Pen& pen, const std::string& text, Font font, double width_mm,
                    double min_factor, std::size_t max_lines);

/// Paints fitted lines from top_y (the top of the first line's ascent); returns the height.
double draw_lines(Pen& pen, double x, double top_y, const FittedText& block,
                  Align align = Align::kLeft);

/// `value` with at most max_decimals decimals and no trailing zeros: 15.875, 63.5, 150.
std::string format_trimmed(double value, int max_decimals);

/// Number of bytes of the UTF-8 character starting at s[i] (1 for invalid bytes).
std::size_t utf8_char_length(const std::string& s, std::size_t i);

/// How much of each list page 1 shows, and at which type scale (1 = nominal sizes).
struct CardFit {
  double scale = 1.0;
  std::size_t table_rows = 0;
  std::size_t checks = 0;
  std::size_t steps = 0;
  std::size_t warnings = 0;
  std::size_t cautions = 0;
};

/// Chooses the largest type scale (down to a legible minimum), then trims the longest lists,
/// so that page 1 fits inside the margins. `measure` maps 1 user unit to 1 mm.
CardFit fit_card(cairo_t* measure, const ChartData& data, const ChartOptions& options);

/// Paints page 1 (the setting card) with `fit`. `cr` maps 1 user unit to 1 mm.
void draw_card(cairo_t* cr, const ChartData& data, const ChartOptions& options,
               const CardFit& fit);

/// Paints page 2 (the angle template at true scale). `cr` maps 1 user unit to 1 mm exactly.
void draw_template(cairo_t* cr, const ChartData& data, const ChartOptions& options);

/// The footer line shared by both pages, from the bottom margin up; returns its height.
double draw_footer(Pen& pen, const ChartOptions& options, int page, int pages, double scale);

/// Height the footer takes at `scale`, mm (including the gap above it).
double footer_height(Pen& pen, double scale);

/// A point at radius r_mm and page angle phi_deg (clockwise from the top) around (cx, cy).
struct PagePoint {
  double x, y;
};
/// Page coordinates of the point at radius r_mm, page angle phi_deg around (cx, cy).
PagePoint polar_point(double cx, double cy, double r_mm, double phi_deg);

/// Paints `text` centred on (x, y) rotated by phi_deg clockwise (its top toward phi_deg).
void text_rotated(Pen& pen, double x, double y, double phi_deg, const std::string& text);

/// An arrowhead with its tip at (x, y) pointing along page direction phi_deg, filled.
void arrow_head(cairo_t* cr, double x, double y, double dir_x, double dir_y, double length_mm,
                double width_mm);

/// A curved arrow on radius r_mm from page angle phi0 to phi1 (degrees, either direction).
void curved_arrow(cairo_t* cr, double cx, double cy, double r_mm, double phi0_deg,
                  double phi1_deg, double line_mm, double head_mm);

}  // namespace trimwright::io::chart_detail
