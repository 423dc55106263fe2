// SPDX-License-Identifier: GPL-3.0-or-later
// The chart as written: page sizes, true scale, the template's hole and reference mark, the
// PNG and SVG, reproducibility, and that long content stays inside the margins. Measurements
// are taken from the files by poppler-utils (pdfinfo, pdffonts, pdftoppm, pdftotext), a PDF
// reader independent of Cairo, and the SVG is parsed by Python's xml.etree (expat).
#include <cairo.h>
#include <catch2/catch.hpp>
#include <fmt/core.h>

#include <cmath>
#include <cstdio>
#include <sstream>

#include "chart_support.hpp"
#include "geom/base/error.hpp"
#include "geom/io/chart.hpp"

using namespace trimwright;
using namespace trimwright::io;
using namespace trimwright::chart_test;

namespace {

struct Written {
  std::string pdf, svg, png;
};

Written write(const ChartData& d, const ChartOptions& o, const std::string& dir,
              const std::string& stem = "chart") {
  Written w{dir + stem + ".pdf", dir + stem + ".svg", dir + stem + ".png"};
  write_chart(d, o, ChartTargets{w.pdf, w.svg, w.png});
  return w;
}

ChartOptions options(Paper paper, int dpi = 150) {
  ChartOptions o;
  o.paper = paper;
  o.png_dpi = dpi;
  o.tool_version = "0.1.0-test";
  return o;
}

// Page sizes as pdfinfo reports them: "Page    1 size: 595.276 x 841.89 pts (A4)".
std::vector<std::pair<double, double>> pdfinfo_page_sizes(const std::string& pdf, int* pages) {
  std::string out;
  REQUIRE(run("pdfinfo -f 1 -l 9 '" + pdf + "'", &out) == 0);
  std::vector<std::pair<double, double>> sizes;
  std::istringstream in(out);
  std::string line;
  *pages = -1;
  while (std::getline(in, line)) {
    int page = 0;
    double w = 0, h = 0;
    if (std::sscanf(line.c_str(), "Page %d size: %lf x %lf", &page, &w, &h) == 3) {
      sizes.emplace_back(w, h);
    }
    std::sscanf(line.c_str(), "Pages: %d", pages);
  }
  return sizes;
}

// Every pixel whose centre lies less than `band_mm` from the page edge is white (> 250).
int dark_pixels_near_edge(const Gray& g, double band_mm) {
  int dark = 0;
  for (int y = 0; y < g.height; ++y) {
    for (int x = 0; x < g.width; ++x) {
      const double mx = g.mm_x(x), my = g.mm_y(y);
      const double wmm = g.width * 25.4 / g.dpi, hmm = g.height * 25.4 / g.dpi;
      const bool edge = mx < band_mm || my < band_mm || mx > wmm - band_mm || my > hmm - band_mm;
      if (edge && g.at(x, y) < 250) ++dark;
    }
  }
  return dark;
}

// The same test on the PNG, read back with Cairo's PNG reader.
int dark_png_pixels_near_edge(const std::string& png, double band_mm, int dpi) {
  cairo_surface_t* s = cairo_image_surface_create_from_png(png.c_str());
  REQUIRE(cairo_surface_status(s) == CAIRO_STATUS_SUCCESS);
  const int w = cairo_image_surface_get_width(s), h = cairo_image_surface_get_height(s);
  const int stride = cairo_image_surface_get_stride(s);
  const unsigned char* data = cairo_image_surface_get_data(s);
  const int band = static_cast<int>(std::floor(band_mm * dpi / 25.4));
  int dark = 0;
  for (int y = 0; y < h; ++y) {
    for (int x = 0; x < w; ++x) {
      if (x >= band && y >= band && x < w - band && y < h - band) continue;
      const unsigned char* p = data + y * stride + 4 * x;
      if (p[0] < 250 || p[1] < 250 || p[2] < 250) ++dark;
    }
  }
  cairo_surface_destroy(s);
  return dark;
}

std::string pdftext(const std::string& pdf, int page) {
  std::string out;
  REQUIRE(run(fmt::format("pdftotext -f {0} -l {0} '{1}' -", page, pdf), &out) == 0);
  return out;
}

// Words of `text` collapsed to single spaces, so wrapped lines still match.
std::string squash(const std::string& text) {
  std::istringstream in(text);
  std::string word, out;
  while (in >> word) out += (out.empty() ? "" : " ") + word;
  return out;
}

}  // namespace

