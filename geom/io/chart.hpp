// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// The paper setting chart: page 1 is the setting card (the setting in large type, the
/// correction, parts, steps, the settings table, a polar diagram, checks, warnings, cautions);
/// page 2 is the angle template at true scale (1 user unit = 1 mm) with a 100 mm scale bar.
/// Written as PDF (both pages), SVG and PNG (page 1) with Cairo. The input is plain data, filled
/// by the pipeline; this module knows nothing of fixtures or the kernel. See docs/chart.md.

#include <cstddef>
#include <limits>
#include <optional>
#include <string>
#include <vector>

namespace trimwright::io {

/// Paper size of the chart (job key `output.paper`).
enum class Paper { kA4, kLetter };

/// Page size in millimetres, portrait.
struct PageSize {
  double width_mm = 0;   ///< page width, mm
  double height_mm = 0;  ///< page height, mm
};

/// Page size of `paper`: A4 210 × 297 mm, US letter 215.9 × 279.4 mm (8.5 × 11 in).
PageSize page_size(Paper paper);
/// "a4" or "letter".
const char* paper_name(Paper paper);
/// Parses "a4" or "letter" (case-insensitive); throws InputError naming `key` otherwise.
Paper parse_paper(const std::string& text, const std::string& key = "output.paper");

/// Sense of rotation seen looking at the fixture side (job key `machine.rotation`).
enum class Rotation { kCw, kCcw };
/// Which way rotor angles count from the reference mark (job key `angles`).
enum class AngleSense { kAgainstRotation, kWithRotation };

/// True when rotor angles increase clockwise on the paper, which is seen like the fixture side.
bool angles_count_clockwise(Rotation rotation, AngleSense sense);
/// Where rotor angle `angle_deg` lies on the paper: degrees clockwise from the top of the page
/// (0° at the reference mark, which is drawn at the top), in [0, 360).
double page_angle_deg(double angle_deg, Rotation rotation, AngleSense sense);

/// One labelled value of the setting, preformatted by the pipeline: {"offset", "3.40", "mm"}.
struct ChartValue {
  std::string label;  ///< what it is, e.g. "offset"
  std::string value;  ///< the number as it should be set, e.g. "3.40"
  std::string unit;   ///< unit text, e.g. "mm", "°"; may be empty
};

/// The correction this chart sets.
struct ChartCorrection {
  double unbalance_gmm = std::numeric_limits<double>::quiet_NaN();  ///< |U|, g·mm, ≥ 0
  double angle_deg = std::numeric_limits<double>::quiet_NaN();      ///< rotor angle, job's sense
  std::string method;  ///< how it was found: "given", "trial", "four-run", …
  std::string grade;   ///< balance grade, e.g. "G6.3"; empty when no target is set
  /// Permissible residual unbalance for `grade`, g·mm; NaN when no target is set.
  double permissible_gmm = std::numeric_limits<double>::quiet_NaN();
};

/// Where a part's mass comes from.
enum class MassSource { kPredicted, kWeighed };

/// One printed part (with its inserts).
struct ChartPart {
  std::string name;                                           ///< part name as in the report
  double mass_g = std::numeric_limits<double>::quiet_NaN();  ///< mass with inserts, g, ≥ 0
  MassSource source = MassSource::kPredicted;                 ///< computed or from the scale
  std::string detail;  ///< optional one-liner: material, infill, inserts
};

/// A fixed position the fixture can reach (fixed-position weights).
struct ChartReachPoint {
  double unbalance_gmm = 0;  ///< g·mm, ≥ 0
  double angle_deg = 0;      ///< rotor angle, job's sense
  std::string label;         ///< optional short label
};

/// The fixture's reachable set: an annulus min..max g·mm at any angle, or discrete points
/// (when `points` is not empty the annulus is not drawn).
struct ChartReach {
  double min_gmm = 0;                   ///< inner radius of the annulus, g·mm, ≥ 0
  double max_gmm = 0;                   ///< outer radius of the annulus, g·mm, ≥ min_gmm
  std::vector<ChartReachPoint> points;  ///< discrete reachable corrections
};

/// The table of settings across the fixture's range (strings, formatted by the pipeline).
struct ChartTable {
  std::string title;                             ///< heading above the table
  std::vector<std::string> header;               ///< column titles
  std::vector<std::vector<std::string>> rows;    ///< cells, each row as long as the header
  std::optional<std::size_t> highlight_row;      ///< row index of this job's setting, if any
  std::string more_rows_note;  ///< where the rows are when not all fit, e.g. "see chart.csv"
};

/// Which side of the limit is safe.
enum class LimitKind {
  kAtMost,   ///< value must be ≤ limit (stress, diameter, speed)
  kAtLeast,  ///< value must be ≥ limit (thread left, friction margin)
};

/// One safety or printability check.
struct ChartCheck {
  std::string name;                                          ///< check name as in the report
  double value = std::numeric_limits<double>::quiet_NaN();  ///< computed value (NaN: none)
  double limit = std::numeric_limits<double>::quiet_NaN();  ///< its limit (NaN: none)
  std::string unit;                                          ///< unit of value and limit
  LimitKind kind = LimitKind::kAtMost;                       ///< which side is safe
  bool ok = true;         ///< the check passed
  bool accepted = false;  ///< failed, and the user accepted it in `checks.accept`
  std::string note;       ///< one line
  std::string subject;    ///< the part or insert it concerns; empty: the whole fixture
};

/// An extra angle marked on the template and the polar diagram (e.g. each disc of a disc pair).
struct ChartMark {
  double angle_deg = 0;  ///< rotor angle, job's sense
  std::string label;     ///< e.g. "disc A"
};

/// Everything the chart shows. Strings are UTF-8 and set in DejaVu Sans.
struct ChartData {
  std::string title;     ///< job title; empty gives "Setting chart"
  std::string subtitle;  ///< one line under the title: fixture, material, machine
  std::string headline;  ///< the setting in words, e.g. "heavy notch at 212°, offset 3.40 mm"
  std::vector<ChartValue> setting;  ///< the setting's values with labels and units
  ChartCorrection correction;       ///< the correction being set
  std::vector<ChartPart> parts;     ///< each printed part
  double resolution_gmm = std::numeric_limits<double>::quiet_NaN();  ///< setting step, g·mm
  std::string resolution_note;      ///< what one step is, e.g. "per 0.1 mm of offset"
  ChartReach reach;                 ///< what the fixture can reach
  std::vector<std::string> steps;   ///< numbered steps, mounting to verification
  ChartTable table;                 ///< settings across the range
  std::vector<ChartCheck> checks;   ///< checks with values and verdicts
  std::vector<std::string> warnings;  ///< job-specific warnings (may be empty)
  std::vector<std::string> cautions;  ///< standing cautions, always shown
  std::optional<Rotation> rotation;   ///< sense of rotation seen from the fixture side; required
  AngleSense sense = AngleSense::kAgainstRotation;  ///< how rotor angles count
  /// Spindle diameter, mm, > 0: the template's centre hole. Required.
  double spindle_diameter_mm = std::numeric_limits<double>::quiet_NaN();
  double flange_diameter_mm = 0;  ///< outer flange, mm; 0 = not drawn
  double rotor_diameter_mm = 0;   ///< rotor (wheel), mm; 0 = not drawn
  std::string correction_mark_label = "heavy mark";  ///< label of the correction on the template
  std::vector<ChartMark> marks;   ///< further angles to mark (disc angles), may be empty
};

/// How to write the chart.
struct ChartOptions {
  Paper paper = Paper::kA4;   ///< paper size of every page
  int png_dpi = 150;          ///< resolution of chart.png, dots per inch, 30..1200
  std::string tool_version;   ///< e.g. "0.1.0", printed in the footer and the PDF metadata
};

/// Output paths; an empty path is not written. The caller chooses names (temporary or final).
struct ChartTargets {
  std::string pdf_path;  ///< both pages, vector, fonts embedded, byte-reproducible
  std::string svg_path;  ///< page 1, sized in mm (1 user unit = 1 mm)
  std::string png_path;  ///< page 1 at ChartOptions::png_dpi
};

/// Renders the chart to every non-empty target. Throws InputError for data it cannot draw
/// truthfully (missing rotation, non-finite numbers, a spindle too large for the paper) and
/// FileError naming the path and Cairo's status when a file cannot be written.
void write_chart(const ChartData& data, const ChartOptions& options, const ChartTargets& targets);

/// Checks `data` and `options` without drawing; throws InputError on the first problem.
void validate_chart(const ChartData& data, const ChartOptions& options);

/// Margin of a check in percent of its limit, positive on the safe side:
/// kAtMost (limit − value)/|limit|·100, kAtLeast (value − limit)/|limit|·100; NaN when value or
/// limit is not finite or the limit is 0.
double check_margin_percent(const ChartCheck& check);

/// Verdict text of a check: "ok", "FAIL" or "FAIL, accepted".
std::string check_verdict(const ChartCheck& check);

/// `value` with `significant` significant digits in fixed notation ("1.87", "12.3", "4140",
/// "0.0123"); "—" when not finite.
std::string format_significant(double value, int significant = 3);

/// A rotor angle for display: wrapped to [0, 360), whole degrees unless a tenth matters: "212°".
std::string format_angle(double angle_deg);

/// Where the template is drawn on page 2 (page coordinates in mm, origin top-left, y down).
struct TemplateGeometry {
  double centre_x_mm = 0;        ///< ring centre
  double centre_y_mm = 0;        ///< ring centre
  double hole_radius_mm = 0;     ///< spindle hole (cut out), = spindle diameter / 2
  double flange_radius_mm = 0;   ///< flange outline; 0 when not drawn
  double rotor_radius_mm = 0;    ///< rotor outline; 0 when not drawn
  bool rotor_partial = false;    ///< rotor larger than the page: only arcs are drawn
  bool flange_partial = false;   ///< flange larger than the page: only arcs are drawn
  double outer_radius_mm = 0;    ///< outer cut line; degree ticks run inward from it
  double fit_radius_mm = 0;      ///< largest ring that fits the page's template area
  double tick_step_deg = 1;      ///< finest tick: 1 or 5 degrees
  double number_step_deg = 10;   ///< numbers every 10 or 30 degrees
  double ref_mark_inner_mm = 0;  ///< the bold 0° mark runs from this radius…
  double ref_mark_width_mm = 0;  ///< …to the outer edge, this wide
  double bar_x_mm = 0;           ///< scale bar: left end, page x
  double bar_y_mm = 0;           ///< scale bar: top of its 100 × bar_height_mm filled rectangle
  double bar_height_mm = 0;      ///< scale bar thickness
};

/// The template's layout for `data` on `paper`. Throws InputError when the spindle hole cannot
/// be drawn at true scale on the page.
TemplateGeometry template_geometry(const ChartData& data, Paper paper);

/// Page margin on every side of both pages, mm: nothing is drawn closer to the paper's edge.
inline constexpr double kChartMarginMm = 12.0;

/// Length of the scale bar on the template, mm.
inline constexpr double kScaleBarMm = 100.0;

}  // namespace trimwright::io
