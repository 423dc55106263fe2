// SPDX-License-Identifier: GPL-3.0-or-later
// Atomic outputs through the real binary (design.md §7: "a failed run leaves no partial file"):
// runs made to fail part-way must leave the output folder exactly as it was, and a hostile title
// must not steer output files out of the folder or hide them.
#include <catch2/catch.hpp>

#include <sys/wait.h>
#include <unistd.h>

#include <filesystem>
#include <fstream>
#include <map>
#include <string>

#include "tests/support/run_cli.hpp"

namespace fs = std::filesystem;
using trimwright::test::run_cli;
using trimwright::test::scratch_dir;
using trimwright::test::shell_quote;
using trimwright::test::slurp;

namespace {

/// A small valid job (our own scenario): every format, so that the output set holds large
/// files (STL, 3MF, PDF, PNG) and small ones (CSV, JSON).
std::string job_text(const std::string& title) {
  return "title = \"" + title + "\"\n" + R"(
[machine]
speed_rpm = 3450
rotation = "ccw"
spindle_diameter_mm = 15.875
free_thread_mm = 19
nut_height_mm = 9.5
max_fixture_diameter_mm = 90

[rotor]
kind = "grinding-wheel"
diameter_mm = 150
bore_mm = 15.875
mass_kg = 0.75
max_speed_rpm = 4140

[correction]
unbalance_gmm = 42
angle_deg = 95

[fixture]
family = "slide-disc"
material = "PETG"
max_diameter_mm = 70
max_thickness_mm = 5
)";
}

fs::path write_job(const fs::path& dir, const std::string& title) {
  fs::path job = dir / "job.toml";
  std::ofstream(job) << job_text(title);
  return job;
}

/// Everything in a folder tree: relative path → content ("<dir>" for folders).
std::map<std::string, std::string> snapshot(const fs::path& root) {
  std::map<std::string, std::string> s;
  for (const auto& e : fs::recursive_directory_iterator(root)) {
    std::string rel = fs::relative(e.path(), root).string();
    s[rel] = e.is_directory() ? std::string("<dir>") : slurp(e.path());
  }
  return s;
}

/// Runs `trimwright design JOB --out OUT` through sh with a prefix (e.g. a file-size limit).
trimwright::test::CliResult run_with(const std::string& prefix, const fs::path& job, const fs::path& out) {
  fs::path base = job.parent_path();
  std::string cmd = prefix + " " + shell_quote(TRIMWRIGHT_EXE) + " design " + shell_quote(job.string()) +
                    " --out " + shell_quote(out.string()) + " </dev/null >" +
                    shell_quote((base / "stdout.txt").string()) + " 2>" + shell_quote((base / "stderr.txt").string());
  std::string sh = "sh -c " + shell_quote(cmd);
  int status = std::system(sh.c_str());
  trimwright::test::CliResult r;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = slurp(base / "stdout.txt");
  r.err = slurp(base / "stderr.txt");
  return r;
}

}  // namespace

