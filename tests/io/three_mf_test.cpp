// SPDX-License-Identifier: GPL-3.0-or-later
// 3MF writer and our own reader: package parts, plate layout, reproducible bytes, round trips,
// and broken files.
#include "geom/io/three_mf.hpp"

#include <catch2/catch.hpp>
#include <random>
#include <string>
#include <vector>

#include "geom/base/error.hpp"
#include "geom/io/mesh_file.hpp"
#include "geom/io/stl.hpp"
#include "geom/io/zip_archive.hpp"
#include "tests/support/meshes.hpp"
#include "tests/support/temp_dir.hpp"

using trimwright::InputError;
using trimwright::InternalError;
namespace kernel = trimwright::kernel;
namespace test = trimwright::test;
namespace io = trimwright::io;

namespace {

std::vector<io::ThreeMfObject> sample_parts() {
  return {{"slide disc", test::cylinder_mesh(30, 6, 96, 0.25)},
          {"weight A", test::cube_mesh(12.3, {-6, -6, 0})},
          {"weight B", test::tetrahedron_mesh(7)}};
}

io::ThreeMfMetadata sample_metadata() {
  io::ThreeMfMetadata m;
  m.title = "Left wheel, 36 grit";
  m.entries = {{"material", "PETG"}, {"infill_percent", "100"}, {"pause_layer", "12"}};
  return m;
}

// A 3MF package around a hand-written model part.
std::string package(const std::string& model_xml, bool with_rels = true) {
  std::vector<io::detail::ZipEntry> entries;
  entries.push_back({"[Content_Types].xml", "<Types/>"});
  if (with_rels) {
    entries.push_back(
        {"_rels/.rels",
         "<?xml version=\"1.0\"?><Relationships xmlns=\"http://schemas.openxmlformats.org/package/"
         "2006/relationships\"><Relationship Target=\"/3D/3dmodel.model\" Id=\"r\" "
         "Type=\"http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel\"/></"
         "Relationships>"});
  }
  entries.push_back({"3D/3dmodel.model", model_xml});
  return io::detail::zip_bytes(entries);
}

const char kTriangleModel[] =
    "<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n"
    "<model unit=\"millimeter\" "
    "xmlns=\"http://schemas.microsoft.com/3dmanufacturing/core/2015/02\">\n"
    " <resources>\n"
    "  <object id=\"3\" type=\"model\" name=\"t\">\n"
    "   <mesh>\n"
    "    <vertices>\n"
    "     <vertex x=\"0\" y=\"0\" z=\"0\"/>\n"
    "     <vertex x=\"1\" y=\"0\" z=\"0\"/>\n"
    "     <vertex x=\"0\" y=\"1\" z=\"0\"/>\n"
    "     <vertex x=\"0\" y=\"0\" z=\"1\"/>\n"
    "    </vertices>\n"
    "    <triangles>\n"
    "     <triangle v1=\"0\" v2=\"2\" v3=\"1\"/>\n"
    "     <triangle v1=\"0\" v2=\"1\" v3=\"3\"/>\n"
    "     <triangle v1=\"0\" v2=\"3\" v3=\"2\"/>\n"
    "     <triangle v1=\"1\" v2=\"2\" v3=\"3\"/>\n"
    "    </triangles>\n"
    "   </mesh>\n"
    "  </object>\n"
    " </resources>\n"
    " <build><item objectid=\"3\"/></build>\n"
    "</model>\n";

std::string replaced(std::string s, const std::string& from, const std::string& to) {
  const std::size_t at = s.find(from);
  REQUIRE(at != std::string::npos);
  return s.replace(at, from.size(), to);
}

// The message of the InputError that parsing `bytes` as 3MF throws.
std::string input_error(const std::string& bytes) {
  try {
    io::parse_3mf(bytes, "bad.3mf");
  } catch (const InputError& e) {
    const std::string msg = e.what();
    CHECK(msg.find('\n') == std::string::npos);
    CHECK(msg.rfind("bad.3mf: ", 0) == 0);
    return msg;
  }
  FAIL("no InputError");
  return {};
}

}  // namespace

