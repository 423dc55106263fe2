// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/job.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <fstream>
#include <set>
#include <sstream>

#include "cli/toml_reader.hpp"
#include "geom/check/check.hpp"
#include "geom/base/error.hpp"

namespace trimwright::cli {
namespace fs = std::filesystem;

namespace {

// Sanity limits: generous for any shop rotor, tight enough to catch a slipped decimal point.
constexpr Range kSpeed{0, 60000, false, true, "a speed in rpm"};
constexpr Range kSmallLength{0, 2000, false, true, "a length in mm"};
constexpr Range kRotorMass{0, 1000, false, true, "a rotor mass in kg"};
constexpr Range kAngle{-3600, 3600, true, true, "an angle in degrees"};

const std::vector<std::string> kKinds = {"grinding-wheel", "buffing-wheel", "pulley", "fan",
                                         "faceplate", "other"};
const std::vector<std::string> kFamilies = {"slide-disc", "disc-pair", "clamp-weights",
                                            "bore-sleeve", "auto"};
const std::vector<std::string> kFormats = {"stl", "stl-ascii", "3mf", "pdf", "svg", "png", "csv",
                                           "json"};

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return std::tolower(c); });
  return s;
}

std::string read_text_file(const std::string& path) {
  std::ifstream in(path, std::ios::binary);
  if (!in) throw FileError(fmt::format("{}: cannot read the job file ({})", path,
                                       std::error_code(errno, std::generic_category()).message()));
  std::ostringstream os;
  os << in.rdbuf();
  return os.str();
}

toml::table parse_toml(const std::string& text, const std::string& source) {
  try {
    return toml::parse(text, source);
  } catch (const toml::parse_error& e) {
    const auto& src = e.source();
    std::string desc(e.description());
    throw InputError(fmt::format("{}:{}:{}: TOML syntax error: {}", source, src.begin.line,
                                 src.begin.column, desc));
  }
}

// Keys of `over` replace those of `base`; tables merge key by key. Nodes keep their source, so
// messages still name the file and line each value came from.
// (Values are moved: toml++ keeps a node's source position on a move, not on a copy.)
void merge_into(toml::table& base, toml::table& over) {
  for (auto&& [k, v] : over) {
    if (auto ot = v.as_table()) {
      if (auto bt = base.get_as<toml::table>(k.str())) {
        merge_into(*bt, *ot);
        continue;
      }
    }
    base.insert_or_assign(k, std::move(v));
  }
}

// Loads a file with its includes resolved (includes first, the file's own keys win).
toml::table load_with_includes(const std::string& text, const std::string& source,
                               const fs::path& base_dir, std::vector<std::string>& chain,
                               std::vector<std::string>& included) {
  toml::table own = parse_toml(text, source);
  const toml::node* inc = own.get("include");
  if (!inc) return own;
  std::map<std::string, std::string> unused;
  TableReader root(own, "", source, unused);
  auto name = root.optional_string("include", "the path of a shared TOML file");
  if (name->empty()) root.fail("include", "the path of a shared TOML file, relative to this one");
  fs::path p = fs::path(*name).is_absolute() ? fs::path(*name) : base_dir / *name;
  std::string canon = fs::weakly_canonical(p).string();
  if (std::find(chain.begin(), chain.end(), canon) != chain.end())
    root.fail("include", "a file that does not include itself (include loop)");
  std::ifstream probe(p);
  if (!probe || !fs::is_regular_file(p))
    throw FileError(fmt::format("{}: include = \"{}\": cannot read {}{}", node_location(*inc, source),
                                *name, p.string(), fs::is_directory(p) ? " (a folder, expected a TOML file)" : ""));
  chain.push_back(canon);
  included.push_back(p.string());
  toml::table merged =
      load_with_includes(read_text_file(p.string()), p.string(), p.parent_path(), chain, included);
  chain.pop_back();
  merged.erase("include");
  own.erase("include");
  merge_into(merged, own);
  return merged;
}