TEST_CASE("chart: the PDF has two pages of A4 or letter size (pdfinfo)", "[chart]") {
  const std::string dir = out_dir("pages");
  const ChartData d = slide_disc_example();
  // Expected sizes (from memory): ISO 216 A4 210 × 297 mm = 595.276 × 841.890 pt; US letter
  // 8.5 × 11 in = 612 × 792 pt (PDF 1.7, ISO 32000-1, user space unit 1/72 in); pdfinfo
  // (poppler-utils) reads the page boxes and names the paper.
  struct Case {
    Paper paper;
    double w_pt, h_pt;
  };
  for (const Case& c : {Case{Paper::kA4, 595.276, 841.89}, Case{Paper::kLetter, 612, 792}}) {
    const Written w = write(d, options(c.paper), dir, paper_name(c.paper));
    int pages = 0;
    const auto sizes = pdfinfo_page_sizes(w.pdf, &pages);
    CHECK(pages == 2);
    std::string info;
    REQUIRE(run("pdfinfo -f 1 -l 2 '" + w.pdf + "'", &info) == 0);
    CHECK_THAT(info, Catch::Contains(c.paper == Paper::kA4 ? "pts (A4)" : "pts (letter)"));
    REQUIRE(sizes.size() == 2);
    for (const auto& s : sizes) {
      CHECK(s.first == Approx(c.w_pt).margin(0.001));
      CHECK(s.second == Approx(c.h_pt).margin(0.001));
    }
  }
}

TEST_CASE("chart: DejaVu Sans is embedded in the PDF (pdffonts)", "[chart]") {
  const std::string dir = out_dir("fonts");
  const Written w = write(slide_disc_example(), options(Paper::kA4), dir);
  std::string out;
  REQUIRE(run("pdffonts '" + w.pdf + "'", &out) == 0);
  CHECK_THAT(out, Catch::Contains("DejaVuSans"));
  CHECK_THAT(out, Catch::Contains("DejaVuSans-Bold"));
  // Every font line (after the two header lines) says "yes" in the emb column.
  std::istringstream in(out);
  std::string line;
  int fonts = 0;
  for (int i = 0; std::getline(in, line); ++i) {
    if (i < 2 || line.empty()) continue;
    ++fonts;
    CHECK_THAT(line, Catch::Contains(" yes "));
  }
  CHECK(fonts >= 2);
}

TEST_CASE("chart: the scale bar measures 100 mm on the page (pdftoppm at 600 dpi)", "[chart]") {
  // Method: pdftoppm renders page 2 at 600 dpi in grey; in the pixel row through the middle of
  // the bar's filled rectangle, the longest run of pixels darker than 50 % is the bar. One pixel
  // is 0.0423 mm and each anti-aliased end is cut at 50 %, so the reading is good to about
  // ±0.05 mm, within the 0.1 mm asked for.
  const std::string dir = out_dir("scale");
  const ChartData d = slide_disc_example();
  for (Paper paper : {Paper::kA4, Paper::kLetter}) {
    const Written w = write(d, options(paper), dir, paper_name(paper));
    const TemplateGeometry geo = template_geometry(d, paper);
    const Crop crop{geo.bar_x_mm - 5, geo.bar_y_mm - 6, kScaleBarMm + 10, 10};
    const Gray g = render_page(w.pdf, 2, 600, dir + paper_name(paper) + "-p2", &crop);
    const int row = g.px_y(geo.bar_y_mm + geo.bar_height_mm / 2);
    Run bar;
    for (const Run& r : row_runs(g, row)) {
      if (r.length() > bar.length()) bar = r;
    }
    const double length_mm = bar.length() * 25.4 / g.dpi;
    INFO(paper_name(paper) << ": bar " << length_mm << " mm");
    CHECK(std::fabs(length_mm - kScaleBarMm) <= 0.1);
    CHECK(std::fabs(g.edge_mm_x(bar.first) - geo.bar_x_mm) <= 0.1);
    // Its 10 mm ticks: 11 dark runs in a row just above the bar, 10 mm apart.
    const int tick_row = g.px_y(geo.bar_y_mm - 1.0);
    std::vector<Run> ticks;
    for (const Run& r : row_runs(g, tick_row)) {
      if (r.last >= bar.first - 10 && r.first <= bar.last + 10) ticks.push_back(r);
    }
    REQUIRE(ticks.size() == 11);
    for (std::size_t i = 1; i < ticks.size(); ++i) {
      CHECK((ticks[i].mid() - ticks[i - 1].mid()) * 25.4 / g.dpi == Approx(10.0).margin(0.1));
    }
  }
}

