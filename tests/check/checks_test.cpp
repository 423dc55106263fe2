// SPDX-License-Identifier: GPL-3.0-or-later
// run_checks on designs built by hand as plain structs: what passes, what is refused, and what a
// job may accept.
#include <catch2/catch.hpp>

#include <algorithm>
#include <string>

#include "geom/base/error.hpp"
#include "geom/check/check.hpp"

using namespace trimwright;
using namespace trimwright::check;

namespace {

/// A 150 mm grinding wheel at 3450 rpm (marked 4140), 5/8-inch spindle, PETG, outboard.
Context grinder() {
  Context c;
  c.speed_rpm = 3450;
  c.rotor_max_speed_rpm = 4140;
  c.rotor_kind = "grinding-wheel";
  c.rotor_diameter_mm = 150;
  c.rotor_mass_kg = 0.72;
  c.material = {"PETG", 1.27, 35, 0.35, 65};
  c.mount = "outboard";
  c.free_thread_mm = 20;
  c.nut_height_mm = 9.5;
  c.spindle_diameter_mm = 15.875;
  c.max_diameter_mm = 100;
  c.flange_diameter_mm = 63.5;
  return c;
}

/// A slide-disc-like design: one disc reaching 40 mm, 6 mm thick, 30 g, range 0–150 g·mm.
fixture::Design disc() {
  fixture::Design d;
  d.family = "slide-disc";
  d.range_min_gmm = 0;
  d.range_max_gmm = 150;
  d.achieved_gmm = 75;
  d.swept_diameter_mm = 80;
  d.stack_height_mm = 6 + 2 + 9.5;
  fixture::Part p;
  p.name = "slide-disc";
  p.density_g_cm3 = 1.27;
  p.plastic_mass_g = 30;
  p.mass_g = 30;
  p.centroid_mm = {4, 0, 3};
  p.shape.outer_radius_mm = 40;
  p.shape.inner_radius_mm = 8;
  p.shape.thickness_mm = 6;
  p.shape.min_wall_mm = 3;
  p.shape.min_feature_mm = 0.6;
  p.shape.engraving_depth_mm = 0.6;
  d.parts.push_back(p);
  d.setting = {{"spindle_x_mm", 1.5, "spindle position in the slot", "mm"},
               {"offset_mm", 2.5, "offset", "mm"}};
  return d;
}

const CheckResult* find(const std::vector<CheckResult>& rs, const std::string& name) {
  for (const auto& r : rs)
    if (r.name == name) return &r;
  return nullptr;
}

std::vector<std::string> failed(const std::vector<CheckResult>& rs) {
  std::vector<std::string> out;
  for (const auto& r : rs)
    if (!r.ok) out.push_back(r.name);
  return out;
}

using Names = std::vector<std::string>;

}  // namespace

TEST_CASE("check: a sound design passes every check", "[check]") {
  auto rs = run_checks(disc(), grinder());
  CHECK(failed(rs).empty());
  CHECK(blocking_failures(rs).empty());
  for (const auto& r : rs) {
    INFO(r.name << ": " << r.note);
    CHECK(!r.note.empty());
    CHECK(std::find(check_names().begin(), check_names().end(), r.name) != check_names().end());
  }
  // No inserts: no insert-retention result; the rest are all there.
  CHECK(find(rs, "insert-retention") == nullptr);
  for (const char* n : {"speed", "surface-speed", "disc-stress", "clamp", "thread", "envelope",
                        "material-temperature", "creep", "print-wall", "print-feature",
                        "print-engraving", "print-infill"})
    CHECK(find(rs, n) != nullptr);
  CHECK(find(rs, "print-cover") == nullptr);  // no pockets
}

