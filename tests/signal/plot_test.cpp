// SPDX-License-Identifier: GPL-3.0-or-later
// The recording picture: SVG and PNG are written, whole, with and without a reference.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>
#include <iterator>

#include "geom/base/error.hpp"
#include "geom/signal/measure.hpp"
#include "geom/signal/plot.hpp"
#include "synthetic.hpp"

using namespace trimwright;
using namespace trimwright::signal;
using namespace trimwright::signal::test;

namespace {
std::string slurp(const std::string& p) {
  std::ifstream in(p, std::ios::binary);
  return {std::istreambuf_iterator<char>(in), std::istreambuf_iterator<char>()};
}
}  // namespace

TEST_CASE("plot: spectrum and polar picture as SVG and PNG", "[signal]") {
  SynthSpec s;
  s.rpm = 2850;
  s.duration_s = 4;
  s.noise_g = 0.03;
  s.harmonics = {{2, 0.08, 30}};
  s.mains = {{50, 0.1}};
  const auto csv = out_path("plot_run.csv");
  for (bool reference : {true, false}) {
    CsvStyle st;
    st.reference = reference;
    write_csv(csv, synthesize(s), 1, st);
    RecordingOptions opt;
    opt.nominal_rpm = 2850;
    opt.units = "mm/s-pk";
    const auto m = measure_recording(csv, opt);
    const auto dir = out_path(reference ? "plots_ref" : "plots_noref");
    const auto files = write_measurement_plots(m, dir, "run-1");
    REQUIRE(files.size() == 2);
    const auto svg = slurp(files[0]);
    const auto png = slurp(files[1]);
    CHECK(svg.find("<svg") != std::string::npos);
    CHECK(svg.size() > 5000);
    REQUIRE(png.size() > 5000);
    CHECK(png.compare(0, 8, "\x89PNG\r\n\x1a\n") == 0);
    CHECK_FALSE(std::filesystem::exists(files[0] + ".part"));
    CHECK_FALSE(std::filesystem::exists(files[1] + ".part"));
  }
}

TEST_CASE("plot: an unwritable folder is a file error", "[signal]") {
  const auto blocker = out_path("plot_blocker");
  write_text(blocker, "a file where the folder should be");
  Measurement m;
  m.units = "g-pk";
  CHECK_THROWS_AS(write_measurement_plots(m, blocker + "/sub", "x"), FileError);
}