TEST_CASE("chart: the template's hole has the spindle's diameter and 0° is at the mark",
          "[chart]") {
  // Method: page 2 at 600 dpi. Along the row and the column through the ring's centre, the
  // hole's outline gives two dark runs either side of the centre; the distance between their
  // middles is the diameter (the outline is stroked centred on the true circle). The bold
  // reference mark must be centred on the hole's vertical through its measured centre, above it.
  const std::string dir = out_dir("hole");
  for (double spindle : {15.875, 12.7, 25.0}) {
    ChartData d = slide_disc_example();
    d.spindle_diameter_mm = spindle;
    const std::string stem = fmt::format("hole-{}", spindle);
    const Written w = write(d, options(Paper::kA4), dir, stem);
    const TemplateGeometry geo = template_geometry(d, Paper::kA4);
    const double ro = geo.outer_radius_mm;
    const Crop crop{geo.centre_x_mm - ro, geo.centre_y_mm - ro, 2 * ro, 2 * ro};
    const Gray g = render_page(w.pdf, 2, 600, dir + stem + "-p2", &crop);
    const int cx = g.px_x(geo.centre_x_mm), cy = g.px_y(geo.centre_y_mm);
    REQUIRE_FALSE(g.dark(cx, cy));  // the hole is empty

    const auto closest = [](const std::vector<Run>& runs, int centre, Run* before, Run* after) {
      bool b = false, a = false;
      for (const Run& r : runs) {
        if (r.last < centre) {
          *before = r;
          b = true;
        } else if (r.first > centre && !a) {
          *after = r;
          a = true;
        }
      }
      return a && b;
    };
    Run left, right, top, bottom;
    REQUIRE(closest(row_runs(g, cy), cx, &left, &right));
    REQUIRE(closest(column_runs(g, cx), cy, &top, &bottom));
    const double px = 25.4 / g.dpi;
    INFO("spindle " << spindle << " mm: horizontal " << (right.mid() - left.mid()) * px
                    << ", vertical " << (bottom.mid() - top.mid()) * px);
    CHECK(std::fabs((right.mid() - left.mid()) * px - spindle) <= 0.1);
    CHECK(std::fabs((bottom.mid() - top.mid()) * px - spindle) <= 0.1);
    const double centre_x = g.mm_x(0.5 * (left.mid() + right.mid()));
    CHECK(centre_x == Approx(geo.centre_x_mm).margin(0.1));

    // The reference mark: a 0.8 mm bar on the vertical through the centre, straight up, at
    // three radii between the hole and the rim.
    for (double r : {geo.ref_mark_inner_mm + 1.5, geo.flange_radius_mm + 4.0,
                     geo.outer_radius_mm - 4.5}) {  // just inside the wedge at the rim
      const int row = g.px_y(geo.centre_y_mm - r);
      Run mark;
      bool found = false;
      for (const Run& run_ : row_runs(g, row)) {
        if (run_.first <= cx && run_.last >= cx) {
          mark = run_;
          found = true;
        }
      }
      INFO("radius " << r << " mm");
      REQUIRE(found);
      CHECK(mark.length() * px == Approx(geo.ref_mark_width_mm).margin(0.1));
      CHECK(g.mm_x(mark.mid()) == Approx(centre_x).margin(0.1));
    }
  }
}