MachineSpec read_machine(TableReader& t) {
  MachineSpec m;
  m.speed_rpm = t.number("speed_rpm", kSpeed);
  m.rotation = t.choice("rotation", {"cw", "ccw"}, "ccw");
  m.spindle_diameter_mm = t.number("spindle_diameter_mm", {0, 200, false, true, "a spindle diameter in mm"});
  m.free_thread_mm = t.optional_number("free_thread_mm", {0, 500, true, true, "a free thread length in mm"});
  m.nut_height_mm = t.optional_number("nut_height_mm", {0, 200, false, true, "a nut height in mm"});
  m.flange_diameter_mm = t.optional_number("flange_diameter_mm", kSmallLength);
  m.max_fixture_diameter_mm = t.optional_number("max_fixture_diameter_mm", kSmallLength);
  if (m.flange_diameter_mm && *m.flange_diameter_mm <= m.spindle_diameter_mm)
    t.fail("flange_diameter_mm", fmt::format("a flange wider than the spindle ({:g} mm)",
                                             m.spindle_diameter_mm));
  if (m.max_fixture_diameter_mm && *m.max_fixture_diameter_mm <= m.spindle_diameter_mm)
    t.fail("max_fixture_diameter_mm",
           fmt::format("a diameter larger than the spindle ({:g} mm)", m.spindle_diameter_mm));
  t.finish();
  return m;
}

RotorSpec read_rotor(TableReader& t, const MachineSpec& machine) {
  RotorSpec r;
  r.kind = t.choice("kind", kKinds, "grinding-wheel");
  r.diameter_mm = t.number("diameter_mm", kSmallLength);
  r.width_mm = t.optional_number("width_mm", kSmallLength);
  r.bore_mm = t.optional_number("bore_mm", {0, 1000, false, true, "a bore diameter in mm"});
  r.mass_kg = t.number("mass_kg", kRotorMass);
  r.max_speed_rpm = t.optional_number("max_speed_rpm", kSpeed);
  r.bore_clearance_mm = t.number_or("bore_clearance_mm", 0, {0, 10, true, true, "a radial clearance in mm"});
  if (r.bore_mm && *r.bore_mm >= r.diameter_mm)
    t.fail("bore_mm", fmt::format("a bore smaller than the rotor ({:g} mm)", r.diameter_mm));
  if (r.bore_mm && *r.bore_mm + 1e-9 < machine.spindle_diameter_mm)
    t.fail("bore_mm", fmt::format("a bore at least the spindle diameter ({:g} mm)",
                                  machine.spindle_diameter_mm));
  t.finish();
  return r;
}

CorrectionSpec read_correction(TableReader& t) {
  CorrectionSpec c;
  auto u = t.optional_number("unbalance_gmm", {0, 1e7, false, true, "an unbalance in g·mm"});
  c.mass_g = t.optional_number("mass_g", {0, 1e5, false, true, "a correction mass in g"});
  c.radius_mm = t.optional_number("radius_mm", kSmallLength);
  c.angle_deg = t.number("angle_deg", kAngle);
  if (u && (c.mass_g || c.radius_mm))
    t.fail("unbalance_gmm", "either unbalance_gmm or mass_g with radius_mm, not both");
  if (!u) {
    if (!c.mass_g && !c.radius_mm)
      t.missing("unbalance_gmm", "the correction in g·mm (or mass_g with radius_mm)");
    if (!c.mass_g) t.missing("mass_g", "the correction mass in g to go with radius_mm");
    if (!c.radius_mm) t.missing("radius_mm", "the radius in mm to go with mass_g");
    c.unbalance_gmm = *c.mass_g * *c.radius_mm;
  } else {
    c.unbalance_gmm = *u;
  }
  t.has("angles");  // read by the caller
  t.finish();
  return c;
}

solve::AngleSense read_angle_sense(TableReader& t) {
  return t.choice("angles", {"against-rotation", "with-rotation"}, "against-rotation") ==
                 "with-rotation"
             ? solve::AngleSense::kWithRotation
             : solve::AngleSense::kAgainstRotation;
}

solve::Method parse_method(TableReader& t) {
  std::string m = t.choice("method", {"trial", "four-run", "two-plane", "fit", "static", "index"}, "");
  if (m.empty()) t.missing("method", "trial | four-run | two-plane | fit | static | index");
  if (m == "trial") return solve::Method::kTrial;
  if (m == "four-run") return solve::Method::kFourRun;
  if (m == "two-plane") return solve::Method::kTwoPlane;
  if (m == "fit") return solve::Method::kFit;
  if (m == "static") return solve::Method::kStatic;
  return solve::Method::kIndex;
}

solve::TrialWeight read_trial_weight(TableReader& t) {
  solve::TrialWeight w;
  w.plane = static_cast<int>(t.has("plane") ? t.integer("plane", 1, 2, "a correction plane, 1 or 2") : 1);
  w.mass_g = t.number("mass_g", {0, 1e5, false, true, "a trial mass in g"});
  w.radius_mm = t.number("radius_mm", kSmallLength);
  w.angle_deg = t.number("angle_deg", kAngle);
  t.finish();
  return w;
}

