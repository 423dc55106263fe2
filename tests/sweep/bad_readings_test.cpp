// SPDX-License-Identifier: GPL-3.0-or-later
// Readings that contradict their method (tests/bad/readings/): each loads as a job (the loader
// cannot know what a method needs), and the solver must then refuse it with its own one-line
// message; through the real binary, `design` must refuse it (exit 2), name the file and write
// nothing. Same `# expect-exit:` / `# expect-message:` lines as the tests/bad battery; the
// message is the solver's.
#include <catch2/catch.hpp>

#include <algorithm>
#include <filesystem>
#include <fstream>

#include "cli/job.hpp"
#include "geom/base/error.hpp"
#include "geom/solve/solve.hpp"
#include "tests/support/run_cli.hpp"

namespace fs = std::filesystem;
using trimwright::test::run_cli;
using trimwright::test::scratch_dir;
using trimwright::test::shell_quote;

namespace {

std::string expected_message(const fs::path& p) {
  std::ifstream in(p);
  std::string line;
  while (std::getline(in, line))
    if (line.rfind("# expect-message: ", 0) == 0) return line.substr(18);
  return "";
}

std::vector<fs::path> readings_files() {
  std::vector<fs::path> files;
  for (const auto& e : fs::directory_iterator(fs::path(TRIMWRIGHT_SOURCE_DIR) / "tests" / "bad" / "readings"))
    if (e.path().extension() == ".toml") files.push_back(e.path());
  std::sort(files.begin(), files.end());
  return files;
}

}  // namespace

TEST_CASE("bad readings: the solver refuses readings that contradict the method", "[cli][bad][solve]") {
  auto files = readings_files();
  REQUIRE(files.size() >= 5);
  for (const auto& f : files) {
    INFO("job file: " << f.filename().string());
    std::string want = expected_message(f);
    REQUIRE(!want.empty());
    trimwright::cli::Job job = trimwright::cli::load_job(f.string());
    REQUIRE(job.readings);
    trimwright::solve::SolveOptions options;
    options.speed_rpm = job.machine.speed_rpm;
    options.rotor_mass_kg = job.rotor.mass_kg;
    try {
      trimwright::solve::solve(*job.readings, options);
      FAIL("solved without complaint");
    } catch (const trimwright::InputError& e) {
      std::string msg = e.what();
      INFO("message: " << msg);
      CHECK(msg.find(want) != std::string::npos);
      CHECK(msg.find(f.filename().string()) != std::string::npos);
      CHECK(msg.find('\n') == std::string::npos);
    }
  }
}

TEST_CASE("bad readings: design refuses them, names the file and writes nothing", "[cli][bad]") {
  for (const auto& f : readings_files()) {
    INFO("job file: " << f.filename().string());
    fs::path out = scratch_dir("bad-readings-" + f.stem().string()) / "out";
    auto r = run_cli("design " + shell_quote(f.string()) + " --out " + shell_quote(out.string()));
    INFO("stderr: " << r.err);
    CHECK(r.exit_code == 2);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK(r.err.find(f.filename().string()) != std::string::npos);
    CHECK_FALSE(fs::exists(out));
  }
}
