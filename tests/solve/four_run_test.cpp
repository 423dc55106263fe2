// SPDX-License-Identifier: GPL-3.0-or-later
// Four-run (amplitude-only) method.
#include <catch2/catch.hpp>

#include "geom/base/error.hpp"
#include "geom/solve/solve.hpp"
#include "model_rotor.hpp"

using namespace trimwright::solve;
using namespace trimwright::solve::test;
using trimwright::InputError;

namespace {

Run amplitude_run(const std::string& name, double amplitude,
                  std::vector<TrialWeight> weights = {}) {
  Run r;
  r.name = name;
  r.amplitude = {amplitude};
  r.trial = std::move(weights);
  return r;
}

Readings shreve() {
  // D. Shreve, "Balancing Without Phase", reliabilityweb.com (references.md): O = 10,
  // TW = 50 g at 0°, 120°, 240°, A = 7, 12, 18.
  Readings r;
  r.method = Method::kFourRun;
  r.units = "mm/s-pk";
  r.correction_radius_mm = 100;
  r.runs = {amplitude_run("original", 10), amplitude_run("0", 7, {weight(1, 50, 100, 0)}),
            amplitude_run("120", 12, {weight(1, 50, 100, 120)}),
            amplitude_run("240", 18, {weight(1, 50, 100, 240)})};
  return r;
}

/// Amplitudes only from a model rotor's runs.
Run strip_phase(Run r) {
  r.phase_deg.clear();
  return r;
}

}  // namespace

TEST_CASE("four-run: published amplitude-only data", "[solve]") {
  const SolveResult s = solve(shreve(), {});
  // D. Shreve, "Balancing Without Phase", reliabilityweb.com, as worked in references.md:
  // t = 8.505, correction 58.79 g at 40.1°, |(cos φ, sin φ)| = 0.948.
  CHECK(s.method == "four-run");
  CHECK(s.corrections[0].mass_g.value() == Approx(58.79).margin(0.005));
  CHECK(s.corrections[0].angle_deg == Approx(40.1).margin(0.05));
  REQUIRE(s.consistency);
  CHECK(*s.consistency == Approx(0.948).margin(0.0005));
  // |α| = t / TW: 8.505 per 50 g at 100 mm.
  CHECK(s.influence->coefficients[0].magnitude == Approx(8.505 / 5000).epsilon(1e-4));
  CHECK_FALSE(s.influence->coefficients[0].angle_deg);
  CHECK(s.warnings.empty());  // 5 % off consistent: below the warning threshold
}

TEST_CASE("four-run: exact rotors at any three or more positions and trial sizes", "[solve]") {
  for (auto angles : {AngleSense::kAgainstRotation, AngleSense::kWithRotation}) {
    ModelRotor m;
    m.unbalance = {polar_deg(140.0, 300.0)};
    m.alpha = {{polar_deg(0.02, 200.0)}};
    m.angles = angles;
    Readings r = m.readings(Method::kFourRun);
    r.runs = {strip_phase(m.run("original", {})), strip_phase(m.run("a", {weight(1, 1.0, 80, 10)})),
              strip_phase(m.run("b", {weight(1, 1.5, 80, 95)})),
              strip_phase(m.run("c", {weight(1, 1.2, 80, 250)}))};
    const SolveResult s = solve(r, {});
    const Cplx expected = m.expected_correction(0);
    CHECK(s.corrections[0].unbalance_gmm == Approx(std::abs(expected)).epsilon(1e-9));
    CHECK(angle_diff(s.corrections[0].angle_deg, deg_of(expected)) < 1e-7);
    CHECK(*s.consistency == Approx(1.0).epsilon(1e-9));
    CHECK(s.influence->coefficients[0].magnitude == Approx(0.02).epsilon(1e-9));
    CHECK(s.redundancy == 0);
  }
}

TEST_CASE("four-run: noisy redundant runs are fitted by least squares", "[solve]") {
  ModelRotor m;
  m.unbalance = {polar_deg(140.0, 300.0)};
  m.alpha = {{polar_deg(0.02, 200.0)}};
  m.noise = 0.01;
  Readings r = m.readings(Method::kFourRun);
  r.runs = {strip_phase(m.run("original", {}))};
  for (double a : {0.0, 60.0, 120.0, 180.0, 240.0, 300.0})
    r.runs.push_back(strip_phase(m.run("trial", {weight(1, 1.5, 80, a)})));
  const SolveResult s = solve(r, {});
  CHECK(s.redundancy == 3);
  CHECK(s.residual_rms > 0);
  CHECK(s.residual_rms < 0.05 * 2.8);  // readings are about 2.8; noise 1 %
  CHECK(s.corrections[0].unbalance_gmm == Approx(140.0).epsilon(0.05));
  CHECK(angle_diff(s.corrections[0].angle_deg, 120.0) < 3.0);
  CHECK(std::fabs(*s.consistency - 1.0) < 0.05);
}

TEST_CASE("four-run: contradictory data warn, impossible data are errors", "[solve]") {
  Readings r = shreve();
  r.runs[3].amplitude = {25};  // far from consistent with the others
  const SolveResult s = solve(r, {});
  REQUIRE(s.consistency);
  CHECK(std::fabs(*s.consistency - 1.0) > 0.10);
  bool warned = false;
  for (const auto& w : s.warnings) warned = warned || w.find("inconsistent") != std::string::npos;
  CHECK(warned);

  Readings low = shreve();
  low.runs[1].amplitude = {5};
  low.runs[2].amplitude = {6};
  low.runs[3].amplitude = {7};  // mean A² below O²: t² ≤ 0
  CHECK_THROWS_WITH(solve(low, {}), Catch::Contains("no real solution (t² = "));

  Readings three = shreve();
  three.runs.pop_back();
  CHECK_THROWS_WITH(solve(three, {}), Catch::Contains("at least 3 trial runs"));

  Readings same = shreve();
  same.runs[3].trial[0].angle_deg = 120;  // only two distinct positions
  CHECK_THROWS_WITH(solve(same, {}), Catch::Contains("three or more different angles"));

  Readings original = shreve();
  original.runs[0].trial = {weight(1, 1, 1, 0)};
  CHECK_THROWS_AS(solve(original, {}), InputError);
}
