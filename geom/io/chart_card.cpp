// SPDX-License-Identifier: GPL-3.0-or-later
// Page 1: the setting card. One layout routine both measures (to choose the type scale and how
// much of each list fits) and paints, so what was measured is what is drawn.
#include <fmt/core.h>

#include <algorithm>
#include <cctype>
#include <cmath>

#include "geom/base/angle.hpp"
#include "geom/io/chart.hpp"
#include "geom/io/chart_draw.hpp"

namespace trimwright::io::chart_detail {
namespace {

// Nominal type sizes at scale 1, mm (2.9 mm ≈ 8.2 pt). The scale never goes below kMinScale,
// which keeps body text at about 6 pt on paper.
constexpr double kMinScale = 0.72;
constexpr double kTitle = 6.0;
constexpr double kSubtitle = 3.1;
constexpr double kHeadline = 7.6;
constexpr double kValue = 5.2;
constexpr double kLabel = 2.4;
constexpr double kBody = 2.9;
constexpr double kSmall = 2.4;
constexpr double kHeading = 3.3;
constexpr std::size_t kTwoColumnRows = 12;  // longer tables go into two column groups

const char* const kDash = "\xE2\x80\x94";      // —
const char* const kGmm = " g\xC2\xB7mm";       // g·mm
const char* const kEllipsis = "\xE2\x80\xA6";  // …

bool looks_numeric(const std::string& s) {
  if (s.empty()) return true;
  const auto c = static_cast<unsigned char>(s[0]);
  return std::isdigit(c) || c == '+' || c == '-' || c == '.' ||
         s.rfind("\xE2\x88\x92", 0) == 0 || s == kDash;  // − or —
}

bool any_unaccepted_failure(const ChartData& d) {
  for (const auto& c : d.checks) {
    if (!c.ok && !c.accepted) return true;
  }
  return false;
}

std::string sense_words(AngleSense s) {
  return s == AngleSense::kAgainstRotation ? "against rotation" : "with rotation";
}

// Grid step for the polar diagram: 1, 2, 2.5 or 5 × 10^k, giving 2 to 5 rings.
double nice_step(double max_value) {
  const double raw = max_value / 4.0;
  const double p = std::pow(10.0, std::floor(std::log10(raw)));
  for (double m : {1.0, 2.0, 2.5, 5.0, 10.0}) {
    if (m * p >= raw) return m * p;
  }
  return 10.0 * p;
}

class Card {
 public:
  Card(Pen& pen, const ChartData& d, const ChartOptions& o, const CardFit& f)
      : pen_(pen), d_(d), f_(f), s_(f.scale), ps_(page_size(o.paper)) {
    x0_ = kChartMarginMm;
    x1_ = ps_.width_mm - kChartMarginMm;
    w_ = x1_ - x0_;
    gap_ = 3.4 * s_;
  }

  // Lays out (and paints when the pen paints) everything above the footer; returns the bottom.
  double run() {
    double y = kChartMarginMm;
    y = header(y) + gap_;
    y = band(y) + gap_;
    if (!d_.steps.empty()) y = steps(y) + gap_;
    if (!d_.table.rows.empty() || !d_.table.header.empty()) y = table(y) + gap_;
    y = checks(y) + gap_;
    if (!d_.warnings.empty()) y = warnings(y) + gap_;
    y = cautions(y);
    return y;
  }

 private:
  Font body(bool bold = false) const { return Font{kBody * s_, bold}; }
  // A degree sign follows its number directly; other units after a small space.
  double unit_gap(const std::string& unit) const {
    return unit.rfind("\xC2\xB0", 0) == 0 ? 0.0 : 0.8 * s_;
  }
  Font small(bool bold = false) const { return Font{kSmall * s_, bold}; }

  // A section heading with a hairline under it; returns the y below it.
  double heading(double y, const std::string& text, Rgb c = kInk, const std::string& aside = "") {
    pen_.set_font(Font{kHeading * s_, true});
    const double asc = pen_.ascent();
    const double desc = pen_.descent();
    pen_.colour(c);
    const double tw = pen_.width(text);
    pen_.text(x0_, y + asc, text);
    if (!aside.empty()) {
      pen_.set_font(small());
      pen_.colour(kGrey);
      pen_.text(x0_ + tw + 2.5 * s_, y + asc,
                pen_.ellipsize(aside, std::max(0.0, w_ - tw - 2.5 * s_)));
    }
    pen_.colour(kRule);
    pen_.line(x0_, y + asc + desc + 0.5 * s_, x1_, y + asc + desc + 0.5 * s_, 0.15);
    return y + asc + desc + 1.6 * s_;
  }

  double header(double y) {
    const std::string title = d_.title.empty() ? std::string("Setting chart") : d_.title;
    pen_.colour(kInk);
    y += draw_lines(pen_, x0_, y, fit_text(pen_, title, Font{kTitle * s_, true}, w_, 0.6, 2));
    if (!d_.subtitle.empty()) {
      y += 1.0 * s_;
      pen_.colour(kGrey);
      y += draw_lines(pen_, x0_, y, fit_text(pen_, d_.subtitle, Font{kSubtitle * s_}, w_, 0.8, 2));
    }
    return y;
  }

