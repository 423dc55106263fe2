// SPDX-License-Identifier: GPL-3.0-or-later
// 3MF reading: the zip package, its relationships, and a small tolerant scanner for the core
// model elements (no XML library: no DTDs, no external entities, nothing fetched).
#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <charconv>
#include <cmath>
#include <map>
#include <optional>
#include <set>
#include <utility>

#include "geom/base/error.hpp"
#include "geom/io/files.hpp"
#include "geom/io/text_util.hpp"
#include "geom/io/three_mf.hpp"
#include "geom/io/zip_archive.hpp"

namespace trimwright::io {
namespace {

constexpr std::string_view k3dModelRelationship =
    "http://schemas.microsoft.com/3dmanufacturing/2013/01/3dmodel";
constexpr const char* kDefaultModelPath = "3D/3dmodel.model";
// Components may nest; deeper than this is taken as a broken file.
constexpr int kMaxComponentDepth = 32;

struct Attribute {
  std::string_view name;
  std::string value;  // entities decoded
};

// One markup event of the scanner.
struct Tag {
  enum class Kind { kStart, kEnd, kText, kEof } kind = Kind::kEof;
  std::string_view name;  // local name (prefix removed) for start and end tags
  std::vector<Attribute> attributes;
  bool self_closing = false;
  std::string text;        // decoded character data for kText
  std::size_t offset = 0;  // where the event starts, for line numbers

  const std::string* attribute(std::string_view key) const {
    for (const Attribute& a : attributes) {
      if (a.name == key) return &a.value;
    }
    return nullptr;
  }
};

// A forward-only XML scanner for well-formed, namespace-light documents such as 3MF models.
// It checks tag syntax and nesting and decodes the five predefined entities and character
// references; it refuses DTDs.
class XmlScanner {
 public:
  XmlScanner(std::string_view text, const std::string& source, const std::string& part)
      : text_(text), source_(source), part_(part) {}

  Tag next() {
    Tag tag;
    for (;;) {
      tag.offset = pos_;
      if (pos_ >= text_.size()) {
        if (!open_.empty()) {
          fail(pos_, fmt::format("the document ends inside <{}>", open_.back()));
        }
        tag.kind = Tag::Kind::kEof;
        return tag;
      }
      if (text_[pos_] != '<') {
        const std::size_t end = std::min(text_.find('<', pos_), text_.size());
        tag.kind = Tag::Kind::kText;
        tag.text = decode(text_.substr(pos_, end - pos_), pos_);
        pos_ = end;
        return tag;
      }
      if (starts_with("<?")) {
        skip_past("?>", "a processing instruction");
      } else if (starts_with("<!--")) {
        skip_past("-->", "a comment");
      } else if (starts_with("<![CDATA[")) {
        const std::size_t start = pos_ + 9;
        skip_past("]]>", "a CDATA section");
        tag.kind = Tag::Kind::kText;
        tag.text = std::string(text_.substr(start, pos_ - 3 - start));
        return tag;
      } else if (starts_with("<!")) {
        fail(pos_, "document type declarations are not allowed in 3MF");
      } else if (starts_with("</")) {
        pos_ += 2;
        const std::string_view qname = read_name();
        skip_space();
        expect('>', "to close an end tag");
        if (open_.empty() || open_.back() != qname) {
          fail(tag.offset, open_.empty() ? fmt::format("</{}> closes no open element", qname)
                                         : fmt::format("</{}> closes <{}>", qname, open_.back()));
        }
        open_.pop_back();
        tag.kind = Tag::Kind::kEnd;
        tag.name = local(qname);
        return tag;
      } else {
        ++pos_;
        const std::string_view qname = read_name();
        for (;;) {
          const bool space = skip_space();
          if (pos_ >= text_.size()) fail(tag.offset, fmt::format("tag <{}> is not closed", qname));
          if (text_[pos_] == '>') {
            ++pos_;
            break;
          }
          if (starts_with("/>")) {
            pos_ += 2;
            tag.self_closing = true;
            break;
          }
          if (!space) fail(pos_, fmt::format("expected a space between attributes of <{}>", qname));
          const std::size_t attr_offset = pos_;
          Attribute a;
          a.name = read_name();
          skip_space();
          expect('=', fmt::format("after attribute '{}' of <{}>", a.name, qname));
          skip_space();
          if (pos_ >= text_.size() || (text_[pos_] != '"' && text_[pos_] != '\'')) {
            fail(pos_, fmt::format("attribute '{}' of <{}> needs a quoted value", a.name, qname));
          }
          const char quote = text_[pos_++];
          const std::size_t end = text_.find(quote, pos_);
          if (end == std::string_view::npos) {
            fail(attr_offset, fmt::format("attribute '{}' of <{}> is not closed", a.name, qname));
          }
          a.value = decode(text_.substr(pos_, end - pos_), pos_);
          pos_ = end + 1;
          tag.attributes.push_back(std::move(a));
        }
        if (!tag.self_closing) open_.push_back(qname);
        tag.kind = Tag::Kind::kStart;
        tag.name = local(qname);
        return tag;
      }
    }
  }

