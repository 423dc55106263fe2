// SPDX-License-Identifier: GPL-3.0-or-later
// Single-plane trial-weight method on exact model rotors, and its degenerate inputs.
#include <catch2/catch.hpp>

#include "geom/base/error.hpp"
#include "geom/solve/solve.hpp"
#include "model_rotor.hpp"

using namespace trimwright::solve;
using namespace trimwright::solve::test;
using trimwright::InputError;

namespace {

ModelRotor single_plane(PhaseSense phase, AngleSense angles) {
  ModelRotor m;
  m.unbalance = {polar_deg(84.0, 212.0)};  // g·mm
  m.alpha = {{polar_deg(0.031, 57.0)}};    // mm/s per g·mm
  m.phase = phase;
  m.angles = angles;
  return m;
}

bool contains(const std::vector<std::string>& lines, const std::string& part) {
  for (const auto& l : lines)
    if (l.find(part) != std::string::npos) return true;
  return false;
}

}  // namespace

TEST_CASE("trial: an exact rotor's unbalance is recovered in every convention", "[solve]") {
  for (auto phase : {PhaseSense::kLag, PhaseSense::kLead})
    for (auto angles : {AngleSense::kAgainstRotation, AngleSense::kWithRotation}) {
      const ModelRotor m = single_plane(phase, angles);
      Readings r = m.readings(Method::kTrial);
      r.correction_radius_mm = 60;
      r.runs = {m.run("original", {}), m.run("trial", {weight(1, 1.5, 60, 30)})};
      const SolveResult s = solve(r, {});
      REQUIRE(s.corrections.size() == 1);
      const Cplx expected = m.expected_correction(0);
      CHECK(s.corrections[0].unbalance_gmm == Approx(std::abs(expected)).epsilon(1e-9));
      CHECK(angle_diff(s.corrections[0].angle_deg, deg_of(expected)) < 1e-9);
      CHECK(s.corrections[0].mass_g.value() == Approx(84.0 / 60.0).epsilon(1e-9));
      // The influence coefficient as the job sees it: 1 g·mm at 0° adds α (phase in its sense).
      const double alpha_phase = phase == PhaseSense::kLag ? 57.0 : 303.0;
      CHECK(s.influence->coefficients[0].magnitude == Approx(0.031).epsilon(1e-9));
      CHECK(angle_diff(*s.influence->coefficients[0].angle_deg, alpha_phase) < 1e-9);
      CHECK(s.redundancy == 0);
      CHECK(s.residual_rms < 1e-12);
      CHECK(s.predicted[0].amplitude < 1e-12);
      CHECK(s.combined.empty());
    }
}

TEST_CASE("trial: a trial left on gives what to add on top of it and the combined weight",
          "[solve]") {
  const ModelRotor m = single_plane(PhaseSense::kLag, AngleSense::kWithRotation);
  Readings r = m.readings(Method::kTrial);
  r.keep_trial = true;
  const TrialWeight trial = weight(1, 2.0, 50, 100);
  r.runs = {m.run("original", {}), m.run("trial", {trial})};
  const SolveResult s = solve(r, {});
  const Cplx total = m.expected_correction(0);
  const Cplx add = total - polar_deg(100.0, 100.0);  // job's angle sense
  CHECK(s.corrections[0].unbalance_gmm == Approx(std::abs(add)).epsilon(1e-9));
  CHECK(angle_diff(s.corrections[0].angle_deg, deg_of(add)) < 1e-9);
  REQUIRE(s.combined.size() == 1);
  CHECK(s.combined[0].unbalance_gmm == Approx(std::abs(total)).epsilon(1e-9));
  CHECK(angle_diff(s.combined[0].angle_deg, deg_of(total)) < 1e-9);
}

TEST_CASE("trial: a trial that changed nothing is an error naming the run", "[solve]") {
  Readings r;
  r.source = "job.toml";
  r.runs.push_back(typed_run("as found", 2.4, 318, {}, 20));
  r.runs.push_back(typed_run("trial at mark", 2.4, 318, {weight(1, 0.5, 60, 0)}, 31));
  try {
    solve(r, {});
    FAIL("no error");
  } catch (const InputError& e) {
    const std::string msg = e.what();
    CHECK(msg.rfind("job.toml:31: run \"trial at mark\": the trial changed nothing", 0) == 0);
    CHECK(msg.find("expected a reading that differs") != std::string::npos);
    CHECK(msg.find('\n') == std::string::npos);
  }
}