  // The setting box and the correction on the left, the polar diagram on the right.
  double band(double y) {
    const double gap = 5.0 * s_;
    const double right_w = std::min(0.38 * w_, 74.0 * s_);
    const double left_w = w_ - right_w - gap;
    double yl = setting_box(x0_, y, left_w) + 2.6 * s_;
    yl = correction(x0_, yl, left_w);
    const double yr = polar(x0_ + left_w + gap, y, right_w);
    return std::max(yl, yr);
  }

  double setting_box(double x, double y, double w) {
    const double pad = 2.8 * s_;
    const double bar = 1.4 * s_;
    const double inner_x = x + bar + pad;
    const double inner_w = w - bar - 2 * pad;
    const bool unsafe = any_unaccepted_failure(d_);
    const std::string label =
        unsafe ? "DO NOT USE: a safety check failed (see Checks)" : "SET THE FIXTURE";
    const FittedText lab = fit_text(pen_, label, Font{kLabel * s_, true}, inner_w, 0.8, 2);
    const std::string headline = d_.headline.empty() ? std::string(kDash) : d_.headline;
    const FittedText head = fit_text(pen_, headline, Font{kHeadline * s_, true}, inner_w, 0.5, 3);

    // Value cells flow left to right: a small label above a bold value and its unit.
    struct Cell {
      std::string label, value, unit;
      double x, y, width;
    };
    std::vector<Cell> cells;
    const Font lab_font{kLabel * s_};
    const Font val_font{kValue * s_, true};
    const Font unit_font{kValue * 0.72 * s_};
    pen_.set_font(lab_font);
    const double lab_h = pen_.ascent() + pen_.descent();
    pen_.set_font(val_font);
    const double val_h = pen_.ascent() + pen_.descent();
    const double row_h = lab_h + 0.6 * s_ + val_h;
    const double cell_gap = 6.0 * s_;
    double cx = 0, cy = 0;
    for (const auto& v : d_.setting) {
      Cell c{v.label, v.value, v.unit, 0, 0, 0};
      pen_.set_font(unit_font);
      const double unit_w = c.unit.empty() ? 0 : pen_.width(c.unit) + unit_gap(c.unit);
      pen_.set_font(val_font);
      c.value = pen_.ellipsize(c.value, std::max(0.0, inner_w - unit_w));
      double vw = pen_.width(c.value) + unit_w;
      pen_.set_font(lab_font);
      c.label = pen_.ellipsize(c.label, inner_w);
      c.width = std::max(vw, pen_.width(c.label));
      if (cx > 0 && cx + c.width > inner_w) {
        cx = 0;
        cy += row_h + 1.5 * s_;
      }
      c.x = cx;
      c.y = cy;
      cx += c.width + cell_gap;
      cells.push_back(c);
    }
    double h = pad;
    const double lab_y = y + h;
    pen_.set_font(lab.font);
    h += (lab.lines.size() - 1) * pen_.line_height() + pen_.ascent() + pen_.descent() + 1.2 * s_;
    const double head_y = y + h;
    pen_.set_font(head.font);
    h += (head.lines.size() - 1) * pen_.line_height() + pen_.ascent() + pen_.descent();
    const double cells_y = y + h + 2.0 * s_;
    if (!cells.empty()) h += 2.0 * s_ + cells.back().y + row_h;
    h += pad;

    if (pen_.painting()) {
      pen_.colour(unsafe ? kShade : kPale);
      pen_.fill_rect(x, y, w, h);
      pen_.colour(kAccent);
      pen_.fill_rect(x, y, bar, h);
    }
    pen_.colour(unsafe ? kAccent : kGrey);
    draw_lines(pen_, inner_x, lab_y, lab);
    pen_.colour(kInk);
    draw_lines(pen_, inner_x, head_y, head);
    for (const auto& c : cells) {
      pen_.set_font(lab_font);
      pen_.colour(kGrey);
      pen_.text(inner_x + c.x, cells_y + c.y + pen_.ascent(), c.label);
      pen_.set_font(val_font);
      pen_.colour(kInk);
      const double base = cells_y + c.y + lab_h + 0.6 * s_ + pen_.ascent();
      pen_.text(inner_x + c.x, base, c.value);
      const double vw = pen_.width(c.value);
      pen_.set_font(unit_font);
      pen_.text(inner_x + c.x + vw + unit_gap(c.unit), base, c.unit);
    }
    return y + h;
  }

  // Paragraph of body text, wrapped; returns the y below it.
  double para(double x, double y, double w, const std::string& text, Font f, Rgb c = kInk) {
    pen_.set_font(f);
    FittedText t{f, pen_.wrap(text, w)};
    pen_.colour(c);
    return y + draw_lines(pen_, x, y, t) + 0.9 * s_;
  }

