// SPDX-License-Identifier: GPL-3.0-or-later
// Chart formulas and conventions: angle mapping onto the paper, check margins, number formats,
// paper sizes, the template's layout rules, and input validation.
#include <catch2/catch.hpp>

#include <cmath>
#include <limits>

#include "chart_support.hpp"
#include "geom/base/error.hpp"
#include "geom/io/chart.hpp"

using namespace trimwright;
using namespace trimwright::io;

TEST_CASE("chart: angles count against rotation on paper seen from the fixture side",
          "[chart]") {
  // design.md §3: rotation is seen facing the fixture side, and the paper is laid face up on
  // that side. A point on a rotor turning counter-clockwise moves counter-clockwise; angles
  // counted against rotation therefore increase clockwise on the paper, and vice versa.
  CHECK(angles_count_clockwise(Rotation::kCcw, AngleSense::kAgainstRotation));
  CHECK_FALSE(angles_count_clockwise(Rotation::kCw, AngleSense::kAgainstRotation));
  CHECK_FALSE(angles_count_clockwise(Rotation::kCcw, AngleSense::kWithRotation));
  CHECK(angles_count_clockwise(Rotation::kCw, AngleSense::kWithRotation));

  CHECK(page_angle_deg(90, Rotation::kCcw, AngleSense::kAgainstRotation) == Approx(90));
  CHECK(page_angle_deg(90, Rotation::kCw, AngleSense::kAgainstRotation) == Approx(270));
  CHECK(page_angle_deg(90, Rotation::kCcw, AngleSense::kWithRotation) == Approx(270));
  CHECK(page_angle_deg(90, Rotation::kCw, AngleSense::kWithRotation) == Approx(90));
  CHECK(page_angle_deg(212, Rotation::kCw, AngleSense::kAgainstRotation) == Approx(148));
  CHECK(page_angle_deg(-30, Rotation::kCcw, AngleSense::kAgainstRotation) == Approx(330));
  CHECK(page_angle_deg(0, Rotation::kCw, AngleSense::kAgainstRotation) == Approx(0).margin(1e-12));
}

TEST_CASE("chart: check margin is the distance to the limit in percent, safe side positive",
          "[chart]") {
  ChartCheck c;
  c.value = 1.87;
  c.limit = 10.0;
  c.kind = LimitKind::kAtMost;
  CHECK(check_margin_percent(c) == Approx(81.3));  // (10 − 1.87)/10
  c.value = 12.5;
  CHECK(check_margin_percent(c) == Approx(-25.0));  // over the limit: negative
  c.kind = LimitKind::kAtLeast;
  c.value = 14.0;
  c.limit = 9.5;
  CHECK(check_margin_percent(c) == Approx(100.0 * 4.5 / 9.5));
  c.limit = -2.0;  // a negative limit divides by its magnitude
  c.value = -1.0;
  CHECK(check_margin_percent(c) == Approx(50.0));
  c.limit = 0;
  CHECK(std::isnan(check_margin_percent(c)));
  c.limit = 5;
  c.value = std::numeric_limits<double>::quiet_NaN();
  CHECK(std::isnan(check_margin_percent(c)));
}

TEST_CASE("chart: check verdicts mark accepted failures", "[chart]") {
  ChartCheck c;
  CHECK(check_verdict(c) == "ok");
  c.ok = false;
  CHECK(check_verdict(c) == "FAIL");
  c.accepted = true;
  CHECK(check_verdict(c) == "FAIL, accepted");
}

TEST_CASE("chart: numbers are printed with three significant digits", "[chart]") {
  CHECK(format_significant(1.8723) == "1.87");
  CHECK(format_significant(12.345) == "12.3");
  CHECK(format_significant(75) == "75.0");
  CHECK(format_significant(4140) == "4140");
  CHECK(format_significant(123456.789) == "123457");
  CHECK(format_significant(0.012345) == "0.0123");
  CHECK(format_significant(9.996) == "10.0");  // rounding up gains a digit before the point
  CHECK(format_significant(99.96) == "100");
  CHECK(format_significant(-3.4) == "-3.40");
  CHECK(format_significant(0) == "0");
  CHECK(format_significant(1e-15) == "0");
  CHECK(format_significant(15.875, 5) == "15.875");
  CHECK(format_significant(std::numeric_limits<double>::quiet_NaN()) == "\xE2\x80\x94");
  CHECK(format_significant(std::numeric_limits<double>::infinity()) == "\xE2\x80\x94");
}

TEST_CASE("chart: angles are shown wrapped to 0..360 in whole degrees unless a tenth matters",
          "[chart]") {
  CHECK(format_angle(212) == "212\xC2\xB0");
  CHECK(format_angle(211.96) == "212\xC2\xB0");
  CHECK(format_angle(212.25) == "212.3\xC2\xB0");
  CHECK(format_angle(-148) == "212\xC2\xB0");
  CHECK(format_angle(359.97) == "0\xC2\xB0");
  CHECK(format_angle(360) == "0\xC2\xB0");
  CHECK(format_angle(720.5) == "0.5\xC2\xB0");
}

TEST_CASE("chart: paper sizes and names", "[chart]") {
  // ISO 216: A4 is 210 × 297 mm (from memory). US letter is 8.5 × 11 in (ANSI/ASME Y14.1,
  // from memory), with 1 in = 25.4 mm exactly (international yard and pound, 1959).
  CHECK(page_size(Paper::kA4).width_mm == 210.0);
  CHECK(page_size(Paper::kA4).height_mm == 297.0);
  CHECK(page_size(Paper::kLetter).width_mm == Approx(215.9));
  CHECK(page_size(Paper::kLetter).height_mm == Approx(279.4));
  CHECK(parse_paper("a4") == Paper::kA4);
  CHECK(parse_paper("A4") == Paper::kA4);
  CHECK(parse_paper("Letter") == Paper::kLetter);
  CHECK(std::string(paper_name(Paper::kLetter)) == "letter");
  CHECK_THROWS_AS(parse_paper("legal"), InputError);
  CHECK_THROWS_WITH(parse_paper("legal"), Catch::Contains("output.paper") &&
                                              Catch::Contains("legal") &&
                                              Catch::Contains("letter"));
}

