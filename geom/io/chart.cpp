// SPDX-License-Identifier: GPL-3.0-or-later
// The chart writer: validation, number formatting, and the PDF, SVG and PNG surfaces.
#include "geom/io/chart.hpp"

#include <cairo-pdf.h>
#include <cairo-svg.h>
#include <cairo.h>
#include <fmt/core.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <memory>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/io/chart_draw.hpp"

namespace trimwright::io {
namespace {

constexpr double kPtPerMm = 72.0 / 25.4;
constexpr int kMinDpi = 30;
constexpr int kMaxDpi = 1200;
// Any fixed instant makes the PDF byte-reproducible; Cairo otherwise writes "now".
constexpr const char* kPdfDate = "2000-01-01T00:00:00Z";

struct SurfaceDeleter {
  void operator()(cairo_surface_t* s) const { cairo_surface_destroy(s); }
};
struct ContextDeleter {
  void operator()(cairo_t* c) const { cairo_destroy(c); }
};
using SurfacePtr = std::unique_ptr<cairo_surface_t, SurfaceDeleter>;
using ContextPtr = std::unique_ptr<cairo_t, ContextDeleter>;

[[noreturn]] void throw_cairo(const std::string& path, const char* what, cairo_status_t st) {
  throw FileError(fmt::format("{}: cannot write the chart {}: {}", path, what,
                              cairo_status_to_string(st)));
}

void check_surface(cairo_surface_t* s, const std::string& path, const char* what) {
  const cairo_status_t st = cairo_surface_status(s);
  if (st != CAIRO_STATUS_SUCCESS) throw_cairo(path, what, st);
}

void check_context(cairo_t* cr, const std::string& path, const char* what) {
  const cairo_status_t st = cairo_status(cr);
  if (st != CAIRO_STATUS_SUCCESS) throw_cairo(path, what, st);
}

void require_finite(double v, const char* field) {
  if (!std::isfinite(v)) {
    throw InputError(fmt::format("chart: {} is {}, expected a finite number", field, v));
  }
}

void require_non_negative(double v, const char* field) {
  require_finite(v, field);
  if (v < 0) {
    throw InputError(fmt::format("chart: {} is {}, expected a number >= 0", field, v));
  }
}

// The layout chosen once on a measuring context (unhinted metrics, 1 unit = 1 mm) serves every
// surface, so the PDF, SVG and PNG of page 1 are the same picture.
chart_detail::CardFit choose_fit(const ChartData& data, const ChartOptions& options) {
  SurfacePtr rec(cairo_recording_surface_create(CAIRO_CONTENT_COLOR_ALPHA, nullptr));
  ContextPtr cr(cairo_create(rec.get()));
  return chart_detail::fit_card(cr.get(), data, options);
}

void write_pdf(const ChartData& data, const ChartOptions& options,
               const chart_detail::CardFit& fit, const std::string& path) {
  const PageSize ps = page_size(options.paper);
  SurfacePtr s(cairo_pdf_surface_create(path.c_str(), ps.width_mm * kPtPerMm,
                                        ps.height_mm * kPtPerMm));
  check_surface(s.get(), path, "PDF");
  const std::string title = data.title.empty() ? "Setting chart" : data.title;
  const std::string creator =
      options.tool_version.empty() ? "trimwright" : "trimwright " + options.tool_version;
  cairo_pdf_surface_set_metadata(s.get(), CAIRO_PDF_METADATA_TITLE, title.c_str());
  cairo_pdf_surface_set_metadata(s.get(), CAIRO_PDF_METADATA_CREATOR, creator.c_str());
  cairo_pdf_surface_set_metadata(s.get(), CAIRO_PDF_METADATA_SUBJECT,
                                 "Balancing fixture setting card and 1:1 angle template");
  cairo_pdf_surface_set_metadata(s.get(), CAIRO_PDF_METADATA_CREATE_DATE, kPdfDate);
  cairo_pdf_surface_set_metadata(s.get(), CAIRO_PDF_METADATA_MOD_DATE, kPdfDate);
  {
    ContextPtr cr(cairo_create(s.get()));
    cairo_scale(cr.get(), kPtPerMm, kPtPerMm);  // 1 user unit = 1 mm
    chart_detail::draw_card(cr.get(), data, options, fit);
    cairo_show_page(cr.get());
    chart_detail::draw_template(cr.get(), data, options);
    cairo_show_page(cr.get());
    check_context(cr.get(), path, "PDF");
  }
  cairo_surface_finish(s.get());
  check_surface(s.get(), path, "PDF");
}

void write_svg(const ChartData& data, const ChartOptions& options,
               const chart_detail::CardFit& fit, const std::string& path) {
  const PageSize ps = page_size(options.paper);
  // Cairo 1.16 does not convert when the document unit is set: it only writes the suffix. So
  // the surface is created with its size in mm and drawn at 1 user unit = 1 mm, which gives
  // width="210mm" height="297mm" viewBox="0 0 210 297".
  SurfacePtr s(cairo_svg_surface_create(path.c_str(), ps.width_mm, ps.height_mm));
  check_surface(s.get(), path, "SVG");
  cairo_svg_surface_set_document_unit(s.get(), CAIRO_SVG_UNIT_MM);
  {
    ContextPtr cr(cairo_create(s.get()));
    chart_detail::draw_card(cr.get(), data, options, fit);
    cairo_show_page(cr.get());
    check_context(cr.get(), path, "SVG");
  }
  cairo_surface_finish(s.get());
  check_surface(s.get(), path, "SVG");
}

void write_png(const ChartData& data, const ChartOptions& options,
               const chart_detail::CardFit& fit, const std::string& path) {
  const PageSize ps = page_size(options.paper);
  const double px_per_mm = options.png_dpi / 25.4;
  const int w = static_cast<int>(std::lround(ps.width_mm * px_per_mm));
  const int h = static_cast<int>(std::lround(ps.height_mm * px_per_mm));
  SurfacePtr s(cairo_image_surface_create(CAIRO_FORMAT_RGB24, w, h));
  check_surface(s.get(), path, "PNG");
  {
    ContextPtr cr(cairo_create(s.get()));
    cairo_scale(cr.get(), px_per_mm, px_per_mm);
    chart_detail::draw_card(cr.get(), data, options, fit);
    check_context(cr.get(), path, "PNG");
  }
  cairo_surface_flush(s.get());
  const cairo_status_t st = cairo_surface_write_to_png(s.get(), path.c_str());
  if (st != CAIRO_STATUS_SUCCESS) throw_cairo(path, "PNG", st);
}

}  // namespace

PageSize page_size(Paper paper) {
  switch (paper) {
    case Paper::kLetter:
      return {215.9, 279.4};  // 8.5 × 11 in
    case Paper::kA4:
      break;
  }
  return {210.0, 297.0};
}

const char* paper_name(Paper paper) { return paper == Paper::kLetter ? "letter" : "a4"; }

Paper parse_paper(const std::string& text, const std::string& key) {
  std::string t = text;
  std::transform(t.begin(), t.end(), t.begin(),
                 [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  if (t == "a4") return Paper::kA4;
  if (t == "letter") return Paper::kLetter;
  throw InputError(fmt::format("{} = \"{}\": expected \"a4\" or \"letter\"", key, text));
}

bool angles_count_clockwise(Rotation rotation, AngleSense sense) {
  const bool rotation_cw = rotation == Rotation::kCw;
  return sense == AngleSense::kWithRotation ? rotation_cw : !rotation_cw;
}

double page_angle_deg(double angle_deg, Rotation rotation, AngleSense sense) {
  return wrap_deg_360(angles_count_clockwise(rotation, sense) ? angle_deg : -angle_deg);
}

double check_margin_percent(const ChartCheck& check) {
  if (!std::isfinite(check.value) || !std::isfinite(check.limit) || check.limit == 0) {
    return std::numeric_limits<double>::quiet_NaN();
  }
  const double safe_side =
      check.kind == LimitKind::kAtMost ? check.limit - check.value : check.value - check.limit;
  return 100.0 * safe_side / std::fabs(check.limit);
}

std::string check_verdict(const ChartCheck& check) {
  if (check.ok) return "ok";
  return check.accepted ? "FAIL, accepted" : "FAIL";
}

std::string format_significant(double value, int significant) {
  if (!std::isfinite(value)) return "\xE2\x80\x94";  // —
  if (value == 0) return "0";
  significant = std::clamp(significant, 1, 15);
  const double mag = std::floor(std::log10(std::fabs(value)));
  int decimals = std::max(0, significant - 1 - static_cast<int>(mag));
  decimals = std::min(decimals, 9);
  // 9.996 at 3 digits rounds up to 10.0, which needs one decimal fewer.
  const double p = std::pow(10.0, decimals);
  const double rounded = std::round(value * p) / p;
  if (decimals > 0 && std::fabs(rounded) >= std::pow(10.0, mag + 1)) --decimals;
  std::string s = fmt::format("{:.{}f}", value, decimals);
  if (s == "-0" || s.find_first_not_of("-0.") == std::string::npos) s = "0";
  return s;
}

std::string format_angle(double angle_deg) {
  if (!std::isfinite(angle_deg)) return "\xE2\x80\x94";
  double tenth = std::round(wrap_deg_360(angle_deg) * 10.0) / 10.0;
  if (tenth >= 360.0) tenth = 0;  // 359.97 reads as 0°
  const double whole = std::round(tenth);
  const std::string s =
      tenth == whole ? fmt::format("{:.0f}", whole) : fmt::format("{:.1f}", tenth);
  return s + "\xC2\xB0";  // °
}

void validate_chart(const ChartData& data, const ChartOptions& options) {
  if (options.png_dpi < kMinDpi || options.png_dpi > kMaxDpi) {
    throw InputError(fmt::format("chart: png dpi {} is outside {}..{}", options.png_dpi, kMinDpi,
                                 kMaxDpi));
  }
  if (!data.rotation) {
    throw InputError(
        "chart: machine.rotation is not set; expected \"cw\" or \"ccw\" seen from the fixture "
        "side, which the template needs to count angles");
  }
  require_non_negative(data.correction.unbalance_gmm, "correction.unbalance_gmm");
  require_finite(data.correction.angle_deg, "correction.angle_deg");
  require_finite(data.spindle_diameter_mm, "machine.spindle_diameter_mm");
  if (data.spindle_diameter_mm <= 0) {
    throw InputError(fmt::format("chart: machine.spindle_diameter_mm is {}, expected > 0",
                                 data.spindle_diameter_mm));
  }
  require_non_negative(data.flange_diameter_mm, "machine.flange_diameter_mm");
  require_non_negative(data.rotor_diameter_mm, "rotor.diameter_mm");
  if (data.flange_diameter_mm > 0 && data.flange_diameter_mm <= data.spindle_diameter_mm) {
    throw InputError(fmt::format(
        "chart: machine.flange_diameter_mm is {}, expected more than the spindle diameter {}",
        data.flange_diameter_mm, data.spindle_diameter_mm));
  }
  if (data.rotor_diameter_mm > 0 && data.rotor_diameter_mm <= data.spindle_diameter_mm) {
    throw InputError(fmt::format(
        "chart: rotor.diameter_mm is {}, expected more than the spindle diameter {}",
        data.rotor_diameter_mm, data.spindle_diameter_mm));
  }
  require_non_negative(data.reach.min_gmm, "fixture range min (g·mm)");
  require_non_negative(data.reach.max_gmm, "fixture range max (g·mm)");
  if (data.reach.max_gmm < data.reach.min_gmm) {
    throw InputError(fmt::format("chart: fixture range {}..{} g·mm has max below min",
                                 data.reach.min_gmm, data.reach.max_gmm));
  }
  for (const auto& p : data.reach.points) {
    require_non_negative(p.unbalance_gmm, "fixture reach point (g·mm)");
    require_finite(p.angle_deg, "fixture reach point angle (deg)");
  }
  for (const auto& m : data.marks) require_finite(m.angle_deg, "template mark angle (deg)");
  for (const auto& p : data.parts) require_non_negative(p.mass_g, "part mass (g)");
  if (data.cautions.empty()) {
    throw InternalError("chart: no cautions supplied; the card must always carry them");
  }
  for (std::size_t r = 0; r < data.table.rows.size(); ++r) {
    if (data.table.rows[r].size() != data.table.header.size()) {
      throw InternalError(fmt::format("chart: table row {} has {} cells, the header {}", r,
                                      data.table.rows[r].size(), data.table.header.size()));
    }
  }
  if (data.table.highlight_row && *data.table.highlight_row >= data.table.rows.size()) {
    throw InternalError(fmt::format("chart: highlighted table row {} of {} rows",
                                    *data.table.highlight_row, data.table.rows.size()));
  }
  // Throws when the spindle hole and a degree scale do not fit the paper.
  (void)template_geometry(data, options.paper);
}

void write_chart(const ChartData& data, const ChartOptions& options, const ChartTargets& targets) {
  validate_chart(data, options);
  if (targets.pdf_path.empty() && targets.svg_path.empty() && targets.png_path.empty()) return;
  const chart_detail::CardFit fit = choose_fit(data, options);
  if (!targets.pdf_path.empty()) write_pdf(data, options, fit, targets.pdf_path);
  if (!targets.svg_path.empty()) write_svg(data, options, fit, targets.svg_path);
  if (!targets.png_path.empty()) write_png(data, options, fit, targets.png_path);
}

}  // namespace trimwright::io