  double correction(double x, double y, double w) {
    const auto& c = d_.correction;
    std::string line = fmt::format("Correction: {}{} at {}", format_significant(c.unbalance_gmm),
                                   kGmm, format_angle(c.angle_deg));
    if (!c.method.empty()) line += fmt::format(" (method: {})", c.method);
    pen_.set_font(body(true));
    y = para(x, y, w, line, body(true));
    if (!c.grade.empty()) {
      y = para(x, y, w,
               fmt::format("Tolerance {}: {}{} permissible residual unbalance (ISO 21940-11).",
                           c.grade, format_significant(c.permissible_gmm), kGmm),
               body());
    }
    std::string reach;
    if (!d_.reach.points.empty()) {
      reach = fmt::format("The fixture reaches {} fixed settings (dots on the diagram).",
                          d_.reach.points.size());
    } else {
      reach = fmt::format("Fixture range {}\xE2\x80\x93{}{} at any angle.",
                          format_significant(d_.reach.min_gmm),
                          format_significant(d_.reach.max_gmm), kGmm);
    }
    if (std::isfinite(d_.resolution_gmm)) {
      reach += fmt::format(" Resolution {}{}", format_significant(d_.resolution_gmm), kGmm);
      reach += d_.resolution_note.empty() ? "." : " " + d_.resolution_note + ".";
    }
    y = para(x, y, w, reach, body());
    const Rotation rot = d_.rotation.value_or(Rotation::kCcw);
    y = para(x, y, w,
             fmt::format("Angles: 0\xC2\xB0 at the reference mark, counting {} ({} on paper; the "
                         "machine turns {} seen from the fixture side).",
                         sense_words(d_.sense),
                         angles_count_clockwise(rot, d_.sense) ? "clockwise" : "counter-clockwise",
                         rot == Rotation::kCw ? "clockwise" : "counter-clockwise"),
             small(), kDark);

    // Parts: name, mass, where the mass comes from, detail.
    y += 1.0 * s_;
    pen_.set_font(body(true));
    pen_.colour(kInk);
    pen_.text(x, y + pen_.ascent(), "Parts");
    y += pen_.line_height();
    if (d_.parts.empty()) return para(x, y, w, "(none listed)", small(), kGrey);
    pen_.set_font(body(true));
    double name_w = 0;
    for (const auto& p : d_.parts) name_w = std::max(name_w, pen_.width(p.name));
    name_w = std::min(name_w, 0.4 * w);
    pen_.set_font(body());
    const double mass_w = pen_.width("0000.00 g");
    const double src_w = pen_.width("predicted");
    const double gap = 2.5 * s_;
    const double detail_x = x + name_w + gap + mass_w + gap + src_w + gap;
    for (const auto& p : d_.parts) {
      pen_.set_font(body(true));
      const double base = y + pen_.ascent();
      pen_.colour(kInk);
      pen_.text(x, base, pen_.ellipsize(p.name, name_w));
      pen_.set_font(body());
      pen_.text(x + name_w + gap + mass_w, base,
                fmt::format("{} g", format_significant(p.mass_g, 4)), Align::kRight);
      const bool weighed = p.source == MassSource::kWeighed;
      pen_.set_font(body(weighed));
      pen_.colour(weighed ? kInk : kDark);
      pen_.text(x + name_w + gap + mass_w + gap, base, weighed ? "weighed" : "predicted");
      pen_.set_font(small());
      pen_.colour(kGrey);
      if (!p.detail.empty() && detail_x < x + w) {
        pen_.text(detail_x, base, pen_.ellipsize(p.detail, x + w - detail_x));
      }
      pen_.set_font(body());
      y += pen_.line_height();
    }
    return y;
  }

