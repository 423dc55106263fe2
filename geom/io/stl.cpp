// SPDX-License-Identifier: GPL-3.0-or-later
// STL writing (one buffer, one write) and strict reading with vertex merging.
#include "geom/io/stl.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <array>
#include <charconv>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <vector>

#include "geom/base/error.hpp"
#include "geom/io/files.hpp"
#include "geom/io/output_set.hpp"
#include "geom/io/three_mf.hpp"

namespace trimwright::io {
namespace {

constexpr std::size_t kHeaderBytes = 80;
constexpr std::size_t kCountBytes = 4;
constexpr std::size_t kFacetBytes = 50;  // 12 floats + uint16 attribute byte count

// Float value as written, with -0 turned into +0 so that equal points have equal bytes.
inline float to_float(double v) { return static_cast<float>(v) + 0.0f; }

inline void put_u32_le(unsigned char* p, std::uint32_t v) {
  p[0] = static_cast<unsigned char>(v);
  p[1] = static_cast<unsigned char>(v >> 8);
  p[2] = static_cast<unsigned char>(v >> 16);
  p[3] = static_cast<unsigned char>(v >> 24);
}

inline void put_f32_le(unsigned char* p, float f) {
  std::uint32_t bits;
  std::memcpy(&bits, &f, 4);
  put_u32_le(p, bits);
}

inline std::uint32_t get_u32_le(const unsigned char* p) {
  return static_cast<std::uint32_t>(p[0]) | (static_cast<std::uint32_t>(p[1]) << 8) |
         (static_cast<std::uint32_t>(p[2]) << 16) | (static_cast<std::uint32_t>(p[3]) << 24);
}

inline float get_f32_le(const unsigned char* p) {
  const std::uint32_t bits = get_u32_le(p);
  float f;
  std::memcpy(&f, &bits, 4);
  return f;
}

// Printable ASCII only, so that the header and `solid` line are plain text on one line.
std::string printable(std::string_view text) {
  std::string out(text);
  for (char& c : out) {
    if (c < 0x20 || c > 0x7e) c = '_';
  }
  return out;
}

struct Facet {
  float n[3];
  float v[3][3];
};

// Validates the mesh and computes one facet (normal from the double-precision cross product).
Facet facet_of(const kernel::Mesh& mesh, std::size_t t) {
  const auto& tri = mesh.triangles[t];
  Facet f{};
  const kernel::Vec3* p[3];
  for (int k = 0; k < 3; ++k) {
    if (tri[k] >= mesh.vertices.size()) {
      throw InternalError(
          fmt::format("STL: triangle {} uses vertex {} of {}", t, tri[k], mesh.vertices.size()));
    }
    p[k] = &mesh.vertices[tri[k]];
    for (int c = 0; c < 3; ++c) {
      if (!std::isfinite((*p[k])[c])) {
        throw InternalError(fmt::format("STL: vertex {} is not finite", tri[k]));
      }
      f.v[k][c] = to_float((*p[k])[c]);
    }
  }
  const double ux = (*p[1])[0] - (*p[0])[0], uy = (*p[1])[1] - (*p[0])[1],
               uz = (*p[1])[2] - (*p[0])[2];
  const double vx = (*p[2])[0] - (*p[0])[0], vy = (*p[2])[1] - (*p[0])[1],
               vz = (*p[2])[2] - (*p[0])[2];
  double nx = uy * vz - uz * vy, ny = uz * vx - ux * vz, nz = ux * vy - uy * vx;
  const double len = std::sqrt(nx * nx + ny * ny + nz * nz);
  if (len > 0 && std::isfinite(len)) {
    nx /= len;
    ny /= len;
    nz /= len;
  } else {
    nx = ny = nz = 0;
  }
  f.n[0] = to_float(nx);
  f.n[1] = to_float(ny);
  f.n[2] = to_float(nz);
  return f;
}

std::string binary_stl(const kernel::Mesh& mesh, std::string_view part_name) {
  if (mesh.triangles.size() > std::numeric_limits<std::uint32_t>::max()) {
    throw InternalError(
        fmt::format("STL: {} triangles do not fit a binary STL", mesh.triangles.size()));
  }
  std::string out(kHeaderBytes + kCountBytes + kFacetBytes * mesh.triangles.size(), '\0');
  auto* base = reinterpret_cast<unsigned char*>(out.data());
  // The header must not start with "solid" (readers would take it for ASCII).
  const std::string header = printable(fmt::format(
      "{} binary STL, part \"{}\", mm, z = spindle axis", application_name(), part_name));
  std::memcpy(base, header.data(), std::min(header.size(), kHeaderBytes));
  put_u32_le(base + kHeaderBytes, static_cast<std::uint32_t>(mesh.triangles.size()));
  unsigned char* p = base + kHeaderBytes + kCountBytes;
  for (std::size_t t = 0; t < mesh.triangles.size(); ++t, p += kFacetBytes) {
    const Facet f = facet_of(mesh, t);
    for (int c = 0; c < 3; ++c) put_f32_le(p + 4 * c, f.n[c]);
    for (int k = 0; k < 3; ++k) {
      for (int c = 0; c < 3; ++c) put_f32_le(p + 12 + 12 * k + 4 * c, f.v[k][c]);
    }
    // p[48], p[49]: attribute byte count 0 (the buffer is zeroed).
  }
  return out;
}

std::string ascii_stl(const kernel::Mesh& mesh, std::string_view part_name) {
  const std::string name = printable(part_name);
  fmt::memory_buffer b;
  b.reserve(64 + 260 * mesh.triangles.size());
  auto out = fmt::appender(b);
  fmt::format_to(out, "solid {}\n", name);
  for (std::size_t t = 0; t < mesh.triangles.size(); ++t) {
    const Facet f = facet_of(mesh, t);
    // Shortest decimal that reads back to the same float: ASCII and binary hold equal values.
    fmt::format_to(out, "  facet normal {} {} {}\n    outer loop\n", f.n[0], f.n[1], f.n[2]);
    for (int k = 0; k < 3; ++k) {
      fmt::format_to(out, "      vertex {} {} {}\n", f.v[k][0], f.v[k][1], f.v[k][2]);
    }
    fmt::format_to(out, "    endloop\n  endfacet\n");
  }
  fmt::format_to(out, "endsolid {}\n", name);
  return std::string(b.data(), b.size());
}

// ---------------------------------------------------------------------------------------------
// Reading

// Merges vertices that are bit-for-bit identical (after -0 → +0), numbering them by first use.
// An open-addressing hash table of vertex indices (linear probing, at most half full): several
// times faster than std::unordered_map on large files.
class VertexMerger {
 public:
  explicit VertexMerger(kernel::Mesh& mesh) : mesh_(mesh) { rehash(1024); }
  void reserve(std::size_t triangles) {
    // A closed mesh has about half as many vertices as triangles.
    mesh_.vertices.reserve(triangles / 2 + 16);
    keys_.reserve(triangles / 2 + 16);
    mesh_.triangles.reserve(triangles);
    std::size_t want = 1024;
    while (want < triangles + 16) want *= 2;  // ≥ 2 × expected vertices
    if (want > slots_.size()) rehash(want);
  }
  std::uint32_t add(const float v[3]) {
    Key key;
    for (int c = 0; c < 3; ++c) {
      const float f = v[c] + 0.0f;
      std::memcpy(&key.bits[c], &f, 4);
    }
    std::size_t h = hash(key) & mask_;
    while (slots_[h] != 0) {
      const std::uint32_t index = slots_[h] - 1;
      if (keys_[index] == key) return index;
      h = (h + 1) & mask_;
    }
    const auto index = static_cast<std::uint32_t>(keys_.size());
    slots_[h] = index + 1;
    keys_.push_back(key);
    mesh_.vertices.push_back({double(v[0]) + 0.0, double(v[1]) + 0.0, double(v[2]) + 0.0});
    if (2 * keys_.size() > slots_.size()) rehash(2 * slots_.size());
    return index;
  }

