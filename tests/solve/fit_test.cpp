// SPDX-License-Identifier: GPL-3.0-or-later
// General least-squares fit: runs × sensors × planes, residuals, the trimming loop and reuse of
// fitted influence coefficients.
#include <catch2/catch.hpp>

#include "geom/base/error.hpp"
#include "geom/solve/solve.hpp"
#include "model_rotor.hpp"

using namespace trimwright::solve;
using namespace trimwright::solve::test;
using trimwright::InputError;

namespace {

ModelRotor three_plane_rotor() {
  ModelRotor m;
  m.unbalance = {polar_deg(50.0, 10.0), polar_deg(80.0, 135.0), polar_deg(30.0, 290.0)};
  m.alpha = {{polar_deg(0.030, 20.0), polar_deg(0.012, 80.0), polar_deg(0.004, 150.0)},
             {polar_deg(0.010, 330.0), polar_deg(0.025, 15.0), polar_deg(0.009, 100.0)},
             {polar_deg(0.005, 200.0), polar_deg(0.011, 60.0), polar_deg(0.027, 300.0)},
             {polar_deg(0.015, 45.0), polar_deg(0.015, 190.0), polar_deg(0.012, 10.0)}};
  return m;
}

std::vector<Run> three_plane_runs(const ModelRotor& m) {
  return {m.run("original", {}),
          m.run("p1", {weight(1, 1.0, 40, 0)}),
          m.run("p2", {weight(2, 1.2, 40, 120)}),
          m.run("p3", {weight(3, 0.9, 40, 240)}),
          m.run("p1+p3", {weight(1, 0.5, 40, 200), weight(3, 0.7, 40, 30)}),
          m.run("p2 two weights", {weight(2, 0.6, 40, 10), weight(2, 0.6, 40, 70)}),
          m.run("all", {weight(1, 0.4, 40, 300), weight(2, 0.4, 40, 45), weight(3, 0.4, 40, 160)})};
}

}  // namespace

TEST_CASE("fit: an exact three-plane, four-sensor rotor with redundant runs", "[solve]") {
  for (auto phase : {PhaseSense::kLag, PhaseSense::kLead})
    for (auto angles : {AngleSense::kAgainstRotation, AngleSense::kWithRotation}) {
      ModelRotor m = three_plane_rotor();
      m.phase = phase;
      m.angles = angles;
      Readings r = m.readings(Method::kFit);
      r.runs = three_plane_runs(m);
      const SolveResult s = solve(r, {});
      REQUIRE(s.corrections.size() == 3);
      for (std::size_t p = 0; p < 3; ++p) {
        const Cplx expected = m.expected_correction(p);
        CHECK(s.corrections[p].unbalance_gmm == Approx(std::abs(expected)).epsilon(1e-9));
        CHECK(angle_diff(s.corrections[p].angle_deg, deg_of(expected)) < 1e-9);
      }
      CHECK(s.redundancy == (7 - 4) * 4);
      CHECK(s.residual_rms < 1e-12);
      CHECK(s.readings.size() == 7 * 4);
      for (const auto& p : s.predicted) CHECK(p.amplitude < 1e-12);
      CHECK(s.condition_number.value() > 1.0);
    }
}