TEST_CASE("3mf: the package holds the three OPC parts with the core namespace", "[io][3mf]") {
  // Content type, relationship target and core namespace as the 3MF Core Specification gives
  // them (3MF Consortium, "3MF Core Specification", github.com/3MFConsortium/spec_core: the
  // chapters on the package and the model, and the appendix of standard namespaces and content
  // types; chapter names from memory). lib3mf reading the same files (three_mf_lib3mf_test.cpp)
  // checks them independently.
  const std::string bytes = io::three_mf_bytes(sample_parts(), sample_metadata());
  const io::detail::ZipReader zip(bytes, "x.3mf");
  const std::string types = zip.read("[Content_Types].xml");
  CHECK(types.find("Extension=\"model\" "
                   "ContentType=\"application/vnd.ms-package.3dmanufacturing-3dmodel+xml\"") !=
        std::string::npos);
  CHECK(zip.read("_rels/.rels").find("Target=\"/3D/3dmodel.model\"") != std::string::npos);
  const std::string model = zip.read("3D/3dmodel.model");
  CHECK(model.find("<model unit=\"millimeter\"") != std::string::npos);
  CHECK(model.find("xmlns=\"http://schemas.microsoft.com/3dmanufacturing/core/2015/02\"") !=
        std::string::npos);
  CHECK(model.find("<metadata name=\"Application\">" + io::application_name() + "</metadata>") !=
        std::string::npos);
  CHECK(model.find("<metadata name=\"trimwright:pause_layer\">12</metadata>") != std::string::npos);
}

TEST_CASE("3mf: two writes of the same input give identical bytes", "[io][3mf]") {
  test::TempDir dir;
  io::write_3mf(dir.file("a.3mf"), sample_parts(), sample_metadata());
  io::write_3mf(dir.file("b.3mf"), sample_parts(), sample_metadata());
  const std::string a = test::read_bytes(dir.file("a.3mf"));
  CHECK(a == test::read_bytes(dir.file("b.3mf")));
  CHECK(a == io::three_mf_bytes(sample_parts(), sample_metadata()));
  // Deflated: far smaller than the model text.
  const io::detail::ZipReader zip(a, "a.3mf");
  CHECK(a.size() * 3 < zip.read("3D/3dmodel.model").size());
}

TEST_CASE("3mf: our reader gets back objects, names, exact vertices, items and metadata",
          "[io][3mf]") {
  const auto parts = sample_parts();
  const io::ThreeMfModel m = io::parse_3mf(io::three_mf_bytes(parts, sample_metadata()), "x");
  CHECK(m.unit == "millimeter");
  CHECK(m.unit_mm == 1.0);
  REQUIRE(m.objects.size() == parts.size());
  for (std::size_t i = 0; i < parts.size(); ++i) {
    CHECK(m.objects[i].id == static_cast<int>(i + 1));
    CHECK(m.objects[i].name == parts[i].name);
    CHECK(m.objects[i].mesh.triangles == parts[i].mesh.triangles);
    // The vertices are the float values the STL holds, exactly.
    CHECK(m.objects[i].mesh.vertices == test::float_rounded(parts[i].mesh).vertices);
  }
  const auto positions = io::plate_positions(parts);
  REQUIRE(m.items.size() == parts.size());
  for (std::size_t i = 0; i < parts.size(); ++i) {
    CHECK(m.items[i].object_id == static_cast<int>(i + 1));
    CHECK(m.items[i].transform[9] == positions[i][0]);  // doubles written shortest round-trip
    CHECK(m.items[i].transform[10] == positions[i][1]);
    CHECK(m.items[i].transform[11] == positions[i][2]);
    CHECK(m.items[i].transform[0] == 1.0);
    CHECK(m.items[i].transform[4] == 1.0);
    CHECK(m.items[i].transform[8] == 1.0);
  }
  REQUIRE(m.find_metadata("Title"));
  CHECK(*m.find_metadata("Title") == "Left wheel, 36 grit");
  REQUIRE(m.find_metadata("trimwright:infill_percent"));
  CHECK(*m.find_metadata("trimwright:infill_percent") == "100");
  CHECK(m.find_metadata("material") == nullptr);  // written with its namespace prefix
}

TEST_CASE("3mf: names and values with markup or control characters stay well-formed", "[io][3mf]") {
  io::ThreeMfMetadata meta;
  meta.title = "a < b & \"c\" 'd' \x01 e\n f";
  meta.entries = {{"note", "x\ty"}};
  const std::vector<io::ThreeMfObject> parts = {{"<part>&", test::cube_mesh(3, {1, 1, 1})}};
  const io::ThreeMfModel m = io::parse_3mf(io::three_mf_bytes(parts, meta), "x");
  CHECK(*m.find_metadata("Title") == "a < b & \"c\" 'd' \xEF\xBF\xBD e\n f");
  CHECK(*m.find_metadata("trimwright:note") == "x\ty");
  CHECK(m.objects[0].name == "<part>&");
}

