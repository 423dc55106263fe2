// SPDX-License-Identifier: GPL-3.0-or-later
// STL writer and reader: layout, round trips, reproducible bytes, format detection, speed.
#include "geom/io/stl.hpp"

#include <catch2/catch.hpp>
#include <chrono>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <string>

#include "geom/io/three_mf.hpp"
#include "tests/support/meshes.hpp"
#include "tests/support/temp_dir.hpp"

using trimwright::io::parse_stl;
using trimwright::io::read_stl;
using trimwright::io::stl_bytes;
using trimwright::io::StlFormat;
using trimwright::io::write_stl;
namespace kernel = trimwright::kernel;
namespace test = trimwright::test;

namespace {

std::uint32_t u32_at(const std::string& b, std::size_t off) {
  std::uint32_t v = 0;
  for (int k = 3; k >= 0; --k) v = (v << 8) | static_cast<unsigned char>(b[off + k]);
  return v;
}

float f32_at(const std::string& b, std::size_t off) {
  const std::uint32_t bits = u32_at(b, off);
  float f;
  std::memcpy(&f, &bits, 4);
  return f;
}

// Each triangle of `read` has exactly the float-rounded corners of the same triangle of `written`.
void require_same_triangles(const kernel::Mesh& written, const kernel::Mesh& read) {
  REQUIRE(read.triangles.size() == written.triangles.size());
  const kernel::Mesh expect = test::float_rounded(written);
  for (std::size_t t = 0; t < written.triangles.size(); ++t) {
    for (int k = 0; k < 3; ++k) {
      const kernel::Vec3& a = expect.vertices[expect.triangles[t][k]];
      const kernel::Vec3& b = read.vertices[read.triangles[t][k]];
      REQUIRE(a == b);
    }
  }
}

}  // namespace

TEST_CASE("stl: binary layout of a cube (header, count, normals, size)", "[io][stl]") {
  const kernel::Mesh cube = test::cube_mesh(10, {2, 3, 0});
  const std::string b = stl_bytes(cube, "slide disc", StlFormat::kBinary);
  REQUIRE(b.size() == 84 + 50 * 12);
  const std::string header = b.substr(0, 80);
  CHECK(header.rfind("trimwright ", 0) == 0);  // names the tool, never starts with "solid"
  CHECK(header.find(trimwright::io::application_name()) == 0);
  CHECK(header.find("slide disc") != std::string::npos);
  CHECK(u32_at(b, 80) == 12);
  for (std::size_t t = 0; t < 12; ++t) {
    const std::size_t off = 84 + 50 * t;
    const kernel::Vec3 n{f32_at(b, off), f32_at(b, off + 4), f32_at(b, off + 8)};
    // Normal from the corners' cross product: unit length, along one axis, pointing away from
    // the cube's centre (7, 8, 5).
    CHECK(std::abs(n[0]) + std::abs(n[1]) + std::abs(n[2]) == 1.0);
    kernel::Vec3 mid{0, 0, 0};
    for (int k = 0; k < 3; ++k) {
      for (int c = 0; c < 3; ++c) mid[c] += f32_at(b, off + 12 + 12 * k + 4 * c) / 3.0;
    }
    const double outward = n[0] * (mid[0] - 7) + n[1] * (mid[1] - 8) + n[2] * (mid[2] - 5);
    CHECK(outward > 0);
    CHECK(b[off + 48] == 0);
    CHECK(b[off + 49] == 0);
  }
}

TEST_CASE("stl: degenerate triangle gets a zero normal, non-ASCII name is made printable",
          "[io][stl]") {
  kernel::Mesh m;
  m.vertices = {{0, 0, 0}, {1, 0, 0}, {2, 0, 0}};
  m.triangles = {{0, 1, 2}};
  const std::string b = stl_bytes(m,
                                  "r\xC3\xA4"
                                  "d\n1");
  CHECK(f32_at(b, 84) == 0.0f);
  CHECK(f32_at(b, 88) == 0.0f);
  CHECK(f32_at(b, 92) == 0.0f);
  CHECK(b.substr(0, 80).find("r__d_1") != std::string::npos);
  const std::string a = stl_bytes(m,
                                  "r\xC3\xA4"
                                  "d\n1",
                                  StlFormat::kAscii);
  CHECK(a.rfind("solid r__d_1\n", 0) == 0);
  CHECK(a.find("facet normal 0 0 0\n") != std::string::npos);
}

TEST_CASE("stl: binary and ASCII round trips of hand-made meshes", "[io][stl]") {
  struct Case {
    const char* name;
    kernel::Mesh mesh;
  };
  const Case cases[] = {
      {"cube", test::cube_mesh(12.5, {-3.25, 1.0 / 3.0, 0})},
      {"tetrahedron", test::tetrahedron_mesh(7.1)},
      {"cylinder", test::cylinder_mesh(31.7, 4.2, 97, 11.0)},
  };
  for (const Case& c : cases) {
    for (StlFormat format : {StlFormat::kBinary, StlFormat::kAscii}) {
      INFO(c.name << (format == StlFormat::kBinary ? " binary" : " ascii"));
      const auto data = parse_stl(stl_bytes(c.mesh, c.name, format), c.name);
      CHECK(data.format == format);
      // Exact triangle count, every corner equal to the written float, and the shared corners
      // merged back to the original vertex count.
      require_same_triangles(c.mesh, data.mesh);
      CHECK(data.mesh.vertices.size() == c.mesh.vertices.size());
      if (format == StlFormat::kAscii) CHECK(data.name == c.name);
    }
  }
}

