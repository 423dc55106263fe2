// SPDX-License-Identifier: GPL-3.0-or-later
#include "geom/solve/influence.hpp"

#include <toml++/toml.h>

#include <cmath>
#include <cstdio>
#include <fstream>
#include <sstream>

#include "geom/base/error.hpp"

namespace trimwright::solve {

const InfluenceCoefficient* InfluenceSet::find(int sensor, int plane) const {
  for (const auto& c : coefficients)
    if (c.sensor == sensor && c.plane == plane) return &c;
  return nullptr;
}

namespace {

constexpr const char* kFormat = "trimwright-influence";
constexpr int kVersion = 1;

std::string number(double value) {
  char buffer[40];
  std::snprintf(buffer, sizeof buffer, "%.17g", value);
  std::string s = buffer;
  // TOML needs a fraction or exponent for a float.
  if (s.find_first_of(".eEn") == std::string::npos) s += ".0";
  return s;
}

std::string quoted(const std::string& text) {
  std::string out = "\"";
  for (unsigned char c : text) {
    switch (c) {
      case '"': out += "\\\""; break;
      case '\\': out += "\\\\"; break;
      case '\n': out += "\\n"; break;
      case '\t': out += "\\t"; break;
      case '\r': out += "\\r"; break;
      default:
        if (c < 0x20 || c == 0x7f) {
          char buffer[8];
          std::snprintf(buffer, sizeof buffer, "\\u%04x", c);
          out += buffer;
        } else {
          out += static_cast<char>(c);
        }
    }
  }
  return out + "\"";
}

/// Reads keys of one table with messages naming file, line and key.
class Reader {
 public:
  Reader(const toml::table& table, std::string source, std::string prefix)
      : table_(table), source_(std::move(source)), prefix_(std::move(prefix)) {}

  [[noreturn]] void fail(const std::string& key, const std::string& what) const {
    const toml::node* node = table_.get(key);
    const auto& region = node ? node->source() : table_.source();
    std::string where = source_;
    if (region.begin.line > 0) where += ":" + std::to_string(region.begin.line);
    throw InputError(where + ": " + prefix_ + key + ": " + what);
  }

  const toml::node* node(const std::string& key, bool required) const {
    const toml::node* n = table_.get(key);
    if (!n && required) fail(key, "missing; expected it in an influence file");
    return n;
  }

  std::optional<double> real(const std::string& key, bool required) const {
    const toml::node* n = node(key, required);
    if (!n) return std::nullopt;
    if (auto v = n->value_exact<double>()) return *v;
    if (auto i = n->value_exact<int64_t>()) return static_cast<double>(*i);
    fail(key, "not a number; expected a number");
  }

  std::optional<int64_t> integer(const std::string& key, bool required) const {
    const toml::node* n = node(key, required);
    if (!n) return std::nullopt;
    if (auto i = n->value_exact<int64_t>()) return *i;
    fail(key, "not an integer; expected a whole number");
  }

  std::optional<std::string> text(const std::string& key, bool required) const {
    const toml::node* n = node(key, required);
    if (!n) return std::nullopt;
    if (auto s = n->value_exact<std::string>()) return *s;
    fail(key, "not a string; expected a quoted string");
  }

