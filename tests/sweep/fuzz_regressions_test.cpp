// SPDX-License-Identifier: GPL-3.0-or-later
// Inputs the fuzzers (tests/fuzz/) once found troublesome, kept in tests/data/fuzz-regressions/
// and run through the normal loaders: a job (.toml) must load or be refused with InputError or
// FileError, an STL (.stl) must parse to a mesh with every index in range or be refused with
// InputError. A TOML file may state what it must give with a first line `# expect: ok`,
// `# expect: input-error` or `# expect: file-error`; STL files are judged by the rules above.
// Besides the fuzzers' findings, the folder keeps hand-made inputs at the loaders' limits
// (nesting beyond toml++'s depth limit, a 20000-character key, an include of an endless device,
// binary STL counts beyond the file, NaN and out-of-range vertices).
#include <catch2/catch.hpp>

#include <algorithm>
#include <filesystem>
#include <string>

#include "cli/job.hpp"
#include "geom/base/error.hpp"
#include "geom/io/stl.hpp"
#include "tests/support/run_cli.hpp"

namespace fs = std::filesystem;
using trimwright::test::slurp;

namespace {

std::vector<fs::path> regression_files() {
  std::vector<fs::path> files;
  fs::path dir = fs::path(TRIMWRIGHT_SOURCE_DIR) / "tests" / "data" / "fuzz-regressions";
  for (const auto& e : fs::directory_iterator(dir))
    if (e.path().extension() == ".toml" || e.path().extension() == ".stl") files.push_back(e.path());
  std::sort(files.begin(), files.end());
  return files;
}

/// "ok", "input-error", "file-error" or "" from a first line `# expect: …`.
std::string expectation(const std::string& text) {
  const std::string tag = "# expect: ";
  if (text.rfind(tag, 0) != 0) return "";
  return text.substr(tag.size(), text.find('\n') - tag.size());
}

}  // namespace

TEST_CASE("fuzz regressions: every kept input loads or is refused cleanly", "[io][cli][fuzz]") {
  auto files = regression_files();
  REQUIRE(!files.empty());
  for (const auto& f : files) {
    INFO("input: " << f.filename().string());
    std::string bytes = slurp(f);
    if (f.extension() == ".toml") {
      std::string want = expectation(bytes);
      std::string got;
      try {
        trimwright::cli::load_job_text(bytes, f.filename().string(), f.parent_path().string());
        got = "ok";
      } catch (const trimwright::InputError& e) {
        got = "input-error";
        std::string msg = e.what();
        INFO("message: " << msg);
        CHECK(msg.find(f.filename().string()) != std::string::npos);
        CHECK(msg.find('\n') == std::string::npos);
      } catch (const trimwright::FileError&) {
        got = "file-error";
      }
      if (!want.empty()) CHECK(got == want);
    } else {
      try {
        trimwright::io::StlData stl = trimwright::io::parse_stl(bytes, f.filename().string());
        CHECK(!stl.mesh.triangles.empty());
        for (const auto& t : stl.mesh.triangles)
          for (auto i : t) CHECK(i < stl.mesh.vertices.size());
      } catch (const trimwright::InputError& e) {
        std::string msg = e.what();
        INFO("message: " << msg);
        CHECK(msg.find(f.filename().string()) != std::string::npos);
      }
    }
  }
}