TEST_CASE("3mf: writer refuses bad input as internal errors", "[io][3mf]") {
  CHECK_THROWS_AS(io::three_mf_bytes({}, {}), InternalError);
  CHECK_THROWS_AS(io::three_mf_bytes({{"empty", kernel::Mesh{}}}, {}), InternalError);
  kernel::Mesh bad = test::tetrahedron_mesh(1);
  bad.triangles[0][2] = 4;
  CHECK_THROWS_AS(io::three_mf_bytes({{"bad", bad}}, {}), InternalError);
  io::ThreeMfMetadata meta;
  for (const char* key : {"bad key", "1st", "", "a:b", "\xC3\xA4"}) {
    meta.entries = {{key, "x"}};
    CHECK_THROWS_AS(io::three_mf_bytes(sample_parts(), meta), InternalError);
  }
  meta.entries = {{"_pause-disc.2", "x"}};
  CHECK(io::parse_3mf(io::three_mf_bytes(sample_parts(), meta), "x")
            .find_metadata("trimwright:_pause-disc.2"));
  meta.entries = {{"material", "x"}, {"material", "y"}};
  CHECK_THROWS_AS(io::three_mf_bytes(sample_parts(), meta), InternalError);
}

TEST_CASE("3mf: plate layout keeps bounding boxes apart by the gap, on z = 0, centred",
          "[io][3mf]") {
  std::mt19937 rng(12345);
  std::uniform_real_distribution<double> size(1, 70), pos(-50, 50);
  std::vector<io::ThreeMfObject> parts;
  for (int i = 0; i < 14; ++i) {
    kernel::Mesh m = test::cube_mesh(1, {0, 0, 0});
    const double sx = size(rng), sy = size(rng), sz = size(rng) / 5;
    const kernel::Vec3 o{pos(rng), pos(rng), pos(rng)};
    for (auto& v : m.vertices) v = {o[0] + v[0] * sx, o[1] + v[1] * sy, o[2] + v[2] * sz};
    parts.push_back({"p" + std::to_string(i), m});
  }
  io::PlateLayout layout;
  layout.plate_width_mm = 180;
  layout.gap_mm = 4;
  layout.plate_center_mm = {110, 90};
  const auto positions = io::plate_positions(parts, layout);
  REQUIRE(positions.size() == parts.size());
  std::vector<kernel::Box3> boxes;
  kernel::Box3 all;
  for (std::size_t i = 0; i < parts.size(); ++i) {
    kernel::Box3 b;
    for (int c = 0; c < 3; ++c)
      b.min[c] = b.max[c] = parts[i].mesh.vertices[0][c] + positions[i][c];
    for (const auto& v : parts[i].mesh.vertices) {
      for (int c = 0; c < 3; ++c) {
        b.min[c] = std::min(b.min[c], v[c] + positions[i][c]);
        b.max[c] = std::max(b.max[c], v[c] + positions[i][c]);
      }
    }
    CHECK(b.min[2] == Approx(0).margin(1e-12));  // standing on the plate
    boxes.push_back(b);
    if (i == 0) all = b;
    for (int c = 0; c < 3; ++c) {
      all.min[c] = std::min(all.min[c], b.min[c]);
      all.max[c] = std::max(all.max[c], b.max[c]);
    }
  }
  CHECK((all.min[0] + all.max[0]) / 2 == Approx(110));
  CHECK((all.min[1] + all.max[1]) / 2 == Approx(90));
  CHECK(all.max[0] - all.min[0] <= 180 + 1e-9);
  for (std::size_t i = 0; i < boxes.size(); ++i) {
    for (std::size_t j = i + 1; j < boxes.size(); ++j) {
      const double sep_x =
          std::max(boxes[j].min[0] - boxes[i].max[0], boxes[i].min[0] - boxes[j].max[0]);
      const double sep_y =
          std::max(boxes[j].min[1] - boxes[i].max[1], boxes[i].min[1] - boxes[j].max[1]);
      INFO("boxes " << i << " and " << j);
      CHECK(std::max(sep_x, sep_y) >= 4 - 1e-9);
    }
  }
}