  double polar(double x, double y, double w) {
    const double side = std::min(w, 70.0 * s_);
    const double bx = x + (w - side) / 2;  // centred in its column
    const double out_h = 5.0 * s_;         // room above and below the circle for labels
    const double out_w = 8.0 * s_;         // room left and right
    const double R = std::max(5.0, std::min(side / 2 - out_w, side / 2 - out_h));
    const double cx = bx + side / 2, cy = y + out_h + R;
    const Rotation rot = d_.rotation.value_or(Rotation::kCcw);
    const double U = d_.correction.unbalance_gmm;
    const double phi_c = page_angle_deg(d_.correction.angle_deg, rot, d_.sense);

    double u_max = std::max(d_.reach.max_gmm, U);
    for (const auto& p : d_.reach.points) u_max = std::max(u_max, p.unbalance_gmm);
    if (!(u_max > 0)) u_max = 1;
    const double step = nice_step(u_max * 1.05);
    const double outer = std::ceil(u_max * 1.05 / step) * step;
    const double k = R / outer;  // mm per g·mm

    if (pen_.painting()) {
      cairo_t* cr = pen_.cr();
      // What the fixture can reach.
      if (d_.reach.points.empty() && d_.reach.max_gmm > 0) {
        pen_.colour(kShade);
        cairo_new_path(cr);
        cairo_set_fill_rule(cr, CAIRO_FILL_RULE_EVEN_ODD);
        cairo_arc(cr, cx, cy, d_.reach.max_gmm * k, 0, 2 * kPi);
        if (d_.reach.min_gmm > 0) {
          cairo_new_sub_path(cr);
          cairo_arc(cr, cx, cy, d_.reach.min_gmm * k, 0, 2 * kPi);
        }
        cairo_fill(cr);
        cairo_set_fill_rule(cr, CAIRO_FILL_RULE_WINDING);
      }
      // Rings and spokes.
      pen_.colour(kRule);
      cairo_set_line_width(cr, 0.15);
      for (double v = step; v <= outer + 1e-9 * outer; v += step) {
        cairo_new_path(cr);
        cairo_arc(cr, cx, cy, v * k, 0, 2 * kPi);
        cairo_stroke(cr);
      }
      for (int a = 0; a < 360; a += 30) {
        const PagePoint p = polar_point(cx, cy, R, a);
        pen_.line(cx, cy, p.x, p.y, 0.12);
      }
      pen_.colour(kDark);
      cairo_set_line_width(cr, 0.3);
      cairo_new_path(cr);
      cairo_arc(cr, cx, cy, R, 0, 2 * kPi);
      cairo_stroke(cr);
      // Discrete settings.
      for (const auto& p : d_.reach.points) {
        const PagePoint q = polar_point(cx, cy, p.unbalance_gmm * k,
                                        page_angle_deg(p.angle_deg, rot, d_.sense));
        pen_.colour(kGrey);
        cairo_new_path(cr);
        cairo_arc(cr, q.x, q.y, 1.0 * s_, 0, 2 * kPi);
        cairo_fill(cr);
      }
      // Rotor-angle labels at the quarters, and the reference mark at the top.
      pen_.set_font(small());
      for (int a : {90, 180, 270}) {
        const double phi = page_angle_deg(a, rot, d_.sense);
        const PagePoint p = polar_point(cx, cy, R + 1.3 * s_, phi);
        const std::string t = std::to_string(a) + "\xC2\xB0";
        pen_.colour(kDark);
        if (std::fabs(phi - 90) < 1) {
          pen_.text(p.x + 0.3, p.y + 0.35 * pen_.ascent(), t, Align::kLeft);
        } else if (std::fabs(phi - 270) < 1) {
          pen_.text(p.x - 0.3, p.y + 0.35 * pen_.ascent(), t, Align::kRight);
        } else {
          pen_.text(p.x, p.y + pen_.ascent() + 0.3, t, Align::kCentre);
        }
      }
      pen_.colour(kInk);
      pen_.line(cx, cy - R - 2.0 * s_, cx, cy - R * 0.35, 0.6 * s_);
      pen_.set_font(small(true));
      pen_.text(cx + 1.0 * s_, cy - R - 1.0 * s_, "0\xC2\xB0 ref", Align::kLeft);
      // Further marks (disc angles): dashed.
      const double dash[] = {1.2, 0.8};
      for (const auto& m : d_.marks) {
        const PagePoint p = polar_point(cx, cy, R, page_angle_deg(m.angle_deg, rot, d_.sense));
        pen_.colour(kDark);
        cairo_set_dash(cr, dash, 2, 0);
        pen_.line(cx, cy, p.x, p.y, 0.3 * s_);
        cairo_set_dash(cr, nullptr, 0, 0);
      }
      // Ring values along the quiet spoke.
      std::vector<double> taken = {0.0, phi_c};
      for (const auto& m : d_.marks) taken.push_back(page_angle_deg(m.angle_deg, rot, d_.sense));
      double quiet = 45, best = -1;
      for (double c : {45.0, 135.0, 225.0, 315.0}) {
        double g = 360;
        for (double t : taken) g = std::min(g, angle_between_deg(c, t));
        if (g > best + 1e-9) {
          best = g;
          quiet = c;
        }
      }
      pen_.set_font(Font{kSmall * 0.85 * s_});
      pen_.colour(kGrey);
      for (double v = step; v <= outer + 1e-9 * outer; v += step) {
        const PagePoint p = polar_point(cx, cy, v * k, quiet);
        const bool last = v + step > outer + 1e-9 * outer;
        pen_.text(p.x, p.y, fmt::format("{:g}", v) + (last ? std::string(kGmm) : ""),
                  std::sin(deg_to_rad(quiet)) >= 0 ? Align::kLeft : Align::kRight);
      }
      // Direction of rotation: an arc outside the circle, opposite the quiet spoke.
      const double arc_c = std::fmod(quiet + 180.0, 360.0);
      const double span = 22.0;
      pen_.colour(kInk);
      curved_arrow(cr, cx, cy, R + 2.2 * s_,
                   rot == Rotation::kCw ? arc_c - span : arc_c + span,
                   rot == Rotation::kCw ? arc_c + span : arc_c - span, 0.35 * s_, 2.0 * s_);
      const PagePoint rl = polar_point(cx, cy, R - 3.5 * s_, arc_c);
      pen_.set_font(small(true));
      pen_.text(rl.x, rl.y + 0.4 * pen_.ascent(), "rotation", Align::kCentre);
      // The correction: an arrow from the centre.
      const PagePoint tip = polar_point(cx, cy, U * k, phi_c);
      pen_.colour(kAccent);
      if (U * k > 2.5 * s_) {
        const PagePoint base = polar_point(cx, cy, U * k - 2.0 * s_, phi_c);
        pen_.line(cx, cy, base.x, base.y, 0.6 * s_);
        const double t = deg_to_rad(phi_c);
        arrow_head(cr, tip.x, tip.y, std::sin(t), -std::cos(t), 2.6 * s_, 2.2 * s_);
      } else {
        cairo_new_path(cr);
        cairo_arc(cr, tip.x, tip.y, 1.0 * s_, 0, 2 * kPi);
        cairo_fill(cr);
      }
      pen_.colour(kInk);
      cairo_new_path(cr);
      cairo_arc(cr, cx, cy, 0.6 * s_, 0, 2 * kPi);
      cairo_fill(cr);
    }

    // Caption under the diagram.
    double yc = y + side;
    const bool outside = d_.reach.points.empty() &&
                         (U > d_.reach.max_gmm * (1 + 1e-9) || U < d_.reach.min_gmm * (1 - 1e-9));
    std::string cap = fmt::format("Arrow: {}{} at {}. ", format_significant(U), kGmm,
                                  format_angle(d_.correction.angle_deg));
    cap += d_.reach.points.empty() ? "Grey: what the fixture reaches. "
                                   : "Dots: the fixture's settings. ";
    cap += "Seen from the fixture side.";
    yc = para(bx, yc, side, cap, Font{kSmall * 0.9 * s_}, kDark);
    if (outside) {
      yc = para(bx, yc, side, "The correction is outside the fixture's range.", small(true),
                kAccent);
    }
    return yc;
  }