  // Depth of open elements (the one just started included).
  std::size_t depth() const { return open_.size(); }

  [[noreturn]] void fail(std::size_t offset, const std::string& what) const {
    const std::size_t line =
        1 + static_cast<std::size_t>(std::count(
                text_.begin(),
                text_.begin() + static_cast<std::ptrdiff_t>(std::min(offset, text_.size())), '\n'));
    throw InputError(fmt::format("{}: {} line {}: {}", source_, part_, line, what));
  }

 private:
  static std::string_view local(std::string_view qname) {
    const std::size_t colon = qname.find(':');
    return colon == std::string_view::npos ? qname : qname.substr(colon + 1);
  }
  bool starts_with(std::string_view s) const { return text_.substr(pos_, s.size()) == s; }
  bool skip_space() {
    const std::size_t start = pos_;
    while (pos_ < text_.size() && (text_[pos_] == ' ' || text_[pos_] == '\t' ||
                                   text_[pos_] == '\n' || text_[pos_] == '\r')) {
      ++pos_;
    }
    return pos_ > start;
  }
  void skip_past(std::string_view end, const char* what) {
    const std::size_t at = text_.find(end, pos_);
    if (at == std::string_view::npos) fail(pos_, fmt::format("{} is not closed", what));
    pos_ = at + end.size();
  }
  void expect(char c, const std::string& context) {
    if (pos_ >= text_.size() || text_[pos_] != c) {
      fail(pos_, fmt::format("expected '{}' {}", c, context));
    }
    ++pos_;
  }
  std::string_view read_name() {
    const std::size_t start = pos_;
    while (pos_ < text_.size()) {
      const char c = text_[pos_];
      if (c == ' ' || c == '\t' || c == '\n' || c == '\r' || c == '>' || c == '/' || c == '=' ||
          c == '<' || c == '"' || c == '\'') {
        break;
      }
      ++pos_;
    }
    if (pos_ == start) fail(start, "expected a name");
    return text_.substr(start, pos_ - start);
  }
  std::string decode(std::string_view raw, std::size_t offset) const {
    std::string out;
    out.reserve(raw.size());
    for (std::size_t i = 0; i < raw.size(); ++i) {
      if (raw[i] != '&') {
        out.push_back(raw[i]);
        continue;
      }
      const std::size_t semi = raw.find(';', i);
      if (semi == std::string_view::npos || semi - i > 12) {
        fail(offset + i, "'&' does not start an entity (write &amp;)");
      }
      const std::string_view ent = raw.substr(i + 1, semi - i - 1);
      if (ent == "amp")
        out.push_back('&');
      else if (ent == "lt")
        out.push_back('<');
      else if (ent == "gt")
        out.push_back('>');
      else if (ent == "quot")
        out.push_back('"');
      else if (ent == "apos")
        out.push_back('\'');
      else if (ent.size() > 1 && ent[0] == '#') {
        const bool hex = ent[1] == 'x' || ent[1] == 'X';
        const std::string_view digits = ent.substr(hex ? 2 : 1);
        std::uint32_t cp = 0;
        const auto [ptr, ec] =
            std::from_chars(digits.data(), digits.data() + digits.size(), cp, hex ? 16 : 10);
        if (ec != std::errc() || ptr != digits.data() + digits.size() || digits.empty() ||
            cp == 0 || cp > 0x10FFFF || (cp >= 0xD800 && cp <= 0xDFFF)) {
          fail(offset + i, fmt::format("bad character reference '&{};'", ent));
        }
        detail::append_utf8(out, cp);
      } else {
        fail(offset + i, fmt::format("unknown entity '&{};'", ent));
      }
      i = semi;
    }
    return out;
  }