TEST_CASE("trial: missing phase, unknown plane, too few runs and bad weights are errors",
          "[solve]") {
  Readings r;
  r.source = "job.toml";
  r.runs.push_back(typed_run("original", 2.4, 318, {}, 20));
  r.runs.push_back(typed_run("trial", 1.6, 265, {weight(1, 0.5, 60, 0)}, 25));

  Readings no_phase = r;
  no_phase.runs[1].phase_deg = {std::nullopt};
  CHECK_THROWS_WITH(solve(no_phase, {}),
                    Catch::Contains("job.toml:25: run \"trial\": no phase for sensor 1"));

  Readings plane = r;
  plane.runs[1].trial[0].plane = 2;
  CHECK_THROWS_WITH(solve(plane, {}),
                    Catch::Contains("trial weight in plane 2, which does not exist"));

  Readings one = r;
  one.runs.pop_back();
  CHECK_THROWS_WITH(solve(one, {}), Catch::Contains("1 run(s); expected 2"));

  Readings same = r;
  same.runs[0].trial = same.runs[1].trial;
  CHECK_THROWS_WITH(solve(same, {}), Catch::Contains("has the same weights as the first run"));

  Readings mass = r;
  mass.runs[1].trial[0].mass_g = 0;
  CHECK_THROWS_WITH(solve(mass, {}), Catch::Contains("trial mass_g 0; expected a mass above 0 g"));

  Readings amplitude = r;
  amplitude.runs[1].amplitude = {-1};
  CHECK_THROWS_AS(solve(amplitude, {}), InputError);

  Readings recording = r;
  recording.runs[1].amplitude.clear();
  recording.runs[1].phase_deg.clear();
  recording.runs[1].recording = "trial.wav";
  CHECK_THROWS_WITH(solve(recording, {}),
                    Catch::Contains("recording \"trial.wav\" has not been measured"));
}

TEST_CASE("trial: a small trial warns by the 30/30 rule, a large one as risky", "[solve]") {
  Readings r;
  r.runs.push_back(typed_run("original", 2.0, 100));
  // 10 % amplitude and 5° phase change: below the 30/30 rule (acoem.com blog, "Selecting a
  // proper trial weight").
  r.runs.push_back(typed_run("small trial", 2.2, 105, {weight(1, 0.2, 50, 0)}));
  const SolveResult small = solve(r, {});
  CHECK(contains(small.warnings, "30/30 rule"));

  // 40 % amplitude change: enough, no warning.
  r.runs[1] = typed_run("trial", 2.8, 100, {weight(1, 0.2, 50, 0)});
  CHECK_FALSE(contains(solve(r, {}).warnings, "30/30 rule"));
  // 35° phase change at the same amplitude: enough.
  r.runs[1] = typed_run("trial", 2.0, 135, {weight(1, 0.2, 50, 0)});
  CHECK_FALSE(contains(solve(r, {}).warnings, "30/30 rule"));

  // Tripled vibration, and a trial pulling with several times the rotor's weight.
  r.runs[1] = typed_run("big trial", 6.0, 140, {weight(1, 10, 50, 0)});
  SolveOptions o;
  o.rotor_mass_kg = 0.5;
  o.speed_rpm = 3450;
  const SolveResult big = solve(r, o);
  CHECK(contains(big.warnings, "times the original"));
  CHECK(contains(big.warnings, "of the rotor's weight"));
}

TEST_CASE("trial: tolerance verdict and severity of each reading", "[solve]") {
  const ModelRotor m = single_plane(PhaseSense::kLag, AngleSense::kAgainstRotation);
  Readings r = m.readings(Method::kTrial);
  r.runs = {m.run("original", {}), m.run("trial", {weight(1, 1.5, 60, 30)})};
  SolveOptions o;
  o.speed_rpm = 3450;
  o.rotor_mass_kg = 0.72;
  o.grade_mm_s = 6.3;
  const SolveResult s = solve(r, o);
  REQUIRE(s.tolerance);
  // U_per = 1000·G·M/Ω, the formula of ISO 21940-11 (references.md).
  const double permissible = 1000.0 * 6.3 * 0.72 / (2 * kTestPi * 3450 / 60);
  CHECK(s.tolerance->permissible_gmm == Approx(permissible).epsilon(1e-12));
  CHECK(s.tolerance->grade == "G6.3");
  CHECK(s.tolerance->present_gmm[0] == Approx(84.0).epsilon(1e-9));
  CHECK_FALSE(s.tolerance->met);  // 84 g·mm on the rotor against about 12.6 permitted
  REQUIRE(s.readings.size() == 2);
  REQUIRE(s.readings[0].severity);
  // 84 g·mm × 0.031 = 2.604 mm/s peak → 1.841 mm/s RMS: zone C (above 1.8).
  CHECK(s.readings[0].severity->velocity_rms_mm_s == Approx(2.604 / std::sqrt(2.0)).epsilon(1e-9));
  CHECK(s.readings[0].severity->zone == Zone::kC);
}