TEST_CASE("check: values the checks report are the formulas' values", "[check]") {
  Context c = grinder();
  auto rs = run_checks(disc(), c);
  const double proof = 3450 * 1.5;
  const CheckResult* s = find(rs, "disc-stress");
  REQUIRE(s != nullptr);
  CHECK(s->value == Approx(hoop_stress_annulus_mpa(1.27, 0.35, 40, 8, proof)));
  CHECK(s->limit == Approx(35 / kPlasticSafetyFactor));
  CHECK(s->unit == "MPa");
  const CheckResult* v = find(rs, "surface-speed");
  REQUIRE(v != nullptr);
  // 150 mm at 3450 rpm → 27.1 m/s (v = π·D·n/60 000; check value in shared references.md,
  // "Abrasive-wheel practice").
  CHECK(v->value == Approx(27.1).margin(0.05));
  // The clamp holds the fixture at its largest setting: 150 g·mm at the proof speed.
  const CheckResult* k = find(rs, "clamp");
  REQUIRE(k != nullptr);
  CHECK(k->value == Approx(centrifugal_force_n(150, 1, proof)).epsilon(1e-9));
  CHECK(k->note.find("N·m") != std::string::npos);  // it advises a torque
  const CheckResult* t = find(rs, "thread");
  REQUIRE(t != nullptr);
  CHECK(t->value == 20);
  CHECK(t->limit == Approx(17.5));
}

TEST_CASE("check: a rotor run over its marked speed is refused even when accepted", "[check]") {
  Context c = grinder();
  c.speed_rpm = 4500;
  c.accept = {"speed"};
  auto rs = run_checks(disc(), c);
  const CheckResult* s = find(rs, "speed");
  REQUIRE(s != nullptr);
  CHECK_FALSE(s->ok);
  CHECK_FALSE(s->acceptable);
  CHECK_FALSE(s->accepted);
  CHECK(s->value == 4500);
  CHECK(s->limit == 4140);
  CHECK(blocking_failures(rs) == Names{"speed"});
}

TEST_CASE("check: an unknown marked speed fails; only a non-abrasive rotor may accept it", "[check]") {
  Context c = grinder();
  c.rotor_max_speed_rpm.reset();
  c.accept = {"speed"};
  auto rs = run_checks(disc(), c);
  CHECK(blocking_failures(rs) == Names{"speed"});
  CHECK(find(rs, "speed")->note.find("rotor.max_speed_rpm") != std::string::npos);
  c.rotor_kind = "fan";
  rs = run_checks(disc(), c);
  CHECK(blocking_failures(rs).empty());
  CHECK(find(rs, "speed")->accepted);
}

TEST_CASE("check: a PLA disc too large for its speed is refused, and may be accepted", "[check]") {
  Context c = grinder();
  c.material = {"PLA", 1.24, 40, 0.35, 70};
  c.speed_rpm = 6000;
  c.rotor_max_speed_rpm = 6000;
  c.rotor_diameter_mm = 300;
  c.max_diameter_mm = 260;
  fixture::Design d = disc();
  d.parts[0].density_g_cm3 = 1.24;
  d.parts[0].shape.outer_radius_mm = 120;
  d.swept_diameter_mm = 240;
  auto rs = run_checks(d, c);
  const CheckResult* s = find(rs, "disc-stress");
  REQUIRE(s != nullptr);
  // At 9000 rpm a 120 mm reach gives about 13.3 MPa, over 40 / 4 = 10 MPa.
  CHECK(s->value == Approx(hoop_stress_annulus_mpa(1.24, 0.35, 120, 8, 9000)));
  CHECK(s->value > 10);
  CHECK(s->limit == Approx(10));
  CHECK(s->note.find("fix") != std::string::npos);
  CHECK(blocking_failures(rs) == Names{"disc-stress"});
  c.accept = {"disc-stress"};
  rs = run_checks(d, c);
  CHECK(find(rs, "disc-stress")->accepted);
  CHECK(blocking_failures(rs).empty());
  // 100 mm reach at the same speed stays inside the limit (about 9.2 MPa).
  d.parts[0].shape.outer_radius_mm = 100;
  c.accept.clear();
  CHECK(find(run_checks(d, c), "disc-stress")->ok);
}

TEST_CASE("check: the overspeed factor sets the speed of the stress checks", "[check]") {
  Context c = grinder();
  c.overspeed_factor = 1.0;
  double at_running = find(run_checks(disc(), c), "disc-stress")->value;
  c.overspeed_factor = 1.5;
  double at_proof = find(run_checks(disc(), c), "disc-stress")->value;
  CHECK(at_proof == Approx(2.25 * at_running));  // stress goes with the square of the speed
}