  std::string_view text_;
  const std::string& source_;
  const std::string& part_;
  std::size_t pos_ = 0;
  std::vector<std::string_view> open_;
};

// A decimal number (ST_Number: optional sign, digits, optional exponent; spaces around
// tolerated), parsed as T. `ok` is false for anything else, NaN, infinity or overflow.
template <typename T>
T parse_number(const std::string& s, bool* ok) {
  std::string_view v(s);
  while (!v.empty() && (v.front() == ' ' || v.front() == '\t')) v.remove_prefix(1);
  while (!v.empty() && (v.back() == ' ' || v.back() == '\t')) v.remove_suffix(1);
  if (!v.empty() && v.front() == '+') v.remove_prefix(1);
  T d = 0;
  const auto [ptr, ec] = std::from_chars(v.data(), v.data() + v.size(), d);
  *ok = ec == std::errc() && ptr == v.data() + v.size() && !v.empty() && std::isfinite(d);
  return d;
}

struct Component {
  int object_id = 0;
  ThreeMfTransform transform{1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0};
};

struct RawObject {
  int id = 0;
  std::string name;
  bool has_mesh = false;
  bool has_components = false;
  kernel::Mesh mesh;
  std::vector<Component> components;
  std::size_t offset = 0;
};

class ModelParser {
 public:
  ModelParser(std::string_view xml, const std::string& source, const std::string& part)
      : scan_(xml, source, part), source_(source) {}

