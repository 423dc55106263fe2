// SPDX-License-Identifier: GPL-3.0-or-later
// libFuzzer target: the STL reader (binary and ASCII detection, parsing, vertex merging). Any
// input must parse to a mesh whose indices are all in range, or be refused with InputError;
// anything else is a bug. Built by scripts/fuzz.sh; see docs/testing.md.
#include <cstddef>
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "geom/base/error.hpp"
#include "geom/io/stl.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  std::string_view bytes(reinterpret_cast<const char*>(data), size);
  try {
    trimwright::io::StlData stl = trimwright::io::parse_stl(bytes, "fuzz.stl");
    const auto n = stl.mesh.vertices.size();
    if (stl.mesh.triangles.empty()) std::abort();  // "no triangles" must be an InputError
    for (const auto& t : stl.mesh.triangles)
      if (t[0] >= n || t[1] >= n || t[2] >= n) std::abort();
  } catch (const trimwright::InputError&) {
  }
  return 0;
}
