// SPDX-License-Identifier: GPL-3.0-or-later
// Accuracy of speed, 1× amplitude and phase on synthetic recordings with known content.
#include <catch2/catch.hpp>

#include <cmath>
#include <string>

#include "geom/base/angle.hpp"
#include "geom/signal/measure.hpp"
#include "synthetic.hpp"

using namespace trimwright;
using namespace trimwright::signal;
using namespace trimwright::signal::test;

namespace {

// The signal-to-noise stated for the accuracy claims: 1× of 0.2 g peak in white noise of 0.05 g
// rms (ratio of 1× rms to noise rms 2.83, 9 dB per sample), 10 s of recording.
SynthSpec noisy(double rpm) {
  SynthSpec s;
  s.rpm = rpm;
  s.amp1_g = 0.2;
  s.lag1_deg = 40;
  s.noise_g = 0.05;
  s.harmonics = {{2, 0.1, 75}, {3, 0.05, 200}};
  return s;
}

Measurement run_csv(const std::string& name, const SynthSpec& spec, RecordingOptions opt = {},
                    CsvStyle style = {}) {
  const auto path = out_path(name);
  write_csv(path, synthesize(spec), spec.axes, style);
  if (!opt.nominal_rpm) opt.nominal_rpm = spec.rpm;
  return measure_recording(path, opt);
}

bool has_warning(const Measurement& m, const std::string& part) {
  for (const auto& w : m.warnings)
    if (w.find(part) != std::string::npos) return true;
  return false;
}

}  // namespace

TEST_CASE("measure: 1x amplitude within 1 % and phase within 1 deg with a reference, 600-6000 rpm", "[signal]") {
  const double rpm = GENERATE(600.0, 1500.0, 2850.0, 3450.0, 6000.0);
  const double lag = GENERATE(40.0, 250.0);
  SynthSpec s = noisy(rpm);
  s.lag1_deg = lag;
  s.seed = static_cast<unsigned>(rpm) + static_cast<unsigned>(lag);
  const auto m = run_csv("ref_" + std::to_string(static_cast<int>(rpm)) + ".csv", s);
  std::string said;
  for (const auto& w : m.warnings) said += w + " | ";
  INFO("warnings: " << said);
  INFO("rpm " << rpm << " lag " << lag << " measured " << m.amplitude << " at " << m.phase_deg.value_or(-1));
  CHECK(m.speed_rpm == Approx(rpm).epsilon(1e-4));
  CHECK(m.amplitude == Approx(0.2).epsilon(0.01));
  REQUIRE(m.phase_deg);
  CHECK(angle_between_deg(*m.phase_deg, lag) < 1.0);
  CHECK(m.units == "g-pk");
  CHECK(m.speed_source == "reference pulses");
  // Harmonics measured alongside and kept out of 1×.
  REQUIRE(m.harmonics.size() >= 2);
  CHECK(m.harmonics[0].amplitude == Approx(0.1).epsilon(0.03));
  CHECK(angle_between_deg(*m.harmonics[0].phase_deg, 75) < 3);
  CHECK(m.harmonics[1].amplitude == Approx(0.05).epsilon(0.06));
  CHECK(m.confidence.snr_db > 20);
  CHECK(m.confidence.level == "good");
  CHECK(*m.confidence.phase_resolution_deg == Approx(180 * rpm / 60 / 2000));  // half a sample
  if (rpm < 6000) {
    CHECK(m.warnings.empty());
  } else {
    // 6000 rpm is 100 Hz, the second harmonic of 50 Hz mains: said, since hum there would be inseparable.
    REQUIRE(m.warnings.size() == 1);
    CHECK_THAT(m.warnings[0], Catch::Matchers::Contains("sits on the 100 Hz mains line"));
  }
}

TEST_CASE("measure: sharp reference edges locked to the sample clock stay within the stated resolution", "[signal]") {
  // 3000 rpm at 2000 samples/s is exactly 40 samples per turn: with perfectly sharp edges and a
  // perfectly steady speed every edge falls at the same place between two samples, so nothing
  // averages out. The error must stay within half a sample (the phase_resolution_deg figure).
  SynthSpec s = noisy(3000);
  s.wobble_percent = 0;
  s.edge_samples = 0;
  const auto m = run_csv("locked.csv", s);
  REQUIRE(m.confidence.phase_resolution_deg);
  CHECK(*m.confidence.phase_resolution_deg == Approx(4.5));
  CHECK(angle_between_deg(*m.phase_deg, 40) <= *m.confidence.phase_resolution_deg + 0.5);
  CHECK(m.amplitude == Approx(0.2).epsilon(0.01));
  bool said = false;
  for (const auto& w : m.warnings) said = said || w.find("edges are sharp and sampled 40 times") != std::string::npos;
  CHECK(said);
}