  ThreeMfModel parse() {
    ThreeMfModel model;
    bool seen_model = false;
    RawObject* object = nullptr;  // the <object> being read
    bool in_mesh = false, in_components = false, in_build = false;
    std::optional<std::pair<std::string, std::string>> metadata;  // <metadata> being read
    std::size_t metadata_depth = 0;
    for (;;) {
      Tag tag = scan_.next();
      if (tag.kind == Tag::Kind::kEof) break;
      if (tag.kind == Tag::Kind::kText) {
        if (metadata) metadata->second += tag.text;
        continue;
      }
      if (tag.kind == Tag::Kind::kEnd) {
        if (metadata && scan_.depth() < metadata_depth) {
          model.metadata.push_back(std::move(*metadata));
          metadata.reset();
        }
        if (tag.name == "object" && object) {
          finish_object(*object);
          object = nullptr;
        } else if (tag.name == "mesh") {
          in_mesh = false;
        } else if (tag.name == "components") {
          in_components = false;
        } else if (tag.name == "build") {
          in_build = false;
        }
        continue;
      }
      // Start tags.
      const std::string_view name = tag.name;
      if (!seen_model) {
        if (name != "model")
          scan_.fail(tag.offset, fmt::format("expected <model>, found <{}>", name));
        seen_model = true;
        if (const std::string* unit = tag.attribute("unit")) set_unit(model, *unit, tag);
        continue;
      }
      // <model> is open, so a model-level <metadata> leaves depth 1 if self-closing, else 2.
      const std::size_t model_child_depth = tag.self_closing ? 1 : 2;
      if (name == "metadata" && scan_.depth() == model_child_depth) {
        // Model-level metadata only (object metadata sits deeper, in <metadatagroup>).
        const std::string* key = tag.attribute("name");
        if (!key) scan_.fail(tag.offset, "<metadata> without a name attribute");
        if (tag.self_closing) {
          model.metadata.emplace_back(*key, std::string());
        } else {
          metadata.emplace(*key, std::string());
          metadata_depth = scan_.depth();
        }
      } else if (name == "object") {
        if (object) scan_.fail(tag.offset, "<object> inside another <object>");
        RawObject o;
        o.id = int_attribute(tag, "id", 1);
        if (const std::string* n = tag.attribute("name")) o.name = *n;
        o.offset = tag.offset;
        if (index_.count(o.id))
          scan_.fail(tag.offset, fmt::format("object id {} used twice", o.id));
        index_[o.id] = objects_.size();
        objects_.push_back(std::move(o));
        object = &objects_.back();
        if (tag.self_closing) {
          finish_object(*object);
          object = nullptr;
        }
      } else if (name == "mesh" && object) {
        object->has_mesh = true;
        in_mesh = !tag.self_closing;
      } else if (name == "vertex" && object && in_mesh) {
        object->mesh.vertices.push_back(
            {coordinate(tag, "x"), coordinate(tag, "y"), coordinate(tag, "z")});
      } else if (name == "triangle" && object && in_mesh) {
        const auto v1 = static_cast<std::uint32_t>(int_attribute(tag, "v1", 0));
        const auto v2 = static_cast<std::uint32_t>(int_attribute(tag, "v2", 0));
        const auto v3 = static_cast<std::uint32_t>(int_attribute(tag, "v3", 0));
        const std::size_t n = object->mesh.vertices.size();
        for (std::uint32_t v : {v1, v2, v3}) {
          if (v >= n) {
            scan_.fail(tag.offset, fmt::format("triangle uses vertex {} but object {} has {} "
                                               "vertices before it",
                                               v, object->id, n));
          }
        }
        object->mesh.triangles.push_back({v1, v2, v3});
      } else if (name == "components" && object) {
        object->has_components = true;
        in_components = !tag.self_closing;
      } else if (name == "component" && object && in_components) {
        refuse_other_part(tag, fmt::format("a component of object {}", object->id));
        Component c;
        c.object_id = int_attribute(tag, "objectid", 1);
        if (const std::string* t = tag.attribute("transform")) c.transform = transform(tag, *t);
        object->components.push_back(c);
      } else if (name == "build") {
        in_build = !tag.self_closing;
      } else if (name == "item" && in_build) {
        refuse_other_part(tag, "a build item");
        ThreeMfBuildItem item;
        item.object_id = int_attribute(tag, "objectid", 1);
        if (const std::string* t = tag.attribute("transform")) item.transform = transform(tag, *t);
        items_.push_back({item, tag.offset});
      }
      // Anything else (extensions, materials, thumbnails) is skipped.
    }
    if (!seen_model) {
      throw InputError(fmt::format("{}: the model part has no <model> element", source_));
    }
    resolve(model);
    return model;
  }

 private:
  void set_unit(ThreeMfModel& model, const std::string& unit, const Tag& tag) {
    static const std::map<std::string, double> kUnits{{"micron", 0.001},    {"millimeter", 1.0},
                                                      {"centimeter", 10.0}, {"inch", 25.4},
                                                      {"foot", 304.8},      {"meter", 1000.0}};
    const auto it = kUnits.find(unit);
    if (it == kUnits.end()) {
      scan_.fail(tag.offset, fmt::format("unknown unit '{}'; expected micron, millimeter, "
                                         "centimeter, inch, foot or meter",
                                         unit));
    }
    model.unit = unit;
    model.unit_mm = it->second;
  }

  // A vertex coordinate, read at float precision as slicers read it (and as STL holds it), so
  // that a 3MF and an STL of one mesh give the same vertices.
  double coordinate(const Tag& tag, std::string_view key) {
    const std::string* s = tag.attribute(key);
    if (!s) scan_.fail(tag.offset, fmt::format("<{}> without attribute {}", tag.name, key));
    bool ok = false;
    const double d = parse_number<float>(*s, &ok);
    if (!ok) {
      scan_.fail(tag.offset, fmt::format("<{}> {}=\"{}\" is not a finite number", tag.name, key,
                                         s->substr(0, 40)));
    }
    return d;
  }

