// SPDX-License-Identifier: GPL-3.0-or-later
// Page 2: the angle template at true scale (1 user unit = 1 mm on paper) and its scale bar.
#include <fmt/core.h>

#include <algorithm>
#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/io/chart.hpp"
#include "geom/io/chart_draw.hpp"

namespace trimwright::io {
namespace {

// Vertical budget of the page, mm (see docs/chart.md, "Template page").
constexpr double kHeaderMm = 32.0;       // title, subtitle and four instruction lines
constexpr double kFooterMm = 6.0;        // footer line above the bottom margin
constexpr double kNoteMm = 8.0;          // two lines of note under the bar
constexpr double kBarGapMm = 2.0;        // between the bar and the note
constexpr double kBarHeightMm = 1.2;     // the bar's filled rectangle
constexpr double kBarLabelsMm = 9.0;     // ticks and labels above the bar, and a gap
constexpr double kScaleBandMm = 13.0;    // ticks, numbers and room for labels inside the rim
constexpr double kMinUsefulRadiusMm = 45.0;  // a template smaller than this is hard to read
constexpr double kTickLong = 5.0, kTickMid = 3.5, kTickShort = 2.0;  // tick lengths, mm
constexpr double kNumberSizeMm = 2.6;    // degree numbers

}  // namespace

TemplateGeometry template_geometry(const ChartData& data, Paper paper) {
  const PageSize ps = page_size(paper);
  TemplateGeometry g;
  g.bar_height_mm = kBarHeightMm;
  g.bar_x_mm = (ps.width_mm - kScaleBarMm) / 2;
  g.bar_y_mm = ps.height_mm - kChartMarginMm - kFooterMm - kNoteMm - kBarGapMm - kBarHeightMm;
  const double area_top = kChartMarginMm + kHeaderMm;
  const double area_bottom = g.bar_y_mm - kBarLabelsMm;
  const double area_w = ps.width_mm - 2 * kChartMarginMm;
  const double area_h = area_bottom - area_top;
  g.centre_x_mm = ps.width_mm / 2;
  g.centre_y_mm = area_top + area_h / 2;
  g.fit_radius_mm = std::min(area_w, area_h) / 2 - 0.5;  // half a stroke of slack

  const double r_hole = data.spindle_diameter_mm / 2;
  const double r_flange = data.flange_diameter_mm > 0 ? data.flange_diameter_mm / 2 : 0;
  const double r_rotor = data.rotor_diameter_mm > 0 ? data.rotor_diameter_mm / 2 : 0;
  if (!(r_hole > 0) || r_hole + kScaleBandMm + 6 > g.fit_radius_mm) {
    throw InputError(fmt::format(
        "chart: machine.spindle_diameter_mm = {} leaves no room for a true-scale degree ring on "
        "{} paper (at most {:.0f} mm)",
        data.spindle_diameter_mm, paper_name(paper),
        2 * (g.fit_radius_mm - kScaleBandMm - 6)));
  }
  g.hole_radius_mm = r_hole;
  // The degree scale sits outside the flange, so the flange outline shows inside the ring.
  const double r_needed = std::max(r_hole + kScaleBandMm + 6, r_flange + kScaleBandMm);
  if (r_rotor > g.fit_radius_mm) {
    g.outer_radius_mm = g.fit_radius_mm;
    g.rotor_partial = true;
  } else if (r_rotor > 0 && r_rotor >= r_needed) {
    g.outer_radius_mm = r_rotor;  // the cut line is the rotor's rim
  } else {
    g.outer_radius_mm =
        std::min(g.fit_radius_mm, std::max(r_needed, std::max(kMinUsefulRadiusMm, r_rotor)));
  }
  g.rotor_radius_mm = r_rotor;
  g.flange_radius_mm = r_flange;
  g.flange_partial = r_flange > g.outer_radius_mm;
  // 1° ticks while they stay at least 0.5 mm apart on the rim.
  g.tick_step_deg = g.outer_radius_mm * kPi / 180.0 >= 0.5 ? 1 : 5;
  // Numbers every 10° while 7 mm apart on their circle (a three-digit number is 5 mm wide),
  // otherwise every 30°.
  const double r_numbers = g.outer_radius_mm - kTickLong - 1.0 - kNumberSizeMm / 2;
  g.number_step_deg = r_numbers * deg_to_rad(10) >= 7.0 ? 10 : 30;
  g.ref_mark_inner_mm = r_hole + 2.5;
  g.ref_mark_width_mm = 0.8;
  return g;
}

namespace chart_detail {
namespace {

// Page angles of everything already marked, for keeping labels apart.
double farthest_candidate(const std::vector<double>& taken, const std::vector<double>& candidates) {
  double best = candidates.front(), best_gap = -1;
  for (double c : candidates) {
    double gap = 360;
    for (double t : taken) gap = std::min(gap, angle_between_deg(c, t));
    if (gap > best_gap + 1e-9) {
      best_gap = gap;
      best = c;
    }
  }
  return best;
}

// Top-left corner of a w × h label box set beside the radial line at page angle phi, on the
// clockwise (side > 0) or counter-clockwise side, as far out as r_start but wholly inside
// r_limit; it moves inward until it fits, but not inside r_floor.
PagePoint place_beside(double cx, double cy, double phi, double side, double w, double h,
                       double r_start, double r_limit, double r_floor) {
  const double t = deg_to_rad(phi);
  const double nx = side * std::cos(t), ny = side * std::sin(t);  // across the line
  const double off = 0.5 * w * std::fabs(nx) + 0.5 * h * std::fabs(ny) + 1.2;
  PagePoint best{0, 0};
  for (double r = r_start; r >= r_floor; r -= 0.5) {
    const PagePoint p = polar_point(cx, cy, r, phi);
    best = {p.x + nx * off - w / 2, p.y + ny * off - h / 2};
    double far = 0;
    for (double dx : {0.0, w}) {
      for (double dy : {0.0, h}) far = std::max(far, std::hypot(best.x + dx - cx, best.y + dy - cy));
    }
    if (far <= r_limit) break;
  }
  return best;
}

// Which side of the line at phi has more room before the next marked angle: +1 clockwise.
double freer_side(double phi, const std::vector<double>& taken) {
  double cw_gap = 360, ccw_gap = 360;
  for (double t : taken) {
    if (angle_between_deg(t, phi) < 1e-9) continue;
    cw_gap = std::min(cw_gap, wrap_deg_360(t - phi));
    ccw_gap = std::min(ccw_gap, wrap_deg_360(phi - t));
  }
  return cw_gap >= ccw_gap ? 1.0 : -1.0;
}

// A label of one or two lines (the first bold) beside the radial line at page angle phi.
void mark_label(Pen& pen, double cx, double cy, double phi, double side, double r_start,
                double r_limit, double r_floor, const std::string& l1, const std::string& l2,
                Rgb c, double size) {
  pen.set_font(Font{size, true});
  const double lh = pen.line_height();
  const double asc = pen.ascent();
  double w = pen.width(l1);
  pen.set_font(Font{size});
  w = std::max(w, pen.width(l2));
  const double h = (l2.empty() ? 0.0 : lh) + asc + pen.descent();
  const PagePoint box = place_beside(cx, cy, phi, side, w, h, r_start, r_limit, r_floor);
  pen.colour(c);
  pen.set_font(Font{size, true});
  pen.text(box.x + w / 2, box.y + asc, l1, Align::kCentre);
  pen.set_font(Font{size});
  pen.text(box.x + w / 2, box.y + asc + lh, l2, Align::kCentre);
}

// A one-line label at page angle phi by the circle of radius r, set just outside the point
// (outward) or just inside it, in the selected font.
void circle_label(Pen& pen, double cx, double cy, double r, double phi, bool outward,
                  const std::string& text) {
  const PagePoint p = polar_point(cx, cy, r, phi);
  const double sn = std::sin(deg_to_rad(phi)), cs = std::cos(deg_to_rad(phi));
  const double out = outward ? 1.0 : -1.0;  // +1: the text lies away from the centre
  if (std::fabs(sn) > 0.5) {
    pen.text(p.x, p.y + 0.35 * pen.ascent(), text, sn * out > 0 ? Align::kLeft : Align::kRight);
  } else {
    const bool above = cs * out > 0;  // the text's box lies above the point
    pen.text(p.x, above ? p.y - pen.descent() : p.y + pen.ascent(), text, Align::kCentre);
  }
}

void radial_line(cairo_t* cr, double cx, double cy, double r0, double r1, double phi, double w) {
  const PagePoint a = polar_point(cx, cy, r0, phi), b = polar_point(cx, cy, r1, phi);
  cairo_set_line_width(cr, w);
  cairo_move_to(cr, a.x, a.y);
  cairo_line_to(cr, b.x, b.y);
  cairo_stroke(cr);
}

void circle(cairo_t* cr, double cx, double cy, double r, double w) {
  cairo_new_path(cr);
  cairo_set_line_width(cr, w);
  cairo_arc(cr, cx, cy, r, 0, 2 * kPi);
  cairo_stroke(cr);
}

}  // namespace

void draw_template(cairo_t* cr, const ChartData& data, const ChartOptions& options) {
  const PageSize ps = page_size(options.paper);
  const TemplateGeometry g = template_geometry(data, options.paper);
  const Rotation rot = data.rotation.value_or(Rotation::kCcw);  // validated before drawing
  const bool cw_count = angles_count_clockwise(rot, data.sense);
  Pen pen(cr, true);
  pen.colour(kWhite);
  cairo_paint(cr);

  const double x0 = kChartMarginMm, x1 = ps.width_mm - kChartMarginMm;
  const double w = x1 - x0;
  const double cx = g.centre_x_mm, cy = g.centre_y_mm, ro = g.outer_radius_mm;

  // Header: title, job line, four instructions.
  double y = kChartMarginMm;
  pen.colour(kInk);
  y += draw_lines(pen, x0, y,
                  fit_text(pen, "Angle template \xC2\xB7 true scale 1:1", Font{5.0, true}, w, 0.7, 1));
  y += 1.0;
  std::string job = data.title.empty() ? std::string("Setting chart") : data.title;
  if (!data.headline.empty()) job += " \xE2\x80\x94 " + data.headline;
  pen.colour(kGrey);
  y += draw_lines(pen, x0, y, fit_text(pen, job, Font{3.0}, w, 0.8, 1));
  y += 2.0;
  const std::string sense_words =
      data.sense == AngleSense::kAgainstRotation ? "against rotation" : "with rotation";
  const std::string page_words = cw_count ? "clockwise" : "counter-clockwise";
  const std::vector<std::string> steps = {
      "1. Print at 100 % (\"actual size\", never \"fit to page\") and check the 100 mm bar below "
      "with a ruler.",
      fmt::format("2. Cut along the outer line and cut out the centre hole (\xC3\x98{} mm, the "
                  "spindle).",
                  format_trimmed(data.spindle_diameter_mm, 3)),
      "3. Slide it over the spindle, face up, against the flange; turn it until 0\xC2\xB0 sits on "
      "the rotor's reference mark.",
      fmt::format("4. Angles count {} ({} on this sheet). Mark the rotor at the {} ({}) and set "
                  "the fixture there.",
                  sense_words, page_words, data.correction_mark_label,
                  format_angle(data.correction.angle_deg))};
  pen.colour(kInk);
  for (const auto& s : steps) y += draw_lines(pen, x0, y, fit_text(pen, s, Font{2.7}, w, 0.75, 1)) + 0.6;

  // Outlines for centring: flange (dashed) and the rotor when it is not the cut line.
  cairo_save(cr);
  cairo_rectangle(cr, x0, kChartMarginMm + kHeaderMm, w,
                  g.bar_y_mm - kBarLabelsMm - kChartMarginMm - kHeaderMm);
  cairo_clip(cr);
  const double dash[] = {2.0, 1.2};
  cairo_set_dash(cr, dash, 2, 0);
  pen.colour(kGrey);
  if (g.flange_radius_mm > 0) circle(cr, cx, cy, g.flange_radius_mm, 0.25);
  if (g.rotor_radius_mm > 0 && std::fabs(g.rotor_radius_mm - ro) > 1e-9) {
    circle(cr, cx, cy, g.rotor_radius_mm, 0.3);
  }
  cairo_set_dash(cr, nullptr, 0, 0);
  cairo_restore(cr);

  // Degree ticks inward from the rim: 10° long, 5° middle, 1° short.
  pen.colour(kInk);
  const int step = static_cast<int>(g.tick_step_deg);
  for (int k = 0; k < 360; k += step) {
    const double len = k % 10 == 0 ? kTickLong : k % 5 == 0 ? kTickMid : kTickShort;
    const double lw = k % 10 == 0 ? 0.25 : k % 5 == 0 ? 0.2 : 0.12;
    radial_line(cr, cx, cy, ro - len, ro, static_cast<double>(k), lw);
  }
  // Numbers in the job's angle sense, tops outward.
  const double r_num = ro - kTickLong - 1.0 - kNumberSizeMm / 2;
  pen.set_font(Font{kNumberSizeMm});
  const int nstep = static_cast<int>(g.number_step_deg);
  for (int k = nstep; k < 360; k += nstep) {
    const double phi = page_angle_deg(k, rot, data.sense);
    const PagePoint p = polar_point(cx, cy, r_num, phi);
    text_rotated(pen, p.x, p.y, phi, std::to_string(k));
  }
  const double r_inner_labels = r_num - kNumberSizeMm;  // labels stay inside the numbers

  // The reference mark: bold radial line at the top, a wedge at the rim, its label.
  pen.colour(kInk);
  cairo_set_line_cap(cr, CAIRO_LINE_CAP_BUTT);
  radial_line(cr, cx, cy, g.ref_mark_inner_mm, ro, 0, g.ref_mark_width_mm);
  cairo_move_to(cr, cx - 2.2, cy - ro);
  cairo_line_to(cr, cx + 2.2, cy - ro);
  cairo_line_to(cr, cx, cy - ro + 4.0);
  cairo_close_path(cr);
  cairo_fill(cr);
  const double r_floor = g.hole_radius_mm + 4.0;
  std::vector<double> taken = {0.0};
  const double phi_c = page_angle_deg(data.correction.angle_deg, rot, data.sense);
  taken.push_back(phi_c);
  for (const auto& m : data.marks) taken.push_back(page_angle_deg(m.angle_deg, rot, data.sense));
  mark_label(pen, cx, cy, 0, freer_side(0, taken), r_inner_labels, r_inner_labels, r_floor,
             "0\xC2\xB0 = reference mark", "", kInk, 2.8);

  // The correction and any further marks, their lines broken where the numbers are.
  const double gap_half = 0.8 * kNumberSizeMm;
  const double dash2[] = {1.6, 1.0};
  for (const auto& m : data.marks) {
    const double phi = page_angle_deg(m.angle_deg, rot, data.sense);
    pen.colour(kDark);
    cairo_set_dash(cr, dash2, 2, 0);
    radial_line(cr, cx, cy, g.hole_radius_mm + 2.5, r_num - gap_half, phi, 0.35);
    radial_line(cr, cx, cy, r_num + gap_half, ro, phi, 0.35);
    cairo_set_dash(cr, nullptr, 0, 0);
    mark_label(pen, cx, cy, phi, freer_side(phi, taken), r_inner_labels - 12.0, r_inner_labels,
               r_floor, m.label, format_angle(m.angle_deg), kDark, 2.6);
  }
  pen.colour(kAccent);
  radial_line(cr, cx, cy, g.hole_radius_mm + 2.5, r_num - gap_half, phi_c, 0.6);
  radial_line(cr, cx, cy, r_num + gap_half, ro, phi_c, 0.6);
  {
    const PagePoint tip = polar_point(cx, cy, ro, phi_c);
    const double t = deg_to_rad(phi_c);
    arrow_head(cr, tip.x, tip.y, std::sin(t), -std::cos(t), 4.0, 3.2);
  }
  mark_label(pen, cx, cy, phi_c, freer_side(phi_c, taken), r_inner_labels, r_inner_labels,
             r_floor, data.correction_mark_label, format_angle(data.correction.angle_deg),
             kAccent, 3.0);

  // Direction of rotation: an arc with an arrowhead, placed away from the marks.
  const double arc_centre = farthest_candidate(taken, {180, 90, 270, 135, 225, 45, 315});
  const double r_rot = std::max(g.hole_radius_mm + 9.0,
                                std::min(r_inner_labels - 14.0,
                                         std::max(g.flange_radius_mm + 4.0,
                                                  0.55 * (g.hole_radius_mm + r_inner_labels))));
  const double half_span = std::min(30.0, rad_to_deg(25.0 / r_rot));
  const bool rot_cw = rot == Rotation::kCw;
  pen.colour(kInk);
  curved_arrow(cr, cx, cy, r_rot, rot_cw ? arc_centre - half_span : arc_centre + half_span,
               rot_cw ? arc_centre + half_span : arc_centre - half_span, 0.45, 2.6);
  {
    // The label beside the arc: on the side with room for it, toward the centre if possible.
    pen.set_font(Font{2.6, true});
    const double lw = pen.width("rotation");
    const double sn = std::sin(deg_to_rad(arc_centre));
    PagePoint p{0, 0};
    Align a = Align::kCentre;
    if (std::fabs(sn) > 0.5) {
      const bool inside = r_rot - 2.0 - lw >= g.hole_radius_mm + 3.5;
      p = polar_point(cx, cy, inside ? r_rot - 2.0 : r_rot + 2.0, arc_centre);
      a = (sn > 0) == inside ? Align::kRight : Align::kLeft;
    } else {
      p = polar_point(cx, cy, r_rot - 4.5, arc_centre);
    }
    pen.text(p.x, p.y + 0.35 * pen.ascent(), "rotation", a);
  }

  // The spindle hole, cut out; centre stubs outside it; labels.
  pen.colour(kInk);
  circle(cr, cx, cy, g.hole_radius_mm, 0.3);
  for (double phi : {90.0, 180.0, 270.0}) {
    radial_line(cr, cx, cy, g.hole_radius_mm + 0.8, g.hole_radius_mm + 2.5, phi, 0.2);
  }
  // Their labels go where no mark line or the rotation arrow runs.
  taken.push_back(arc_centre);
  const std::vector<double> spots = {180, 135, 225, 90, 270, 45, 315};
  pen.colour(kDark);
  pen.set_font(Font{2.2});
  const double hole_phi = farthest_candidate(taken, spots);
  circle_label(pen, cx, cy, g.hole_radius_mm + 3.0, hole_phi, true,
               fmt::format("cut out \xC3\x98{}", format_trimmed(data.spindle_diameter_mm, 3)));
  if (g.flange_radius_mm > 0 && !g.flange_partial) {
    taken.push_back(hole_phi);
    pen.colour(kGrey);
    circle_label(pen, cx, cy, g.flange_radius_mm - 1.0, farthest_candidate(taken, spots), false,
                 fmt::format("flange \xC3\x98{}", format_trimmed(data.flange_diameter_mm, 2)));
  }
  if (g.rotor_radius_mm > 0) {
    pen.colour(kGrey);
    pen.set_font(Font{2.2});
    std::string what;
    if (g.rotor_partial) {
      what = fmt::format("rotor \xC3\x98{} is larger than the page: cut line at \xC3\x98{}",
                         format_trimmed(data.rotor_diameter_mm, 1),
                         format_trimmed(2 * ro, 1));
    } else if (std::fabs(g.rotor_radius_mm - ro) <= 1e-9) {
      what = fmt::format("outer line = rotor \xC3\x98{}", format_trimmed(data.rotor_diameter_mm, 1));
    } else {
      what = fmt::format("rotor \xC3\x98{} (dashed)", format_trimmed(data.rotor_diameter_mm, 1));
    }
    pen.text(x0, kChartMarginMm + kHeaderMm + 2.5, what, Align::kLeft);
  }

  // The outer cut line.
  pen.colour(kInk);
  circle(cr, cx, cy, ro, 0.35);

  // Scale bar: a filled 100 mm rectangle, 10 mm ticks above it, and the note below.
  const double bx = g.bar_x_mm, by = g.bar_y_mm;
  pen.colour(kInk);
  pen.fill_rect(bx, by, kScaleBarMm, g.bar_height_mm);
  for (int i = 0; i <= 10; ++i) {
    const double x = bx + 10.0 * i;
    pen.line(x, by, x, by - (i % 5 == 0 ? 3.5 : 2.2), 0.25);
  }
  pen.set_font(Font{2.4});
  pen.text(bx, by - 4.4, "0", Align::kCentre);
  pen.text(bx + 50, by - 4.4, "50", Align::kCentre);
  pen.text(bx + 100, by - 4.4, "100 mm", Align::kCentre);
  double ny = by + g.bar_height_mm + kBarGapMm;
  pen.colour(kInk);
  ny += draw_lines(pen, x0, ny,
                   fit_text(pen, "Check before use: this bar must measure 100 mm on a ruler.",
                            Font{2.6, true}, w, 0.75, 1),
                   Align::kLeft) + 0.6;
  pen.colour(kDark);
  draw_lines(pen, x0, ny,
             fit_text(pen,
                      "If it does not, print again at 100 % (\"actual size\"), never \"fit to "
                      "page\". Angles do not depend on the scale; the hole and the flange circle do.",
                      Font{2.4}, w, 0.75, 1),
             Align::kLeft);

  draw_footer(pen, options, 2, 2, 1.0);
}

}  // namespace chart_detail
}  // namespace trimwright::io
