// SPDX-License-Identifier: GPL-3.0-or-later
// Static balancing on a knife-edge or roller stand.
#include <catch2/catch.hpp>
#include <cmath>

#include "geom/base/error.hpp"
#include "geom/solve/solve.hpp"
#include "model_rotor.hpp"

using namespace trimwright::solve;
using namespace trimwright::solve::test;
using trimwright::InputError;

namespace {

Run settled(const std::string& name, double settle_deg, std::vector<TrialWeight> weights = {}) {
  Run r;
  r.name = name;
  r.settle_angle_deg = settle_deg;
  r.trial = std::move(weights);
  return r;
}

/// Where a rotor with unbalance u (g·mm, angle in the job's sense) and weights settles: the
/// total unbalance points down, so the rotor angle at the bottom is the total's angle.
double settle_of(Cplx u, const std::vector<TrialWeight>& weights) {
  for (const auto& w : weights) u += polar_deg(w.mass_g * w.radius_mm, w.angle_deg);
  return deg_of(u);
}

}  // namespace

TEST_CASE("static: trial at 3 o'clock gives U = m·r / tan β", "[solve]") {
  // Statics (references.md, "derived from statics"): heavy spot at the bottom, trial m_t at r_t
  // placed at 3 o'clock (90° from the heavy spot), the rotor turns by β: U = m_t·r_t / tan β.
  const double heavy_deg = 35.0, beta_deg = 40.0;
  Readings r;
  r.method = Method::kStatic;
  r.correction_radius_mm = 50;
  r.runs = {
      settled("heavy spot down", heavy_deg),
      settled("trial at 3 o'clock", heavy_deg + beta_deg, {weight(1, 2.0, 60, heavy_deg + 90)})};
  const SolveResult s = solve(r, {});
  const double expected = 2.0 * 60 / std::tan(beta_deg * kTestPi / 180);
  CHECK(s.corrections[0].unbalance_gmm == Approx(expected).epsilon(1e-12));
  CHECK(s.corrections[0].angle_deg == Approx(heavy_deg + 180).epsilon(1e-12));
  CHECK(s.heavy_spot_deg.value() == Approx(heavy_deg).epsilon(1e-12));
  CHECK(s.corrections[0].mass_g.value() == Approx(expected / 50).epsilon(1e-12));
  CHECK(s.method == "static");
  CHECK(s.warnings.empty());
}

TEST_CASE("static: exact rotors with trials anywhere, fitted over several runs", "[solve]") {
  const Cplx u = polar_deg(130.0, 250.0);
  const std::vector<std::vector<TrialWeight>> trials = {
      {},
      {weight(1, 1.5, 60, 10)},
      {weight(1, 1.0, 60, 160)},
      {weight(1, 0.5, 60, 300), weight(1, 0.5, 60, 330)}};
  Readings r;
  r.method = Method::kStatic;
  for (const auto& t : trials) r.runs.push_back(settled("run", settle_of(u, t), t));
  const SolveResult s = solve(r, {});
  CHECK(s.corrections[0].unbalance_gmm == Approx(130.0).epsilon(1e-9));
  CHECK(angle_diff(s.corrections[0].angle_deg, 70.0) < 1e-9);
  CHECK(s.redundancy == 2);
  CHECK(s.residual_rms < 1e-9);
  REQUIRE(s.settles.size() == 4);

  // Half a degree of reading error: the fit stays close and reports the misfit.
  r.runs[1].settle_angle_deg = *r.runs[1].settle_angle_deg + 0.5;
  const SolveResult n = solve(r, {});
  CHECK(n.residual_rms > 0.05);
  CHECK(n.corrections[0].unbalance_gmm == Approx(130.0).epsilon(0.03));

  // With the trial left on, the correction is what to add on top of it.
  Readings keep;
  keep.method = Method::kStatic;
  keep.keep_trial = true;
  keep.runs = {settled("down", settle_of(u, {})),
               settled("trial", settle_of(u, trials[1]), trials[1])};
  const SolveResult k = solve(keep, {});
  const Cplx add = -u - polar_deg(90.0, 10.0);
  CHECK(k.corrections[0].unbalance_gmm == Approx(std::abs(add)).epsilon(1e-9));
  CHECK(angle_diff(k.corrections[0].angle_deg, deg_of(add)) < 1e-9);
}

TEST_CASE("static: degenerate stand readings", "[solve]") {
  Readings r;
  r.method = Method::kStatic;
  r.source = "job.toml";
  r.runs = {settled("down", 35), settled("trial", 35, {weight(1, 2, 60, 125)})};
  r.runs[1].line = 44;
  CHECK_THROWS_WITH(solve(r, {}),
                    Catch::Contains("job.toml:44: run \"trial\": the trial changed nothing"));

  // The heavy side would have to be at the top: contradictory.
  r.runs[1].settle_angle_deg = 35 - 40;
  CHECK_THROWS_WITH(solve(r, {}), Catch::Contains("put the heavy side at"));

  // A tiny turn: friction could be most of it.
  r.runs[1].settle_angle_deg = 38;
  const SolveResult s = solve(r, {});
  REQUIRE_FALSE(s.warnings.empty());
  CHECK(s.warnings[0].find("turned the rotor 3.0°") != std::string::npos);

  r.runs[1].settle_angle_deg.reset();
  CHECK_THROWS_WITH(solve(r, {}), Catch::Contains("no settle angle"));

  Readings cancel;
  cancel.method = Method::kStatic;
  cancel.runs = {settled("a", 10), settled("b", 30, {weight(1, 1, 50, 0), weight(1, 1, 50, 180)})};
  CHECK_THROWS_WITH(solve(cancel, {}), Catch::Contains("cancel out"));

  Readings no_trial;
  no_trial.method = Method::kStatic;
  no_trial.runs = {settled("a", 10), settled("b", 10)};
  CHECK_THROWS_WITH(solve(no_trial, {}), Catch::Contains("no run has a trial weight"));
}