  double steps(double y) {
    y = heading(y, "Steps");
    const std::size_t n = std::min(f_.steps, d_.steps.size());
    const double indent = 6.0 * s_;
    for (std::size_t i = 0; i < n; ++i) {
      pen_.set_font(body(true));
      pen_.colour(kInk);
      pen_.text(x0_ + indent - 1.5 * s_, y + pen_.ascent(), fmt::format("{}.", i + 1),
                Align::kRight);
      y = para(x0_ + indent, y, w_ - indent, d_.steps[i], body());
    }
    if (n < d_.steps.size()) {
      y = para(x0_ + indent, y, w_ - indent,
               fmt::format("{} {} more steps not shown: see the report.", kEllipsis,
                           d_.steps.size() - n),
               small(), kGrey);
    }
    return y;
  }

  double table(double y) {
    const ChartTable& t = d_.table;
    const std::size_t ncol = t.header.size();
    const std::size_t nrows = t.rows.size();
    const std::size_t shown = std::min(f_.table_rows, nrows);
    // Rows shown: a window that keeps this job's row in view.
    std::size_t first = 0;
    if (t.highlight_row && shown > 0 && *t.highlight_row >= shown) {
      first = std::min(nrows - shown, *t.highlight_row - shown / 2);
    }
    std::string aside = t.highlight_row ? "shaded: this job's setting" : "";
    y = heading(y, t.title.empty() ? std::string("Settings across the range") : t.title, kInk,
                aside);
    const Font font{kBody * 0.95 * s_};
    const Font bold{kBody * 0.95 * s_, true};
    const double pad = 3.0 * s_;
    std::vector<double> col_w(ncol, 0.0);
    std::vector<bool> numeric(ncol, true);
    for (std::size_t c = 0; c < ncol; ++c) {
      pen_.set_font(bold);
      col_w[c] = pen_.width(t.header[c]);
      pen_.set_font(font);
      for (const auto& row : t.rows) {
        const std::string& cell = c < row.size() ? row[c] : std::string();
        col_w[c] = std::max(col_w[c], pen_.width(cell) * 1.06);  // room for the bold row
        numeric[c] = numeric[c] && looks_numeric(cell);
      }
      col_w[c] += pad;
    }
    double group_w = 0;
    for (double cw : col_w) group_w += cw;
    const double group_gap = 8.0 * s_;
    const bool two = shown > kTwoColumnRows && 2 * group_w + group_gap <= w_;
    if (group_w > w_ && group_w > 0) {
      for (double& cw : col_w) cw *= w_ / group_w;
      group_w = w_;
    }
    pen_.set_font(font);
    const double asc = pen_.ascent();
    const double pad_top = 0.16 * font.size_mm;
    // Row box: padding, ascent, descent, padding; the baseline sits inside it.
    const double lh = pad_top + asc + pen_.descent() + 0.1 * font.size_mm;
    const std::size_t per_group = two ? (shown + 1) / 2 : shown;
    const std::size_t groups = two ? 2 : 1;
    double bottom = y;
    for (std::size_t g = 0; g < groups; ++g) {
      const double gx = x0_ + static_cast<double>(g) * (group_w + group_gap);
      double ry = y;
      // Header row.
      pen_.set_font(bold);
      pen_.colour(kInk);
      double cx = gx;
      for (std::size_t c = 0; c < ncol; ++c) {
        const std::string h = pen_.ellipsize(t.header[c], col_w[c] - pad);
        if (numeric[c]) {
          pen_.text(cx + col_w[c] - pad / 2, ry + pad_top + asc, h, Align::kRight);
        } else {
          pen_.text(cx + pad / 2, ry + pad_top + asc, h);
        }
        cx += col_w[c];
      }
      ry += lh;
      pen_.colour(kDark);
      pen_.line(gx, ry, gx + group_w, ry, 0.2);
      ry += 0.3 * s_;
      const std::size_t lo = g * per_group;
      const std::size_t hi = std::min(shown, lo + per_group);
      for (std::size_t i = lo; i < hi; ++i) {
        const std::size_t r = first + i;
        const bool hl = t.highlight_row && *t.highlight_row == r;
        if (hl || i % 2 == 1) {
          pen_.colour(hl ? kShade : kPale);
          pen_.fill_rect(gx, ry, group_w, lh);
        }
        pen_.set_font(hl ? bold : font);
        pen_.colour(kInk);
        cx = gx;
        for (std::size_t c = 0; c < ncol; ++c) {
          const std::string& raw = c < t.rows[r].size() ? t.rows[r][c] : std::string();
          const std::string cell = pen_.ellipsize(raw, col_w[c] - pad);
          if (numeric[c]) {
            pen_.text(cx + col_w[c] - pad / 2, ry + pad_top + asc, cell, Align::kRight);
          } else {
            pen_.text(cx + pad / 2, ry + pad_top + asc, cell);
          }
          cx += col_w[c];
        }
        ry += lh;
      }
      bottom = std::max(bottom, ry);
    }
    y = bottom;
    if (shown < nrows) {
      std::string note = fmt::format("{} {} more rows not shown", kEllipsis, nrows - shown);
      note += t.more_rows_note.empty() ? "." : ": " + t.more_rows_note + ".";
      y = para(x0_, y + 0.5 * s_, w_, note, small(), kGrey);
    }
    return y;
  }