TEST_CASE("measure: 1x amplitude within 1 % without a reference, 600-6000 rpm", "[signal]") {
  const double rpm = GENERATE(600.0, 1500.0, 3450.0, 6000.0);
  SynthSpec s = noisy(rpm);
  s.seed = 7 + static_cast<unsigned>(rpm);
  CsvStyle style;
  style.reference = false;
  const auto m = run_csv("noref_" + std::to_string(static_cast<int>(rpm)) + ".csv", s, {}, style);
  INFO("rpm " << rpm << " measured " << m.amplitude << " at " << m.speed_rpm);
  CHECK(m.speed_rpm == Approx(rpm).epsilon(1e-4));
  CHECK(m.amplitude == Approx(0.2).epsilon(0.01));
  CHECK_FALSE(m.phase_deg);
  CHECK_FALSE(m.confidence.phase_scatter_deg);
  CHECK(m.speed_source == "spectrum peak");
  CHECK(m.reference.empty());
}

TEST_CASE("measure: mains hum near 1x is fitted jointly and kept out of the reading", "[signal]") {
  // 2850 rpm is 47.5 Hz, 2.5 Hz below 50 Hz mains; 3450 rpm is 57.5 Hz, 2.5 Hz below 60 Hz.
  struct Case { double rpm; double mains; };
  const auto c = GENERATE(Case{2850, 50}, Case{3450, 60});
  SynthSpec s = noisy(c.rpm);
  s.mains = {{c.mains, 0.6}, {2 * c.mains, 0.2}};  // hum three times the 1× amplitude
  s.seed = 11;
  for (bool reference : {true, false}) {
    CsvStyle style;
    style.reference = reference;
    const auto m = run_csv("mains.csv", s, {}, style);
    INFO("rpm " << c.rpm << " reference " << reference << " measured " << m.amplitude);
    CHECK(m.amplitude == Approx(0.2).epsilon(0.01));
    if (reference) CHECK(angle_between_deg(*m.phase_deg, 40) < 1.0);
    REQUIRE(m.mains.size() >= 1);
    CHECK(m.mains[0].frequency_hz == c.mains);
    CHECK(m.mains[0].amplitude == Approx(0.6).epsilon(0.02));
  }
}

TEST_CASE("measure: mains hum left unfitted would spoil the 1x figure", "[signal]") {
  // The same recording with mains fitting turned off: shows that the joint fit is what keeps the
  // hum out (this test fails if the mains lines stop mattering).
  SynthSpec s = noisy(2850);
  s.mains = {{50, 0.6}};
  s.seed = 12;
  s.duration_s = 2;
  CsvStyle style;
  RecordingOptions off;
  off.mains = Mains::kNone;
  const auto m_off = run_csv("mains_off.csv", s, off, style);
  RecordingOptions on;
  on.mains = Mains::k50;
  const auto m_on = run_csv("mains_on.csv", s, on, style);
  CHECK(m_on.amplitude == Approx(0.2).epsilon(0.015));
  CHECK(std::fabs(m_off.amplitude - 0.2) > 0.002);  // more than 1 % off without the mains line
}

TEST_CASE("measure: speed drift is followed and reported", "[signal]") {
  SynthSpec s = noisy(2900);
  s.rpm_end = 3100;  // 6.7 % over 10 s
  s.seed = 21;
  for (bool reference : {true, false}) {
    CsvStyle style;
    style.reference = reference;
    RecordingOptions opt;
    opt.nominal_rpm = 3000;
    const auto m = run_csv("drift.csv", s, opt, style);
    INFO("reference " << reference << " measured " << m.amplitude << " at " << m.speed_rpm);
    CHECK(m.speed_rpm == Approx(3000).epsilon(0.005));
    CHECK(m.amplitude == Approx(0.2).epsilon(0.01));
    if (reference) CHECK(angle_between_deg(*m.phase_deg, 40) < 1.0);
    CHECK(m.confidence.speed_wander_percent > 4.0);
    CHECK(has_warning(m, "speed wandered"));
  }
  // A steady speed is not reported.
  SynthSpec steady = noisy(3000);
  const auto m = run_csv("steady.csv", steady);
  CHECK(m.confidence.speed_wander_percent < 0.5);
  CHECK_FALSE(has_warning(m, "speed wandered"));
}

TEST_CASE("measure: uneven sampling as phones record", "[signal]") {
  // About 400 samples per second with each time jittered by up to ±40 % of the interval.
  SynthSpec s = noisy(1500);
  s.sample_rate_hz = 400;
  s.jitter = 0.8;
  s.duration_s = 20;
  s.harmonics = {{2, 0.1, 75}};
  s.pulse_width_rev = 0.25;  // a magnet switch closed for a quarter turn: several samples per pulse
  s.seed = 31;
  for (bool reference : {true, false}) {
    CsvStyle style;
    style.reference = reference;
    const auto m = run_csv("uneven.csv", s, {}, style);
    INFO("reference " << reference << " measured " << m.amplitude << " at " << m.speed_rpm);
    CHECK_FALSE(m.evenly_sampled);
    CHECK(m.speed_rpm == Approx(1500).epsilon(1e-4));
    CHECK(m.amplitude == Approx(0.2).epsilon(0.01));
    if (reference) CHECK(angle_between_deg(*m.phase_deg, 40) < 1.0);
  }
}

