// SPDX-License-Identifier: GPL-3.0-or-later
// Every sample job runs through the real binary, and its setting, applied to the mesh as
// written, reproduces the requested correction.
#include <catch2/catch.hpp>

#include <nlohmann/json.hpp>

#include <cmath>
#include <filesystem>
#include <fstream>
#include <regex>

#include "tests/support/run_cli.hpp"
#include "tests/support/stl_mass.hpp"

namespace fs = std::filesystem;
using nlohmann::json;
using namespace trimwright::test;

namespace {

std::vector<fs::path> sample_jobs() {
  std::vector<fs::path> files;
  for (const auto& e : fs::directory_iterator(fs::path(TRIMWRIGHT_SOURCE_DIR) / "samples"))
    if (e.path().extension() == ".toml") files.push_back(e.path());
  std::sort(files.begin(), files.end());
  return files;
}

// admesh (Debian package `admesh`) as an independent STL checker. It repairs by default and
// always exits 0, so read the "Original" column of its report with -e -d -v; it was seen to hang
// on some inputs, hence the timeout.
struct AdmeshReport {
  bool ran = false;
  long disconnected = -1;
  long backwards = -1;
  double volume = 0;
};

AdmeshReport admesh(const fs::path& stl) {
  AdmeshReport r;
  fs::path log = stl;
  log += ".admesh.txt";
  std::string cmd = "timeout 30 admesh -e -d -v " + shell_quote(stl.string()) + " >" +
                    shell_quote(log.string()) + " 2>&1";
  if (std::system(cmd.c_str()) != 0) return r;
  std::string text = slurp(log);
  std::smatch m;
  if (std::regex_search(text, m, std::regex(R"(Total disconnected facets\s*:\s*(\d+))"))) r.disconnected = std::stol(m[1]);
  if (std::regex_search(text, m, std::regex(R"(Backwards edges\s*:\s*(\d+))"))) r.backwards = std::stol(m[1]);
  if (std::regex_search(text, m, std::regex(R"(Volume\s*:\s*([0-9.eE+-]+))"))) r.volume = std::stod(m[1]);
  r.ran = r.disconnected >= 0;
  return r;
}

// The part's first moment in its own frame (g·mm), from its STL read back independently plus the
// reported inserts; checks the plastic and total masses against the report on the way.
std::pair<double, double> first_moment_gmm(const StlMass& sm, const json& part) {
  double mass = sm.volume_mm3 * part["density_g_cm3"].get<double>() * 1e-3;
  CHECK(mass == Approx(part["plastic_mass_g"].get<double>()).epsilon(1e-4));
  double mx = mass * sm.centroid_mm[0], my = mass * sm.centroid_mm[1], total = mass;
  for (const auto& ins : part["inserts"]) {
    double g = ins["mass_g"].get<double>();
    mx += g * ins["position_mm"][0].get<double>();
    my += g * ins["position_mm"][1].get<double>();
    total += g;
  }
  CHECK(total == Approx(part["mass_g"].get<double>()).epsilon(1e-4));
  return {mx, my};
}

// disc-pair samples: each disc's first moment from its STL as written (read back by the
// independent reader) plus the inserts the report lists, turned so that its heavy mark (+x)
// points at its setting, summed: the pair must give the correction within 0.5 % and 0.5°.
// The job's angle sense decides which way a part-frame angle turns in rotor angles; it is read
// from the sample itself (rotation and angles keys).
void check_disc_pair_sample(const fs::path& job, const json& rep, const fs::path& out) {
  std::string text = slurp(job);
  std::smatch m;
  REQUIRE(std::regex_search(text, m, std::regex(R"re(rotation\s*=\s*"(cw|ccw)")re")));
  bool ccw_rotation = m[1] == "ccw";
  bool with_rotation = rep["correction"]["angles"] == "with-rotation";
  double sense = ccw_rotation == with_rotation ? 1.0 : -1.0;  // +1: angles count ccw seen from +z
  const double pi = 3.14159265358979323846;
  double need = rep["correction"]["unbalance_gmm"].get<double>();
  double angle = rep["correction"]["angle_deg"].get<double>();
  REQUIRE(rep["fixture"]["parts"].size() == 2);
  double x = 0, y = 0, u_each[2] = {0, 0};
  const char* keys[] = {"disc_a_deg", "disc_b_deg"};
  for (int i = 0; i < 2; ++i) {
    const json& part = rep["fixture"]["parts"][i];
    fs::path stl = out / part["file"].get<std::string>();
    REQUIRE(fs::exists(stl));
    StlMass sm = stl_mass(slurp(stl));
    auto [mx, my] = first_moment_gmm(sm, part);
    if (!part["inserts"].empty()) {
      // Closed pockets: the print pauses at a layer above the floor.
      CHECK(part["pause_layer"].get<int>() > 1);
    }
    u_each[i] = std::hypot(mx, my);
    double dir = (rep["setting"][keys[i]].get<double>() + sense * std::atan2(my, mx) * 180 / pi) * pi / 180;
    x += u_each[i] * std::cos(dir);
    y += u_each[i] * std::sin(dir);
    AdmeshReport a = admesh(stl);
    REQUIRE(a.ran);
    CHECK(a.disconnected == 0);
    CHECK(a.backwards == 0);
  }
  CHECK(u_each[0] == Approx(u_each[1]).epsilon(1e-3));
  CHECK(std::hypot(x, y) == Approx(need).epsilon(0.005));
  double got = std::atan2(y, x) * 180 / pi;
  CHECK(std::fabs(std::remainder(got - angle, 360.0)) < 0.5);
  CHECK(rep["fixture"]["range_gmm"][1].get<double>() >= need);
  if (job.stem() == "trim-disc-pair") {
    // Its readings were made for a rotor of 50 g·mm at 70° (see the sample): the logged setting,
    // read back from the printed pair, must lead to 50 g·mm at 250° (readings rounded to 4 digits).
    CHECK(need == Approx(50).epsilon(0.001));
    CHECK(std::fabs(angle - 250) < 0.05);
  }
}

// The sense in which a sample's angles count, seen from the fixture side (+z of the part frame):
// +1 counter-clockwise, −1 clockwise; read from the sample itself (rotation and angles keys).
double angle_sense(const fs::path& job, const json& rep) {
  std::string text = slurp(job);
  std::smatch m;
  REQUIRE(std::regex_search(text, m, std::regex(R"re(rotation\s*=\s*"(cw|ccw)")re")));
  bool ccw_rotation = m[1] == "ccw";
  bool with_rotation = rep["correction"]["angles"] == "with-rotation";
  return ccw_rotation == with_rotation ? 1.0 : -1.0;
}

// clamp-weights samples: each weight's first moment from its STL as written (read back by the
// independent reader) plus the screw, nut and inserts the report lists, turned so that its +x
// axis points at the angle the setting gives it, summed over the placed weights: the sum must
// give the correction within 0.5 % and 0.5°.
void check_clamp_weights_sample(const fs::path& job, const json& rep, const fs::path& out) {
  const double pi = 3.14159265358979323846;
  const double sense = angle_sense(job, rep);
  double need = rep["correction"]["unbalance_gmm"].get<double>();
  double angle = rep["correction"]["angle_deg"].get<double>();
  REQUIRE(!rep["setting"]["weights"].empty());
  double x = 0, y = 0;
  for (const auto& w : rep["setting"]["weights"]) {
    const json* found = nullptr;
    for (const auto& part : rep["fixture"]["parts"])
      if (part["name"] == w["part"]) found = &part;
    REQUIRE(found);
    const json& part = *found;
    fs::path stl = out / part["file"].get<std::string>();
    REQUIRE(fs::exists(stl));
    StlMass sm = stl_mass(slurp(stl));
    auto [mx, my] = first_moment_gmm(sm, part);
    // The weight sits over the rim's edge on +x of its own frame.
    CHECK(sm.centroid_mm[0] > 0);
    double u = std::hypot(mx, my);
    double dir = (w["angle_deg"].get<double>() + sense * std::atan2(my, mx) * 180 / pi) * pi / 180;
    x += u * std::cos(dir);
    y += u * std::sin(dir);
    AdmeshReport a = admesh(stl);
    REQUIRE(a.ran);
    CHECK(a.disconnected == 0);
    CHECK(a.backwards == 0);
    CHECK(a.volume == Approx(sm.volume_mm3).epsilon(1e-5));  // admesh sums in float
  }
  CHECK(std::hypot(x, y) == Approx(need).epsilon(0.005));
  double got = std::atan2(y, x) * 180 / pi;
  CHECK(std::fabs(std::remainder(got - angle, 360.0)) < 0.5);
  CHECK(rep["fixture"]["range_gmm"][1].get<double>() >= need);
  CHECK(rep["fixture"]["stack_height_mm"].get<double>() == 0);
  CHECK(rep["fixture"]["swept_diameter_mm"].get<double>() > 0);
}

// bore-sleeve samples: no correction is made, only a fit. The sleeve as written is a round tube
// on the axis (its own unbalance nil), as long as the report says, with the diameters it gives.
void check_bore_sleeve_sample(const json& rep, const fs::path& out) {
  REQUIRE(rep["fixture"]["parts"].size() == 1);
  const json& part = rep["fixture"]["parts"][0];
  fs::path stl = out / part["file"].get<std::string>();
  REQUIRE(fs::exists(stl));
  StlMass sm = stl_mass(slurp(stl));
  double mass = sm.volume_mm3 * part["density_g_cm3"].get<double>() * 1e-3;
  CHECK(mass == Approx(part["mass_g"].get<double>()).epsilon(1e-4));
  CHECK(mass * std::hypot(sm.centroid_mm[0], sm.centroid_mm[1]) < 1e-3);  // g·mm
  const double pi = 3.14159265358979323846;
  double od = rep["setting"]["outer_diameter_mm"].get<double>();
  double id = rep["setting"]["inner_diameter_mm"].get<double>();
  double len = rep["setting"]["length_mm"].get<double>();
  // The annulus π/4·(D² − d²)·L: the mesh's polygons keep each circle's exact area.
  CHECK(sm.volume_mm3 == Approx(pi / 4 * (od * od - id * id) * len).epsilon(1e-5));
  CHECK(sm.centroid_mm[2] == Approx(len / 2).epsilon(1e-5));
  CHECK(rep["fixture"]["range_gmm"][0].get<double>() == 0);
  CHECK(rep["fixture"]["range_gmm"][1].get<double>() == 0);
  CHECK(rep["setting"]["old_slop_gmm"].get<double>() > rep["setting"]["residual_gmm"].get<double>());
  AdmeshReport a = admesh(stl);
  REQUIRE(a.ran);
  CHECK(a.disconnected == 0);
  CHECK(a.backwards == 0);
}

}  // namespace