TEST_CASE("check: inserts add their ring load to the disc stress", "[check]") {
  fixture::Design d = disc();
  d.parts[0].inserts = {{"ball-6", 0.8856, {30, 0, 3}}, {"ball-6", 0.8856, {30, 5, 3}}};
  auto rs = run_checks(d, grinder());
  const double proof = 3450 * 1.5;
  double ring = rim_load_hoop_stress_mpa(rim_load_mpa(2 * 0.8856, 6, proof), 40, 8);
  CHECK(find(rs, "disc-stress")->value ==
        Approx(hoop_stress_annulus_mpa(1.27, 0.35, 40, 8, proof) + ring));
}

TEST_CASE("check: an insert pocket with too thin a wall is refused", "[check]") {
  fixture::Design d = disc();
  d.parts[0].inserts = {{"nut-M8", 8.4, {30, 0, 3}}};
  d.parts[0].shape.min_wall_mm = 0.8;
  auto rs = run_checks(d, grinder());
  const CheckResult* r = find(rs, "insert-retention");
  REQUIRE(r != nullptr);
  // The insert is checked where it is farthest from the axis over the slide's range: the spindle
  // at cx − range/m = 4 − 150/30 = −1 mm, so 31 mm.
  const double proof = 3450 * 1.5;
  CHECK(r->value == Approx(centrifugal_force_n(8.4, 31, proof)));
  // Loaded height: a tungsten cube of 8.4 g is 7.6 mm, more than the 6 mm part: 6 mm.
  CHECK(r->limit == Approx(insert_shear_capacity_n(0.8, 6, 35) / kPlasticSafetyFactor));
  CHECK_FALSE(r->ok);
  CHECK(r->subject == "slide-disc nut-M8");
  CHECK(r->note.find("fix") != std::string::npos);
  CHECK(blocking_failures(rs) == Names{"insert-retention"});
  // A 2 mm wall holds it.
  d.parts[0].shape.min_wall_mm = 2.0;
  CHECK(find(run_checks(d, grinder()), "insert-retention")->ok);
}

TEST_CASE("check: the clamp fails when a modest torque cannot hold the fixture", "[check]") {
  Context c = grinder();
  c.speed_rpm = 6000;
  c.rotor_max_speed_rpm = 6000;
  c.spindle_diameter_mm = 8;
  fixture::Design d = disc();
  d.range_max_gmm = 20000;  // a heavy fixture, far off the axis
  d.parts[0].mass_g = 400;
  d.parts[0].centroid_mm = {50, 0, 3};
  auto rs = run_checks(d, c);
  const CheckResult* k = find(rs, "clamp");
  REQUIRE(k != nullptr);
  CHECK_FALSE(k->ok);
  // Friction at the modest torque: 2 faces × 0.2 × 5 / (0.2 × 0.008) N, halved for the margin.
  CHECK(k->limit == Approx(2 * 0.2 * nut_preload_n(kModestTorque_nm, 8, 0.2) / kClampSafetyFactor));
  CHECK(k->note.find("N·m") != std::string::npos);
  // A user who tightens harder is told it is more than a modest torque, and it holds if enough.
  c.nut_torque_nm = 200;
  auto tightened = run_checks(d, c);
  k = find(tightened, "clamp");
  REQUIRE(k != nullptr);
  CHECK(k->ok);
}

TEST_CASE("check: a fixture with no thread for its nut is refused", "[check]") {
  Context c = grinder();
  c.free_thread_mm.reset();
  auto rs = run_checks(disc(), c);
  CHECK(blocking_failures(rs) == Names{"thread"});
  CHECK(find(rs, "thread")->note.find("machine.free_thread_mm") != std::string::npos);
  c.free_thread_mm = 12;  // less than the 17.5 mm stack
  rs = run_checks(disc(), c);
  CHECK(blocking_failures(rs) == Names{"thread"});
  CHECK(find(rs, "thread")->value == 12);
  c.free_thread_mm = 17.5;  // exactly enough: the nut is fully engaged
  CHECK(find(run_checks(disc(), c), "thread")->ok);
}