 private:
  struct Key {
    std::uint32_t bits[3];
    bool operator==(const Key& o) const {
      return bits[0] == o.bits[0] && bits[1] == o.bits[1] && bits[2] == o.bits[2];
    }
  };
  static std::size_t hash(const Key& k) {
    std::uint64_t h = 0x9e3779b97f4a7c15ull;
    for (std::uint32_t b : k.bits) {
      h ^= b;
      h *= 0xff51afd7ed558ccdull;
      h ^= h >> 32;
    }
    return static_cast<std::size_t>(h);
  }
  void rehash(std::size_t size) {
    slots_.assign(size, 0);
    mask_ = size - 1;
    for (std::size_t i = 0; i < keys_.size(); ++i) {
      std::size_t h = hash(keys_[i]) & mask_;
      while (slots_[h] != 0) h = (h + 1) & mask_;
      slots_[h] = static_cast<std::uint32_t>(i + 1);
    }
  }
  kernel::Mesh& mesh_;
  std::vector<Key> keys_;             // key of each vertex, by index
  std::vector<std::uint32_t> slots_;  // vertex index + 1; 0 is empty
  std::size_t mask_ = 0;
};

const char* axis_name(int c) { return c == 0 ? "x" : c == 1 ? "y" : "z"; }

StlData parse_binary(std::string_view bytes, const std::string& source) {
  const auto* base = reinterpret_cast<const unsigned char*>(bytes.data());
  const std::uint32_t count = get_u32_le(base + kHeaderBytes);
  const std::uint64_t expected =
      kHeaderBytes + kCountBytes + std::uint64_t{kFacetBytes} * std::uint64_t{count};
  if (count == 0) {
    throw InputError(
        fmt::format("{}: binary STL with 0 triangles; a mesh needs at least one", source));
  }
  if (bytes.size() < expected) {
    throw InputError(fmt::format(
        "{}: truncated binary STL: the header says {} triangles ({} bytes) but the file has {} "
        "bytes ({} whole triangles)",
        source, count, expected, bytes.size(),
        (bytes.size() - kHeaderBytes - kCountBytes) / kFacetBytes));
  }
  if (bytes.size() > expected) {
    throw InputError(fmt::format(
        "{}: binary STL with {} bytes after its {} triangles ({} bytes expected in all)", source,
        bytes.size() - expected, count, expected));
  }
  StlData data;
  data.format = StlFormat::kBinary;
  const char* header = bytes.data();
  data.name.assign(header, strnlen(header, kHeaderBytes));
  VertexMerger merger(data.mesh);
  merger.reserve(count);
  const unsigned char* p = base + kHeaderBytes + kCountBytes;
  for (std::uint32_t t = 0; t < count; ++t, p += kFacetBytes) {
    std::array<std::uint32_t, 3> tri;
    for (int k = 0; k < 3; ++k) {
      float v[3];
      for (int c = 0; c < 3; ++c) {
        v[c] = get_f32_le(p + 12 + 12 * k + 4 * c);
        if (!std::isfinite(v[c])) {
          throw InputError(
              fmt::format("{}: triangle {} (of {}) vertex {} has {} = {}; vertices "
                          "must be finite numbers",
                          source, t + 1, count, k + 1, axis_name(c), v[c]));
        }
      }
      tri[k] = merger.add(v);
    }
    data.mesh.triangles.push_back(tri);
  }
  return data;
}

// Whitespace tokenizer over ASCII STL text that tracks line numbers.
class Tokens {
 public:
  Tokens(std::string_view text, const std::string& source) : text_(text), source_(source) {}

