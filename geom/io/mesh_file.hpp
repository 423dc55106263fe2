// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Reading any mesh file trimwright understands (STL or 3MF), for `trimwright check FILE`.

#include <string>
#include <vector>

#include "geom/kernel/mesh.hpp"

namespace trimwright::io {

/// A mesh read from a file, with the name it had there.
struct NamedMesh {
  std::string name;   ///< STL solid name or 3MF object name ("object ID" when it has none)
  kernel::Mesh mesh;  ///< mm
};

/// The mesh or meshes in an STL or 3MF file, recognised by content (a zip is 3MF, anything else
/// is read as STL). One entry for an STL file, one per mesh object for a 3MF file. FileError when
/// the file cannot be read, InputError when its content is broken.
std::vector<NamedMesh> read_mesh_file(const std::string& path);

}  // namespace trimwright::io