TEST_CASE("check: the fixture stays inside the guard and clear of the work", "[check]") {
  Context c = grinder();
  fixture::Design d = disc();
  d.swept_diameter_mm = 101;  // over the 100 mm room
  auto rs = run_checks(d, c);
  CHECK(find(rs, "envelope")->limit == 100);
  CHECK_FALSE(find(rs, "envelope")->ok);
  c.max_diameter_mm = 200;  // room enough, but the rotor is 150 mm: 140 mm with clearance
  d.swept_diameter_mm = 145;
  rs = run_checks(d, c);
  CHECK(find(rs, "envelope")->limit == Approx(150 - 2 * kWorkClearance_mm));
  CHECK_FALSE(find(rs, "envelope")->ok);
  CHECK(blocking_failures(rs) == Names{"envelope"});
}

TEST_CASE("check: material temperature against a warm machine", "[check]") {
  Context c = grinder();
  c.material = {"PLA", 1.24, 40, 0.35, 50};
  auto rs = run_checks(disc(), c);
  const CheckResult* t = find(rs, "material-temperature");
  CHECK(t->value == kWarmMachineTemp_c);
  CHECK(t->limit == 50);
  CHECK_FALSE(t->ok);
  c.rotor_kind = "fan";  // a cooler machine: 45 °C assumed
  CHECK(find(run_checks(disc(), c), "material-temperature")->ok);
  c.rotor_kind = "grinding-wheel";
  c.service_temp_c = 40;  // measured
  CHECK(find(run_checks(disc(), c), "material-temperature")->ok);
}

TEST_CASE("check: a printed part under the wheel's nut is flagged for creep", "[check]") {
  Context c = grinder();
  c.mount = "under-nut";
  fixture::Design d = disc();
  d.stack_height_mm = 6;
  auto rs = run_checks(d, c);
  CHECK(blocking_failures(rs) == Names{"creep"});
  CHECK(find(rs, "creep")->note.find("re-torque") != std::string::npos);
  c.accept = {"creep"};
  CHECK(blocking_failures(run_checks(d, c)).empty());
}

TEST_CASE("check: printability limits follow the nozzle and the layer", "[check]") {
  Context c = grinder();
  fixture::Design d = disc();
  d.parts[0].shape.min_wall_mm = 0.7;         // < 2 × 0.4
  d.parts[0].shape.min_feature_mm = 0.35;     // < 0.4
  d.parts[0].shape.engraving_depth_mm = 0.3;  // < 2 × 0.2
  d.parts[0].shape.pocket_cover_mm = 0.4;     // < 3 × 0.2
  c.infill_percent = 80;
  auto rs = run_checks(d, c);
  CHECK(blocking_failures(rs) ==
        Names{"print-wall", "print-feature", "print-engraving", "print-cover", "print-infill"});
  CHECK(find(rs, "print-wall")->limit == Approx(0.8));
  CHECK(find(rs, "print-cover")->limit == Approx(0.6));
  // A finer nozzle and thinner layers make the same part printable.
  c.nozzle_mm = 0.25;
  c.layer_mm = 0.12;
  c.accept = {"print-infill"};
  rs = run_checks(d, c);
  CHECK(blocking_failures(rs).empty());
  CHECK(find(rs, "print-infill")->accepted);
}

TEST_CASE("check: accepting one check leaves the others blocking", "[check]") {
  Context c = grinder();
  c.free_thread_mm.reset();
  c.infill_percent = 90;
  c.accept = {"print-infill", "no-such-check"};
  auto rs = run_checks(disc(), c);
  CHECK(blocking_failures(rs) == Names{"thread"});
}

