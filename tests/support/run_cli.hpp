// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
// Runs the real trimwright binary for CLI tests and captures its exit code, stdout and stderr.
#include <sys/wait.h>

#include <cstdio>
#include <cstdlib>
#include <filesystem>
#include <fstream>
#include <sstream>
#include <string>

namespace trimwright::test {

struct CliResult {
  int exit_code = -1;
  std::string out;
  std::string err;
};

inline std::string slurp(const std::filesystem::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::ostringstream os;
  os << in.rdbuf();
  return os.str();
}

/// A fresh, empty scratch folder under the test's working directory.
inline std::filesystem::path scratch_dir(const std::string& name) {
  std::filesystem::path p = std::filesystem::current_path() / "scratch" / name;
  std::filesystem::remove_all(p);
  std::filesystem::create_directories(p);
  return p;
}

inline std::string shell_quote(const std::string& s) {
  std::string q = "'";
  for (char c : s) q += c == '\'' ? std::string("'\\''") : std::string(1, c);
  return q + "'";
}

/// Run `trimwright ARGS` (args already shell-quoted as needed) with stdin closed.
inline CliResult run_cli(const std::string& args) {
  static int counter = 0;
  std::filesystem::path base = std::filesystem::current_path() / "scratch" / "io";
  std::filesystem::create_directories(base);
  std::string tag = std::to_string(++counter);
  std::filesystem::path out = base / ("out" + tag), err = base / ("err" + tag);
  std::string cmd = shell_quote(TRIMWRIGHT_EXE) + " " + args + " </dev/null >" +
                    shell_quote(out.string()) + " 2>" + shell_quote(err.string());
  int status = std::system(cmd.c_str());
  CliResult r;
  r.exit_code = WIFEXITED(status) ? WEXITSTATUS(status) : -1;
  r.out = slurp(out);
  r.err = slurp(err);
  return r;
}

}  // namespace trimwright::test
