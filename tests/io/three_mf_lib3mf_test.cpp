// SPDX-License-Identifier: GPL-3.0-or-later
// An independent 3MF reader checks our 3MF: lib3mf 1.8.1 (Debian package lib3mf-dev, the 3MF
// Consortium's reference library; flat C API in Model/COM/NMR_DLLInterfaces.h), in strict mode.
// Its headers put Windows-style typedefs and macros in the global namespace, so they stay in
// this one file.
#include <Model/COM/NMR_DLLInterfaces.h>

#include <catch2/catch.hpp>
#include <string>
#include <vector>

#include "geom/io/stl.hpp"
#include "geom/io/three_mf.hpp"
#include "tests/support/meshes.hpp"
#include "tests/support/temp_dir.hpp"

namespace kernel = trimwright::kernel;
namespace test = trimwright::test;
namespace io = trimwright::io;

namespace {

// Owns one lib3mf handle (every handle the C API returns must be released).
class Handle {
 public:
  Handle() = default;
  ~Handle() {
    if (p_) NMR::lib3mf_release(p_);
  }
  Handle(const Handle&) = delete;
  Handle& operator=(const Handle&) = delete;
  NMR::PLib3MFBase** out() { return &p_; }
  NMR::PLib3MFBase* get() const { return p_; }

