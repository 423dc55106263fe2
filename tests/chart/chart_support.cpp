// SPDX-License-Identifier: GPL-3.0-or-later
#include "chart_support.hpp"

#include <fmt/core.h>

#include <array>
#include <cmath>
#include <cstdio>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <stdexcept>

namespace trimwright::chart_test {

namespace fs = std::filesystem;
using io::ChartCheck;
using io::ChartData;
using io::LimitKind;

namespace {

// The standing cautions of design.md §6, as the pipeline will supply them.
std::vector<std::string> standard_cautions() {
  return {
      "Never run a wheel above the maximum speed marked on it.",
      "Ring-test and inspect every wheel before mounting; discard a cracked wheel.",
      "Wear eye and face protection; keep the guard and tool rest in place.",
      "Stand aside at the first start and let the wheel run a full minute at speed.",
      "Inspect printed parts for cracks before every use; reprint at the first sign of one.",
      "Keep printed parts away from heat: PETG softens near 70 \xC2\xB0" "C.",
      "Follow the machine maker's manual, the abrasive-wheel safety standards and local codes.",
      "Use only the hardware listed on this card; never nest bushings or stack spacers.",
  };
}

ChartCheck check(const std::string& name, double value, double limit, const std::string& unit,
                 LimitKind kind, const std::string& note) {
  ChartCheck c;
  c.name = name;
  c.value = value;
  c.limit = limit;
  c.unit = unit;
  c.kind = kind;
  c.ok = kind == LimitKind::kAtMost ? value <= limit : value >= limit;
  c.note = note;
  return c;
}

}  // namespace

ChartData slide_disc_example() {
  ChartData d;
  d.title = "Left wheel, 36 grit";
  d.subtitle = "slide-disc \xC2\xB7 PETG \xC2\xB7 outboard \xC2\xB7 3450 rpm \xC2\xB7 "
               "150 mm grinding wheel, 0.72 kg";
  d.headline = "Heavy notch at 212\xC2\xB0, offset 3.40 mm";
  d.setting = {{"heavy notch at", "212", "\xC2\xB0"},
               {"offset", "3.40", "mm"},
               {"caliper: rim to spindle", "35.46", "mm"},
               {"spindle x", "-3.05", "mm"}};
  d.correction.unbalance_gmm = 75;
  d.correction.angle_deg = 212;
  d.correction.method = "given";
  d.correction.grade = "G6.3";
  // ISO 21940-11: U_per = 9549·G·M/n = 9549 × 6.3 × 0.72 / 3450 g·mm.
  d.correction.permissible_gmm = 9549.0 * 6.3 * 0.72 / 3450.0;
  const double disc_mass_g = 22.06;
  d.parts = {{"slide disc", disc_mass_g, io::MassSource::kPredicted,
              "PETG, 100 % infill, 2 \xC3\x97 ball-6 inserts"}};
  d.resolution_gmm = disc_mass_g * 0.1;
  d.resolution_note = "per 0.1 mm of offset";
  d.reach.min_gmm = 0;
  d.reach.max_gmm = 120;
  d.steps = {
      "Stop the machine and unplug it. Mark the wheel's reference mark at 0\xC2\xB0 if it has none.",
      "Cut out the angle template (page 2), lay it on the flange with 0\xC2\xB0 on the mark and "
      "mark the wheel at 212\xC2\xB0.",
      "Slide the disc along its slot until the caliper reads 35.46 mm from the rim to the "
      "spindle on the heavy side; that is an offset of 3.40 mm.",
      "Turn the disc until its heavy notch points at the 212\xC2\xB0 mark; tighten the nut to "
      "hand-tight plus a quarter turn.",
      "Check the caliper reading again after tightening: 35.46 mm \xC2\xB1 0.05 mm.",
      "Stand aside, run the wheel one minute, then take a reading; log it as a run with setting "
      "{ spindle_x_mm = -3.05, angle_deg = 212 } and run trimwright design again to trim.",
  };
  d.table.title = "Settings across the range";
  d.table.header = {"U (g\xC2\xB7mm)", "offset (mm)", "spindle x (mm)", "caliper (mm)"};
  for (int i = 1; i <= 25; ++i) {
    const double u = 5.0 * i;
    const double e = u / disc_mass_g;
    d.table.rows.push_back({fmt::format("{:.0f}", u), fmt::format("{:.2f}", e),
                            fmt::format("{:.2f}", 0.35 - e),
                            fmt::format("{:.2f}", 40.0 + e - 15.875 / 2)});
  }
  d.table.highlight_row = 14;  // 75 g·mm
  d.table.more_rows_note = "see chart.csv";
  d.checks = {
      check("hoop stress at 1.5\xC3\x97 speed", 0.42, 11.3, "MPa", LimitKind::kAtMost,
            "PETG disc at 5175 rpm, safety factor 4 on printed strength"),
      check("insert retention", 4.1, 60, "N", LimitKind::kAtMost,
            "centrifugal force on each 6 mm ball against the pocket wall"),
      check("clamp friction", 3.8, 1.5, "", LimitKind::kAtLeast,
            "friction from the nut's clamping force over the disc's centrifugal force"),
      check("thread engagement", 14.0, 9.5, "mm", LimitKind::kAtLeast,
            "free thread left for a fully engaged nut"),
      check("fixture diameter", 80, 100, "mm", LimitKind::kAtMost,
            "inside the guard and clear of the work"),
      check("wheel speed", 3450, 4140, "rpm", LimitKind::kAtMost,
            "running speed against the speed marked on the wheel"),
      check("material temperature", 40, 70, "\xC2\xB0""C", LimitKind::kAtMost,
            "expected flange temperature against PETG's softening point"),
      check("clamping load", 1, 0, "", LimitKind::kAtMost,
            "the printed disc carries the wheel's clamping load (mount = under-nut)"),
      check("wall thickness", 1.6, 1.2, "mm", LimitKind::kAtLeast,
            "thinnest wall against 3 perimeters of a 0.4 mm nozzle"),
      check("engraving depth", 0.6, 0.4, "mm", LimitKind::kAtLeast,
            "engraved scale against two layers of 0.2 mm"),
  };
  d.checks[7].accepted = true;  // the user chose the under-nut mount knowingly
  d.warnings = {
      "The disc is clamped under the wheel's nut (accepted in [checks] accept): retighten after "
      "the first minute and inspect it for creep every week.",
      "The wheel's bore clearance of 0.05 mm alone can cause 36 g\xC2\xB7mm of unbalance; a "
      "bore sleeve would remove it.",
  };
  d.cautions = standard_cautions();
  d.rotation = io::Rotation::kCcw;
  d.sense = io::AngleSense::kAgainstRotation;
  d.spindle_diameter_mm = 15.875;
  d.flange_diameter_mm = 63.5;
  d.rotor_diameter_mm = 150;
  d.correction_mark_label = "heavy notch";
  return d;
}

ChartData overloaded_example() {
  ChartData d = slide_disc_example();
  d.title = "An exceedingly long job title that goes on and on, naming the machine, the wheel, "
            "the grit, the shop, the date of dressing and the person who mounted it, and more";
  d.subtitle = std::string(300, 'x');
  d.headline = "Heavy notch of the upper disc at 212\xC2\xB0 and the lower disc at 97\xC2\xB0, "
               "offset 3.40 mm, then turn both together by 15\xC2\xB0 against rotation";
  for (int i = 0; i < 6; ++i) {
    d.steps.push_back("A further long step with many words that explains in great detail what "
                      "to do with the calipers, the nut, the template and the wheel guard, " +
                      std::to_string(i) + ".");
  }
  d.table.header.push_back("a rather long column heading");
  for (auto& r : d.table.rows) r.push_back("a long cell that does not fit in any column at all");
  for (int i = 0; i < 15; ++i) {
    auto r = d.table.rows.back();
    d.table.rows.push_back(r);
  }
  d.table.highlight_row = 38;
  for (int i = 0; i < 20; ++i) {
    ChartCheck c = d.checks[static_cast<std::size_t>(i % 10)];
    c.name = "an unusually long check name number " + std::to_string(i);
    c.note = "a long note that explains the check, its limit, its safety factor, where the "
             "numbers come from and what to do when it fails, in far more words than fit";
    c.value = 123456.789;
    d.checks.push_back(c);
  }
  ChartCheck failing = d.checks[0];
  failing.name = "a failing check at the very end";
  failing.value = 20;
  failing.ok = false;
  d.checks.push_back(failing);  // kept on the card although later checks are trimmed
  for (int i = 0; i < 15; ++i) {
    d.warnings.push_back("Warning " + std::to_string(i) +
                         ": something that needs attention before the first start, explained "
                         "at some length so that it wraps onto a second line of the card.");
  }
  for (int i = 0; i < 12; ++i) {
    d.cautions.push_back("Further caution " + std::to_string(i) +
                         " with enough words to wrap over two lines in a half-width column.");
  }
  d.setting.push_back({"a very long label for a setting value", std::string(80, '9'), "mm"});
  d.marks = {{172, "disc A"}, {252, "disc B"}};
  return d;
}

std::string out_dir(const std::string& name) {
  const fs::path dir = fs::path(TRIMWRIGHT_BINARY_DIR) / "tests" / "chart" / "out" / name;
  fs::remove_all(dir);
  fs::create_directories(dir);
  return dir.string() + "/";
}

int run(const std::string& command, std::string* output) {
  FILE* p = popen(command.c_str(), "r");
  if (!p) throw std::runtime_error("cannot run: " + command);
  std::string out;
  std::array<char, 4096> buf{};
  std::size_t n;
  while ((n = std::fread(buf.data(), 1, buf.size(), p)) > 0) out.append(buf.data(), n);
  const int status = pclose(p);
  if (output) *output = out;
  return status;
}

std::string read_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  std::ostringstream ss;
  ss << in.rdbuf();
  return ss.str();
}

