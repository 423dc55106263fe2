// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// 3MF (3MF Core Specification 1.x) writer for all parts of a design, and a tolerant reader of
/// the core mesh elements for `trimwright check`. The package is written directly as OPC parts
/// (`[Content_Types].xml`, `_rels/.rels`, `3D/3dmodel.model`) in a deflated zip with fixed
/// timestamps, so the same input gives the same bytes. See docs/file-formats.md.

#include <array>
#include <string>
#include <string_view>
#include <utility>
#include <vector>

#include "geom/kernel/mesh.hpp"

namespace trimwright::io {

/// One named part to place on the build plate.
struct ThreeMfObject {
  std::string name;   ///< the object's name shown by slicers (free text)
  kernel::Mesh mesh;  ///< closed mesh in the part frame (design.md §3), mm
};

/// XML namespace of trimwright's own 3MF metadata names (written with the prefix "trimwright:").
inline constexpr const char* kThreeMfMetadataNamespace = "urn:trimwright:3mf:metadata:1";

/// Package-level metadata.
struct ThreeMfMetadata {
  std::string title;  ///< 3MF "Title"; omitted when empty
  /// Extra key/value pairs in this order, written as `trimwright:KEY` (3MF requires custom
  /// metadata names to carry a namespace). Keys: ASCII letters, digits, '_', '-' and '.',
  /// starting with a letter or '_' (e.g. "material", "infill_percent", "pause_layer",
  /// "setting").
  std::vector<std::pair<std::string, std::string>> entries;
};

/// How parts are laid out on the build plate: shelf packing of their bounding boxes (rows along
/// +x, filled tallest-first), the whole arrangement centred on `plate_center_mm`, each part
/// standing on z = 0.
struct PlateLayout {
  double plate_width_mm = 200;                      ///< row length before starting a new row (x)
  double gap_mm = 5;                                ///< clear space between bounding boxes, ≥ 0
  std::array<double, 2> plate_center_mm{100, 100};  ///< where the arrangement's centre goes
};

/// The application string written into every file: "trimwright <version>".
std::string application_name();

/// Translation (mm) of each object's part frame on the plate, in the order given: bounding boxes
/// moved by these never overlap (they are at least `gap_mm` apart in x or y), and every part's
/// lowest point is at z = 0. An object wider than the plate gets a row of its own.
std::vector<kernel::Vec3> plate_positions(const std::vector<ThreeMfObject>& objects,
                                          const PlateLayout& layout = {});

/// The 3MF package as bytes: one mesh object per part (ids 1…n in the given order, vertices as
/// given, in mm), one build item per part translated to its plate position, metadata Title,
/// Application and the caller's entries. Vertex coordinates are the 32-bit float values that an
/// STL of the same mesh holds, printed as the shortest decimal that reads back to that float.
/// Throws InternalError for an empty object list, an empty mesh, an index out of range, a
/// non-finite vertex, or a bad or repeated metadata key.
std::string three_mf_bytes(const std::vector<ThreeMfObject>& objects,
                           const ThreeMfMetadata& metadata, const PlateLayout& layout = {});

/// Write `three_mf_bytes(...)` to `path` atomically. Throws FileError naming the path and the OS
/// reason.
void write_3mf(const std::string& path, const std::vector<ThreeMfObject>& objects,
               const ThreeMfMetadata& metadata, const PlateLayout& layout = {});

/// A 3MF affine transform: the twelve numbers m00 m01 m02 m10 … m32 as written, a 4×3 row-major
/// matrix M with p' = (x, y, z, 1)·M (rows 0–2 the linear part, row 3 the translation in mm).
using ThreeMfTransform = std::array<double, 12>;

/// One mesh object read from a 3MF file.
struct ThreeMfReadObject {
  int id = 0;        ///< the object's resource id
  std::string name;  ///< its `name` attribute (may be empty)
  /// Vertices at float precision (as slicers and STL hold them), converted to mm; components
  /// resolved into one mesh.
  kernel::Mesh mesh;
};

/// One build item read from a 3MF file.
struct ThreeMfBuildItem {
  int object_id = 0;                                               ///< the object it places
  ThreeMfTransform transform{1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0};  ///< translation in mm
};

/// What read_3mf found.
struct ThreeMfModel {
  std::string unit = "millimeter";  ///< the model's unit attribute as written
  double unit_mm = 1;               ///< size of that unit in mm (vertices are already scaled)
  std::vector<ThreeMfReadObject> objects;  ///< objects with geometry, in file order
  std::vector<ThreeMfBuildItem> items;     ///< build items, in file order
  std::vector<std::pair<std::string, std::string>> metadata;  ///< name (as written), value

  /// The value of metadata `name` (exact match), or nullptr.
  const std::string* find_metadata(std::string_view name) const;
};

/// Parse 3MF bytes (a zip package). `source` names the file in error messages. Finds the model
/// part through `_rels/.rels`, then reads `<model unit>`, `<metadata>`, `<object>` with
/// `<mesh>` (`<vertex x y z>`, `<triangle v1 v2 v3>`) or `<components>`, and `<build>` `<item>`s;
/// unknown elements and extensions are skipped. Throws InputError with the source (and the model
/// line) for: not a zip, a damaged zip entry, no model part, malformed XML tags, a bad number, a
/// triangle index out of range, an unknown unit, an object with neither mesh nor components,
/// a component cycle, a reference into another model part (production extension), or a model
/// with no object.
ThreeMfModel parse_3mf(std::string_view bytes, const std::string& source);

/// Read and parse a 3MF file: FileError when it cannot be read, InputError for bad content.
ThreeMfModel read_3mf(const std::string& path);

}  // namespace trimwright::io
