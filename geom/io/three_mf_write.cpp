// SPDX-License-Identifier: GPL-3.0-or-later
// 3MF writing: plate layout, model XML, OPC parts, reproducible zip.
#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <cmath>
#include <limits>
#include <numeric>
#include <set>

#include "geom/base/error.hpp"
#include "geom/io/output_set.hpp"
#include "geom/io/text_util.hpp"
#include "geom/io/three_mf.hpp"
#include "geom/io/zip_archive.hpp"

#ifndef TRIMWRIGHT_VERSION
#error "tw_io needs TRIMWRIGHT_VERSION (set from the CMake project version)"
#endif

namespace trimwright::io {
namespace {

constexpr const char* kCoreNamespace = "http://schemas.microsoft.com/3dmanufacturing/core/2015/02";
// Custom metadata names must be namespace-qualified (3MF Core Specification, "Metadata").
constexpr const char* kMetadataPrefix = "trimwright";
constexpr const char* kModelPath = "3D/3dmodel.model";

constexpr const char* kContentTypes =
    "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    "<Types xmlns=\"http://schemas.openxmlformats.org/package/2006/content-types\">\n"
    " <Default Extension=\"rels\" "
    "ContentType=\"application/vnd.openxmlformats-package.relationships+xml\"/>\n"
    " <Default Extension=\"model\" "
    "ContentType=\"application/vnd.ms-package.3dmanufacturing-3dmodel+xml\"/>\n"
    "</Types>\n";

constexpr const char* kRelationships =
    "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    "<Relationships xmlns=\"http://schemas.openxmlformats.org/package/2006/relationships\">\n"
    " <Relationship Target=\"/3D/3dmodel.model\" Id=\"rel0\" "
    "Type=\"http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel\"/>\n"
    "</Relationships>\n";

// Float value as stored, -0 as +0 (the same value an STL of the mesh holds).
inline float to_float(double v) { return static_cast<float>(v) + 0.0f; }

struct Bounds {
  kernel::Vec3 min{0, 0, 0};
  kernel::Vec3 max{0, 0, 0};
};

Bounds bounds_of(const kernel::Mesh& mesh) {
  Bounds b;
  if (mesh.vertices.empty()) return b;
  b.min = b.max = mesh.vertices.front();
  for (const kernel::Vec3& v : mesh.vertices) {
    for (int c = 0; c < 3; ++c) {
      b.min[c] = std::min(b.min[c], v[c]);
      b.max[c] = std::max(b.max[c], v[c]);
    }
  }
  return b;
}

// An XML local name in plain ASCII: a letter or '_', then letters, digits, '_', '-' or '.'.
bool valid_metadata_key(const std::string& key) {
  auto ascii_alpha = [](char c) { return (c >= 'a' && c <= 'z') || (c >= 'A' && c <= 'Z'); };
  if (key.empty() || !(ascii_alpha(key[0]) || key[0] == '_')) return false;
  return std::all_of(key.begin(), key.end(), [&](char c) {
    return ascii_alpha(c) || (c >= '0' && c <= '9') || c == '_' || c == '-' || c == '.';
  });
}

void validate(const std::vector<ThreeMfObject>& objects, const ThreeMfMetadata& metadata) {
  if (objects.empty()) throw InternalError("3MF: no objects to write");
  for (std::size_t i = 0; i < objects.size(); ++i) {
    const kernel::Mesh& m = objects[i].mesh;
    if (m.triangles.empty()) {
      throw InternalError(fmt::format("3MF: object '{}' has no triangles", objects[i].name));
    }
    for (const kernel::Vec3& v : m.vertices) {
      if (!std::isfinite(v[0]) || !std::isfinite(v[1]) || !std::isfinite(v[2])) {
        throw InternalError(
            fmt::format("3MF: object '{}' has a non-finite vertex", objects[i].name));
      }
    }
    for (const auto& t : m.triangles) {
      for (std::uint32_t k : t) {
        if (k >= m.vertices.size()) {
          throw InternalError(fmt::format("3MF: object '{}' uses vertex {} of {}", objects[i].name,
                                          k, m.vertices.size()));
        }
      }
    }
  }
  std::set<std::string> seen;
  for (const auto& [key, value] : metadata.entries) {
    if (!valid_metadata_key(key)) {
      throw InternalError(fmt::format("3MF: metadata key '{}' is not a plain name", key));
    }
    if (!seen.insert(key).second) {
      throw InternalError(fmt::format("3MF: metadata key '{}' given twice", key));
    }
  }
}

std::string model_xml(const std::vector<ThreeMfObject>& objects, const ThreeMfMetadata& metadata,
                      const std::vector<kernel::Vec3>& positions) {
  std::size_t estimate = 1024;
  for (const ThreeMfObject& o : objects) {
    estimate += 60 * o.mesh.vertices.size() + 50 * o.mesh.triangles.size() + 200;
  }
  fmt::memory_buffer b;
  b.reserve(estimate);
  auto out = fmt::appender(b);
  fmt::format_to(out,
                 "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
                 "<model unit=\"millimeter\" xml:lang=\"en-US\" xmlns=\"{}\" xmlns:{}=\"{}\">\n",
                 kCoreNamespace, kMetadataPrefix, kThreeMfMetadataNamespace);
  if (!metadata.title.empty()) {
    fmt::format_to(out, " <metadata name=\"Title\">{}</metadata>\n",
                   detail::xml_escape(metadata.title));
  }
  fmt::format_to(out, " <metadata name=\"Application\">{}</metadata>\n",
                 detail::xml_escape(application_name()));
  for (const auto& [key, value] : metadata.entries) {
    fmt::format_to(out, " <metadata name=\"{}:{}\">{}</metadata>\n", kMetadataPrefix, key,
                   detail::xml_escape(value));
  }
  fmt::format_to(out, " <resources>\n");
  for (std::size_t i = 0; i < objects.size(); ++i) {
    const kernel::Mesh& m = objects[i].mesh;
    fmt::format_to(out,
                   "  <object id=\"{}\" type=\"model\" name=\"{}\">\n   <mesh>\n    <vertices>\n",
                   i + 1, detail::xml_escape(objects[i].name));
    for (const kernel::Vec3& v : m.vertices) {
      // Shortest decimal that reads back to the same float.
      fmt::format_to(out, "     <vertex x=\"{}\" y=\"{}\" z=\"{}\"/>\n", to_float(v[0]),
                     to_float(v[1]), to_float(v[2]));
    }
    fmt::format_to(out, "    </vertices>\n    <triangles>\n");
    for (const auto& t : m.triangles) {
      fmt::format_to(out, "     <triangle v1=\"{}\" v2=\"{}\" v3=\"{}\"/>\n", t[0], t[1], t[2]);
    }
    fmt::format_to(out, "    </triangles>\n   </mesh>\n  </object>\n");
  }
  fmt::format_to(out, " </resources>\n <build>\n");
  for (std::size_t i = 0; i < objects.size(); ++i) {
    const kernel::Vec3& t = positions[i];
    // Translation only; the shortest decimal that reads back to the same double.
    fmt::format_to(out, "  <item objectid=\"{}\" transform=\"1 0 0 0 1 0 0 0 1 {} {} {}\"/>\n",
                   i + 1, t[0] + 0.0, t[1] + 0.0, t[2] + 0.0);
  }
  fmt::format_to(out, " </build>\n</model>\n");
  return std::string(b.data(), b.size());
}

}  // namespace

std::string application_name() { return std::string("trimwright ") + TRIMWRIGHT_VERSION; }

std::vector<kernel::Vec3> plate_positions(const std::vector<ThreeMfObject>& objects,
                                          const PlateLayout& layout) {
  if (!(layout.gap_mm >= 0) || !std::isfinite(layout.gap_mm) ||
      !std::isfinite(layout.plate_width_mm) || !std::isfinite(layout.plate_center_mm[0]) ||
      !std::isfinite(layout.plate_center_mm[1])) {
    throw InternalError(fmt::format("3MF: bad plate layout (width {} mm, gap {} mm)",
                                    layout.plate_width_mm, layout.gap_mm));
  }
  const std::size_t n = objects.size();
  std::vector<Bounds> boxes(n);
  for (std::size_t i = 0; i < n; ++i) boxes[i] = bounds_of(objects[i].mesh);
  // Deepest (largest y extent) first, so each row is as shallow as its first part.
  std::vector<std::size_t> order(n);
  std::iota(order.begin(), order.end(), std::size_t{0});
  std::stable_sort(order.begin(), order.end(), [&](std::size_t a, std::size_t b) {
    return boxes[a].max[1] - boxes[a].min[1] > boxes[b].max[1] - boxes[b].min[1];
  });
  std::vector<std::array<double, 2>> corner(n);  // where each box's min corner goes
  double x = 0, row_y = 0, row_depth = 0, used_width = 0;
  bool row_empty = true;
  for (std::size_t i : order) {
    const double w = boxes[i].max[0] - boxes[i].min[0];
    const double d = boxes[i].max[1] - boxes[i].min[1];
    if (!row_empty && x + w > layout.plate_width_mm) {
      row_y += row_depth + layout.gap_mm;
      x = 0;
      row_depth = 0;
      row_empty = true;
    }
    corner[i] = {x, row_y};
    used_width = std::max(used_width, x + w);
    x += w + layout.gap_mm;
    row_depth = std::max(row_depth, d);
    row_empty = false;
  }
  const double used_depth = row_y + row_depth;
  const double shift_x = layout.plate_center_mm[0] - used_width / 2;
  const double shift_y = layout.plate_center_mm[1] - used_depth / 2;
  std::vector<kernel::Vec3> positions(n);
  for (std::size_t i = 0; i < n; ++i) {
    positions[i] = {corner[i][0] + shift_x - boxes[i].min[0],
                    corner[i][1] + shift_y - boxes[i].min[1], -boxes[i].min[2]};
  }
  return positions;
}

std::string three_mf_bytes(const std::vector<ThreeMfObject>& objects,
                           const ThreeMfMetadata& metadata, const PlateLayout& layout) {
  validate(objects, metadata);
  const std::vector<kernel::Vec3> positions = plate_positions(objects, layout);
  std::vector<detail::ZipEntry> entries;
  entries.push_back({"[Content_Types].xml", kContentTypes});
  entries.push_back({"_rels/.rels", kRelationships});
  entries.push_back({kModelPath, model_xml(objects, metadata, positions)});
  return detail::zip_bytes(entries);
}

void write_3mf(const std::string& path, const std::vector<ThreeMfObject>& objects,
               const ThreeMfMetadata& metadata, const PlateLayout& layout) {
  write_file_atomic(path, three_mf_bytes(objects, metadata, layout));
}

}  // namespace trimwright::io