int Gray::px_x(double mm) const { return static_cast<int>(std::floor(mm * dpi / 25.4)) - x0_px; }

int Gray::px_y(double mm) const { return static_cast<int>(std::floor(mm * dpi / 25.4)) - y0_px; }

Gray render_page(const std::string& pdf, int page, int dpi, const std::string& out_prefix,
                 const Crop* crop) {
  std::string region;
  int x0 = 0, y0 = 0;
  if (crop) {
    const auto px = [dpi](double mm) { return static_cast<int>(std::floor(mm * dpi / 25.4)); };
    x0 = px(crop->x_mm);
    y0 = px(crop->y_mm);
    region = fmt::format(" -x {} -y {} -W {} -H {}", x0, y0, px(crop->w_mm) + 1,
                         px(crop->h_mm) + 1);
  }
  const std::string cmd =
      fmt::format("pdftoppm -gray -r {} -f {} -l {}{} -singlefile '{}' '{}'", dpi, page, page,
                  region, pdf, out_prefix);
  if (run(cmd) != 0) throw std::runtime_error("pdftoppm failed: " + cmd);
  const std::string bytes = read_file(out_prefix + ".pgm");
  // Binary PGM: "P5" <w> <h> <maxval> then one byte per pixel.
  std::istringstream hdr(bytes);
  std::string magic;
  int w = 0, h = 0, maxval = 0;
  hdr >> magic >> w >> h >> maxval;
  if (magic != "P5" || w <= 0 || h <= 0 || maxval != 255) {
    throw std::runtime_error("not an 8-bit binary PGM: " + out_prefix + ".pgm");
  }
  const std::size_t offset = static_cast<std::size_t>(hdr.tellg()) + 1;  // one whitespace
  Gray g;
  g.width = w;
  g.height = h;
  g.dpi = dpi;
  g.x0_px = x0;
  g.y0_px = y0;
  const std::size_t n = static_cast<std::size_t>(w) * static_cast<std::size_t>(h);
  if (bytes.size() < offset + n) throw std::runtime_error("short PGM: " + out_prefix);
  g.px.assign(bytes.begin() + static_cast<std::ptrdiff_t>(offset),
              bytes.begin() + static_cast<std::ptrdiff_t>(offset + n));
  return g;
}

std::vector<Run> row_runs(const Gray& g, int y) {
  std::vector<Run> runs;
  for (int x = 0; x < g.width; ++x) {
    if (!g.dark(x, y)) continue;
    Run r{x, x};
    while (r.last + 1 < g.width && g.dark(r.last + 1, y)) ++r.last;
    runs.push_back(r);
    x = r.last;
  }
  return runs;
}

std::vector<Run> column_runs(const Gray& g, int x) {
  std::vector<Run> runs;
  for (int y = 0; y < g.height; ++y) {
    if (!g.dark(x, y)) continue;
    Run r{y, y};
    while (r.last + 1 < g.height && g.dark(x, r.last + 1)) ++r.last;
    runs.push_back(r);
    y = r.last;
  }
  return runs;
}

}  // namespace trimwright::chart_test