solve::Run read_run(TableReader& t, int index) {
  solve::Run run;
  run.name = t.optional_string("name", "a label for the run").value_or(fmt::format("run {}", index + 1));
  auto amp = t.optional_numbers("amplitude", {0, 1e9, true, true, "a vibration amplitude (≥ 0)"});
  auto phase = t.optional_numbers("phase_deg", kAngle);
  run.recording = t.optional_string("recording", "a CSV or WAV file, relative to the job file").value_or("");
  run.axis = t.optional_string("axis", "the recording column to use").value_or("");
  run.settle_angle_deg = t.optional_number("settle_angle_deg", kAngle);
  if (!amp && run.recording.empty() && !run.settle_angle_deg)
    t.missing("amplitude", "the vibration amplitude of this run (or a recording, or settle_angle_deg on a static stand)");
  if (amp && !run.recording.empty())
    t.fail("recording", "either typed amplitude/phase_deg or a recording, not both");
  if (amp) run.amplitude = *amp;
  if (phase) {
    if (!amp) t.fail("phase_deg", "phase_deg together with amplitude");
    if (phase->size() != run.amplitude.size())
      t.fail("phase_deg", fmt::format("one phase per amplitude ({} values)", run.amplitude.size()));
    for (double p : *phase) run.phase_deg.emplace_back(p);
  } else {
    run.phase_deg.assign(run.amplitude.size(), std::nullopt);
  }
  if (const toml::node* tr = t.node("trial")) {
    const toml::array* arr = tr->as_array();
    if (!arr) t.fail("trial", "an array of inline tables like [{ plane = 1, mass_g = 0.5, radius_mm = 60, angle_deg = 0 }]");
    for (std::size_t i = 0; i < arr->size(); ++i) {
      const toml::table* wt = (*arr)[i].as_table();
      if (!wt) t.fail("trial", "an array of inline tables like [{ mass_g = 0.5, radius_mm = 60, angle_deg = 0 }]");
      std::map<std::string, std::string> loc;
      TableReader wr(*wt, fmt::format("{}[{}]", t.dotted("trial"), i), t.file(), loc);
      run.trial.push_back(read_trial_weight(wr));
    }
  }
  if (const toml::table* st = t.optional_table("setting")) {
    solve::FixtureSetting s;
    for (auto&& [k, v] : *st) {
      std::map<std::string, std::string> loc;
      TableReader sr(*st, t.dotted("setting"), t.file(), loc);
      std::string key(k.str());
      s.values.emplace_back(key, sr.number(key, {-1e6, 1e6, true, true, "a number for the fixture setting"}));
    }
    if (s.values.empty()) t.fail("setting", "a table of setting values, e.g. { spindle_x_mm = 1.8, angle_deg = 212 }");
    run.setting = s;
  }
  run.index_deg = t.optional_number("index_deg", kAngle);
  t.finish();
  return run;
}

solve::Readings read_readings(TableReader& t, const std::string& source) {
  solve::Readings r;
  r.source = source;
  r.method = parse_method(t);
  if (auto u = t.optional_string("units", "an amplitude unit label")) {
    if (u->empty()) t.fail("units", "a unit label such as mm/s-pk or g-pk");
    r.units = *u;
  }
  r.phase = t.choice("phase", {"lag", "lead"}, "lag") == "lead" ? solve::PhaseSense::kLead
                                                                 : solve::PhaseSense::kLag;
  r.angles = read_angle_sense(t);
  r.correction_radius_mm = t.number_or("correction_radius_mm", 0, {0, 2000, true, true, "a radius in mm"});
  r.keep_trial = t.boolean_or("keep_trial", false,
                              "whether the last run's weights stay on the rotor (corrections add to them)");
  if (t.has("planes"))
    r.planes = static_cast<int>(t.integer("planes", 1, 2, "the number of correction planes"));
  r.sensor_notes = t.optional_strings("sensor_notes", "where each sensor sits, one per sensor")
                       .value_or(std::vector<std::string>{});
  r.index_reference = t.choice("index_reference", {"adapter", "rotor"}, "adapter") == "rotor"
                          ? solve::IndexReference::kRotor
                          : solve::IndexReference::kAdapter;
  r.influence_file = t.optional_string("influence_file", "a saved influence-coefficient file").value_or("");
  r.save_influence = t.optional_string("save_influence", "where to save influence coefficients").value_or("");
  const toml::array* runs = t.optional_table_array("run");
  if (!runs || runs->empty())
    t.missing("run", "one [[readings.run]] table per run of the machine");
  for (std::size_t i = 0; i < runs->size(); ++i) {
    const toml::table& rt = *(*runs)[i].as_table();
    std::map<std::string, std::string> loc;
    TableReader rr(rt, fmt::format("readings.run[{}]", i + 1), t.file(), loc);
    solve::Run run = read_run(rr, static_cast<int>(i));
    run.line = static_cast<int>(rt.source().begin.line);
    r.runs.push_back(std::move(run));
  }
  t.finish();
  return r;
}

