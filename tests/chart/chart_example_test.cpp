// SPDX-License-Identifier: GPL-3.0-or-later
// Realistic charts written into the build tree for people to look at:
//   <build>/chart-example/slide-disc/  chart.pdf, chart.svg, chart.png (page 1 at 150 dpi),
//                                      page-2.png (the template, rendered by pdftoppm)
//   <build>/chart-example/disc-pair-letter/  the same for a disc pair on US letter, cw rotation
//   <build>/chart-example/clamp-weights/     fixed positions (dots on the diagram), angles
//                                            counted with rotation
#include <catch2/catch.hpp>
#include <fmt/core.h>

#include <filesystem>

#include "chart_support.hpp"
#include "geom/io/chart.hpp"

using namespace trimwright;
using namespace trimwright::io;
using namespace trimwright::chart_test;

namespace {

std::string example_dir(const std::string& name) {
  const auto dir = std::filesystem::path(TRIMWRIGHT_BINARY_DIR) / "chart-example" / name;
  std::filesystem::create_directories(dir);
  return dir.string() + "/";
}

void write_example(const ChartData& d, Paper paper, const std::string& dir) {
  ChartOptions o;
  o.paper = paper;
  o.tool_version = "0.1.0";
  write_chart(d, o, ChartTargets{dir + "chart.pdf", dir + "chart.svg", dir + "chart.png"});
  CHECK(run(fmt::format("pdftoppm -png -r 150 -f 2 -l 2 -singlefile '{0}chart.pdf' "
                        "'{0}page-2'",
                        dir)) == 0);
  CHECK(std::filesystem::file_size(dir + "chart.png") > 10000);
  CHECK(std::filesystem::file_size(dir + "page-2.png") > 10000);
}

}  // namespace

TEST_CASE("chart: the slide-disc example is written for inspection", "[chart]") {
  write_example(slide_disc_example(), Paper::kA4, example_dir("slide-disc"));
}

TEST_CASE("chart: a disc-pair example on letter paper is written for inspection", "[chart]") {
  ChartData d = slide_disc_example();
  d.title = "Buffing wheel, right side";
  d.subtitle = "disc-pair \xC2\xB7 PLA \xC2\xB7 outboard \xC2\xB7 1725 rpm \xC2\xB7 200 mm "
               "buffing wheel";
  d.headline = "Disc A heavy mark at 172\xC2\xB0, disc B at 252\xC2\xB0";
  d.setting = {{"disc A", "172", "\xC2\xB0"}, {"disc B", "252", "\xC2\xB0"}};
  d.correction.method = "trial";
  d.rotation = Rotation::kCw;
  d.rotor_diameter_mm = 200;  // larger than the page: drawn in part
  d.marks = {{172, "disc A"}, {252, "disc B"}};
  d.correction_mark_label = "resultant";
  d.reach = {};
  d.reach.max_gmm = 2 * 48.9;
  d.table.highlight_row.reset();
  d.warnings.clear();
  write_example(d, Paper::kLetter, example_dir("disc-pair-letter"));
}

TEST_CASE("chart: a clamp-weights example with fixed positions is written for inspection",
          "[chart]") {
  ChartData d = slide_disc_example();
  d.title = "Pulley, 4-groove";
  d.subtitle = "clamp-weights \xC2\xB7 PETG \xC2\xB7 on the 100 mm rim \xC2\xB7 1725 rpm";
  d.headline = "Weights at 190\xC2\xB0 and 235\xC2\xB0 on the rim";
  d.setting = {{"weight 1", "190", "\xC2\xB0"}, {"weight 2", "235", "\xC2\xB0"}};
  d.sense = AngleSense::kWithRotation;
  d.correction.unbalance_gmm = 75;
  d.correction.angle_deg = 212;
  d.reach = {};
  for (int a = 0; a < 360; a += 45) {
    d.reach.points.push_back({40.0, static_cast<double>(a), ""});
    d.reach.points.push_back({80.0, static_cast<double>(a) + 22.5, ""});
  }
  d.rotor_diameter_mm = 100;
  d.flange_diameter_mm = 0;
  d.spindle_diameter_mm = 19.05;
  d.marks = {{190, "weight 1"}, {235, "weight 2"}};
  d.correction_mark_label = "resultant";
  d.checks[1].subject = "weight 1";
  write_example(d, Paper::kA4, example_dir("clamp-weights"));
}
