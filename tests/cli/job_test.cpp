// SPDX-License-Identifier: GPL-3.0-or-later
// Job loading: defaults, include overrides, locations, suggestions.
#include <catch2/catch.hpp>

#include <filesystem>
#include <fstream>

#include "cli/job.hpp"
#include "cli/toml_reader.hpp"
#include "geom/base/error.hpp"
#include "tests/support/run_cli.hpp"

using namespace trimwright;
using namespace trimwright::cli;
namespace fs = std::filesystem;

namespace {
const char* kMinimal = R"([machine]
speed_rpm = 3450
spindle_diameter_mm = 15.875
[rotor]
diameter_mm = 150
mass_kg = 0.72
[correction]
unbalance_gmm = 75
angle_deg = 212
)";

std::string message_of(const std::string& text) {
  try {
    load_job_text(text, "job.toml", ".");
  } catch (const InputError& e) {
    return e.what();
  }
  return "";
}
}  // namespace

TEST_CASE("job: a minimal job gets the documented defaults", "[cli][job]") {
  Job j = load_job_text(kMinimal, "job.toml", ".");
  CHECK(j.machine.rotation == "ccw");
  CHECK(j.fixture.family == "slide-disc");
  CHECK(j.fixture.mount == "outboard");
  CHECK(j.fixture.margin == 1.5);
  CHECK(j.material.name == "PETG");
  CHECK(j.print.nozzle_mm == 0.4);
  CHECK(j.print.layer_mm == 0.2);
  CHECK(j.print.clearance_mm == 0.2);
  CHECK(j.angles == solve::AngleSense::kAgainstRotation);
  REQUIRE(j.correction);
  CHECK(j.correction->unbalance_gmm == 75);
  CHECK(j.where("correction.angle_deg") == "job.toml:9");
}

TEST_CASE("job: a correction as mass and radius becomes g·mm", "[cli][job]") {
  std::string t = kMinimal;
  t.replace(t.find("unbalance_gmm = 75"), 18, "mass_g = 1.25\nradius_mm = 60");
  Job j = load_job_text(t, "job.toml", ".");
  CHECK(j.correction->unbalance_gmm == Approx(75.0));
}

TEST_CASE("job: include supplies keys, the job's own keys win, messages name the right file", "[cli][job]") {
  fs::path dir = trimwright::test::scratch_dir("include");
  std::ofstream(dir / "machine.toml") << "[machine]\nspeed_rpm = 1725\nspindle_diameter_mm = 15.875\n"
                                         "max_fixture_diameter_mm = 90\n[fixture]\nmaterial = \"ASA\"\n";
  std::string job = "include = \"machine.toml\"\n[machine]\nspeed_rpm = 3450\n[rotor]\ndiameter_mm = 150\n"
                    "mass_kg = 0.72\n[correction]\nunbalance_gmm = 75\nangle_deg = 212\n";
  std::ofstream(dir / "job.toml") << job;
  Job j = load_job((dir / "job.toml").string());
  CHECK(j.machine.speed_rpm == 3450);                 // overridden
  CHECK(*j.machine.max_fixture_diameter_mm == 90);    // from the include
  CHECK(j.material.name == "ASA");
  CHECK(j.where("machine.max_fixture_diameter_mm") == (dir / "machine.toml").string() + ":4");
  CHECK(j.where("machine.speed_rpm") == (dir / "job.toml").string() + ":3");
  // A bad value in the included file is reported there.
  std::ofstream(dir / "machine.toml") << "[machine]\nspeed_rpm = 1725\nspindle_diameter_mm = -1\n";
  try {
    load_job((dir / "job.toml").string());
    FAIL("expected an error");
  } catch (const InputError& e) {
    CHECK(std::string(e.what()).find((dir / "machine.toml").string() + ":3") != std::string::npos);
  }
}

TEST_CASE("job: unknown keys suggest the nearest valid key", "[cli][job]") {
  std::string t = kMinimal;
  t.replace(t.find("mass_kg"), 7, "mass_kgs");
  CHECK(message_of(t).find("did you mean \"rotor.mass_kg\"") != std::string::npos);
  CHECK(edit_distance("speed_rpm", "sped_rpm") == 1);
  CHECK(edit_distance("", "abc") == 3);
}

TEST_CASE("job: integers are accepted where numbers are expected, booleans are not", "[cli][job]") {
  std::string t = kMinimal;
  CHECK_NOTHROW(load_job_text(t, "job.toml", "."));
  t.replace(t.find("mass_kg = 0.72"), 14, "mass_kg = true");
  CHECK(message_of(t).find("rotor.mass_kg = true: expected a number") != std::string::npos);
}

TEST_CASE("job: the demo job and the template load", "[cli][job]") {
  CHECK_NOTHROW(load_job_text(demo_job_text(), "<demo>", "."));
  CHECK_NOTHROW(load_job_text(job_template(), "<template>", "."));
  CHECK(material_presets().size() >= 6);
}