TEST_CASE("fit: noisy readings leave least-squares residuals orthogonal to the runs", "[solve]") {
  ModelRotor m = three_plane_rotor();
  m.noise = 0.02;
  Readings r = m.readings(Method::kFit);
  r.runs = three_plane_runs(m);
  for (int k = 0; k < 5; ++k)
    r.runs.push_back(m.run("extra", {weight(1 + k % 3, 0.8, 40, 70.0 * k)}));
  const SolveResult s = solve(r, {});
  CHECK(s.residual_rms > 1e-4);
  double sum_sq = 0;
  for (const auto& f : s.readings) sum_sq += f.residual * f.residual;
  CHECK(s.residual_rms == Approx(std::sqrt(sum_sq / static_cast<double>(s.readings.size()))));
  // Normal equations: for each sensor, Σ_r e_r = 0 and Σ_r conj(W_rp)·e_r = 0 (lag and
  // against rotation: the job's sense is the internal one).
  for (int sensor = 1; sensor <= 4; ++sensor) {
    Cplx sum = 0;
    std::vector<Cplx> by_plane(3, Cplx(0, 0));
    for (const auto& f : s.readings) {
      if (f.sensor != sensor) continue;
      const Cplx e =
          polar_deg(f.amplitude, *f.phase_deg) - polar_deg(f.fitted_amplitude, *f.fitted_phase_deg);
      CHECK(std::abs(e) == Approx(f.residual).margin(1e-12));
      sum += e;
      for (const auto& t : r.runs[static_cast<std::size_t>(f.run_index)].trial)
        by_plane[static_cast<std::size_t>(t.plane - 1)] += std::conj(m.physical(t)) * e;
    }
    CHECK(std::abs(sum) < 1e-10);
    for (const Cplx& b : by_plane) CHECK(std::abs(b) < 1e-7);
  }
  // Noise of 2 % moves the corrections by a few per cent at most.
  for (std::size_t p = 0; p < 3; ++p)
    CHECK(s.corrections[p].unbalance_gmm == Approx(std::abs(m.unbalance[p])).epsilon(0.1));
}

TEST_CASE("fit: the trimming loop with a fixture's settings as weights", "[solve]") {
  ModelRotor m;
  m.unbalance = {polar_deg(95.0, 75.0)};
  m.alpha = {{polar_deg(0.022, 140.0)}};
  m.angles = AngleSense::kWithRotation;
  Readings r = m.readings(Method::kFit);
  r.keep_trial = true;
  r.correction_radius_mm = 1;
  // Each fixture setting already converted to the unbalance it adds (g·mm at an angle).
  r.runs = {m.run("fixture at zero", {weight(1, 4.0, 1, 0)}),
            m.run("first setting", {weight(1, 60.0, 1, 240)}),
            m.run("second setting", {weight(1, 88.0, 1, 250)})};
  const SolveResult s = solve(r, {});
  const Cplx total = m.expected_correction(0);
  REQUIRE(s.combined.size() == 1);
  // What the fixture should produce, and what to add on top of the last setting.
  CHECK(s.combined[0].unbalance_gmm == Approx(std::abs(total)).epsilon(1e-9));
  CHECK(angle_diff(s.combined[0].angle_deg, deg_of(total)) < 1e-9);
  const Cplx add = total - polar_deg(88.0, 250.0);
  CHECK(s.corrections[0].unbalance_gmm == Approx(std::abs(add)).epsilon(1e-9));
  // The residual unbalance after the last setting, from the last reading and |α|.
  CHECK(s.corrections[0].unbalance_gmm == Approx(r.runs.back().amplitude[0] / 0.022).epsilon(1e-9));
  CHECK(unbalance_from_reading(r.runs.back().amplitude[0], 0.022) ==
        Approx(std::abs(add)).epsilon(1e-9));
}

TEST_CASE("fit: saved influence coefficients turn one reading into a correction", "[solve]") {
  ModelRotor m = three_plane_rotor();
  m.angles = AngleSense::kWithRotation;
  m.phase = PhaseSense::kLead;
  Readings r = m.readings(Method::kFit);
  r.runs = three_plane_runs(m);
  const SolveResult fitted = solve(r, {});
  REQUIRE(fitted.influence);

  // The wheels were dressed: a new unbalance, one reading.
  m.unbalance = {polar_deg(20.0, 300.0), polar_deg(45.0, 10.0), polar_deg(12.0, 100.0)};
  Readings again = m.readings(Method::kFit);
  again.runs = {m.run("after dressing", {})};
  SolveOptions o;
  o.influence = fitted.influence;
  const SolveResult s = solve(again, o);
  for (std::size_t p = 0; p < 3; ++p) {
    const Cplx expected = m.expected_correction(p);
    CHECK(s.corrections[p].unbalance_gmm == Approx(std::abs(expected)).epsilon(1e-9));
    CHECK(angle_diff(s.corrections[p].angle_deg, deg_of(expected)) < 1e-9);
  }

  // A reading with a weight still on: the correction is what to add on top of it.
  again.runs = {m.run("with last correction", {weight(2, 0.5, 40, 33)})};
  again.keep_trial = true;
  const SolveResult k = solve(again, o);
  const Cplx add = m.expected_correction(1) - polar_deg(20.0, 33.0);
  CHECK(k.corrections[1].unbalance_gmm == Approx(std::abs(add)).epsilon(1e-9));

  // A set for other units or another shape is refused.
  InfluenceSet other = *fitted.influence;
  other.units = "g-pk";
  o.influence = other;
  CHECK_THROWS_WITH(solve(again, o), Catch::Contains("expected the readings' units \"mm/s-pk\""));
}

