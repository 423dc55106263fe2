// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// STL writer and strict STL reader for plain meshes. Meshes are written as they are given, in the
/// part frame of design.md §3 (mm, z along the spindle axis, the part in z ≥ 0); STL carries no
/// unit, millimetres are implied. Coordinates are stored as 32-bit floats. See
/// docs/file-formats.md for the exact bytes.

#include <string>
#include <string_view>

#include "geom/kernel/mesh.hpp"

namespace trimwright::io {

/// Which STL encoding.
enum class StlFormat {
  kBinary,  ///< 80-byte header, uint32 triangle count, 50 bytes per triangle (little-endian)
  kAscii,   ///< `solid NAME` … `endsolid NAME`, one `facet` block per triangle
};

/// The STL file of `mesh` as bytes. `part_name` goes into the binary header (with "trimwright" and
/// the version) or the ASCII `solid` line; characters outside printable ASCII become '_'. Facet
/// normals come from the cross product of the edges (right-hand rule), zero for a degenerate
/// triangle. The same input gives the same bytes. Throws InternalError for an index out of range,
/// a non-finite vertex or more than 2^32 − 1 triangles.
std::string stl_bytes(const kernel::Mesh& mesh, std::string_view part_name,
                      StlFormat format = StlFormat::kBinary);

/// Write `stl_bytes(mesh, part_name, format)` to `path` atomically (temporary file in the same
/// folder, then rename). Throws FileError naming the path and the OS reason.
void write_stl(const std::string& path, const kernel::Mesh& mesh, std::string_view part_name,
               StlFormat format = StlFormat::kBinary);

/// What read_stl found.
struct StlData {
  kernel::Mesh mesh;  ///< indexed mesh, identical vertices (bit for bit) merged, mm
  StlFormat format = StlFormat::kBinary;
  std::string name;  ///< ASCII `solid` name, or the binary header up to its first NUL
};

/// Parse STL bytes, binary or ASCII, detected from the content (a binary file whose size matches
/// its triangle count is binary even when its header starts with "solid"). `source` names the
/// file in error messages. Throws InputError, one line naming the source (and the line for
/// ASCII), for: truncated or oversized binary data, a malformed ASCII keyword or number,
/// a NaN or infinite vertex, no triangles at all, or content that is not STL. Stored normals
/// are read but not used.
StlData parse_stl(std::string_view bytes, const std::string& source);

/// Read and parse an STL file. Throws FileError when the file cannot be read (exit 3) and
/// InputError when its content is not a valid STL (exit 2).
StlData read_stl(const std::string& path);

}  // namespace trimwright::io