TEST_CASE("3mf: a part wider than the plate gets its own row", "[io][3mf]") {
  const std::vector<io::ThreeMfObject> parts = {{"wide", test::cube_mesh(300, {0, 0, 0})},
                                                {"small", test::cube_mesh(10, {0, 0, 0})}};
  const auto p = io::plate_positions(parts);
  CHECK(p[1][1] - p[0][1] == Approx(305));  // next row: 300 deep + 5 gap
}

TEST_CASE("3mf reader: tolerant of prefixes, comments, CDATA, units and components", "[io][3mf]") {
  const std::string xml =
      "<?xml version=\"1.0\"?>\n"
      "<!-- written by hand -->\n"
      "<m:model unit=\"inch\" xmlns:m=\"http://schemas.microsoft.com/3dmanufacturing/core/2015/02\""
      " xmlns:x=\"urn:other\">\n"
      " <m:metadata name=\"Title\"><![CDATA[a <b>]]> &amp; &#x263A;</m:metadata>\n"
      " <m:resources>\n"
      "  <x:unknown><x:vertex x=\"bad\"/></x:unknown>\n"
      "  <m:object id='1' name='base'>\n"
      "   <m:mesh><m:vertices>\n"
      "    <m:vertex x='0' y='0' z='0'/><m:vertex x='1' y='0' z='0'/>\n"
      "    <m:vertex x='0' y='1' z='0'/><m:vertex x=' +1e0 ' y='1' z='0'/>\n"
      "   </m:vertices><m:triangles><m:triangle v1='0' v2='1' v3='2' p1='7'/></m:triangles>"
      "</m:mesh>\n"
      "  </m:object>\n"
      "  <m:object id='2' name='assembly'><m:components>\n"
      "   <m:component objectid='1'/>\n"
      "   <m:component objectid='1' transform='-1 0 0 0 1 0 0 0 1 10 0 0'/>\n"
      "  </m:components></m:object>\n"
      " </m:resources>\n"
      " <m:build><m:item objectid='2' transform='1 0 0 0 1 0 0 0 1 1 2 3'/></m:build>\n"
      "</m:model>\n";
  const io::ThreeMfModel m = io::parse_3mf(package(xml), "hand.3mf");
  CHECK(m.unit == "inch");
  CHECK(m.unit_mm == 25.4);
  CHECK(*m.find_metadata("Title") == "a <b> & \xE2\x98\xBA");
  REQUIRE(m.objects.size() == 2);
  CHECK(m.objects[0].mesh.vertices.size() == 4);
  CHECK(m.objects[0].mesh.vertices[3] == kernel::Vec3{25.4, 25.4, 0});
  // The assembly: the base as is, plus a mirrored copy 10 inches along x whose winding is
  // swapped back so the copy still faces the same way.
  const kernel::Mesh& a = m.objects[1].mesh;
  REQUIRE(a.triangles.size() == 2);
  CHECK(a.vertices[4 + 1] == kernel::Vec3{(10 - 1) * 25.4, 0, 0});
  CHECK(a.triangles[1] == std::array<std::uint32_t, 3>{4, 6, 5});
  REQUIRE(m.items.size() == 1);
  CHECK(m.items[0].transform[9] == 25.4);
  CHECK(m.items[0].transform[11] == Approx(3 * 25.4));
}

TEST_CASE("3mf reader: finds the model without _rels/.rels at the usual path", "[io][3mf]") {
  const io::ThreeMfModel m = io::parse_3mf(package(kTriangleModel, false), "norels.3mf");
  REQUIRE(m.objects.size() == 1);
  CHECK(m.objects[0].id == 3);
  CHECK(m.objects[0].mesh.triangles.size() == 4);
}

