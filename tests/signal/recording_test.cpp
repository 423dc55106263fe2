// SPDX-License-Identifier: GPL-3.0-or-later
// CSV and WAV readers: accepted layouts, units, channels, and bad recordings with clear messages.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/signal/measure.hpp"
#include "geom/signal/recording.hpp"
#include "synthetic.hpp"

using namespace trimwright;
using namespace trimwright::signal;
using namespace trimwright::signal::test;
using Catch::Matchers::Contains;

namespace {

SynthSpec clean(double rpm = 3000) {
  SynthSpec s;
  s.rpm = rpm;
  s.duration_s = 4;
  s.noise_g = 0.01;
  return s;
}

RecordingOptions at_rpm(double rpm) {
  RecordingOptions o;
  o.nominal_rpm = rpm;
  return o;
}

}  // namespace

TEST_CASE("recording: CSV layouts give the same reading", "[signal]") {
  const SynthData d = synthesize(clean());
  RecordingOptions opt = at_rpm(3000);
  SECTION("comma, header, seconds, g") {
    const auto p = out_path("layout_comma.csv");
    write_csv(p, d, 1, {});
    const auto m = measure_recording(p, opt);
    CHECK(m.amplitude == Approx(0.2).epsilon(0.005));
    CHECK(angle_between_deg(*m.phase_deg, 40) < 0.5);
    CHECK(m.reference == "ref");
    CHECK(m.axis == "z_g");
  }
  SECTION("semicolon with decimal commas, time in ms, m/s2") {
    CsvStyle st;
    st.sep = ';';
    st.decimal_comma = true;
    st.time_units = "ms";
    st.accel_units = "m/s2";
    const auto p = out_path("layout_semicolon.csv");
    write_csv(p, d, 1, st);
    const auto rec = read_recording(p, {});
    CHECK(rec.time_s.back() == Approx(4.0));
    CHECK_THAT(rec.units_source, Contains("m/s2"));
    const auto m = measure_recording(p, opt);
    CHECK(m.amplitude == Approx(0.2).epsilon(0.005));
    CHECK(angle_between_deg(*m.phase_deg, 40) < 0.5);
  }
  SECTION("no header: a column map names the columns") {
    CsvStyle st;
    st.header = false;
    const auto p = out_path("layout_noheader.csv");
    write_csv(p, d, 1, st);
    opt.read.columns = "t,z_g,ref";
    const auto m = measure_recording(p, opt);
    CHECK(m.amplitude == Approx(0.2).epsilon(0.005));
    CHECK(angle_between_deg(*m.phase_deg, 40) < 0.5);
  }
  SECTION("no header: columns by number and units given") {
    CsvStyle st;
    st.header = false;
    const auto p = out_path("layout_numbers.csv");
    write_csv(p, d, 1, st);
    opt.read.reference = "3";
    opt.read.input_units = "g";
    opt.axis = "2";
    const auto m = measure_recording(p, opt);
    CHECK(m.amplitude == Approx(0.2).epsilon(0.005));
    CHECK(m.reference == "3");
    // Without naming the reference, a header-less file is read without one.
    RecordingOptions plain = at_rpm(3000);
    plain.read.input_units = "g";
    plain.axis = "2";
    CHECK_FALSE(measure_recording(p, plain).phase_deg);
  }
  SECTION("three axes: units from gravity, the axis with the largest 1x chosen, or named") {
    SynthSpec s = clean();
    s.axes = 3;
    CsvStyle st;
    st.units_in_header = false;
    st.accel_units = "m/s2";
    const auto p = out_path("layout_xyz.csv");
    write_csv(p, synthesize(s), 3, st);
    const auto rec = read_recording(p, {});
    REQUIRE(rec.channels.size() == 3);
    CHECK_THAT(rec.units_source, Contains("gravity"));
    const auto m = measure_recording(p, opt);
    CHECK(m.axis == "z");
    CHECK(m.axis_auto);
    CHECK(m.amplitude == Approx(0.2).epsilon(0.005));
    opt.axis = "y";
    const auto my = measure_recording(p, opt);
    CHECK(my.axis == "y");
    CHECK(my.amplitude == Approx(0.1).epsilon(0.01));
    CHECK(angle_between_deg(*my.phase_deg, 160) < 1);
  }
}