MaterialSpec read_material_table(TableReader& t) {
  MaterialSpec m;
  m.name = t.optional_string("name", "a material name").value_or("custom");
  m.density_g_cm3 = t.number("density_g_cm3", {0.3, 25, true, true, "a density in g/cm³"});
  m.tensile_mpa = t.number("tensile_mpa", {1, 2000, true, true, "a tensile strength in MPa"});
  m.poisson = t.number_or("poisson", 0.35, {0, 0.5, true, false, "a Poisson's ratio"});
  m.max_temp_c = t.number("max_temp_c", {20, 400, true, true, "a service temperature limit in °C"});
  m.note = "custom material from the job file";
  t.finish();
  return m;
}

FixtureSpec read_fixture(TableReader& t, std::string& material_name) {
  FixtureSpec f;
  f.family = t.choice("family", kFamilies, "slide-disc");
  f.mount = t.choice("mount", {"outboard", "under-nut"}, "outboard");
  material_name = t.optional_string("material", "a material preset name (see `trimwright materials`)").value_or("");
  f.max_diameter_mm = t.optional_number("max_diameter_mm", kSmallLength);
  f.max_thickness_mm = t.optional_number("max_thickness_mm", {0, 200, false, true, "a thickness in mm"});
  f.margin = t.number_or("margin", 1.5, {1.0, 10, true, true, "a range margin (range / needed correction)"});
  f.inserts = t.optional_string("inserts", "an insert kind (see `trimwright inserts`)").value_or("none");
  f.rim_diameter_mm = t.optional_number("rim_diameter_mm", kSmallLength);
  f.rim_thickness_mm = t.optional_number("rim_thickness_mm", {0, 100, false, true, "a rim thickness in mm"});
  f.positions_deg = t.optional_numbers("positions_deg", {-360, 360, true, true, "a rim position in degrees"}).value_or(std::vector<double>{});
  f.sized_for_gmm = t.optional_number("sized_for_gmm", {0, 1e7, false, true,
                                      "the correction in g·mm the printed fixture was sized for"});
  t.finish();
  return f;
}

PrintSpec read_print(TableReader& t) {
  PrintSpec p;
  p.nozzle_mm = t.number_or("nozzle_mm", 0.4, {0.1, 2.0, true, true, "a nozzle diameter in mm"});
  p.layer_mm = t.number_or("layer_mm", 0.2, {0.04, 1.0, true, true, "a layer height in mm"});
  p.infill_percent = t.number_or("infill_percent", 100, {0, 100, false, true, "an infill in percent"});
  p.clearance_mm = t.number_or("clearance_mm", 0.2, {0, 2, true, true, "a fit clearance in mm"});
  if (p.layer_mm > p.nozzle_mm) t.fail("layer_mm", fmt::format("a layer no thicker than the nozzle ({:g} mm)", p.nozzle_mm));
  t.finish();
  return p;
}

OutputSpec read_output(TableReader& t) {
  OutputSpec o;
  if (auto d = t.optional_string("dir", "an output folder")) {
    if (d->empty()) t.fail("dir", "a folder name");
    o.dir = *d;
  }
  if (auto f = t.optional_strings("formats", "output formats")) {
    for (const auto& s : *f)
      if (std::find(kFormats.begin(), kFormats.end(), s) == kFormats.end()) {
        std::string list;
        for (const auto& k : kFormats) list += (list.empty() ? "" : ", ") + k;
        t.fail("formats", fmt::format("formats from {} (\"{}\" is not one)", list, s));
      }
    o.formats = *f;
  }
  o.paper = t.choice("paper", {"a4", "letter"}, "a4");
  if (t.has("png_dpi")) o.png_dpi = static_cast<int>(t.integer("png_dpi", 30, 600, "a PNG resolution in dots per inch"));
  t.finish();
  return o;
}