TEST_CASE("measure: amplitude units and the phase of velocity", "[signal]") {
  // references.md, "Vibration units": 1 g peak at 57.5 Hz → 27.144 mm/s peak; peak = √2 × RMS,
  // peak-to-peak = 2 × peak; velocity lags acceleration by a quarter cycle (v = ∫a dt).
  SynthSpec s;
  s.rpm = 3450;
  s.amp1_g = 1.0;
  s.lag1_deg = 100;
  const auto path = out_path("units.csv");
  write_csv(path, synthesize(s), 1, {});
  RecordingOptions opt;
  opt.nominal_rpm = 3450;
  auto at = [&](const std::string& u) {
    opt.units = u;
    return measure_recording(path, opt);
  };
  const auto g = at("g-pk");
  CHECK(g.amplitude == Approx(1.0).epsilon(1e-3));
  CHECK(at("g-rms").amplitude == Approx(1.0 / std::sqrt(2.0)).epsilon(1e-3));
  CHECK(at("g-pp").amplitude == Approx(2.0).epsilon(1e-3));
  CHECK(at("m/s2-pk").amplitude == Approx(9.80665).epsilon(1e-3));  // standard gravity, CGPM 1901
  const auto v = at("mm/s-pk");
  CHECK(v.amplitude == Approx(27.144).epsilon(1e-3));
  CHECK(v.units == "mm/s-pk");
  CHECK(angle_between_deg(*v.phase_deg, *g.phase_deg + 90) < 0.01);
  CHECK(angle_between_deg(*at("um-pp").phase_deg, *g.phase_deg + 180) < 0.01);
  CHECK(phase_shift_from_acceleration_deg("in/s-pk") == 90);
  CHECK(phase_shift_from_acceleration_deg("mil-pp") == 180);
  CHECK(phase_shift_from_acceleration_deg("g-rms") == 0);
}

TEST_CASE("measure: confidence warns about noise, short and clipped recordings", "[signal]") {
  SECTION("1x buried in noise") {
    SynthSpec s = noisy(3000);
    s.amp1_g = 0.003;
    s.noise_g = 0.5;
    s.harmonics.clear();
    const auto m = run_csv("buried.csv", s);
    CHECK(m.confidence.snr_db < 10);
    CHECK(has_warning(m, "not clearly above the noise"));
    CHECK(m.confidence.level == "poor");
  }
  SECTION("fewer revolutions than asked") {
    SynthSpec s = noisy(1200);
    s.duration_s = 0.6;  // 12 revolutions
    const auto m = run_csv("short.csv", s);
    CHECK(m.confidence.revolutions < 20);
    CHECK(has_warning(m, "short recording"));
    CHECK(m.confidence.level == "poor");
  }
  SECTION("clipped") {
    SynthSpec s = noisy(3000);
    s.amp1_g = 0.5;
    s.noise_g = 0.01;
    s.clip_g = 0.4;
    const auto m = run_csv("clipped.csv", s);
    CHECK(m.clipped);
    CHECK(has_warning(m, "clipped"));
    CHECK(m.confidence.level == "poor");
  }
  SECTION("a clean recording is not flagged clipped") {
    const auto m = run_csv("clean.csv", noisy(3000));
    CHECK_FALSE(m.clipped);
  }
}

TEST_CASE("measure: scatter figures follow the noise", "[signal]") {
  SynthSpec quiet = noisy(3000);
  quiet.noise_g = 0.01;
  SynthSpec loud = noisy(3000);
  loud.noise_g = 0.2;
  const auto q = run_csv("quiet.csv", quiet);
  const auto l = run_csv("loud.csv", loud);
  CHECK(q.confidence.amplitude_scatter_percent < l.confidence.amplitude_scatter_percent);
  CHECK(*q.confidence.phase_scatter_deg < *l.confidence.phase_scatter_deg);
  CHECK(q.confidence.snr_db > l.confidence.snr_db + 20);  // 26 dB more noise
  // Block phases of a 0.2 g 1× in 0.2 g noise scatter by roughly σ/(A·√(N/2)) per block.
  CHECK(*l.confidence.phase_scatter_deg > 0.5);
  CHECK(l.confidence.blocks >= 8);
  CHECK(l.blocks.size() == static_cast<size_t>(l.confidence.blocks));
}