  // The next token (empty at the end of input).
  std::string_view next() {
    skip_space();
    const std::size_t start = pos_;
    while (pos_ < text_.size() && !is_space(text_[pos_])) ++pos_;
    token_line_ = line_;
    return text_.substr(start, pos_ - start);
  }
  // The rest of the current line (for the solid name), trimmed.
  std::string_view rest_of_line() {
    while (pos_ < text_.size() && (text_[pos_] == ' ' || text_[pos_] == '\t')) ++pos_;
    const std::size_t start = pos_;
    while (pos_ < text_.size() && text_[pos_] != '\n' && text_[pos_] != '\r') ++pos_;
    std::string_view s = text_.substr(start, pos_ - start);
    while (!s.empty() && (s.back() == ' ' || s.back() == '\t')) s.remove_suffix(1);
    return s;
  }
  std::size_t line() const { return token_line_; }

  [[noreturn]] void fail(const std::string& what) const {
    throw InputError(fmt::format("{}:{}: {}", source_, token_line_, what));
  }

  void expect(std::string_view keyword, std::string_view context) {
    const std::string_view tok = next();
    if (!equals_ignore_case(tok, keyword)) {
      fail(fmt::format("expected '{}' {}, found {}", keyword, context, describe(tok)));
    }
  }

  double number(std::string_view what) {
    const std::string_view tok = next();
    if (tok.empty()) fail(fmt::format("file ends where {} was expected", what));
    double value = 0;
    const char* first = tok.data();
    const char* last = tok.data() + tok.size();
    if (*first == '+') ++first;  // from_chars does not take a leading '+'
    const auto [ptr, ec] = std::from_chars(first, last, value);
    if (ec == std::errc::result_out_of_range) {
      fail(fmt::format("{} '{}' is out of range", what, tok));
    }
    if (ec != std::errc() || ptr != last || first == last) {
      fail(fmt::format("bad number '{}' for {}", printable(tok), what));
    }
    return value;
  }