  double checks(double y) {
    bool accepted = false;
    for (const auto& c : d_.checks) accepted = accepted || (!c.ok && c.accepted);
    y = heading(y, "Checks", kInk,
                accepted ? "FAIL, accepted: a failed check named in [checks] accept; you use "
                           "the part at your own risk."
                         : "");
    if (d_.checks.empty()) return para(x0_, y, w_, "No checks were run.", body(), kGrey);
    const std::size_t n = std::min(f_.checks, d_.checks.size());
    // When not all fit, failed checks are kept first; the rows keep the report's order.
    std::vector<std::size_t> idx;
    for (int pass = 0; pass < 2; ++pass) {
      for (std::size_t i = 0; i < d_.checks.size() && idx.size() < n; ++i) {
        if (d_.checks[i].ok == (pass == 1)) idx.push_back(i);
      }
    }
    std::sort(idx.begin(), idx.end());
    const Font font{kBody * 0.95 * s_};
    const Font bold{kBody * 0.95 * s_, true};
    const double pad = 3.0 * s_;
    struct Row {
      std::string cells[5];
    };
    std::vector<Row> rows;
    for (std::size_t i : idx) {
      const ChartCheck& c = d_.checks[i];
      const std::string unit = c.unit.empty() ? "" : " " + c.unit;
      Row r;
      r.cells[0] = c.subject.empty() ? c.name : c.name + " (" + c.subject + ")";
      r.cells[1] = std::isfinite(c.value) ? format_significant(c.value) + unit : kDash;
      r.cells[2] = std::isfinite(c.limit)
                       ? (c.kind == LimitKind::kAtMost ? "\xE2\x89\xA4 " : "\xE2\x89\xA5 ") +
                             format_significant(c.limit) + unit
                       : kDash;
      const double m = check_margin_percent(c);
      r.cells[3] = std::isfinite(m) ? fmt::format("{:+.0f} %", m) : kDash;
      r.cells[4] = check_verdict(c);
      rows.push_back(r);
    }
    const char* heads[6] = {"Check", "Value", "Limit", "Margin", "Verdict", "Note"};
    double cw[5];
    for (int c = 0; c < 5; ++c) {
      pen_.set_font(bold);
      cw[c] = pen_.width(heads[c]);
      for (const auto& r : rows) cw[c] = std::max(cw[c], pen_.width(r.cells[c]));
      cw[c] += pad;
    }
    // The note takes what is left, at least 40 % of the width; long names are cut.
    const double fixed = cw[1] + cw[2] + cw[3] + cw[4];
    cw[0] = std::min(cw[0], std::max(15.0 * s_, 0.6 * w_ - fixed));
    const double note_x = x0_ + cw[0] + fixed;
    const double note_w = std::max(10.0, x1_ - note_x);
    pen_.set_font(font);
    const double asc = pen_.ascent();
    const double lh = pen_.line_height();                   // pitch of wrapped note lines
    const double pad_top = 0.16 * font.size_mm;
    const double pad_bottom = 0.1 * font.size_mm;
    const double one_line = pad_top + asc + pen_.descent() + pad_bottom;
    // Header.
    pen_.set_font(bold);
    pen_.colour(kInk);
    double cx = x0_;
    for (int c = 0; c < 6; ++c) {
      const bool right = c >= 1 && c <= 3;
      if (c < 5) {
        pen_.text(right ? cx + cw[c] - pad : cx, y + pad_top + asc, heads[c],
                  right ? Align::kRight : Align::kLeft);
        cx += cw[c];
      } else {
        pen_.text(note_x, y + pad_top + asc, heads[c]);
      }
    }
    y += one_line;
    pen_.colour(kDark);
    pen_.line(x0_, y, x1_, y, 0.2);
    y += 0.3 * s_;
    for (std::size_t i = 0; i < n; ++i) {
      const ChartCheck& c = d_.checks[idx[i]];
      pen_.set_font(font);
      std::vector<std::string> note = pen_.wrap(c.note, note_w);
      if (note.size() > 3) {
        std::string rest;
        for (std::size_t j = 2; j < note.size(); ++j) rest += (j > 2 ? " " : "") + note[j];
        note.resize(3);
        note[2] = pen_.ellipsize(rest, note_w);
      }
      const double extra = note.size() > 1 ? static_cast<double>(note.size() - 1) * lh : 0.0;
      const double rh = one_line + extra;
      if (!c.ok) {
        pen_.colour(c.accepted ? kPale : kShade);
        pen_.fill_rect(x0_, y, w_, rh);
      }
      const double base = y + pad_top + asc;
      cx = x0_;
      for (int k = 0; k < 5; ++k) {
        const bool right = k >= 1 && k <= 3;
        const bool verdict = k == 4;
        pen_.set_font(verdict && !c.ok ? bold : font);
        pen_.colour(verdict && !c.ok && !c.accepted ? kAccent : kInk);
        const std::string cell = pen_.ellipsize(rows[i].cells[k], cw[k] - pad);
        pen_.text(right ? cx + cw[k] - pad : cx, base, cell,
                  right ? Align::kRight : Align::kLeft);
        cx += cw[k];
      }
      pen_.set_font(font);
      pen_.colour(kDark);
      for (std::size_t j = 0; j < note.size(); ++j) {
        pen_.text(note_x, base + static_cast<double>(j) * lh, note[j]);
      }
      y += rh;
    }
    if (n < d_.checks.size()) {
      y = para(x0_, y + 0.5 * s_, w_,
               fmt::format("{} {} more checks not shown: see the report.", kEllipsis,
                           d_.checks.size() - n),
               small(), kGrey);
    }
    return y;
  }