TEST_CASE("fit: too few runs, too few sensors and unseparated planes are errors", "[solve]") {
  ModelRotor m = three_plane_rotor();
  Readings r = m.readings(Method::kFit);
  auto runs = three_plane_runs(m);
  r.runs.assign(runs.begin(), runs.begin() + 3);
  r.planes = 3;
  CHECK_THROWS_WITH(solve(r, {}), Catch::Contains("3 run(s) for 3 plane(s); expected at least 4"));

  r.runs = runs;
  for (auto& run : r.runs) run.amplitude.resize(2), run.phase_deg.resize(2);
  CHECK_THROWS_WITH(solve(r, {}), Catch::Contains("2 sensor(s) for 3 planes"));

  // Planes 1 and 3 always carry weights in the same proportion.
  r.runs = {m.run("original", {}), m.run("a", {weight(1, 1, 40, 0), weight(3, 2, 40, 0)}),
            m.run("b", {weight(2, 1, 40, 0)}),
            m.run("c", {weight(1, 2, 40, 90), weight(3, 4, 40, 90)})};
  CHECK_THROWS_WITH(solve(r, {}), Catch::Contains("do not separate the planes"));

  Readings many = m.readings(Method::kFit);
  many.runs = three_plane_runs(m);
  many.runs[1].trial[0].plane = 1000;
  CHECK_THROWS_WITH(solve(many, {}),
                    Catch::Contains("a weight in plane 1000; expected planes 1 to 16"));

  // Plane 3's weights move but no sensor responds to them.
  ModelRotor deaf = m;
  for (auto& row : deaf.alpha) row[2] = 0;
  r.runs = three_plane_runs(deaf);
  r.planes = 0;
  CHECK_THROWS_WITH(solve(r, {}), Catch::Contains("the weights in plane 3 changed nothing"));

  Readings mixed = m.readings(Method::kFit);
  mixed.runs = three_plane_runs(m);
  mixed.runs[3].amplitude.pop_back();
  mixed.runs[3].phase_deg.pop_back();
  CHECK_THROWS_WITH(solve(mixed, {}), Catch::Contains("run \"p3\": 3 amplitudes; expected 4"));
}

TEST_CASE("fit: readings that do not fit a linear model are flagged", "[solve]") {
  ModelRotor m;
  m.unbalance = {polar_deg(95.0, 75.0)};
  m.alpha = {{polar_deg(0.022, 140.0)}};
  Readings r = m.readings(Method::kFit);
  r.runs = {m.run("original", {}), m.run("a", {weight(1, 1.0, 50, 0)}),
            m.run("b", {weight(1, 1.0, 50, 120)}), m.run("c", {weight(1, 1.0, 50, 240)})};
  r.runs[2].amplitude[0] *= 1.8;  // a mistyped reading
  const SolveResult s = solve(r, {});
  REQUIRE_FALSE(s.warnings.empty());
  CHECK(s.warnings[0].find("do not fit one linear model") != std::string::npos);
  // The mistyped reading has the largest residual.
  std::size_t worst = 0;
  for (std::size_t i = 0; i < s.readings.size(); ++i)
    if (s.readings[i].residual > s.readings[worst].residual) worst = i;
  CHECK(s.readings[worst].run == "b");
}