  // The production extension lets a component or item point into another model part (a
  // `p:path` attribute); this reader reads one model part only, and says so.
  void refuse_other_part(const Tag& tag, const std::string& what) {
    for (const Attribute& a : tag.attributes) {
      const std::size_t colon = a.name.find(':');
      if (colon != std::string_view::npos && a.name.substr(colon + 1) == "path") {
        scan_.fail(tag.offset, fmt::format("{} refers to another model part '{}' (3MF production "
                                           "extension); only single-part models are read",
                                           what, a.value.substr(0, 80)));
      }
    }
  }

  int int_attribute(const Tag& tag, std::string_view key, int min) {
    const std::string* s = tag.attribute(key);
    if (!s) scan_.fail(tag.offset, fmt::format("<{}> without attribute {}", tag.name, key));
    long long v = -1;
    const auto [ptr, ec] = std::from_chars(s->data(), s->data() + s->size(), v);
    if (ec != std::errc() || ptr != s->data() + s->size() || s->empty() || v < min ||
        v > 2147483647LL) {
      scan_.fail(tag.offset, fmt::format("<{}> {}=\"{}\": expected a whole number ≥ {}", tag.name,
                                         key, s->substr(0, 40), min));
    }
    return static_cast<int>(v);
  }

  ThreeMfTransform transform(const Tag& tag, const std::string& text) {
    ThreeMfTransform m{};
    std::size_t count = 0, i = 0;
    while (i < text.size()) {
      while (i < text.size() && std::isspace(static_cast<unsigned char>(text[i]))) ++i;
      if (i >= text.size()) break;
      std::size_t j = i;
      while (j < text.size() && !std::isspace(static_cast<unsigned char>(text[j]))) ++j;
      bool ok = false;
      const double d = parse_number<double>(text.substr(i, j - i), &ok);
      if (!ok || count >= 12) {
        scan_.fail(tag.offset, fmt::format("<{}> transform \"{}\": expected 12 finite numbers",
                                           tag.name, text.substr(0, 80)));
      }
      m[count++] = d;
      i = j;
    }
    if (count != 12) {
      scan_.fail(tag.offset,
                 fmt::format("<{}> transform has {} numbers; expected 12", tag.name, count));
    }
    return m;
  }

  void finish_object(RawObject& o) {
    if (o.has_mesh && o.has_components) {
      scan_.fail(o.offset, fmt::format("object {} has both a mesh and components", o.id));
    }
  }

  static kernel::Vec3 apply(const ThreeMfTransform& m, const kernel::Vec3& p) {
    return {p[0] * m[0] + p[1] * m[3] + p[2] * m[6] + m[9],
            p[0] * m[1] + p[1] * m[4] + p[2] * m[7] + m[10],
            p[0] * m[2] + p[1] * m[5] + p[2] * m[8] + m[11]};
  }

  static ThreeMfTransform compose(const ThreeMfTransform& inner, const ThreeMfTransform& outer) {
    // Row-vector convention: p·inner·outer.
    ThreeMfTransform r{};
    for (int row = 0; row < 4; ++row) {
      for (int col = 0; col < 3; ++col) {
        double s = row == 3 ? outer[9 + col] : 0.0;
        for (int k = 0; k < 3; ++k) s += inner[3 * row + k] * outer[3 * k + col];
        r[3 * row + col] = s;
      }
    }
    return r;
  }