TEST_CASE("recording: WAV mono and stereo", "[signal]") {
  const SynthData d = synthesize(clean(2400));
  RecordingOptions opt = at_rpm(2400);
  opt.read.full_scale = 2.0;  // g at digital full scale
  SECTION("16-bit mono: amplitude only") {
    const auto p = out_path("mono16.wav");
    write_wav(p, d, 16, false, 2.0);
    const auto m = measure_recording(p, opt);
    CHECK(m.format == "wav");
    CHECK(m.axis == "mono");
    CHECK(m.amplitude == Approx(0.2).epsilon(0.01));
    CHECK_FALSE(m.phase_deg);
  }
  SECTION("24-bit stereo: vibration left, reference right") {
    const auto p = out_path("stereo24.wav");
    write_wav(p, d, 24, true, 2.0);
    const auto m = measure_recording(p, opt);
    CHECK(m.reference == "right");
    CHECK(m.axis == "left");
    CHECK(m.amplitude == Approx(0.2).epsilon(0.005));
    CHECK(angle_between_deg(*m.phase_deg, 40) < 0.5);
  }
  SECTION("32-bit float stereo, and the reference ignored on request") {
    const auto p = out_path("stereo32f.wav");
    write_wav(p, d, 32, true, 2.0);
    const auto m = measure_recording(p, opt);
    CHECK(m.amplitude == Approx(0.2).epsilon(0.005));
    CHECK(angle_between_deg(*m.phase_deg, 40) < 0.5);
    opt.read.reference = "none";
    opt.axis = "left";
    const auto n = measure_recording(p, opt);
    CHECK_FALSE(n.phase_deg);
    CHECK(n.amplitude == Approx(0.2).epsilon(0.01));
  }
  SECTION("no full scale given: 1 g assumed and said") {
    const auto p = out_path("mono_fs.wav");
    write_wav(p, d, 16, false, 2.0);
    RecordingOptions o = at_rpm(2400);
    const auto m = measure_recording(p, o);
    CHECK(m.amplitude == Approx(0.1).epsilon(0.01));
    bool said = false;
    for (const auto& w : m.warnings) said = said || w.find("full scale") != std::string::npos;
    CHECK(said);
  }
}

