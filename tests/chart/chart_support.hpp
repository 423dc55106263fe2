// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
// Helpers for the chart tests: sample charts, running the poppler tools (an independent PDF
// reader), and reading their greyscale rasters.

#include <cstddef>
#include <cstdint>
#include <string>
#include <vector>

#include "geom/io/chart.hpp"

namespace trimwright::chart_test {

/// The realistic slide-disc chart of the issue: 75 g·mm at 212°, offset 3.40 mm, a 25-row
/// table, 10 checks (one accepted failure), 2 warnings, 8 cautions, spindle 15.875 mm, flange
/// 63.5 mm, a 150 mm wheel turning counter-clockwise seen from the fixture side.
io::ChartData slide_disc_example();

/// A chart built to overflow: very long title, headline and steps, 40 table rows with long
/// cells, 30 checks with long notes, 15 warnings, 20 cautions.
io::ChartData overloaded_example();

/// A fresh, empty directory under the build tree for a test's files; returns it with a '/'.
std::string out_dir(const std::string& name);

/// Runs a shell command; returns its exit status and fills `output` with its stdout.
int run(const std::string& command, std::string* output = nullptr);

/// The whole file as bytes.
std::string read_file(const std::string& path);

/// An 8-bit greyscale raster (0 black, 255 white), row-major, possibly a crop of the page
/// whose top-left pixel is page pixel (x0_px, y0_px).
struct Gray {
  int width = 0;
  int height = 0;
  double dpi = 0;
  int x0_px = 0;
  int y0_px = 0;
  std::vector<std::uint8_t> px;
  std::uint8_t at(int x, int y) const {
    return px[static_cast<std::size_t>(y) * static_cast<std::size_t>(width) +
              static_cast<std::size_t>(x)];
  }
  bool dark(int x, int y) const { return at(x, y) < 128; }
  /// Raster column of the pixel containing page x `mm`.
  int px_x(double mm) const;
  /// Raster row of the pixel containing page y `mm`.
  int px_y(double mm) const;
  /// Page x of the centre of raster column `i` (fractional allowed), mm.
  double mm_x(double i) const { return (i + x0_px + 0.5) * 25.4 / dpi; }
  /// Page y of the centre of raster row `i`, mm.
  double mm_y(double i) const { return (i + y0_px + 0.5) * 25.4 / dpi; }
  /// Page x of the left edge of raster column `i`, mm.
  double edge_mm_x(int i) const { return (i + x0_px) * 25.4 / dpi; }
};

/// A region of the page in mm (top-left corner and size).
struct Crop {
  double x_mm, y_mm, w_mm, h_mm;
};

/// Renders one page of a PDF with `pdftoppm -gray` (poppler-utils), optionally only `crop`,
/// and reads the PGM it writes.
Gray render_page(const std::string& pdf, int page, int dpi, const std::string& out_prefix,
                 const Crop* crop = nullptr);

/// A run of dark pixels [first, last] along a row or a column.
struct Run {
  int first = 0;
  int last = -1;
  int length() const { return last - first + 1; }
  double mid() const { return 0.5 * (first + last); }
};

/// Every dark run in row y.
std::vector<Run> row_runs(const Gray& g, int y);
/// Every dark run in column x.
std::vector<Run> column_runs(const Gray& g, int x);

}  // namespace trimwright::chart_test