  // Append object `id`'s geometry, transformed, to `out`.
  void flatten(int id, const ThreeMfTransform& m, kernel::Mesh& out, int depth,
               std::size_t offset) {
    const auto it = index_.find(id);
    if (it == index_.end()) {
      scan_.fail(offset, fmt::format("refers to object {}, which does not exist", id));
    }
    const RawObject& o = objects_[it->second];
    if (depth > kMaxComponentDepth) {
      scan_.fail(o.offset, fmt::format("components nest deeper than {} levels (a cycle?) at object "
                                       "{}",
                                       kMaxComponentDepth, id));
    }
    if (o.has_components) {
      for (const Component& c : o.components) {
        flatten(c.object_id, compose(c.transform, m), out, depth + 1, o.offset);
      }
      return;
    }
    const double det = m[0] * (m[4] * m[8] - m[5] * m[7]) - m[1] * (m[3] * m[8] - m[5] * m[6]) +
                       m[2] * (m[3] * m[7] - m[4] * m[6]);
    const auto base = static_cast<std::uint32_t>(out.vertices.size());
    for (const kernel::Vec3& v : o.mesh.vertices) out.vertices.push_back(apply(m, v));
    for (const auto& t : o.mesh.triangles) {
      // A mirroring transform turns the winding; swap to keep the outside outside.
      if (det < 0) {
        out.triangles.push_back({base + t[0], base + t[2], base + t[1]});
      } else {
        out.triangles.push_back({base + t[0], base + t[1], base + t[2]});
      }
    }
  }

  void resolve(ThreeMfModel& model) {
    static const ThreeMfTransform kIdentity{1, 0, 0, 0, 1, 0, 0, 0, 1, 0, 0, 0};
    for (const RawObject& o : objects_) {
      if (!o.has_mesh && !o.has_components) {
        scan_.fail(o.offset, fmt::format("object {} has neither a mesh nor components", o.id));
      }
      ThreeMfReadObject r;
      r.id = o.id;
      r.name = o.name;
      flatten(o.id, kIdentity, r.mesh, 0, o.offset);
      if (model.unit_mm != 1.0) {
        for (kernel::Vec3& v : r.mesh.vertices) {
          for (double& c : v) c *= model.unit_mm;
        }
      }
      model.objects.push_back(std::move(r));
    }
    if (model.objects.empty()) {
      throw InputError(fmt::format("{}: the model holds no object (nothing to print)", source_));
    }
    for (auto& [item, offset] : items_) {
      if (!index_.count(item.object_id)) {
        scan_.fail(offset, fmt::format("build item refers to object {}, which does not exist",
                                       item.object_id));
      }
      for (int k = 9; k < 12; ++k) item.transform[k] *= model.unit_mm;
      model.items.push_back(item);
    }
  }

  XmlScanner scan_;
  const std::string& source_;
  std::vector<RawObject> objects_;
  std::map<int, std::size_t> index_;
  std::vector<std::pair<ThreeMfBuildItem, std::size_t>> items_;
};

// The model part named by the package relationships, or the conventional path.
std::string model_part_name(const detail::ZipReader& zip, const std::string& source) {
  const std::string rels_name = "_rels/.rels";
  if (zip.contains(rels_name, true)) {
    const std::string rels = zip.read(rels_name, true);
    XmlScanner scan(rels, source, rels_name);
    for (Tag tag = scan.next(); tag.kind != Tag::Kind::kEof; tag = scan.next()) {
      if (tag.kind != Tag::Kind::kStart || tag.name != "Relationship") continue;
      const std::string* type = tag.attribute("Type");
      const std::string* target = tag.attribute("Target");
      if (type && target && *type == k3dModelRelationship) {
        std::string name = *target;
        if (!name.empty() && name.front() == '/') name.erase(0, 1);
        return name;
      }
    }
    throw InputError(
        fmt::format("{}: {} names no 3D model part; not a 3MF file", source, rels_name));
  }
  if (zip.contains(kDefaultModelPath, true)) return kDefaultModelPath;
  throw InputError(fmt::format("{}: a zip archive without _rels/.rels or {}; not a 3MF file",
                               source, kDefaultModelPath));
}

}  // namespace

const std::string* ThreeMfModel::find_metadata(std::string_view name) const {
  for (const auto& [key, value] : metadata) {
    if (key == name) return &value;
  }
  return nullptr;
}

ThreeMfModel parse_3mf(std::string_view bytes, const std::string& source) {
  const detail::ZipReader zip(bytes, source);
  const std::string part = model_part_name(zip, source);
  const std::string xml = zip.read(part, true);
  return ModelParser(xml, source, part).parse();
}

ThreeMfModel read_3mf(const std::string& path) { return parse_3mf(read_file(path), path); }

}  // namespace trimwright::io