TEST_CASE("recording: bad recordings stop with a clear message", "[signal]") {
  RecordingOptions opt = at_rpm(3000);
  auto message = [&](const std::string& name, const std::string& text) -> std::string {
    const auto p = out_path(name);
    write_text(p, text);
    try {
      measure_recording(p, opt);
    } catch (const InputError& e) {
      return e.what();
    }
    return "no error";
  };
  CHECK_THAT(message("empty.csv", ""), Contains("empty.csv") && Contains("no data rows"));
  CHECK_THAT(message("comments.csv", "# only a comment\n\n"), Contains("no data rows"));
  CHECK_THAT(message("onecol.csv", "time\n0\n0.1\n0.2\n"), Contains("onecol.csv:2") && Contains("found 1 column"));
  CHECK_THAT(message("nonnumeric.csv", "time_s,z_g\n0,1.0\n0.001,1.1\n0.002,abc\n"),
             Contains("nonnumeric.csv:4") && Contains("column 2 'z_g'") && Contains("expected a number, found 'abc'"));
  CHECK_THAT(message("short_row.csv", "time_s,z_g,ref\n0,1.0,0\n0.001,1.1\n"),
             Contains("short_row.csv:3") && Contains("column 3 'ref' is missing"));
  CHECK_THAT(message("backwards.csv", "time_s,z_g\n0,1\n0.002,1\n0.001,1\n"),
             Contains("backwards.csv:4") && Contains("column 1 'time_s'") && Contains("earlier than the previous"));
  CHECK_THAT(message("header_only.csv", "time_s,z_g\n"), Contains("no data rows"));
  CHECK_THAT(message("nounits.csv", "t,vib\n0,0.1\n0.001,-0.1\n0.002,0.1\n"),
             Contains("g or m/s2") && Contains("vib"));
  CHECK_THAT(message("notwav.wav", "RIFF0000JUNK"), Contains("not a WAV file"));
  std::string flat = "t,z_g\n";
  for (int i = 0; i < 200; ++i) flat += std::to_string(i / 1000.0) + ",1.0\n";
  CHECK_THAT(message("constant.csv", flat), Contains("constant: no vibration was recorded"));

  SECTION("no pulses in the reference") {
    SynthSpec s = clean();
    s.ref = SynthSpec::Ref::kFlat;
    const auto p = out_path("flatref.csv");
    write_csv(p, synthesize(s), 1, {});
    CHECK_THROWS_WITH(measure_recording(p, opt), Contains("no pulses found in reference 'ref'"));
  }
  SECTION("a threshold outside the reference's range finds no pulses") {
    const auto p = out_path("threshold.csv");
    write_csv(p, synthesize(clean()), 1, {});
    opt.pulses.threshold = 7.0;
    CHECK_THROWS_WITH(measure_recording(p, opt), Contains("no pulses found") && Contains("threshold 7"));
  }
  SECTION("reference speed far from nominal") {
    const auto p = out_path("far_ref.csv");
    write_csv(p, synthesize(clean(1500)), 1, {});
    opt.nominal_rpm = 3450;
    CHECK_THROWS_WITH(measure_recording(p, opt),
                      Contains("1500 rpm") && Contains("far from the nominal 3450 rpm"));
  }
  SECTION("spectral speed far from nominal") {
    CsvStyle st;
    st.reference = false;
    const auto p = out_path("far_spec.csv");
    write_csv(p, synthesize(clean(1500)), 1, st);
    opt.nominal_rpm = 3450;
    CHECK_THROWS_WITH(measure_recording(p, opt),
                      Contains("far from nominal") && (Contains("1500 rpm") || Contains("1499 rpm")));
  }
  SECTION("too short to measure") {
    SynthSpec s = clean(600);
    s.duration_s = 0.15;  // 1.5 revolutions
    const auto p = out_path("tiny.csv");
    write_csv(p, synthesize(s), 1, {});
    opt.nominal_rpm = 600;
    CHECK_THROWS_WITH(measure_recording(p, opt), Contains("too short to measure") && Contains("1.5 revolutions"));
  }
  SECTION("sample rate too low for the speed") {
    SynthSpec s = clean(6000);
    s.sample_rate_hz = 150;
    const auto p = out_path("slow_rate.csv");
    write_csv(p, synthesize(s), 1, {});
    opt.nominal_rpm = 6000;
    CHECK_THROWS_WITH(measure_recording(p, opt), Contains("sample rate"));
  }
  SECTION("unknown output units and axis") {
    const auto p = out_path("units_ok.csv");
    write_csv(p, synthesize(clean()), 1, {});
    opt.units = "furlongs";
    CHECK_THROWS_WITH(measure_recording(p, opt), Contains("units 'furlongs'") && Contains("expected one of"));
    opt.units = "g-pk";
    opt.axis = "q";
    CHECK_THROWS_WITH(measure_recording(p, opt), Contains("axis 'q'") && Contains("'z_g'"));
  }
}

TEST_CASE("recording: a missing file is a file error", "[signal]") {
  CHECK_THROWS_AS(measure_recording(out_path("does_not_exist.csv"), {}), FileError);
  CHECK_THROWS_AS(read_recording(out_path(""), {}), FileError);  // a folder
}

TEST_CASE("recording: paths in a job file are relative to it", "[signal]") {
  CHECK(recording_path_for_job("/shop/jobs/left.toml", "run-1.csv") == "/shop/jobs/run-1.csv");
  CHECK(recording_path_for_job("/shop/jobs/left.toml", "../rec/run-1.wav") == "/shop/rec/run-1.wav");
  CHECK(recording_path_for_job("/shop/jobs/left.toml", "/data/run-1.csv") == "/data/run-1.csv");
  CHECK(recording_path_for_job("left.toml", "run-1.csv") == "run-1.csv");
}

TEST_CASE("recording: flat tops are found at the extremes only", "[signal]") {
  std::vector<double> sine, clipped;
  for (int i = 0; i < 2000; ++i) {
    const double v = std::sin(0.05 * i + 0.001 * i * i * 1e-3);
    sine.push_back(v);
    clipped.push_back(std::clamp(v, -0.9, 0.9));
  }
  CHECK_FALSE(has_flat_tops(sine));
  CHECK(has_flat_tops(clipped));
  CHECK_FALSE(has_flat_tops(std::vector<double>(100, 1.0)));  // constant: nothing to clip
}
