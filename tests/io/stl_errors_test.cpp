// SPDX-License-Identifier: GPL-3.0-or-later
// Broken STL files made by hand: each gives its own one-line message and error class.
#include <catch2/catch.hpp>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <limits>
#include <string>

#include "geom/base/error.hpp"
#include "geom/io/stl.hpp"
#include "tests/support/meshes.hpp"
#include "tests/support/temp_dir.hpp"

using trimwright::ExitCode;
using trimwright::FileError;
using trimwright::InputError;
using trimwright::io::parse_stl;
using trimwright::io::read_stl;
using trimwright::io::stl_bytes;
namespace test = trimwright::test;

namespace {

// The message of the InputError that parsing `bytes` throws (fails the test if none is thrown).
std::string input_error(const std::string& bytes, const std::string& source = "bad.stl") {
  try {
    parse_stl(bytes, source);
  } catch (const InputError& e) {
    CHECK(e.code() == ExitCode::kBadInput);
    const std::string msg = e.what();
    CHECK(msg.find('\n') == std::string::npos);  // one line
    CHECK(msg.rfind(source, 0) == 0);            // names the file first
    return msg;
  }
  FAIL("no InputError for " << source);
  return {};
}

void put_f32(std::string& b, std::size_t off, float f) {
  std::uint32_t bits;
  std::memcpy(&bits, &f, 4);
  for (int k = 0; k < 4; ++k) b[off + k] = static_cast<char>((bits >> (8 * k)) & 0xff);
}

const char kFacet[] =
    "facet normal 0 0 1\n outer loop\n  vertex 0 0 0\n  vertex 1 0 0\n  vertex 0 1 0\n endloop\n"
    "endfacet\n";

}  // namespace

TEST_CASE("stl errors: truncated binary names the count and the sizes", "[io][stl]") {
  std::string b = stl_bytes(test::cube_mesh(5, {1, 1, 1}), "cube");
  b.resize(b.size() - 30);  // 11 whole triangles and part of the 12th
  const std::string msg = input_error(b);
  CHECK(msg.find("truncated binary STL") != std::string::npos);
  CHECK(msg.find("12 triangles (684 bytes)") != std::string::npos);
  CHECK(msg.find("654 bytes (11 whole triangles)") != std::string::npos);
}

TEST_CASE("stl errors: binary with bytes after its triangles", "[io][stl]") {
  std::string b = stl_bytes(test::cube_mesh(5, {1, 1, 1}), "cube");
  b += std::string(7, '\0');
  CHECK(input_error(b).find("7 bytes after its 12 triangles") != std::string::npos);
}

TEST_CASE("stl errors: bad ASCII number names the line and the token", "[io][stl]") {
  const std::string text = std::string("solid s\n") + kFacet +
                           "facet normal 0 0 1\n outer loop\n  vertex 0 0 0\n"
                           "  vertex 1 0,5 0\n  vertex 0 1 0\n endloop\nendfacet\nendsolid s\n";
  const std::string msg = input_error(text);
  CHECK(msg.find("bad.stl:12:") == 0);  // the vertex line
  CHECK(msg.find("bad number '0,5' for vertex y") != std::string::npos);
}

TEST_CASE("stl errors: ASCII structure errors name what was expected", "[io][stl]") {
  CHECK(input_error("solid s\nfacet normal 0 0 1\n outer loop\n  vertex 0 0 0\n  vertex 1 0 0\n"
                    " endloop\nendfacet\nendsolid s\n")
            .find(":6: expected 'vertex' (vertex 3 of 3 of a facet), found 'endloop'") !=
        std::string::npos);
  CHECK(input_error(std::string("solid s\n") + kFacet)
            .find("expected 'facet' or 'endsolid', found the end of the file") !=
        std::string::npos);
  CHECK(input_error("solid s\nfacet normal 0 0 1\n outer loop\n  vertex 0 0")
            .find("file ends where vertex z was expected") != std::string::npos);
}

TEST_CASE("stl errors: NaN or infinite vertices are refused", "[io][stl]") {
  SECTION("binary NaN") {
    std::string b = stl_bytes(test::tetrahedron_mesh(3), "t");
    put_f32(b, 84 + 50 * 2 + 12 + 12 * 1 + 4, std::numeric_limits<float>::quiet_NaN());
    const std::string msg = input_error(b);
    CHECK(msg.find("triangle 3 (of 4) vertex 2 has y = nan") != std::string::npos);
  }
  SECTION("binary infinity") {
    std::string b = stl_bytes(test::tetrahedron_mesh(3), "t");
    put_f32(b, 84 + 12 + 8, -std::numeric_limits<float>::infinity());
    CHECK(input_error(b).find("triangle 1 (of 4) vertex 1 has z = -inf") != std::string::npos);
  }
  SECTION("ASCII nan") {
    const std::string msg = input_error(
        "solid s\nfacet normal 0 0 1\nouter loop\nvertex 0 0 0\nvertex nan 0 0\nvertex 0 1 0\n"
        "endloop\nendfacet\nendsolid\n");
    CHECK(msg.find("bad.stl:5: vertex x = nan is not a finite number") == 0);
  }
  SECTION("ASCII value beyond float range") {
    CHECK(input_error("solid s\nfacet normal 0 0 1\nouter loop\nvertex 0 0 0\nvertex 1 0 0\n"
                      "vertex 0 1e39 0\nendloop\nendfacet\nendsolid\n")
              .find("bad.stl:6: vertex y = 1e+39 is not a finite number") == 0);
  }
}

TEST_CASE("stl errors: zero triangles", "[io][stl]") {
  std::string b(84, '\0');
  std::memcpy(&b[0], "empty", 5);
  CHECK(input_error(b).find("binary STL with 0 triangles") != std::string::npos);
  CHECK(input_error("solid nothing\nendsolid nothing\n").find("ASCII STL with 0 triangles") !=
        std::string::npos);
}

TEST_CASE("stl errors: content that is not STL at all", "[io][stl]") {
  CHECK(input_error("").find("empty file") != std::string::npos);
  CHECK(input_error("hello\n").find("shorter than a binary STL's 84-byte header") !=
        std::string::npos);
  CHECK(input_error(std::string(200, 'x') + "\n").find("text that does not start with 'solid'") !=
        std::string::npos);
  std::string png = "\x89PNG\r\n\x1a\n";
  png += std::string(300, '\x01');
  CHECK(input_error(png).find("truncated binary STL") != std::string::npos);
  std::string zip = "PK\x03\x04";
  zip += std::string(300, '\0');
  CHECK(input_error(zip).find("a zip archive (a 3MF file?), not an STL") != std::string::npos);
}

TEST_CASE("stl errors: unreadable file is a FileError (exit 3), not an InputError", "[io][stl]") {
  test::TempDir dir;
  const auto file_error = [](const std::string& path) -> std::string {
    try {
      read_stl(path);
    } catch (const FileError& e) {
      CHECK(e.code() == ExitCode::kFileError);
      return e.what();
    }
    FAIL("no FileError for " << path);
    return {};
  };
  const std::string missing = file_error(dir.file("missing.stl"));
  CHECK(missing == dir.file("missing.stl") + ": cannot read: No such file or directory");
  CHECK(file_error(dir.path()).find("it is a folder, not a file") != std::string::npos);
  // Bad content in a readable file is InputError.
  test::write_bytes(dir.file("text.stl"), "not a mesh at all, just some words\n");
  CHECK_THROWS_AS(read_stl(dir.file("text.stl")), InputError);
}