 private:
  NMR::PLib3MFBase* p_ = nullptr;
};

std::string last_error(NMR::PLib3MFBase* obj) {
  DWORD code = 0;
  LPCSTR msg = nullptr;
  if (obj) NMR::lib3mf_getlasterror(obj, &code, &msg);
  return "lib3mf error " + std::to_string(code) + (msg ? std::string(": ") + msg : std::string());
}

// Reads a UTF-8 string through lib3mf's two-call protocol (ask the size, then fill).
template <typename Getter>
std::string utf8(Getter get) {
  ULONG needed = 0;
  if (get(nullptr, 0, &needed) != LIB3MF_OK) return "<error>";
  std::string s(needed + 1, '\0');
  if (get(&s[0], static_cast<ULONG>(s.size()), &needed) != LIB3MF_OK) return "<error>";
  s.resize(needed);
  while (!s.empty() && s.back() == '\0') s.pop_back();
  return s;
}

struct Lib3mfObject {
  std::uint32_t id = 0;
  std::string name;
  bool manifold_and_oriented = false;
  std::vector<kernel::Vec3> vertices;
  std::vector<std::array<std::uint32_t, 3>> triangles;
};

struct Lib3mfItem {
  std::uint32_t object_id = 0;
  bool has_transform = false;
  NMR::MODELTRANSFORM transform{};
};

struct Lib3mfResult {
  bool ok = false;
  std::string error;
  std::uint32_t warnings = 0;
  DWORD unit = 99;
  std::vector<std::pair<std::string, std::string>> metadata;
  std::vector<Lib3mfObject> objects;
  std::vector<Lib3mfItem> items;
};

Lib3mfResult read_with_lib3mf(const std::string& path) {
  Lib3mfResult r;
  Handle model, reader, objects, items;
  if (NMR::lib3mf_createmodel(model.out()) != LIB3MF_OK) {
    r.error = "createmodel";
    return r;
  }
  if (NMR::lib3mf_model_queryreader(model.get(), "3mf", reader.out()) != LIB3MF_OK) {
    r.error = last_error(model.get());
    return r;
  }
  NMR::lib3mf_reader_setstrictmodeactive(reader.get(), true);
  if (NMR::lib3mf_reader_readfromfileutf8(reader.get(), path.c_str()) != LIB3MF_OK) {
    r.error = last_error(reader.get());
    return r;
  }
  DWORD warnings = 0;
  NMR::lib3mf_reader_getwarningcount(reader.get(), &warnings);
  r.warnings = warnings;
  NMR::lib3mf_model_getunit(model.get(), &r.unit);
  DWORD meta_count = 0;
  NMR::lib3mf_model_getmetadatacount(model.get(), &meta_count);
  for (DWORD i = 0; i < meta_count; ++i) {
    const std::string key = utf8([&](LPSTR b, ULONG n, ULONG* need) {
      return NMR::lib3mf_model_getmetadatakeyutf8(model.get(), i, b, n, need);
    });
    const std::string value = utf8([&](LPSTR b, ULONG n, ULONG* need) {
      return NMR::lib3mf_model_getmetadatavalueutf8(model.get(), i, b, n, need);
    });
    r.metadata.emplace_back(key, value);
  }
  if (NMR::lib3mf_model_getmeshobjects(model.get(), objects.out()) != LIB3MF_OK) {
    r.error = last_error(model.get());
    return r;
  }
  BOOL more = false;
  while (NMR::lib3mf_resourceiterator_movenext(objects.get(), &more) == LIB3MF_OK && more) {
    Handle res;
    if (NMR::lib3mf_resourceiterator_getcurrent(objects.get(), res.out()) != LIB3MF_OK) break;
    Lib3mfObject o;
    DWORD id = 0;
    NMR::lib3mf_resource_getresourceid(res.get(), &id);
    o.id = id;
    o.name = utf8([&](LPSTR b, ULONG n, ULONG* need) {
      return NMR::lib3mf_object_getnameutf8(res.get(), b, n, need);
    });
    BOOL manifold = false;
    NMR::lib3mf_meshobject_ismanifoldandoriented(res.get(), &manifold);
    o.manifold_and_oriented = manifold;
    DWORD nv = 0, nt = 0;
    NMR::lib3mf_meshobject_getvertexcount(res.get(), &nv);
    NMR::lib3mf_meshobject_gettrianglecount(res.get(), &nt);
    std::vector<NMR::MODELMESHVERTEX> v(nv);
    std::vector<NMR::MODELMESHTRIANGLE> t(nt);
    if (nv) NMR::lib3mf_meshobject_getvertices(res.get(), v.data(), nv, nullptr);
    if (nt) NMR::lib3mf_meshobject_gettriangleindices(res.get(), t.data(), nt, nullptr);
    for (const auto& x : v) {
      o.vertices.push_back({x.m_fPosition[0], x.m_fPosition[1], x.m_fPosition[2]});
    }
    for (const auto& x : t)
      o.triangles.push_back({x.m_nIndices[0], x.m_nIndices[1], x.m_nIndices[2]});
    r.objects.push_back(std::move(o));
  }
  if (NMR::lib3mf_model_getbuilditems(model.get(), items.out()) != LIB3MF_OK) {
    r.error = last_error(model.get());
    return r;
  }
  while (NMR::lib3mf_builditemiterator_movenext(items.get(), &more) == LIB3MF_OK && more) {
    Handle item;
    if (NMR::lib3mf_builditemiterator_getcurrent(items.get(), item.out()) != LIB3MF_OK) break;
    Lib3mfItem it;
    DWORD id = 0;
    NMR::lib3mf_builditem_getobjectresourceid(item.get(), &id);
    it.object_id = id;
    BOOL has = false;
    NMR::lib3mf_builditem_hasobjecttransform(item.get(), &has);
    it.has_transform = has;
    if (has) NMR::lib3mf_builditem_getobjecttransform(item.get(), &it.transform);
    r.items.push_back(it);
  }
  r.ok = true;
  return r;
}

const std::string* find(const std::vector<std::pair<std::string, std::string>>& md,
                        const std::string& key) {
  for (const auto& [k, v] : md) {
    if (k == key) return &v;
  }
  return nullptr;
}

}  // namespace

