// SPDX-License-Identifier: GPL-3.0-or-later
// Trial-weight advice: starting size, the 30/30 rule and risk warnings.
#include "geom/solve/trial_advice.hpp"

#include <catch2/catch.hpp>
#include <cmath>

#include "geom/base/error.hpp"

using namespace trimwright::solve;
using trimwright::InputError;

TEST_CASE("trial advice: a trial whose force is 10 % of the rotor's weight", "[solve]") {
  // Common practice, no source: centrifugal force ≈ 10 % of the rotor's weight. F = U·Ω²,
  // weight = M·g with g = 9.806 65 m/s² (CGPM).
  const TrialSuggestion t = suggest_trial(0.72, 60, 3450);
  const double omega = 2 * 3.14159265358979323846 * 3450 / 60;
  CHECK(t.force_n == Approx(0.1 * 0.72 * 9.80665));
  CHECK(t.unbalance_gmm * 1e-6 * omega * omega == Approx(t.force_n));
  CHECK(t.unbalance_gmm == Approx(5.4097).epsilon(1e-4));
  CHECK(t.mass_g == Approx(t.unbalance_gmm / 60));
  CHECK(centrifugal_force_n(t.unbalance_gmm, 3450) == Approx(t.force_n));
  // Half the speed: four times the trial.
  CHECK(suggest_trial(0.72, 60, 1725).unbalance_gmm == Approx(4 * t.unbalance_gmm));
  CHECK_THROWS_AS(suggest_trial(0, 60, 3450), InputError);
  CHECK_THROWS_AS(suggest_trial(1, 60, 3450, -0.1), InputError);
}

TEST_CASE("trial advice: the 30/30 rule", "[solve]") {
  // "30/30" acceptance rule: ≥ 30 % amplitude change or ≥ 30° phase change (acoem.com blog,
  // "Selecting a proper trial weight"; references.md).
  CHECK(trial_effect(10, 0.0, 13, 0.0).enough);
  CHECK(trial_effect(10, 0.0, 7, 0.0).enough);
  CHECK_FALSE(trial_effect(10, 0.0, 12.9, 29.0).enough);
  CHECK(trial_effect(10, 350.0, 10, 20.0).enough);  // 30° across 0°
  CHECK(trial_effect(10, 350.0, 10, 20.0).phase_change_deg.value() == Approx(30));
  CHECK_FALSE(trial_effect(10, std::nullopt, 12, std::nullopt).enough);
  CHECK(trial_effect(10, std::nullopt, 12, std::nullopt).amplitude_change_percent == Approx(20));
}

TEST_CASE("trial advice: risky trials are flagged", "[solve]") {
  // A trial pulling with 1.2× the rotor's weight, and a run that tripled the vibration.
  const double omega = 2 * 3.14159265358979323846 * 3000 / 60;
  const double big_gmm = 1.2 * 0.5 * 9.80665 / (omega * omega) * 1e6;
  CHECK(trial_risk_warnings(big_gmm, 0.5, 3000, 0, 0).size() == 1);
  CHECK(trial_risk_warnings(0.9 * big_gmm / 1.2, 0.5, 3000, 0, 0).empty());
  CHECK(trial_risk_warnings(1, 0, 0, 2.0, 6.0).size() == 1);
  CHECK(trial_risk_warnings(1, 0, 0, 2.0, 3.9).empty());
}
