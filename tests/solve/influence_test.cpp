// SPDX-License-Identifier: GPL-3.0-or-later
// Influence-coefficient files: round trip, reuse, and bad files.
#include "geom/solve/influence.hpp"

#include <catch2/catch.hpp>
#include <cstdio>
#include <fstream>

#include "geom/base/error.hpp"
#include "geom/solve/solve.hpp"
#include "model_rotor.hpp"

using namespace trimwright::solve;
using namespace trimwright::solve::test;
using trimwright::FileError;
using trimwright::InputError;

namespace {

std::string temp_path(const std::string& name) {
  return std::string(TRIMWRIGHT_BINARY_DIR) + "/solve_test_" + name;
}

const char* kValid = R"(format = "trimwright-influence"
version = 1
units = "mm/s-pk"
phase = "lag"
speed_rpm = 3450
sensors = 1
planes = 1
[[coefficient]]
sensor = 1
plane = 1
magnitude_per_gmm = 0.02
angle_deg = 30
)";

}  // namespace

TEST_CASE("influence: saved and loaded coefficients give the same correction", "[solve]") {
  ModelRotor m;
  m.unbalance = {polar_deg(60.0, 40.0), polar_deg(35.0, 250.0)};
  m.alpha = {{polar_deg(0.030, 20.0), polar_deg(0.012, 80.0)},
             {polar_deg(0.010, 330.0), polar_deg(0.025, 15.0)}};
  m.phase = PhaseSense::kLead;
  Readings r = m.readings(Method::kTwoPlane);
  r.correction_radius_mm = 55;
  r.sensor_notes = {"left bearing, \"horizontal\"", "right bearing"};
  r.runs = {m.run("original", {}), m.run("trial 1", {weight(1, 1.0, 50, 90)}),
            m.run("trial 2", {weight(2, 0.8, 50, 200)})};
  SolveOptions o;
  o.speed_rpm = 2850;
  const SolveResult fitted = solve(r, o);
  InfluenceSet set = *fitted.influence;
  set.note = "left wheel, 36 grit";
  const std::string path = temp_path("influence.toml");
  save_influence(path, set);
  const InfluenceSet loaded = load_influence(path);
  CHECK(loaded.sensors == 2);
  CHECK(loaded.planes == 2);
  CHECK(loaded.units == "mm/s-pk");
  CHECK(loaded.phase == PhaseSense::kLead);
  CHECK(loaded.speed_rpm == 2850);
  CHECK(loaded.correction_radius_mm == 55);
  CHECK(loaded.sensor_notes == r.sensor_notes);
  CHECK(loaded.note == set.note);
  CHECK(loaded.method == "two-plane");
  REQUIRE(loaded.coefficients.size() == 4);
  for (std::size_t i = 0; i < 4; ++i) {
    CHECK(loaded.coefficients[i].magnitude == set.coefficients[i].magnitude);  // exact round trip
    CHECK(loaded.coefficients[i].angle_deg == set.coefficients[i].angle_deg);
  }

  // After a change of wheel one reading and the saved file give the correction.
  m.unbalance = {polar_deg(22.0, 200.0), polar_deg(41.0, 95.0)};
  Readings again = m.readings(Method::kTwoPlane);
  again.runs = {m.run("new wheel", {})};
  again.influence_file = path;
  const SolveResult s = solve(again, o);
  // No radius in the job: masses at the radius the coefficients were saved with.
  CHECK(s.corrections[0].radius_mm == 55);
  CHECK(s.corrections[0].mass_g.value() == Approx(s.corrections[0].unbalance_gmm / 55));
  for (std::size_t p = 0; p < 2; ++p) {
    const Cplx expected = m.expected_correction(p);
    CHECK(s.corrections[p].unbalance_gmm == Approx(std::abs(expected)).epsilon(1e-9));
    CHECK(angle_diff(s.corrections[p].angle_deg, deg_of(expected)) < 1e-9);
  }
  // Measured at another speed: a warning.
  o.speed_rpm = 3450;
  CHECK_FALSE(solve(again, o).warnings.empty());
  std::remove(path.c_str());
}

TEST_CASE("influence: bad files are clear errors", "[solve]") {
  CHECK_THROWS_AS(load_influence(temp_path("does-not-exist.toml")), FileError);
  CHECK_NOTHROW(influence_from_toml(kValid, "a.toml"));
  std::string text = kValid;
  CHECK_THROWS_WITH(influence_from_toml(text + "oops", "a.toml"), Catch::StartsWith("a.toml:13: "));
  std::string bad_phase = text;
  bad_phase.replace(bad_phase.find("\"lag\""), 5, "\"late\"");
  CHECK_THROWS_WITH(influence_from_toml(bad_phase, "a.toml"),
                    Catch::Contains("a.toml:4: phase: \"late\"; expected \"lag\" or \"lead\""));
  std::string bad_plane = text;
  bad_plane.replace(bad_plane.find("plane = 1"), 9, "plane = 3");
  CHECK_THROWS_WITH(influence_from_toml(bad_plane, "a.toml"),
                    Catch::Contains("a.toml:10: coefficient.plane: 3; expected 1 to 1"));
  std::string text_magnitude = text;
  text_magnitude.replace(text_magnitude.find("0.02"), 4, "\"big\"");
  CHECK_THROWS_WITH(influence_from_toml(text_magnitude, "a.toml"), Catch::Contains("not a number"));
  CHECK_THROWS_WITH(influence_from_toml("format = \"other\"", "a.toml"), Catch::Contains("format"));
  std::string missing = text.substr(0, text.find("[[coefficient]]"));
  CHECK_THROWS_WITH(influence_from_toml(missing, "a.toml"),
                    Catch::Contains("coefficient: missing"));

  // Amplitude-only coefficients load but cannot give a phase correction.
  std::string no_angle = text.substr(0, text.find("angle_deg"));
  const InfluenceSet set = influence_from_toml(no_angle, "a.toml");
  CHECK_FALSE(set.coefficients[0].angle_deg);
  Readings r;
  r.runs = {typed_run("now", 2.0, 100)};
  SolveOptions o;
  o.influence = set;
  CHECK_THROWS_WITH(solve(r, o), Catch::Contains("no phase for sensor 1, plane 1"));
  // Unwritable path.
  CHECK_THROWS_AS(save_influence("/nonexistent-dir/x.toml", set), FileError);
}