TEST_CASE("check: blocking failures name each check once, in order", "[check]") {
  std::vector<CheckResult> rs(4);
  rs[0].name = "b";
  rs[0].ok = false;
  rs[1].name = "a";
  rs[1].ok = false;
  rs[2].name = "b";
  rs[2].ok = false;
  rs[3].name = "c";
  rs[3].ok = false;
  rs[3].accepted = true;
  CHECK(blocking_failures(rs) == Names{"b", "a"});
  rs[3].acceptable = false;  // accepted by mistake: still blocks
  CHECK(blocking_failures(rs) == Names{"b", "a", "c"});
}

TEST_CASE("check: an unusable context stops with an input error", "[check]") {
  Context c = grinder();
  c.speed_rpm = 0;
  CHECK_THROWS_AS(run_checks(disc(), c), InputError);
  c = grinder();
  c.mount = "sideways";
  CHECK_THROWS_AS(run_checks(disc(), c), InputError);
  c = grinder();
  c.overspeed_factor = 0.9;
  CHECK_THROWS_AS(run_checks(disc(), c), InputError);
}

TEST_CASE("check: missing part facts fail rather than pass", "[check]") {
  fixture::Design d = disc();
  d.parts[0].shape.outer_radius_mm = 0;
  d.parts[0].shape.min_wall_mm = 0;
  d.swept_diameter_mm = 0;
  auto rs = run_checks(d, grinder());
  CHECK(blocking_failures(rs) == Names{"disc-stress", "envelope", "print-wall"});
}

TEST_CASE("check: clamp weights need their screw's size", "[check]") {
  Context c = grinder();
  fixture::Design d = disc();
  d.family = "clamp-weights";
  d.setting.clear();
  d.parts[0].name = "weight-a";
  d.parts[0].mass_g = 5;
  d.parts[0].centroid_mm = {35, 0, 3};
  auto rs = run_checks(d, c);
  CHECK(find(rs, "disc-stress") == nullptr);  // not a disc about the spindle
  CHECK(find(rs, "thread") == nullptr);       // on a rim, not on the spindle's thread
  CHECK_FALSE(find(rs, "clamp")->ok);
  c.clamp_screw_diameter_mm = 4;
  rs = run_checks(d, c);
  const CheckResult* k = find(rs, "clamp");
  CHECK(k->ok);
  CHECK(k->subject == "weight-a");
  CHECK(k->value == Approx(centrifugal_force_n(5, 35, 3450 * 1.5)));
}

TEST_CASE("check: the cautions cover the essentials", "[check]") {
  const auto& cs = cautions();
  auto has = [&](const std::string& word) {
    return std::any_of(cs.begin(), cs.end(), [&](const std::string& s) { return s.find(word) != std::string::npos; });
  };
  CHECK(has("marked"));
  CHECK(has("Ring-test"));
  CHECK(has("guards"));
  CHECK(has("eye and face"));
  CHECK(has("stand aside"));
  CHECK(has("cracks"));
  CHECK(has("ANSI B7.1"));
  CHECK(has("not a certified component"));
}

TEST_CASE("check: each result says which side of its limit is safe", "[check]") {
  Context c = grinder();
  c.infill_percent = 90;
  for (const auto& r : run_checks(disc(), c)) {
    INFO(r.name);
    bool reach = r.name == "thread" || r.name.rfind("print-", 0) == 0;
    CHECK(r.at_least == reach);
    // A failed check is on the wrong side of its limit; a passed one on the right side.
    if (r.name == "surface-speed") continue;  // information only
    CHECK(r.ok == (r.at_least ? r.value >= r.limit : r.value <= r.limit));
  }
}

TEST_CASE("check: a length sized exactly to its limit is not failed by rounding", "[check]") {
  fixture::Design d = disc();
  d.parts[0].shape.min_wall_mm = 0.8 - 1e-9;  // two 0.4 mm lines, as computed with rounding
  d.swept_diameter_mm = 100 + 1e-9;           // the whole room
  auto rs = run_checks(d, grinder());
  CHECK(find(rs, "print-wall")->ok);
  CHECK(find(rs, "envelope")->ok);
  d.parts[0].shape.min_wall_mm = 0.79;  // a real shortfall still fails
  d.swept_diameter_mm = 100.01;
  rs = run_checks(d, grinder());
  CHECK(blocking_failures(rs) == Names{"envelope", "print-wall"});
}