TEST_CASE("stl: ASCII and binary of one mesh hold equal values", "[io][stl]") {
  const kernel::Mesh m = test::cylinder_mesh(17.3, 5.9, 41, 3.7);
  const auto bin = parse_stl(stl_bytes(m, "x", StlFormat::kBinary), "bin");
  const auto asc = parse_stl(stl_bytes(m, "x", StlFormat::kAscii), "asc");
  CHECK(bin.mesh.vertices == asc.mesh.vertices);
  CHECK(bin.mesh.triangles == asc.mesh.triangles);
}

TEST_CASE("stl: the same mesh gives the same bytes, also through files", "[io][stl]") {
  const kernel::Mesh m = test::cylinder_mesh(20, 6, 64);
  test::TempDir dir;
  for (StlFormat format : {StlFormat::kBinary, StlFormat::kAscii}) {
    write_stl(dir.file("a.stl"), m, "part", format);
    write_stl(dir.file("b.stl"), test::cylinder_mesh(20, 6, 64), "part", format);
    const std::string a = test::read_bytes(dir.file("a.stl"));
    CHECK(a == test::read_bytes(dir.file("b.stl")));
    CHECK(a == stl_bytes(m, "part", format));
    CHECK(read_stl(dir.file("a.stl")).mesh.triangles.size() == m.triangles.size());
  }
}

TEST_CASE("stl: negative zero is written as positive zero", "[io][stl]") {
  kernel::Mesh m;
  m.vertices = {{-0.0, 0, 0}, {1, -0.0, 0}, {0, 1, -0.0}};
  m.triangles = {{0, 1, 2}};
  const std::string b = stl_bytes(m, "z");
  for (std::size_t off = 84; off < 84 + 48; off += 4) {
    const float f = f32_at(b, off);
    if (f == 0.0f) CHECK_FALSE(std::signbit(f));
  }
  CHECK(stl_bytes(m, "z", StlFormat::kAscii).find("-0") == std::string::npos);
}

TEST_CASE("stl: a binary file whose header starts with 'solid' is read as binary", "[io][stl]") {
  const kernel::Mesh cube = test::cube_mesh(4, {1, 1, 1});
  std::string b = stl_bytes(cube, "c");
  const char kSolidHeader[] = "solid exported by some other program";
  std::memset(&b[0], 0, 80);
  std::memcpy(&b[0], kSolidHeader, sizeof kSolidHeader - 1);
  const auto data = parse_stl(b, "solid-header.stl");
  CHECK(data.format == StlFormat::kBinary);
  CHECK(data.mesh.triangles.size() == 12);
  CHECK(data.name == "solid exported by some other program");
}

TEST_CASE("stl: ASCII reader takes CRLF, upper case, several solids and signed numbers",
          "[io][stl]") {
  const std::string text =
      "SOLID one\r\n"
      " FACET NORMAL 0 0 -1\r\n  OUTER LOOP\r\n   VERTEX +0 0 0\r\n   VERTEX 0 1e1 0\r\n"
      "   VERTEX 10.0 10 0\r\n  ENDLOOP\r\n ENDFACET\r\n"
      "ENDSOLID one\r\n"
      "solid two\n"
      "facet normal 0 0 -1\nouter loop\nvertex 0 0 0\nvertex 10 10 0\nvertex 10 0 0\nendloop\n"
      "endfacet\nendsolid\n";
  const auto data = parse_stl(text, "mixed.stl");
  CHECK(data.format == StlFormat::kAscii);
  CHECK(data.name == "one");
  REQUIRE(data.mesh.triangles.size() == 2);
  CHECK(data.mesh.vertices.size() == 4);  // (0,0,0) and (10,10,0) shared
  CHECK(data.mesh.vertices[1] == kernel::Vec3{0, 10, 0});
}

TEST_CASE("stl: binary writing runs at 200 MB/s or more", "[io][stl][.perf][slow]") {
  // A 1 million triangle mesh (50 MB of STL). Hidden: run with `tw_io_tests "[.perf]"` on an
  // idle machine; timings on shared CI cores are not reliable enough for a default test.
  const kernel::Mesh m = test::cylinder_mesh(40, 10, 250000);
  (void)stl_bytes(m, "warm-up");
  const auto t0 = std::chrono::steady_clock::now();
  const std::string b = stl_bytes(m, "speed");
  const double s = std::chrono::duration<double>(std::chrono::steady_clock::now() - t0).count();
  const double mb_per_s = static_cast<double>(b.size()) / 1e6 / s;
  WARN("binary STL: " << b.size() << " bytes in " << s * 1e3 << " ms = " << mb_per_s << " MB/s");
  CHECK(mb_per_s >= 200);
  test::TempDir dir;
  const auto t1 = std::chrono::steady_clock::now();
  write_stl(dir.file("speed.stl"), m, "speed");
  const double s1 = std::chrono::duration<double>(std::chrono::steady_clock::now() - t1).count();
  WARN("write_stl to disk: " << static_cast<double>(b.size()) / 1e6 / s1 << " MB/s");
  const auto t2 = std::chrono::steady_clock::now();
  const auto back = read_stl(dir.file("speed.stl"));
  const double s2 = std::chrono::duration<double>(std::chrono::steady_clock::now() - t2).count();
  WARN("read_stl: " << static_cast<double>(b.size()) / 1e6 / s2 << " MB/s");
  CHECK(back.mesh.triangles.size() == m.triangles.size());
}