TEST_CASE("chart: both pages render with pdftoppm and carry the footer", "[chart]") {
  const std::string dir = out_dir("render");
  const Written w = write(slide_disc_example(), options(Paper::kA4), dir);
  for (int page : {1, 2}) {
    const Gray g = render_page(w.pdf, page, 50, dir + "p" + std::to_string(page));
    // A4 at 50 dpi: 210/25.4 × 50 = 413.4 by 584.6 pixels.
    CHECK(std::abs(g.width - 413) <= 1);
    CHECK(std::abs(g.height - 585) <= 1);
    int dark = 0;
    for (auto v : g.px) dark += v < 128;
    CHECK(dark > 1000);  // not a blank page
    const std::string text = squash(pdftext(w.pdf, page));
    CHECK_THAT(text, Catch::Contains("A printed part is not a certified component"));
    CHECK_THAT(text, Catch::Contains("0.1.0-test"));
  }
}

TEST_CASE("chart: the card shows every caution, check, step and table row", "[chart]") {
  const std::string dir = out_dir("content");
  const ChartData d = slide_disc_example();
  const Written w = write(d, options(Paper::kA4), dir);
  const std::string text = squash(pdftext(w.pdf, 1));
  for (const auto& c : d.cautions) CHECK_THAT(text, Catch::Contains(squash(c)));
  for (const auto& s : d.steps) CHECK_THAT(text, Catch::Contains(squash(s)));
  for (const auto& c : d.warnings) CHECK_THAT(text, Catch::Contains(squash(c)));
  for (const auto& c : d.checks) CHECK_THAT(text, Catch::Contains(c.name));
  for (const auto& r : d.table.rows) CHECK_THAT(text, Catch::Contains(r[3]));
  CHECK_THAT(text, Catch::Contains("FAIL, accepted"));
  CHECK_THAT(text, Catch::Contains(squash(d.headline)));
  CHECK_THAT(text, Catch::Contains("75.0 g\xC2\xB7mm at 212\xC2\xB0"));
  CHECK_THAT(text, Catch::Contains("predicted"));
  CHECK_THAT(text, !Catch::Contains("not shown"));
  const std::string page2 = squash(pdftext(w.pdf, 2));
  CHECK_THAT(page2, Catch::Contains("100 mm"));
  CHECK_THAT(page2, Catch::Contains("reference mark"));
  CHECK_THAT(page2, Catch::Contains("heavy notch"));
}

TEST_CASE("chart: the PNG has the pixel size asked for (PNG header)", "[chart]") {
  const std::string dir = out_dir("png");
  const ChartData d = slide_disc_example();
  struct Case {
    Paper paper;
    int dpi;
    int w, h;
  };
  // round(mm / 25.4 × dpi): A4 at 150 dpi 1240 × 1754; at 96 dpi 794 × 1123; letter at 150 dpi
  // 1275 × 1650.
  for (const Case& c : {Case{Paper::kA4, 150, 1240, 1754}, Case{Paper::kA4, 96, 794, 1123},
                        Case{Paper::kLetter, 150, 1275, 1650}}) {
    ChartTargets t;
    t.png_path = dir + fmt::format("{}-{}.png", paper_name(c.paper), c.dpi);
    write_chart(d, options(c.paper, c.dpi), t);
    // PNG (ISO/IEC 15948, from memory): 8-byte signature, then the IHDR chunk: length, "IHDR",
    // width and height as big-endian 32-bit integers at bytes 16 and 20. Cairo's own PNG reader
    // (libpng) agrees in the overflow test, which reads the pixels back.
    const std::string b = read_file(t.png_path);
    REQUIRE(b.size() > 24);
    CHECK(b.compare(0, 8, "\x89PNG\r\n\x1a\n") == 0);
    CHECK(b.compare(12, 4, "IHDR") == 0);
    const auto be32 = [&](std::size_t i) {
      return (static_cast<unsigned char>(b[i]) << 24) | (static_cast<unsigned char>(b[i + 1]) << 16) |
             (static_cast<unsigned char>(b[i + 2]) << 8) | static_cast<unsigned char>(b[i + 3]);
    };
    CHECK(be32(16) == c.w);
    CHECK(be32(20) == c.h);
  }
}