  // Bulleted items in `columns` columns, balanced by height; returns the y below them.
  double bullets(double y, const std::vector<std::string>& items, std::size_t count,
                 std::size_t columns, const std::string& mark, Rgb mark_colour) {
    const double col_gap = 6.0 * s_;
    const double col_w = (w_ - (columns - 1) * col_gap) / static_cast<double>(columns);
    const double indent = 3.2 * s_;
    pen_.set_font(body());
    const double lh = pen_.line_height();
    std::vector<std::vector<std::string>> wrapped;
    std::vector<double> heights;
    double total = 0;
    for (std::size_t i = 0; i < count; ++i) {
      wrapped.push_back(pen_.wrap(items[i], col_w - indent));
      heights.push_back(static_cast<double>(wrapped.back().size()) * lh + 0.5 * s_);
      total += heights.back();
    }
    // Split point: the first column takes items until it holds about half the height.
    std::size_t split = count;
    if (columns == 2) {
      double acc = 0, best = 1e300;
      for (std::size_t k = 0; k <= count; ++k) {
        const double worst = std::max(acc, total - acc);
        if (worst < best) {
          best = worst;
          split = k;
        }
        if (k < count) acc += heights[k];
      }
    }
    double bottom = y;
    double cy = y;
    double cx = x0_;
    for (std::size_t i = 0; i < count; ++i) {
      if (columns == 2 && i == split) {
        cy = y;
        cx = x0_ + col_w + col_gap;
      }
      pen_.set_font(body(true));
      pen_.colour(mark_colour);
      pen_.text(cx, cy + pen_.ascent(), mark);
      pen_.set_font(body());
      pen_.colour(kInk);
      for (const auto& l : wrapped[i]) {
        pen_.text(cx + indent, cy + pen_.ascent(), l);
        cy += lh;
      }
      cy += 0.5 * s_;
      bottom = std::max(bottom, cy);
    }
    return bottom;
  }