TEST_CASE("atomic outputs: a run that fails part-way leaves the folder as it was", "[cli][atomic]") {
  fs::path dir = scratch_dir("atomic-collision");
  fs::path job = write_job(dir, "Atomic wheel");
  fs::path out = dir / "out";
  // A first, good run fills the folder.
  auto first = run_cli("design " + shell_quote(job.string()) + " --out " + shell_quote(out.string()));
  INFO("stderr: " << first.err);
  REQUIRE(first.exit_code == 0);
  REQUIRE(fs::exists(out / "chart.csv"));
  // The user keeps a file of their own there; the job then changes (another correction), and a
  // folder now stands where one of the outputs goes.
  std::ofstream(out / "notes.txt") << "my notes\n";
  std::string changed = job_text("Atomic wheel");
  changed.replace(changed.find("unbalance_gmm = 42"), 18, "unbalance_gmm = 57");
  std::ofstream(job) << changed;

  SECTION("a folder in the way of the last file") {
    fs::remove(out / "report.json");
    fs::create_directory(out / "report.json");
    std::ofstream(out / "report.json" / "keep.txt") << "keep\n";
    auto before = snapshot(out);
    auto r = run_cli("design " + shell_quote(job.string()) + " --out " + shell_quote(out.string()));
    INFO("stderr: " << r.err);
    CHECK(r.exit_code == 3);
    CHECK(r.err.find("report.json") != std::string::npos);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK(snapshot(out) == before);
  }

  SECTION("a file-size limit makes a large file fail after smaller ones were written") {
    // With SIGXFSZ ignored (inherited across exec), writes beyond `ulimit -f` blocks fail with
    // EFBIG instead of killing the process. 400 blocks (200 KiB) hold the STL (~65 KB), the
    // 3MF, the CSV and the PDF, written first; the SVG chart (~600 KB) then fails.
    auto before = snapshot(out);
    auto r = run_with("trap '' XFSZ; ulimit -f 400;", job, out);
    INFO("stderr: " << r.err);
    CHECK(r.exit_code == 3);
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK(snapshot(out) == before);
  }

  SECTION("a read-only folder") {
    if (::geteuid() == 0) {
      // root writes into read-only folders; the two sections above cover the failure path.
      SUCCEED("skipped: running as root");
      return;
    }
    fs::permissions(out, fs::perms::owner_write | fs::perms::group_write | fs::perms::others_write,
                    fs::perm_options::remove);
    auto before = snapshot(out);
    auto r = run_cli("design " + shell_quote(job.string()) + " --out " + shell_quote(out.string()));
    fs::permissions(out, fs::perms::owner_write, fs::perm_options::add);
    INFO("stderr: " << r.err);
    CHECK(r.exit_code == 3);
    CHECK(snapshot(out) == before);
  }
}

TEST_CASE("atomic outputs: a missing output folder is not left behind by a failed run", "[cli][atomic]") {
  fs::path dir = scratch_dir("atomic-new-folder");
  fs::path job = write_job(dir, "New folder wheel");
  fs::path out = dir / "a" / "b" / "out";
  auto r = run_with("trap '' XFSZ; ulimit -f 400;", job, out);
  INFO("stderr: " << r.err);
  CHECK(r.exit_code == 3);
  CHECK_FALSE(fs::exists(dir / "a"));
}

TEST_CASE("atomic outputs: a title with path separators and leading dots stays in the folder", "[cli][atomic]") {
  fs::path dir = scratch_dir("atomic-title");
  fs::path sub = dir / "jobs";
  fs::create_directories(sub);
  // Separators of both kinds, parent references, a leading dot, a space and a newline.
  fs::path job = write_job(sub, "../../.hidden/..\\\\evil name\\n.");
  fs::path out = sub / "out";
  auto before_parent = snapshot(dir);
  auto r = run_cli("design " + shell_quote(job.string()) + " --out " + shell_quote(out.string()));
  INFO("stderr: " << r.err);
  REQUIRE(r.exit_code == 0);
  // Nothing appeared anywhere but inside the output folder.
  auto after = snapshot(dir);
  for (const auto& [path, content] : after) {
    if (path.rfind("jobs/out", 0) == 0) continue;
    INFO("path: " << path);
    CHECK(before_parent.count(path) == 1);
  }
  // Every output is a plain, visible file directly in the folder.
  int stl = 0;
  for (const auto& e : fs::directory_iterator(out)) {
    std::string name = e.path().filename().string();
    INFO("output: " << name);
    CHECK(e.is_regular_file());
    CHECK(name[0] != '.');
    CHECK(name.find('\\') == std::string::npos);
    CHECK(name.find('\n') == std::string::npos);
    if (e.path().extension() == ".stl") {
      ++stl;
      CHECK(name.find("evil") != std::string::npos);  // the readable part of the title survives
    }
  }
  CHECK(stl == 1);
}