Job build_job(toml::table& root, const std::string& source) {
  Job job;
  job.source = source;
  TableReader top(root, "", source, job.locations);
  job.title = top.optional_string("title", "a title for the job").value_or("");
  auto sub = [&](const char* name, bool required) -> const toml::table* {
    const toml::table* t = top.optional_table(name);
    if (!t && required) top.missing(name, fmt::format("a [{}] table", name));
    return t;
  };
  {
    TableReader t(*sub("machine", true), "machine", source, job.locations);
    job.machine = read_machine(t);
  }
  {
    TableReader t(*sub("rotor", true), "rotor", source, job.locations);
    job.rotor = read_rotor(t, job.machine);
  }
  const toml::table* corr = sub("correction", false);
  const toml::table* read = sub("readings", false);
  if (corr && read)
    top.fail("readings", "either [correction] (a known correction) or [readings], not both");
  if (!corr && !read)
    top.missing("correction", "a [correction] table (a known correction) or a [readings] table");
  if (corr) {
    TableReader t(*corr, "correction", source, job.locations);
    job.angles = read_angle_sense(t);
    job.correction = read_correction(t);
  } else {
    TableReader t(*read, "readings", source, job.locations);
    job.readings = read_readings(t, source);
    job.angles = job.readings->angles;
  }
  std::string material_name;
  if (const toml::table* f = sub("fixture", false)) {
    TableReader t(*f, "fixture", source, job.locations);
    job.fixture = read_fixture(t, material_name);
  }
  if (const toml::table* m = sub("material", false)) {
    TableReader t(*m, "material", source, job.locations);
    job.material = read_material_table(t);
    if (!material_name.empty() && lower(material_name) != lower(job.material.name))
      throw InputError(fmt::format("{}: fixture.material = \"{}\": expected the name of the [material] table (\"{}\") or no fixture.material",
                                   job.where("fixture.material"), material_name, job.material.name));
  } else {
    std::string want = material_name.empty() ? "PETG" : material_name;
    bool found = false;
    for (const auto& p : material_presets())
      if (lower(p.name) == lower(want)) job.material = p, found = true;
    if (!found) {
      std::string list;
      for (const auto& p : material_presets()) list += (list.empty() ? "" : ", ") + p.name;
      throw InputError(fmt::format("{}: fixture.material = \"{}\": expected a preset ({}) or a [material] table",
                                   job.where("fixture.material"), want, list));
    }
  }
  if (const toml::table* p = sub("print", false)) {
    TableReader t(*p, "print", source, job.locations);
    job.print = read_print(t);
  }
  if (const toml::table* g = sub("target", false)) {
    TableReader t(*g, "target", source, job.locations);
    job.grade = t.optional_string("grade", "an ISO 21940-11 balance grade such as G6.3");
    t.finish();
  }
  if (const toml::table* c = sub("checks", false)) {
    TableReader t(*c, "checks", source, job.locations);
    job.accept = t.optional_strings("accept", "names of failed checks you knowingly accept").value_or(std::vector<std::string>{});
    for (const auto& name : job.accept) {
      const auto& known = check::check_names();
      if (std::find(known.begin(), known.end(), name) == known.end()) {
        std::string list;
        for (const auto& k : known) list += (list.empty() ? "" : ", ") + k;
        t.fail("accept", fmt::format("names of checks (\"{}\" is not one of {})", name, list));
      }
    }
    t.finish();
  }
  if (const toml::table* o = sub("output", false)) {
    TableReader t(*o, "output", source, job.locations);
    job.output = read_output(t);
  }
  top.finish({"include"});
  return job;
}

}  // namespace

std::string Job::where(const std::string& key) const {
  auto it = locations.find(key);
  return it != locations.end() ? it->second : source;
}

Job load_job_text(const std::string& text, const std::string& source, const std::string& base_dir) {
  std::vector<std::string> chain{fs::weakly_canonical(fs::path(source)).string()};
  std::vector<std::string> included;
  toml::table root = load_with_includes(text, source, fs::path(base_dir), chain, included);
  Job job = build_job(root, source);
  job.included = included;
  return job;
}

Job load_job(const std::string& path) {
  if (fs::is_directory(path)) throw FileError(fmt::format("{}: is a folder, expected a job file (.toml)", path));
  std::string text = read_text_file(path);
  fs::path dir = fs::path(path).parent_path();
  return load_job_text(text, path, dir.empty() ? "." : dir.string());
}

}  // namespace trimwright::cli