TEST_CASE("chart: the template ring follows the rotor when it fits the page", "[chart]") {
  ChartData d = chart_test::slide_disc_example();
  for (Paper paper : {Paper::kA4, Paper::kLetter}) {
    const TemplateGeometry g = template_geometry(d, paper);
    const PageSize ps = page_size(paper);
    CHECK(g.hole_radius_mm == Approx(15.875 / 2));
    CHECK(g.flange_radius_mm == Approx(63.5 / 2));
    CHECK(g.outer_radius_mm == Approx(75.0));  // the cut line is the 150 mm wheel's rim
    CHECK_FALSE(g.rotor_partial);
    CHECK(g.tick_step_deg == 1);
    CHECK(g.number_step_deg == 10);
    // The whole ring lies inside the margins, above the scale bar.
    CHECK(g.centre_x_mm - g.outer_radius_mm >= kChartMarginMm);
    CHECK(g.centre_x_mm + g.outer_radius_mm <= ps.width_mm - kChartMarginMm);
    CHECK(g.centre_y_mm - g.outer_radius_mm >= kChartMarginMm);
    CHECK(g.centre_y_mm + g.outer_radius_mm < g.bar_y_mm);
    CHECK(g.bar_x_mm >= kChartMarginMm);
    CHECK(g.bar_x_mm + kScaleBarMm <= ps.width_mm - kChartMarginMm);
  }
}

TEST_CASE("chart: a rotor larger than the page is drawn in part", "[chart]") {
  ChartData d = chart_test::slide_disc_example();
  d.rotor_diameter_mm = 300;
  const TemplateGeometry g = template_geometry(d, Paper::kA4);
  CHECK(g.rotor_partial);
  CHECK(g.outer_radius_mm == Approx(g.fit_radius_mm));
  CHECK(g.rotor_radius_mm == Approx(150));
}

TEST_CASE("chart: a small template numbers every 30 degrees", "[chart]") {
  ChartData d = chart_test::slide_disc_example();
  d.rotor_diameter_mm = 0;
  d.flange_diameter_mm = 0;
  d.spindle_diameter_mm = 8;
  const TemplateGeometry g = template_geometry(d, Paper::kA4);
  CHECK(g.outer_radius_mm == Approx(45.0));  // the smallest useful ring
  // Numbers 10° apart would sit 6.6 mm apart on their circle (under 7 mm): every 30° instead.
  CHECK(g.number_step_deg == 30);
  CHECK(g.tick_step_deg == 1);
}

TEST_CASE("chart: a spindle too large for a true-scale ring is refused", "[chart]") {
  ChartData d = chart_test::slide_disc_example();
  d.spindle_diameter_mm = 170;
  d.flange_diameter_mm = 0;
  d.rotor_diameter_mm = 0;
  CHECK_THROWS_AS(template_geometry(d, Paper::kA4), InputError);
  CHECK_THROWS_WITH(template_geometry(d, Paper::kA4),
                    Catch::Contains("machine.spindle_diameter_mm") && Catch::Contains("a4"));
}

TEST_CASE("chart: invalid data is refused with the field named", "[chart]") {
  const ChartOptions opt;
  ChartData d = chart_test::slide_disc_example();
  CHECK_NOTHROW(validate_chart(d, opt));

  ChartData no_rotation = d;
  no_rotation.rotation.reset();
  CHECK_THROWS_WITH(validate_chart(no_rotation, opt), Catch::Contains("machine.rotation"));

  ChartData bad = d;
  bad.spindle_diameter_mm = std::numeric_limits<double>::quiet_NaN();
  CHECK_THROWS_AS(validate_chart(bad, opt), InputError);
  bad = d;
  bad.spindle_diameter_mm = -1;
  CHECK_THROWS_WITH(validate_chart(bad, opt), Catch::Contains("spindle_diameter_mm"));
  bad = d;
  bad.flange_diameter_mm = 10;  // smaller than the spindle
  CHECK_THROWS_WITH(validate_chart(bad, opt), Catch::Contains("flange_diameter_mm"));
  bad = d;
  bad.correction.unbalance_gmm = -5;
  CHECK_THROWS_WITH(validate_chart(bad, opt), Catch::Contains("unbalance_gmm"));
  bad = d;
  bad.correction.angle_deg = std::numeric_limits<double>::infinity();
  CHECK_THROWS_WITH(validate_chart(bad, opt), Catch::Contains("angle_deg"));
  bad = d;
  bad.reach.max_gmm = -1;
  CHECK_THROWS_AS(validate_chart(bad, opt), InputError);
  bad = d;
  bad.cautions.clear();  // the card always carries cautions
  CHECK_THROWS_AS(validate_chart(bad, opt), InternalError);
  bad = d;
  bad.table.rows[3].pop_back();
  CHECK_THROWS_AS(validate_chart(bad, opt), InternalError);
  bad = d;
  bad.table.highlight_row = 25;
  CHECK_THROWS_AS(validate_chart(bad, opt), InternalError);

  ChartOptions low = opt;
  low.png_dpi = 10;
  CHECK_THROWS_WITH(validate_chart(d, low), Catch::Contains("dpi"));
}
