// SPDX-License-Identifier: GPL-3.0-or-later
// Index method: rotor unbalance against adapter error by remounting the rotor 180°.
#include <catch2/catch.hpp>

#include "geom/base/error.hpp"
#include "geom/solve/solve.hpp"
#include "model_rotor.hpp"

using namespace trimwright::solve;
using namespace trimwright::solve::test;
using trimwright::InputError;

namespace {

Run indexed(const std::string& name, Cplx reading, double index_deg,
            std::vector<TrialWeight> weights = {}) {
  Run r = typed_run(name, std::abs(reading), deg_of(reading), std::move(weights));
  r.index_deg = index_deg;
  return r;
}

}  // namespace

TEST_CASE("index: half the difference is the rotor's, half the sum the adapter's", "[solve]") {
  // Bloch & Geitner, Machinery Component Maintenance and Repair, Fig. 6-38 (the half-sum form
  // from memory; references.md), with the phase reference on the adapter.
  const Cplx v1 = polar_deg(3.0, 40.0), v2 = polar_deg(1.4, 170.0);
  Readings r;
  r.method = Method::kIndex;
  r.runs = {indexed("index 0", v1, 0), indexed("index 180", v2, 180)};
  const SolveResult s = solve(r, {});
  REQUIRE(s.adapter);
  const Cplx rotor = (v1 - v2) / 2.0, adapter = (v1 + v2) / 2.0;
  CHECK(s.adapter->rotor_reading.magnitude == Approx(std::abs(rotor)).epsilon(1e-12));
  CHECK(angle_diff(s.adapter->rotor_reading.angle_deg, deg_of(rotor)) < 1e-9);
  CHECK(s.adapter->adapter_reading.magnitude == Approx(std::abs(adapter)).epsilon(1e-12));
  CHECK(angle_diff(s.adapter->adapter_reading.angle_deg, deg_of(adapter)) < 1e-9);
  // No influence coefficient: shares only, with a warning.
  CHECK(s.corrections.empty());
  REQUIRE_FALSE(s.warnings.empty());

  // With the reference on the rotor the roles swap.
  r.index_reference = IndexReference::kRotor;
  const SolveResult o = solve(r, {});
  CHECK(o.adapter->rotor_reading.magnitude == Approx(std::abs(adapter)).epsilon(1e-12));
  CHECK(o.adapter->adapter_reading.magnitude == Approx(std::abs(rotor)).epsilon(1e-12));
}

TEST_CASE("index: an exact rotor on an eccentric adapter, with a trial run", "[solve]") {
  for (auto reference : {IndexReference::kAdapter, IndexReference::kRotor})
    for (auto angles : {AngleSense::kAgainstRotation, AngleSense::kWithRotation}) {
      // Physical sense: rotor unbalance u (rotor frame), adapter unbalance a (adapter frame).
      const Cplx u = polar_deg(70.0, 100.0), a = polar_deg(25.0, 310.0),
                 alpha = polar_deg(0.02, 30.0);
      auto reading = [&](double index_deg, const std::vector<TrialWeight>& weights) {
        const double psi = angles == AngleSense::kAgainstRotation ? index_deg : -index_deg;
        Cplx rotor = u;
        for (const auto& w : weights)
          rotor += polar_deg(w.mass_g * w.radius_mm,
                             angles == AngleSense::kAgainstRotation ? w.angle_deg : -w.angle_deg);
        if (reference == IndexReference::kAdapter) return alpha * (a + rotor * polar_deg(1, psi));
        return alpha * (a * polar_deg(1, -psi) + rotor);
      };
      Readings r;
      r.method = Method::kIndex;
      r.angles = angles;
      r.index_reference = reference;
      const auto trial = std::vector<TrialWeight>{weight(1, 1.0, 40, 60)};
      r.runs = {indexed("0", reading(0, {}), 0), indexed("180", reading(180, {}), 180),
                indexed("trial", reading(0, trial), 0, trial)};
      const SolveResult s = solve(r, {});
      INFO((s.warnings.empty() ? std::string("no warnings") : s.warnings[0]));
      REQUIRE(s.corrections.size() == 1);
      const Cplx expected_rotor = angles == AngleSense::kAgainstRotation ? -u : std::conj(-u);
      const Cplx expected_adapter = angles == AngleSense::kAgainstRotation ? -a : std::conj(-a);
      CHECK(s.corrections[0].unbalance_gmm == Approx(70.0).epsilon(1e-9));
      CHECK(angle_diff(s.corrections[0].angle_deg, deg_of(expected_rotor)) < 1e-9);
      REQUIRE(s.adapter->adapter_correction);
      CHECK(s.adapter->adapter_correction->unbalance_gmm == Approx(25.0).epsilon(1e-9));
      CHECK(angle_diff(s.adapter->adapter_correction->angle_deg, deg_of(expected_adapter)) < 1e-9);
      CHECK(s.influence->coefficients[0].magnitude == Approx(0.02).epsilon(1e-9));
    }
}

TEST_CASE("index: runs at one position only are an error", "[solve]") {
  Readings r;
  r.method = Method::kIndex;
  r.runs = {indexed("a", polar_deg(3, 40), 0), indexed("b", polar_deg(3.1, 42), 0)};
  CHECK_THROWS_WITH(solve(r, {}), Catch::Contains("every run is at the same index position"));
  r.runs.pop_back();
  CHECK_THROWS_WITH(solve(r, {}), Catch::Contains("expected at least 2"));
}

TEST_CASE("index: noisy readings at four positions are fitted by least squares", "[solve]") {
  const Cplx rotor = polar_deg(2.0, 70.0), adapter = polar_deg(0.8, 200.0);
  const Cplx noise[] = {Cplx(0.02, -0.01), Cplx(-0.015, 0.02), Cplx(0.01, 0.01),
                        Cplx(-0.02, -0.015)};
  Readings r;
  r.method = Method::kIndex;
  const double positions[] = {0, 90, 180, 270};
  for (int k = 0; k < 4; ++k)
    r.runs.push_back(
        indexed("k", adapter + rotor * polar_deg(1, positions[k]) + noise[k], positions[k]));
  const SolveResult s = solve(r, {});
  CHECK(s.redundancy == 2);
  CHECK(s.residual_rms > 0.005);
  CHECK(s.residual_rms < 0.03);
  // Least squares with the columns 1 and e^{iψ} orthogonal over 0/90/180/270: the shares move by
  // the mean of the noise only.
  Cplx mean_noise = 0, turned_noise = 0;
  for (int k = 0; k < 4; ++k) {
    mean_noise += noise[k] / 4.0;
    turned_noise += noise[k] * polar_deg(1, -positions[k]) / 4.0;
  }
  CHECK(s.adapter->adapter_reading.magnitude ==
        Approx(std::abs(adapter + mean_noise)).epsilon(1e-12));
  CHECK(s.adapter->rotor_reading.magnitude ==
        Approx(std::abs(rotor + turned_noise)).epsilon(1e-12));
}
