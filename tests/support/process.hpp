// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Running an external program from a test and capturing its output.

#include <sys/wait.h>

#include <cstdio>
#include <string>

namespace trimwright::test {

/// What a finished command gave.
struct CommandResult {
  int exit_code = -1;  ///< the shell's exit status (124 when `timeout` stopped it), -1 if killed
  std::string output;  ///< standard output (and standard error when the command redirects it)
};

/// Run `command` through /bin/sh and capture its standard output. Wrap external tools in
/// `timeout N` so that a hung tool fails the test instead of hanging it.
inline CommandResult run_command(const std::string& command) {
  CommandResult r;
  FILE* p = ::popen(command.c_str(), "r");
  if (!p) return r;
  char buf[4096];
  std::size_t n;
  while ((n = std::fread(buf, 1, sizeof buf, p)) > 0) r.output.append(buf, n);
  const int status = ::pclose(p);
  if (status != -1 && WIFEXITED(status)) r.exit_code = WEXITSTATUS(status);
  return r;
}

/// `text` quoted for /bin/sh.
inline std::string shell_quote(const std::string& text) {
  std::string out = "'";
  for (char c : text) {
    if (c == '\'') {
      out += "'\\''";
    } else {
      out.push_back(c);
    }
  }
  return out + "'";
}

}  // namespace trimwright::test