TEST_CASE("chart: the SVG is well-formed XML sized in millimetres", "[chart]") {
  const std::string dir = out_dir("svg");
  for (Paper paper : {Paper::kA4, Paper::kLetter}) {
    ChartTargets t;
    t.svg_path = dir + paper_name(paper) + ".svg";
    write_chart(slide_disc_example(), options(paper), t);
    std::string out;
    // Python's xml.etree (expat) refuses a file that is not well-formed.
    const int rc = run("python3 -c \"import sys, xml.etree.ElementTree as E; "
                       "r = E.parse(sys.argv[1]).getroot(); "
                       "print(r.get('width'), r.get('height'), r.get('viewBox'))\" '" +
                           t.svg_path + "'",
                       &out);
    REQUIRE(rc == 0);
    const PageSize ps = page_size(paper);
    const std::string expected =
        fmt::format("{}mm {}mm 0 0 {} {}\n", ps.width_mm, ps.height_mm, ps.width_mm, ps.height_mm);
    CHECK(out == expected);
  }
}

TEST_CASE("chart: two renders of the same data give identical PDF bytes", "[chart]") {
  const std::string dir = out_dir("repro");
  const ChartData d = slide_disc_example();
  const Written a = write(d, options(Paper::kA4), dir, "a");
  const Written b = write(d, options(Paper::kA4), dir, "b");
  const std::string pa = read_file(a.pdf), pb = read_file(b.pdf);
  REQUIRE(pa.size() > 1000);
  CHECK(pa == pb);
  CHECK(read_file(a.png) == read_file(b.png));
  // A different correction changes the file, so the comparison can fail.
  ChartData e = d;
  e.correction.angle_deg = 213;
  const Written c = write(e, options(Paper::kA4), dir, "c");
  CHECK(read_file(c.pdf) != pa);
}

TEST_CASE("chart: long content is shrunk, wrapped or trimmed inside the page margins",
          "[chart]") {
  // Method: both pages rendered by pdftoppm at 100 dpi, and the PNG read back: no pixel centred
  // within 11 mm of the paper's edge (the margin is 12 mm) may be darker than 250 of 255.
  const std::string dir = out_dir("overflow");
  const ChartData heavy = overloaded_example();
  const ChartData normal = slide_disc_example();
  for (Paper paper : {Paper::kA4, Paper::kLetter}) {
    for (const ChartData* d : {&normal, &heavy}) {
      const std::string stem =
          std::string(paper_name(paper)) + (d == &heavy ? "-heavy" : "-normal");
      const Written w = write(*d, options(paper, 100), dir, stem);
      for (int page : {1, 2}) {
        const Gray g = render_page(w.pdf, page, 100, dir + stem + "-p" + std::to_string(page));
        INFO(stem << " page " << page);
        CHECK(dark_pixels_near_edge(g, kChartMarginMm - 1.0) == 0);
      }
      CHECK(dark_png_pixels_near_edge(w.png, kChartMarginMm - 1.0, 100) == 0);
    }
    const std::string stem = std::string(paper_name(paper)) + "-heavy";
    const std::string text = squash(pdftext(dir + stem + ".pdf", 1));
    // What did not fit says so; the standing parts are still there.
    CHECK_THAT(text, Catch::Contains("more rows not shown: see chart.csv"));
    CHECK_THAT(text, Catch::Contains("more checks not shown"));
    CHECK_THAT(text, Catch::Contains("a failing check at the very end"));
    CHECK_THAT(text, Catch::Contains("DO NOT USE"));
    CHECK_THAT(text, Catch::Contains("Cautions"));
    CHECK_THAT(text, Catch::Contains(heavy.cautions.front()));
    CHECK_THAT(text, Catch::Contains("A printed part is not a certified component"));
  }
}

TEST_CASE("chart: an unwritable path throws FileError naming the path and the cause",
          "[chart]") {
  const std::string bad = out_dir("bad") + "no/such/dir/";
  const ChartData d = slide_disc_example();
  const ChartOptions o = options(Paper::kA4);
  for (const std::string ext : {"pdf", "svg", "png"}) {
    ChartTargets t;
    const std::string path = bad + "chart." + ext;
    (ext == "pdf" ? t.pdf_path : ext == "svg" ? t.svg_path : t.png_path) = path;
    INFO(ext);
    CHECK_THROWS_AS(write_chart(d, o, t), FileError);
    CHECK_THROWS_WITH(write_chart(d, o, t),
                      Catch::Contains(path) && Catch::Contains("error while writing"));
  }
}