  static bool equals_ignore_case(std::string_view a, std::string_view b) {
    if (a.size() != b.size()) return false;
    for (std::size_t i = 0; i < a.size(); ++i) {
      char x = a[i], y = b[i];
      if (x >= 'A' && x <= 'Z') x = static_cast<char>(x - 'A' + 'a');
      if (y >= 'A' && y <= 'Z') y = static_cast<char>(y - 'A' + 'a');
      if (x != y) return false;
    }
    return true;
  }

  static std::string describe(std::string_view tok) {
    if (tok.empty()) return "the end of the file";
    if (tok.size() > 40) tok = tok.substr(0, 40);
    return "'" + printable(tok) + "'";
  }

 private:
  static bool is_space(char c) {
    return c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '\f' || c == '\v';
  }
  void skip_space() {
    while (pos_ < text_.size() && is_space(text_[pos_])) {
      if (text_[pos_] == '\n') ++line_;
      ++pos_;
    }
  }
  std::string_view text_;
  const std::string& source_;
  std::size_t pos_ = 0;
  std::size_t line_ = 1;
  std::size_t token_line_ = 1;
};

StlData parse_ascii(std::string_view text, const std::string& source) {
  StlData data;
  data.format = StlFormat::kAscii;
  VertexMerger merger(data.mesh);
  merger.reserve(text.size() / 200);
  Tokens tok(text, source);
  tok.expect("solid", "at the start of an ASCII STL");
  data.name = std::string(tok.rest_of_line());
  static const char* const kVertexWhat[3] = {"vertex x", "vertex y", "vertex z"};
  for (;;) {
    std::string_view word = tok.next();
    if (Tokens::equals_ignore_case(word, "endsolid")) {
      tok.rest_of_line();  // the optional name
      // Some exporters write several solids in one file: read them all as one mesh.
      word = tok.next();
      if (word.empty()) break;
      if (!Tokens::equals_ignore_case(word, "solid")) {
        tok.fail(fmt::format("expected 'solid' or the end of the file after 'endsolid', found {}",
                             Tokens::describe(word)));
      }
      tok.rest_of_line();
      continue;
    }
    if (!Tokens::equals_ignore_case(word, "facet")) {
      tok.fail(fmt::format("expected 'facet' or 'endsolid', found {}", Tokens::describe(word)));
    }
    tok.expect("normal", "after 'facet'");
    for (int c = 0; c < 3; ++c) tok.number("a facet normal component");
    tok.expect("outer", "to start a facet's vertex list");
    tok.expect("loop", "after 'outer'");
    std::array<std::uint32_t, 3> tri;
    for (int k = 0; k < 3; ++k) {
      tok.expect("vertex", fmt::format("(vertex {} of 3 of a facet)", k + 1));
      float v[3];
      for (int c = 0; c < 3; ++c) {
        const double d = tok.number(kVertexWhat[c]);
        const float f = static_cast<float>(d);
        if (!std::isfinite(d) || !std::isfinite(f)) {
          tok.fail(fmt::format("{} = {} is not a finite number (or too large for STL's float)",
                               kVertexWhat[c], d));
        }
        v[c] = f;
      }
      tri[k] = merger.add(v);
    }
    tok.expect("endloop", "after a facet's 3 vertices");
    tok.expect("endfacet", "after 'endloop'");
    data.mesh.triangles.push_back(tri);
  }
  if (data.mesh.triangles.empty()) {
    throw InputError(
        fmt::format("{}: ASCII STL with 0 triangles; a mesh needs at least one", source));
  }
  return data;
}

bool starts_with_solid(std::string_view bytes) {
  std::size_t i = 0;
  while (i < bytes.size() &&
         (bytes[i] == ' ' || bytes[i] == '\t' || bytes[i] == '\r' || bytes[i] == '\n')) {
    ++i;
  }
  return bytes.size() - i >= 5 && Tokens::equals_ignore_case(bytes.substr(i, 5), "solid") &&
         (bytes.size() - i == 5 || static_cast<unsigned char>(bytes[i + 5]) <= 0x20);
}

// True when the bytes after the first line look like text (no NUL or other binary control bytes
// in the first 4 KiB): a binary STL whose header starts with "solid" fails this.
bool looks_like_text(std::string_view bytes) {
  const std::size_t n = std::min<std::size_t>(bytes.size(), 4096);
  for (std::size_t i = 0; i < n; ++i) {
    const auto c = static_cast<unsigned char>(bytes[i]);
    if (c < 0x20 && c != '\n' && c != '\r' && c != '\t' && c != '\f' && c != '\v') return false;
  }
  return true;
}

}  // namespace

std::string stl_bytes(const kernel::Mesh& mesh, std::string_view part_name, StlFormat format) {
  return format == StlFormat::kBinary ? binary_stl(mesh, part_name) : ascii_stl(mesh, part_name);
}

void write_stl(const std::string& path, const kernel::Mesh& mesh, std::string_view part_name,
               StlFormat format) {
  write_file_atomic(path, stl_bytes(mesh, part_name, format));
}

StlData parse_stl(std::string_view bytes, const std::string& source) {
  if (bytes.empty()) throw InputError(fmt::format("{}: empty file, not an STL", source));
  const bool binary_size_matches =
      bytes.size() >= kHeaderBytes + kCountBytes &&
      bytes.size() ==
          kHeaderBytes + kCountBytes +
              std::uint64_t{kFacetBytes} *
                  get_u32_le(reinterpret_cast<const unsigned char*>(bytes.data()) + kHeaderBytes);
  if (binary_size_matches) return parse_binary(bytes, source);
  if (bytes.substr(0, 4) == std::string_view("PK\x03\x04", 4)) {
    throw InputError(fmt::format("{}: a zip archive (a 3MF file?), not an STL", source));
  }
  if (starts_with_solid(bytes) && looks_like_text(bytes)) return parse_ascii(bytes, source);
  if (bytes.size() < kHeaderBytes + kCountBytes) {
    throw InputError(fmt::format(
        "{}: not an STL: {} bytes is shorter than a binary STL's 84-byte header and the text does "
        "not start with 'solid'",
        source, bytes.size()));
  }
  if (looks_like_text(bytes)) {
    throw InputError(fmt::format(
        "{}: not an STL: text that does not start with 'solid', and its size does not match a "
        "binary STL",
        source));
  }
  return parse_binary(bytes, source);  // reports the size mismatch precisely
}

StlData read_stl(const std::string& path) { return parse_stl(read_file(path), path); }

}  // namespace trimwright::io