TEST_CASE("samples: every sample designs, writes its outputs and reproduces its correction", "[cli][samples]") {
  auto jobs = sample_jobs();
  REQUIRE(jobs.size() >= 4);
  for (const auto& job : jobs) {
    INFO("sample: " << job.filename().string());
    fs::path out = scratch_dir("sample-" + job.stem().string());
    auto r = run_cli("design " + shell_quote(job.string()) + " --out " + shell_quote(out.string()));
    INFO("stderr: " << r.err << "\nstdout: " << r.out);
    REQUIRE(r.exit_code == 0);
    REQUIRE(fs::exists(out / "report.json"));
    json rep = json::parse(slurp(out / "report.json"));
    double need = rep["correction"]["unbalance_gmm"].get<double>();
    double angle = rep["correction"]["angle_deg"].get<double>();
    double resolution = rep["fixture"]["resolution_gmm"].get<double>();
    if (rep["fixture"]["family"] == "disc-pair") {
      check_disc_pair_sample(job, rep, out);
      continue;
    }
    if (rep["fixture"]["family"] == "clamp-weights") {
      check_clamp_weights_sample(job, rep, out);
      continue;
    }
    if (rep["fixture"]["family"] == "bore-sleeve") {
      check_bore_sleeve_sample(rep, out);
      continue;
    }
    REQUIRE(rep["fixture"]["family"] == "slide-disc");
    for (const auto& part : rep["fixture"]["parts"]) {
      fs::path stl = out / part["file"].get<std::string>();
      REQUIRE(fs::exists(stl));
      StlMass sm = stl_mass(slurp(stl));
      double density = part["density_g_cm3"].get<double>();
      double mass = sm.volume_mm3 * density * 1e-3;
      double offset = std::hypot(sm.centroid_mm[0] - rep["setting"]["spindle_x_mm"].get<double>(),
                                 sm.centroid_mm[1]);
      double achieved = mass * offset;
      // Within 0.5 % or one setting step (issue 2's acceptance rule).
      CHECK(std::fabs(achieved - need) <= std::max(0.005 * need, resolution));
      // The heavy side points at the notch (+x) within 0.5°, and the notch is set at the angle.
      double skew_deg = std::atan2(sm.centroid_mm[1], offset) * 180 / 3.14159265358979;
      CHECK(std::fabs(skew_deg) < 0.5);
      CHECK(rep["setting"]["angle_deg"].get<double>() == Approx(angle));
      CHECK(offset == Approx(rep["setting"]["offset_mm"].get<double>()).epsilon(0.002));
      CHECK(mass == Approx(part["mass_g"].get<double>()).epsilon(1e-4));
      // The full range covers the need with the margin and includes zero.
      CHECK(rep["fixture"]["range_gmm"][0].get<double>() == 0);
      CHECK(rep["fixture"]["range_gmm"][1].get<double>() >= need);
      AdmeshReport a = admesh(stl);
      REQUIRE(a.ran);
      CHECK(a.disconnected == 0);
      CHECK(a.backwards == 0);
      CHECK(a.volume == Approx(sm.volume_mm3).epsilon(1e-5));  // admesh sums in float
    }
    for (const char* f : {"chart.csv", "report.json"}) CHECK(fs::exists(out / f));
  }
}