TEST_CASE("3mf reader: broken files give clear one-line input errors", "[io][3mf]") {
  CHECK(input_error("solid x\nendsolid x\n").find("not a readable zip archive") !=
        std::string::npos);
  std::string cut = io::three_mf_bytes(sample_parts(), sample_metadata());
  cut.resize(cut.size() - 40);
  CHECK(input_error(cut).find("not a readable zip archive") != std::string::npos);
  std::string flipped = io::three_mf_bytes(sample_parts(), sample_metadata());
  flipped[flipped.size() / 2] =
      static_cast<char>(flipped[flipped.size() / 2] ^ 0x5a);  // model data
  CHECK(input_error(flipped).find("part '3D/3dmodel.model' is damaged") != std::string::npos);
  CHECK(input_error(io::detail::zip_bytes({{"readme.txt", "hello"}}))
            .find("without _rels/.rels or 3D/3dmodel.model") != std::string::npos);
  const std::string m = kTriangleModel;
  CHECK(input_error(package(replaced(m, "x=\"1\"", "x=\"1,5\"")))
            .find("3D/3dmodel.model line 8: <vertex> x=\"1,5\" is not a finite number") !=
        std::string::npos);
  CHECK(input_error(package(replaced(m, "y=\"1\"", "y=\"nan\"")))
            .find("line 9: <vertex> y=\"nan\" is not a finite number") != std::string::npos);
  CHECK(input_error(package(replaced(m, "v3=\"3\"/>\n     <triangle v1=\"0\" v2=\"3\"",
                                     "v3=\"4\"/>\n     <triangle v1=\"0\" v2=\"3\"")))
            .find("line 14: triangle uses vertex 4 but object 3 has 4 vertices") !=
        std::string::npos);
  CHECK(input_error(package(replaced(m, "millimeter", "furlong"))).find("unknown unit 'furlong'") !=
        std::string::npos);
  CHECK(input_error(package(replaced(m, "</vertices>", "</vertex>")))
            .find("line 11: </vertex> closes <vertices>") != std::string::npos);
  CHECK(input_error(package(replaced(m, "</model>\n", "")))
            .find("the document ends inside <model>") != std::string::npos);
  CHECK(input_error(package("<!DOCTYPE model [<!ENTITY a \"b\">]>" + m))
            .find("document type declarations are not allowed") != std::string::npos);
  CHECK(input_error(package(replaced(m, "name=\"t\"", "name=\"&bogus;\"")))
            .find("unknown entity '&bogus;'") != std::string::npos);
  CHECK(input_error(
            package(replaced(m, "<build><item objectid=\"3\"/>", "<build><item objectid=\"9\"/>")))
            .find("build item refers to object 9, which does not exist") != std::string::npos);
  CHECK(input_error(package("<model unit=\"millimeter\"><resources/><build/></model>"))
            .find("the model holds no object") != std::string::npos);
  CHECK(input_error(package("<model><resources><object id=\"1\"/></resources></model>"))
            .find("object 1 has neither a mesh nor components") != std::string::npos);
  CHECK(input_error(
            package("<model><resources><object id=\"1\"><components><component objectid=\"2\"/>"
                    "</components></object><object id=\"2\"><components>"
                    "<component objectid=\"1\"/></components></object></resources></model>"))
            .find("a cycle?") != std::string::npos);
  CHECK(input_error(package("<model xmlns:p=\"http://schemas.microsoft.com/3dmanufacturing/"
                            "production/2015/06\"><resources><object id=\"1\"><components>"
                            "<component p:path=\"/3D/Objects/a.model\" objectid=\"1\"/>"
                            "</components></object></resources></model>"))
            .find("a component of object 1 refers to another model part '/3D/Objects/a.model' "
                  "(3MF production extension)") != std::string::npos);
}

TEST_CASE("mesh file: STL and 3MF are told apart by content", "[io][3mf][stl]") {
  test::TempDir dir;
  // Misleading extensions on purpose.
  io::write_3mf(dir.file("parts.stl"), sample_parts(), sample_metadata());
  io::write_stl(dir.file("part.3mf"), test::cube_mesh(2, {1, 1, 1}), "cube", io::StlFormat::kAscii);
  const auto from_3mf = io::read_mesh_file(dir.file("parts.stl"));
  REQUIRE(from_3mf.size() == 3);
  CHECK(from_3mf[1].name == "weight A");
  CHECK(from_3mf[1].mesh.triangles.size() == 12);
  const auto from_stl = io::read_mesh_file(dir.file("part.3mf"));
  REQUIRE(from_stl.size() == 1);
  CHECK(from_stl[0].name == "cube");
  CHECK(test::signed_volume_mm3(from_stl[0].mesh) == Approx(8));
  CHECK_THROWS_AS(io::read_mesh_file(dir.file("none.3mf")), trimwright::FileError);
}
