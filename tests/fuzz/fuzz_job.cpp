// SPDX-License-Identifier: GPL-3.0-or-later
// libFuzzer target: the job loader (TOML parsing, includes, every key's type and range check).
// Any input must load or be refused with InputError (bad job) or FileError (an include that
// cannot be read); anything else (a crash, a sanitizer report, InternalError or another
// exception) is a bug. Built by scripts/fuzz.sh; see docs/testing.md.
#include <cstddef>
#include <cstdint>
#include <string>

#include "cli/job.hpp"
#include "geom/base/error.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  std::string text(reinterpret_cast<const char*>(data), size);
  try {
    // Includes resolve against a folder that does not exist, so a fuzzed `include` can only
    // name an absolute path; the loader must then read it or refuse it.
    trimwright::cli::load_job_text(text, "fuzz.toml", "/nonexistent-trimwright-fuzz");
  } catch (const trimwright::InputError&) {
  } catch (const trimwright::FileError&) {
  }
  return 0;
}