TEST_CASE("demo: writes the STL, chart.csv and report.json and prints the setting", "[cli][samples]") {
  fs::path out = scratch_dir("demo") / "d";
  auto r = run_cli("demo --out " + shell_quote(out.string()));
  INFO(r.err);
  REQUIRE(r.exit_code == 0);
  CHECK(r.out.find("SETTING") != std::string::npos);
  CHECK(r.out.find("cautions") != std::string::npos);
  CHECK(fs::exists(out / "chart.csv"));
  CHECK(fs::exists(out / "report.json"));
  bool stl = false;
  for (const auto& e : fs::directory_iterator(out)) stl = stl || e.path().extension() == ".stl";
  CHECK(stl);
  // No temporary or hidden file is left behind.
  for (const auto& e : fs::directory_iterator(out)) CHECK(e.path().filename().string()[0] != '.');
}

TEST_CASE("cli: --version, --help and a bad command line", "[cli]") {
  auto v = run_cli("--version");
  CHECK(v.exit_code == 0);
  CHECK(v.out.find("trimwright") != std::string::npos);
  CHECK(run_cli("--help").exit_code == 0);
  CHECK(run_cli("design").exit_code == 2);
  CHECK(run_cli("frobnicate").exit_code == 2);
  auto missing = run_cli("design /nonexistent/job.toml");
  CHECK(missing.exit_code == 3);
  CHECK(missing.err.find("/nonexistent/job.toml") != std::string::npos);
}

