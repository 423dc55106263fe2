// SPDX-License-Identifier: GPL-3.0-or-later
// Conventions: angle sense and phase sense, checked on published single-plane examples.
#include "geom/solve/conventions.hpp"

#include <catch2/catch.hpp>

#include "geom/solve/solve.hpp"
#include "model_rotor.hpp"

using namespace trimwright::solve;
using namespace trimwright::solve::test;

namespace {

// Vector tutorial on single-plane balancing (acoem.com blog, "A vector approach to single-plane
// balancing"): O = 7 mils∠160°, trial 100 g at 0°, O+T = 5 mils∠70°; exact complex result
// 81.37 g at −35.54° (references.md). The trial radius is not given there; any radius works
// when the correction is expressed at the same radius (50 mm here).
Readings acoem(PhaseSense phase, AngleSense angles) {
  Readings r;
  r.method = Method::kTrial;
  r.units = "mil-pp";
  r.phase = phase;
  r.angles = angles;
  r.correction_radius_mm = 50;
  r.runs.push_back(typed_run("original", 7, 160));
  r.runs.push_back(typed_run("trial", 5, 70, {weight(1, 100, 50, 0)}));
  return r;
}

}  // namespace

TEST_CASE("conventions: published single-plane example with phase lag, angles against rotation",
          "[solve]") {
  const SolveResult s = solve(acoem(PhaseSense::kLag, AngleSense::kAgainstRotation), {});
  REQUIRE(s.corrections.size() == 1);
  // acoem.com blog, "A vector approach to single-plane balancing": 81.37 g at −35.54°.
  CHECK(s.corrections[0].mass_g.value() == Approx(81.37).margin(0.005));
  CHECK(s.corrections[0].angle_deg == Approx(360 - 35.54).margin(0.005));
  CHECK(s.method == "trial");
}

TEST_CASE("conventions: mixing the senses mirrors the published answer", "[solve]") {
  // acoem.com blog, "A vector approach to single-plane balancing": mirrored, +35.54°
  // (references.md: "with the angle sense mirrored the answer is +35.54°").
  const SolveResult with = solve(acoem(PhaseSense::kLag, AngleSense::kWithRotation), {});
  CHECK(with.corrections[0].mass_g.value() == Approx(81.37).margin(0.005));
  CHECK(with.corrections[0].angle_deg == Approx(35.54).margin(0.005));
  // Phase read as lead with angles against rotation: also mirrored.
  const SolveResult lead = solve(acoem(PhaseSense::kLead, AngleSense::kAgainstRotation), {});
  CHECK(lead.corrections[0].angle_deg == Approx(35.54).margin(0.005));
  // Both flipped: the senses agree again and the answer is the unmirrored one.
  const SolveResult both = solve(acoem(PhaseSense::kLead, AngleSense::kWithRotation), {});
  CHECK(both.corrections[0].angle_deg == Approx(360 - 35.54).margin(0.005));
  CHECK(both.corrections[0].mass_g.value() == Approx(81.37).margin(0.005));
}

TEST_CASE("conventions: grinding-wheel textbook problem", "[solve]") {
  // S. S. Rao, Mechanical Vibrations, balancing chapter (attribution from memory; references.md):
  // 1200 rpm; original 0.2 mm∠40°; trial 0.2 kg at −65° at r = 65 mm; with trial 0.5 mm∠150°
  // → W = 0.0668 kg at −13.30°.
  Readings r;
  r.method = Method::kTrial;
  r.units = "mm";
  r.correction_radius_mm = 65;
  r.runs.push_back(typed_run("original", 0.2, 40));
  r.runs.push_back(typed_run("with trial", 0.5, 150, {weight(1, 200, 65, -65)}));
  const SolveResult s = solve(r, SolveOptions{});
  CHECK(s.corrections[0].mass_g.value() == Approx(66.8).margin(0.05));
  CHECK(s.corrections[0].angle_deg == Approx(360 - 13.30).margin(0.005));
}

TEST_CASE("conventions: conversions to and from the internal sense", "[solve]") {
  using trimwright::solve::from_polar_deg;
  // Lag and against rotation pass through; lead and with-rotation are conjugated.
  const auto v = reading_to_internal(2.0, 30.0, PhaseSense::kLag);
  CHECK(std::abs(v - polar_deg(2.0, 30.0)) < 1e-12);
  const auto vl = reading_to_internal(2.0, 30.0, PhaseSense::kLead);
  CHECK(std::abs(vl - polar_deg(2.0, -30.0)) < 1e-12);
  const auto w = weight_to_internal(5.0, 100.0, AngleSense::kWithRotation);
  CHECK(std::abs(w - polar_deg(5.0, -100.0)) < 1e-12);
  CHECK(angle_deg_of(internal_to_angle_sense(w, AngleSense::kWithRotation)) == Approx(100.0));
  CHECK(angle_deg_of(internal_to_phase_sense(vl, PhaseSense::kLead)) == Approx(30.0));
  CHECK(angle_deg_of(from_polar_deg(1.0, -90.0)) == Approx(270.0));
  // Seen from the fixture side: against a clockwise rotation counts counterclockwise.
  CHECK(angles_count_ccw_seen_from_fixture(AngleSense::kAgainstRotation, Rotation::kCw));
  CHECK_FALSE(angles_count_ccw_seen_from_fixture(AngleSense::kAgainstRotation, Rotation::kCcw));
  CHECK(angles_count_ccw_seen_from_fixture(AngleSense::kWithRotation, Rotation::kCcw));
  CHECK_FALSE(angles_count_ccw_seen_from_fixture(AngleSense::kWithRotation, Rotation::kCw));
}