  double warnings(double y) {
    y = heading(y, "Warnings", kAccent);
    const std::size_t n = std::min(f_.warnings, d_.warnings.size());
    y = bullets(y, d_.warnings, n, 1, "!", kAccent);
    if (n < d_.warnings.size()) {
      y = para(x0_, y, w_,
               fmt::format("{} {} more warnings not shown: see the report and the terminal.",
                           kEllipsis, d_.warnings.size() - n),
               small(true), kAccent);
    }
    return y;
  }

  double cautions(double y) {
    y = heading(y, "Cautions");
    const std::size_t n = std::min(f_.cautions, d_.cautions.size());
    y = bullets(y, d_.cautions, n, n >= 4 ? 2 : 1, "\xE2\x80\xA2", kInk);  // •
    if (n < d_.cautions.size()) {
      y = para(x0_, y, w_,
               fmt::format("{} {} more cautions not shown: see the report and the terminal.",
                           kEllipsis, d_.cautions.size() - n),
               small(true), kInk);
    }
    return y;
  }

  Pen& pen_;
  const ChartData& d_;
  CardFit f_;
  double s_;
  PageSize ps_;
  double x0_ = 0, x1_ = 0, w_ = 0, gap_ = 0;
};

// Lowest y the card's content may reach at `scale`: the footer sits below it.
double content_limit(Pen& pen, const ChartOptions& o, double scale) {
  return page_size(o.paper).height_mm - kChartMarginMm - footer_height(pen, scale);
}

}  // namespace

CardFit fit_card(cairo_t* measure, const ChartData& data, const ChartOptions& options) {
  Pen pen(measure, false);
  CardFit f;
  f.table_rows = data.table.rows.size();
  f.checks = data.checks.size();
  f.steps = data.steps.size();
  f.warnings = data.warnings.size();
  f.cautions = data.cautions.size();
  const auto fits = [&](const CardFit& c) {
    Card card(pen, data, options, c);
    return card.run() <= content_limit(pen, options, c.scale);
  };
  // Largest type scale that fits, in 2 % steps from 1 down to kMinScale; the height grows
  // with the scale, so the search bisects.
  const auto scale_of = [](int k) { return 1.0 - 0.02 * k; };
  const int k_min = static_cast<int>(std::lround((1.0 - kMinScale) / 0.02));
  f.scale = 1.0;
  if (fits(f)) return f;
  f.scale = kMinScale;
  if (fits(f)) {
    int lo = 0, hi = k_min;  // scale_of(lo) does not fit, scale_of(hi) does
    while (hi - lo > 1) {
      const int mid = (lo + hi) / 2;
      f.scale = scale_of(mid);
      if (fits(f)) {
        hi = mid;
      } else {
        lo = mid;
      }
    }
    f.scale = scale_of(hi);
    return f;
  }
  // Still too long: trim lists, each to the most that fits, in this order: the table (it is in
  // chart.csv), passing checks (in the report), steps, warnings, cautions.
  std::size_t CardFit::*order[] = {&CardFit::table_rows, &CardFit::checks, &CardFit::steps,
                                   &CardFit::warnings, &CardFit::cautions};
  for (auto member : order) {
    if (fits(f)) return f;
    const std::size_t full = f.*member;
    f.*member = 0;
    if (!fits(f)) continue;  // even none of this list is not enough; trim the next one too
    std::size_t lo = 0, hi = full;  // lo fits, find the largest
    while (lo < hi) {
      const std::size_t mid = (lo + hi + 1) / 2;
      f.*member = mid;
      if (fits(f)) {
        lo = mid;
      } else {
        hi = mid - 1;
      }
    }
    f.*member = lo;
    return f;
  }
  return f;  // pathological: draw_card clips to the margins
}

void draw_card(cairo_t* cr, const ChartData& data, const ChartOptions& options,
               const CardFit& fit) {
  const PageSize ps = page_size(options.paper);
  Pen pen(cr, true);
  pen.colour(kWhite);
  cairo_paint(cr);
  cairo_save(cr);
  // Nothing reaches the margins, even for input the fit could not accommodate.
  cairo_rectangle(cr, kChartMarginMm, kChartMarginMm, ps.width_mm - 2 * kChartMarginMm,
                  content_limit(pen, options, fit.scale) - kChartMarginMm);
  cairo_clip(cr);
  Card card(pen, data, options, fit);
  card.run();
  cairo_restore(cr);
  draw_footer(pen, options, 1, 2, fit.scale);
}

}  // namespace trimwright::io::chart_detail
