// SPDX-License-Identifier: GPL-3.0-or-later
// The bad-input battery: every file in tests/bad/ states the exit code and a fragment of the
// one-line message it must produce, and none may write a file.
#include <catch2/catch.hpp>

#include <algorithm>
#include <filesystem>
#include <fstream>
#include <regex>

#include "tests/support/run_cli.hpp"

namespace fs = std::filesystem;
using trimwright::test::run_cli;
using trimwright::test::scratch_dir;
using trimwright::test::shell_quote;

namespace {

struct Expectation {
  int exit_code = -1;
  std::string message;
};

Expectation read_expectation(const fs::path& p) {
  std::ifstream in(p);
  std::string line;
  Expectation e;
  while (std::getline(in, line)) {
    if (line.rfind("# expect-exit: ", 0) == 0) e.exit_code = std::stoi(line.substr(15));
    if (line.rfind("# expect-message: ", 0) == 0) e.message = line.substr(18);
  }
  return e;
}

}  // namespace

TEST_CASE("bad jobs: each gives its own one-line message, its exit code, and writes nothing", "[cli][bad]") {
  fs::path dir = fs::path(TRIMWRIGHT_SOURCE_DIR) / "tests" / "bad";
  std::vector<fs::path> files;
  for (const auto& e : fs::directory_iterator(dir))
    if (e.path().extension() == ".toml") files.push_back(e.path());
  std::sort(files.begin(), files.end());
  REQUIRE(files.size() >= 30);
  std::vector<std::string> messages;
  for (const auto& f : files) {
    Expectation want = read_expectation(f);
    INFO("job file: " << f.filename().string());
    REQUIRE(want.exit_code > 0);
    REQUIRE(!want.message.empty());
    fs::path out = scratch_dir("bad-" + f.stem().string()) / "out";
    auto r = run_cli("design " + shell_quote(f.string()) + " --out " + shell_quote(out.string()));
    INFO("stderr: " << r.err);
    CHECK(r.exit_code == want.exit_code);
    CHECK(r.err.find(want.message) != std::string::npos);
    // One line, naming the file.
    CHECK(std::count(r.err.begin(), r.err.end(), '\n') == 1);
    CHECK(r.err.find(f.filename().string()) != std::string::npos);
    CHECK_FALSE(fs::exists(out));
    messages.push_back(r.err);
  }
  // Distinct messages: no two bad files are reported the same way.
  std::sort(messages.begin(), messages.end());
  CHECK(std::adjacent_find(messages.begin(), messages.end()) == messages.end());
}