TEST_CASE("cli: init writes a template that designs as it is", "[cli]") {
  fs::path dir = scratch_dir("init");
  fs::path job = dir / "job.toml";
  REQUIRE(run_cli("init " + shell_quote(job.string())).exit_code == 0);
  CHECK(run_cli("init " + shell_quote(job.string())).exit_code == 2);  // no silent overwrite
  auto r = run_cli("design " + shell_quote(job.string()) + " --out " + shell_quote((dir / "o").string()));
  INFO(r.err);
  CHECK(r.exit_code == 0);
  CHECK(run_cli("materials").exit_code == 0);
}

TEST_CASE("cli: a rim too thin for a clamp weight and a bore too small for a sleeve exit 1", "[cli][samples]") {
  fs::path dir = scratch_dir("fixb-refusals");
  std::string clamp = slurp(fs::path(TRIMWRIGHT_SOURCE_DIR) / "samples" / "pulley-clamp-weights.toml");
  clamp = std::regex_replace(clamp, std::regex(R"(rim_thickness_mm = 5)"), "rim_thickness_mm = 0.5");
  std::ofstream(dir / "thin-rim.toml") << clamp;
  auto thin = run_cli("design " + shell_quote((dir / "thin-rim.toml").string()) + " --out " +
                      shell_quote((dir / "o1").string()));
  CHECK(thin.exit_code == 1);
  CHECK(thin.err.find("rim_thickness_mm = 0.5") != std::string::npos);
  CHECK(!fs::exists(dir / "o1"));
  std::string sleeve = slurp(fs::path(TRIMWRIGHT_SOURCE_DIR) / "samples" / "loose-bore-sleeve.toml");
  sleeve = std::regex_replace(sleeve, std::regex(R"(bore_mm = 15.875)"), "bore_mm = 13.5");
  std::ofstream(dir / "tight-bore.toml") << sleeve;
  auto tight = run_cli("design " + shell_quote((dir / "tight-bore.toml").string()) + " --out " +
                       shell_quote((dir / "o2").string()));
  CHECK(tight.exit_code == 1);
  CHECK(tight.err.find("bore_mm = 13.5") != std::string::npos);
  CHECK(!fs::exists(dir / "o2"));
}