 private:
  const toml::table& table_;
  std::string source_;
  std::string prefix_;
};

}  // namespace

std::string influence_to_toml(const InfluenceSet& set) {
  std::ostringstream out;
  out << "# trimwright influence coefficients: the reading that 1 g·mm at a plane's reference\n"
         "# mark (0°) adds at each sensor. Reuse them only on the same machine, speed and\n"
         "# sensor positions.\n";
  out << "format = " << quoted(kFormat) << "\n";
  out << "version = " << kVersion << "\n";
  out << "units = " << quoted(set.units) << "\n";
  out << "phase = " << quoted(set.phase == PhaseSense::kLag ? "lag" : "lead") << "\n";
  out << "speed_rpm = " << number(set.speed_rpm) << "\n";
  out << "correction_radius_mm = " << number(set.correction_radius_mm) << "\n";
  out << "sensors = " << set.sensors << "\n";
  out << "planes = " << set.planes << "\n";
  out << "method = " << quoted(set.method) << "\n";
  out << "note = " << quoted(set.note) << "\n";
  out << "sensor_notes = [";
  for (std::size_t i = 0; i < set.sensor_notes.size(); ++i)
    out << (i ? ", " : "") << quoted(set.sensor_notes[i]);
  out << "]\n";
  for (const auto& c : set.coefficients) {
    out << "\n[[coefficient]]\n";
    out << "sensor = " << c.sensor << "\n";
    out << "plane = " << c.plane << "\n";
    out << "magnitude_per_gmm = " << number(c.magnitude) << "   # " << set.units << " per g·mm\n";
    if (c.angle_deg) out << "angle_deg = " << number(*c.angle_deg) << "\n";
  }
  return out.str();
}

InfluenceSet influence_from_toml(const std::string& text, const std::string& source) {
  toml::table root;
  try {
    root = toml::parse(text, source);
  } catch (const toml::parse_error& e) {
    throw InputError(source + ":" + std::to_string(e.source().begin.line) + ": " +
                     std::string(e.description()) + "; expected a TOML influence file");
  }
  const Reader top(root, source, "");
  if (top.text("format", true) != std::string(kFormat))
    top.fail("format", "not \"" + std::string(kFormat) + "\"; expected an influence file");
  if (top.integer("version", true) != kVersion)
    top.fail("version", "unknown version; expected " + std::to_string(kVersion));
  InfluenceSet set;
  set.source = source;
  set.units = *top.text("units", true);
  const std::string phase = *top.text("phase", true);
  if (phase == "lag")
    set.phase = PhaseSense::kLag;
  else if (phase == "lead")
    set.phase = PhaseSense::kLead;
  else
    top.fail("phase", "\"" + phase + "\"; expected \"lag\" or \"lead\"");
  set.speed_rpm = top.real("speed_rpm", false).value_or(0.0);
  if (!(set.speed_rpm >= 0) || !std::isfinite(set.speed_rpm))
    top.fail("speed_rpm", number(set.speed_rpm) + "; expected 0 (unknown) or a speed above 0");
  set.correction_radius_mm = top.real("correction_radius_mm", false).value_or(0.0);
  if (!(set.correction_radius_mm >= 0) || !std::isfinite(set.correction_radius_mm))
    top.fail("correction_radius_mm", number(set.correction_radius_mm) + "; expected 0 or more");
  const int64_t sensors = *top.integer("sensors", true);
  const int64_t planes = *top.integer("planes", true);
  if (sensors < 1 || sensors > 64)
    top.fail("sensors", std::to_string(sensors) + "; expected 1 to 64");
  if (planes < 1 || planes > 64) top.fail("planes", std::to_string(planes) + "; expected 1 to 64");
  set.sensors = static_cast<int>(sensors);
  set.planes = static_cast<int>(planes);
  set.method = top.text("method", false).value_or("");
  set.note = top.text("note", false).value_or("");
  if (const toml::node* notes = top.node("sensor_notes", false)) {
    const toml::array* array = notes->as_array();
    if (!array) top.fail("sensor_notes", "not an array; expected a list of strings");
    for (const auto& item : *array) {
      auto s = item.value_exact<std::string>();
      if (!s) top.fail("sensor_notes", "holds a non-string; expected a list of strings");
      set.sensor_notes.push_back(*s);
    }
  }
  const toml::node* list = top.node("coefficient", true);
  const toml::array* array = list->as_array();
  if (!array) top.fail("coefficient", "not an array of tables; expected [[coefficient]] entries");
  for (const auto& item : *array) {
    const toml::table* table = item.as_table();
    if (!table) top.fail("coefficient", "holds a non-table; expected [[coefficient]] entries");
    const Reader r(*table, source, "coefficient.");
    InfluenceCoefficient c;
    const int64_t sensor = *r.integer("sensor", true);
    const int64_t plane = *r.integer("plane", true);
    if (sensor < 1 || sensor > sensors)
      r.fail("sensor", std::to_string(sensor) + "; expected 1 to " + std::to_string(sensors));
    if (plane < 1 || plane > planes)
      r.fail("plane", std::to_string(plane) + "; expected 1 to " + std::to_string(planes));
    c.sensor = static_cast<int>(sensor);
    c.plane = static_cast<int>(plane);
    c.magnitude = *r.real("magnitude_per_gmm", true);
    if (!(c.magnitude >= 0) || !std::isfinite(c.magnitude))
      r.fail("magnitude_per_gmm", number(c.magnitude) + "; expected a finite value of 0 or more");
    c.angle_deg = r.real("angle_deg", false);
    if (c.angle_deg && !std::isfinite(*c.angle_deg))
      r.fail("angle_deg", "not finite; expected an angle in degrees");
    if (set.find(c.sensor, c.plane))
      r.fail("sensor", "sensor " + std::to_string(sensor) + ", plane " + std::to_string(plane) +
                           " given twice; expected each pair once");
    set.coefficients.push_back(c);
  }
  if (set.coefficients.size() != static_cast<std::size_t>(sensors * planes))
    top.fail("coefficient", std::to_string(set.coefficients.size()) + " entries; expected " +
                                std::to_string(sensors * planes) + " (sensors × planes)");
  return set;
}

void save_influence(const std::string& path, const InfluenceSet& set) {
  const std::string temporary = path + ".partial";
  {
    std::ofstream out(temporary, std::ios::binary | std::ios::trunc);
    if (!out)
      throw FileError(path + ": cannot write the influence file (cannot create " + temporary + ")");
    out << influence_to_toml(set);
    out.flush();
    if (!out) {
      out.close();
      std::remove(temporary.c_str());
      throw FileError(path + ": cannot write the influence file (write failed)");
    }
  }
  if (std::rename(temporary.c_str(), path.c_str()) != 0) {
    std::remove(temporary.c_str());
    throw FileError(path + ": cannot write the influence file (rename failed)");
  }
}

InfluenceSet load_influence(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw FileError(
        path +
        ": cannot read the influence file; expected a file written by a solve with save_influence");
  std::ostringstream text;
  text << in.rdbuf();
  if (in.bad()) throw FileError(path + ": cannot read the influence file (read failed)");
  return influence_from_toml(text.str(), path);
}

}  // namespace trimwright::solve