TEST_CASE("3mf: lib3mf reads our file: objects, names, counts, vertices, unit, metadata",
          "[io][3mf][lib3mf]") {
  const std::vector<io::ThreeMfObject> parts = {
      {"slide disc", test::cylinder_mesh(30, 6, 128, 0.5)},
      {"clamp weight <A> & \"B\"", test::cube_mesh(12, {-6, -6, 0})},
      {"pin", test::tetrahedron_mesh(5)},
  };
  io::ThreeMfMetadata meta;
  meta.title = "Left wheel, 36 grit";
  meta.entries = {{"material", "PETG"},
                  {"infill_percent", "100"},
                  {"pause_layer", "12"},
                  {"setting", "spindle_x_mm = 1.8"}};
  test::TempDir dir;
  const std::string path = dir.file("design.3mf");
  io::write_3mf(path, parts, meta);

  const Lib3mfResult r = read_with_lib3mf(path);
  INFO(r.error);
  REQUIRE(r.ok);
  CHECK(r.warnings == 0);
  CHECK(r.unit == NMR::MODELUNIT_MILLIMETER);
  REQUIRE(r.objects.size() == parts.size());
  for (std::size_t i = 0; i < parts.size(); ++i) {
    INFO(parts[i].name);
    const Lib3mfObject& o = r.objects[i];
    CHECK(o.id == i + 1);
    CHECK(o.name == parts[i].name);
    CHECK(o.manifold_and_oriented);
    REQUIRE(o.triangles.size() == parts[i].mesh.triangles.size());
    // Every triangle corner is the same float as in the STL of the same part.
    const auto stl = io::parse_stl(io::stl_bytes(parts[i].mesh, parts[i].name), "stl");
    REQUIRE(stl.mesh.triangles.size() == o.triangles.size());
    for (std::size_t t = 0; t < o.triangles.size(); ++t) {
      for (int k = 0; k < 3; ++k) {
        REQUIRE(o.vertices.at(o.triangles[t][k]) == stl.mesh.vertices[stl.mesh.triangles[t][k]]);
      }
    }
  }
  // Metadata as lib3mf reports it.
  REQUIRE(find(r.metadata, "Title"));
  CHECK(*find(r.metadata, "Title") == "Left wheel, 36 grit");
  REQUIRE(find(r.metadata, "Application"));
  CHECK(*find(r.metadata, "Application") == io::application_name());
  // lib3mf names namespaced metadata by the namespace URI rather than the prefix.
  const std::string ns = io::kThreeMfMetadataNamespace;
  REQUIRE(find(r.metadata, ns + ":material"));
  CHECK(*find(r.metadata, ns + ":material") == "PETG");
  REQUIRE(find(r.metadata, ns + ":setting"));
  CHECK(*find(r.metadata, ns + ":setting") == "spindle_x_mm = 1.8");
  REQUIRE(find(r.metadata, ns + ":pause_layer"));
  CHECK(*find(r.metadata, ns + ":pause_layer") == "12");
  // One build item per object, translated to its plate position.
  const auto positions = io::plate_positions(parts);
  REQUIRE(r.items.size() == parts.size());
  for (std::size_t i = 0; i < parts.size(); ++i) {
    CHECK(r.items[i].object_id == i + 1);
    REQUIRE(r.items[i].has_transform);
    for (int c = 0; c < 3; ++c) {
      // Copy out of lib3mf's packed struct: a reference to its member would be misaligned.
      const double field = r.items[i].transform.m_fFields[c][3];
      CHECK(field == Approx(positions[i][c]).margin(1e-4));
    }
  }
}

TEST_CASE("3mf: lib3mf refuses a damaged package (the check can fail)", "[io][3mf][lib3mf]") {
  std::string bytes = io::three_mf_bytes({{"cube", test::cube_mesh(5, {1, 1, 1})}}, {});
  bytes.resize(bytes.size() / 2);
  test::TempDir dir;
  test::write_bytes(dir.file("half.3mf"), bytes);
  CHECK_FALSE(read_with_lib3mf(dir.file("half.3mf")).ok);
}