namespace {

// The disc-pair wheel sample with some lines replaced, written to a scratch job file.
fs::path disc_pair_variant(const std::string& name, const std::vector<std::pair<std::string, std::string>>& edits) {
  std::string text = slurp(fs::path(TRIMWRIGHT_SOURCE_DIR) / "samples" / "disc-pair-wheel.toml");
  for (const auto& [from, to] : edits) {
    auto at = text.find(from);
    REQUIRE(at != std::string::npos);
    text.replace(at, from.size(), to);
  }
  fs::path job = scratch_dir("disc-pair-" + name) / "job.toml";
  std::ofstream(job) << text;
  return job;
}

}  // namespace

TEST_CASE("inserts: the command lists the catalogue, also as JSON", "[cli][inserts]") {
  auto r = run_cli("inserts");
  REQUIRE(r.exit_code == 0);
  for (const char* name : {"ball-6", "nut-M4", "washer-M5", "weighed:"}) CHECK(r.out.find(name) != std::string::npos);
  auto j = run_cli("inserts --json");
  REQUIRE(j.exit_code == 0);
  json list = json::parse(j.out);
  REQUIRE(list.size() == 15);
  for (const auto& k : list)
    if (k["name"] == "ball-6") CHECK(k["mass_g"].get<double>() == Approx(0.8856).epsilon(0.001));  // references.md, steel balls
}

TEST_CASE("disc-pair: the command line refuses what cannot be met, with what would be needed", "[cli][disc-pair]") {
  // No thread left for two discs, a washer and a nut.
  auto thin = run_cli("design " + shell_quote(disc_pair_variant("thread", {{"free_thread_mm = 26", "free_thread_mm = 12"}}).string()) +
                      " --out " + shell_quote((scratch_dir("disc-pair-thread-out") / "o").string()));
  CHECK(thin.exit_code == 1);
  CHECK(thin.err.find("thread") != std::string::npos);
  CHECK(thin.err.find("disc-pair") != std::string::npos);
  // A correction beyond every family: auto says what each one would need.
  auto far = run_cli("design " + shell_quote(disc_pair_variant("far", {{"unbalance_gmm = 60", "unbalance_gmm = 60000"},
                                                                        {"family = \"disc-pair\"", "family = \"auto\""}}).string()) +
                     " --out " + shell_quote((scratch_dir("disc-pair-far-out") / "o").string()));
  CHECK(far.exit_code == 1);
  CHECK(far.err.find("auto") != std::string::npos);
  CHECK(far.err.find("disc-pair: rejected") != std::string::npos);
  CHECK(far.err.find("needed") != std::string::npos);
  // An unknown insert is bad input, and the message lists the catalogue.
  auto bad = run_cli("design " + shell_quote(disc_pair_variant("bad-insert", {{"material = \"PETG\"", "material = \"PETG\"\ninserts = \"nut-M7\""}}).string()) +
                     " --out " + shell_quote((scratch_dir("disc-pair-bad-out") / "o").string()));
  CHECK(bad.exit_code == 2);
  CHECK(bad.err.find("nut-M7") != std::string::npos);
  CHECK(bad.err.find("washer-M8") != std::string::npos);
  // --family on the command line overrides the job's family.
  fs::path auto_out = scratch_dir("disc-pair-auto") / "o";
  auto over = run_cli("design " + shell_quote((fs::path(TRIMWRIGHT_SOURCE_DIR) / "samples" / "disc-pair-wheel.toml").string()) +
                      " --family auto --out " + shell_quote(auto_out.string()));
  REQUIRE(over.exit_code == 0);
  json rep = json::parse(slurp(auto_out / "report.json"));
  CHECK(rep["fixture"]["reason"].get<std::string>().rfind("auto chose", 0) == 0);
}
