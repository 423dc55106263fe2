// SPDX-License-Identifier: GPL-3.0-or-later
// Any mesh file: STL or 3MF, told apart by content.
#include "geom/io/mesh_file.hpp"

#include <fmt/core.h>

#include "geom/io/files.hpp"
#include "geom/io/stl.hpp"
#include "geom/io/three_mf.hpp"

namespace trimwright::io {

std::vector<NamedMesh> read_mesh_file(const std::string& path) {
  const std::string bytes = read_file(path);
  std::vector<NamedMesh> out;
  // Every zip archive (3MF is one) starts with a local file header, "PK\3\4".
  if (bytes.compare(0, 4, "PK\x03\x04") == 0) {
    ThreeMfModel model = parse_3mf(bytes, path);
    for (ThreeMfReadObject& o : model.objects) {
      out.push_back({o.name.empty() ? fmt::format("object {}", o.id) : o.name, std::move(o.mesh)});
    }
    return out;
  }
  StlData stl = parse_stl(bytes, path);
  out.push_back({std::move(stl.name), std::move(stl.mesh)});
  return out;
}

}  // namespace trimwright::io
