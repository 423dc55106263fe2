// SPDX-License-Identifier: GPL-3.0-or-later
// Writing a design: meshes, chart, table and report into one folder (all or none), and the
// terminal summary.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "cli/pipeline.hpp"
#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/io/chart.hpp"
#include "geom/io/csv.hpp"
#include "geom/io/json.hpp"
#include "geom/io/output_set.hpp"
#include "geom/io/stl.hpp"
#include "geom/io/three_mf.hpp"

namespace trimwright::cli {
namespace {

using io::Json;

bool wants(const DesignRun& run, const std::string& format) {
  const auto& f = run.job.output.formats;
  return std::find(f.begin(), f.end(), format) != f.end();
}

std::string stl_name(const DesignRun& run, const fixture::Part& part) {
  return fmt::format("{}-{}.stl", run.file_stem, part.name);
}

std::string angle_sense_name(solve::AngleSense s) {
  return s == solve::AngleSense::kWithRotation ? "with-rotation" : "against-rotation";
}

io::ChartData chart_data(const DesignRun& run) {
  const Job& job = run.job;
  const fixture::Design& d = run.design;
  io::ChartData c;
  c.title = job.title.empty() ? "trimwright setting chart" : job.title;
  c.subtitle = fmt::format("{} in {} · {} at {:g} rpm · spindle {:g} mm", d.family, job.material.name,
                           job.rotor.kind, job.machine.speed_rpm, job.machine.spindle_diameter_mm);
  c.headline = d.headline;
  for (const auto& v : d.setting)
    c.setting.push_back({v.label, v.unit == "°" ? io::format_angle(v.value) : fmt::format("{:.2f}", v.value),
                         v.unit == "°" ? "" : v.unit});
  c.correction.unbalance_gmm = run.correction.unbalance_gmm;
  c.correction.angle_deg = run.correction.angle_deg;
  c.correction.method = run.correction.method;
  if (run.tolerance) {
    c.correction.grade = run.tolerance->grade;
    c.correction.permissible_gmm = run.tolerance->permissible_gmm;
  }
  for (const auto& p : d.parts)
    c.parts.push_back({p.name, p.mass_g, p.weighed_g ? io::MassSource::kWeighed : io::MassSource::kPredicted,
                       fmt::format("{} at {:g} % infill{}", job.material.name, job.print.infill_percent,
                                   p.inserts.empty() ? "" : fmt::format(", {} inserts", p.inserts.size()))});
  c.resolution_gmm = d.resolution_gmm;
  c.resolution_note = "per " + d.resolution_basis;
  // A range that starts within a hundredth of a g·mm of zero (two discs opposite) starts at zero
  // for anyone setting it by hand.
  c.reach.min_gmm = d.range_min_gmm < 0.01 ? 0.0 : d.range_min_gmm;
  c.reach.max_gmm = d.range_max_gmm;
  c.steps = d.steps;
  c.table.title = "Settings across the range";
  c.table.header = d.table.header;
  c.table.rows = d.table.rows;
  c.table.more_rows_note = "all rows: chart.csv";
  for (const auto& k : run.checks) {
    io::ChartCheck cc;
    cc.name = k.name;
    cc.value = k.value;
    cc.limit = k.limit;
    cc.unit = k.unit;
    cc.kind = k.at_least ? io::LimitKind::kAtLeast : io::LimitKind::kAtMost;
    cc.ok = k.ok;
    cc.accepted = k.accepted;
    cc.note = k.note;
    c.checks.push_back(cc);
  }
  c.warnings = run.warnings;
  c.cautions = check::cautions();
  c.rotation = job.machine.rotation == "cw" ? io::Rotation::kCw : io::Rotation::kCcw;
  c.sense = job.angles == solve::AngleSense::kWithRotation ? io::AngleSense::kWithRotation
                                                           : io::AngleSense::kAgainstRotation;
  c.spindle_diameter_mm = job.machine.spindle_diameter_mm;
  c.flange_diameter_mm = job.machine.flange_diameter_mm.value_or(0);
  c.rotor_diameter_mm = job.rotor.diameter_mm;
  c.correction_mark_label = "heavy side";
  return c;
}

Json vec3(const kernel::Vec3& v, const char* what) {
  return Json::array({io::json_number(v[0], what), io::json_number(v[1], what), io::json_number(v[2], what)});
}

}  // namespace

std::string report_json(const DesignRun& run, const std::vector<std::string>& outputs) {
  const Job& job = run.job;
  const fixture::Design& d = run.design;
  Json r;
  r["tool"] = {{"name", "trimwright"}, {"version", TRIMWRIGHT_VERSION}};
  r["job"] = {{"title", job.title}, {"source", job.source}, {"included", job.included}};
  Json corr;
  corr["unbalance_gmm"] = io::json_number(run.correction.unbalance_gmm, "correction");
  corr["angle_deg"] = io::json_number(run.correction.angle_deg, "correction angle");
  corr["method"] = run.correction.method;
  corr["angles"] = angle_sense_name(job.angles);
  if (run.correction.mass_g) corr["mass_g"] = io::json_number(*run.correction.mass_g, "correction mass");
  if (run.correction.radius_mm) corr["radius_mm"] = io::json_number(*run.correction.radius_mm, "correction radius");
  r["correction"] = corr;
  if (run.tolerance)
    r["tolerance"] = {{"grade", run.tolerance->grade},
                      {"permissible_gmm", io::json_number(run.tolerance->permissible_gmm, "tolerance")}};
  Json fx;
  fx["family"] = d.family;
  fx["range_gmm"] = Json::array({io::json_number(d.range_min_gmm, "range"), io::json_number(d.range_max_gmm, "range")});
  fx["resolution_gmm"] = io::json_number(d.resolution_gmm, "resolution");
  fx["resolution_basis"] = d.resolution_basis;
  fx["swept_diameter_mm"] = io::json_number(d.swept_diameter_mm, "swept diameter");
  fx["stack_height_mm"] = io::json_number(d.stack_height_mm, "stack height");
  fx["mount"] = job.fixture.mount;
  fx["reason"] = d.reason;
  fx["sized_for_gmm"] = io::json_number(d.sized_for_gmm, "sized for");
  Json parts = Json::array();
  for (const auto& p : d.parts) {
    Json pj;
    pj["name"] = p.name;
    pj["file"] = wants(run, "stl") || wants(run, "stl-ascii") ? Json(stl_name(run, p)) : Json(nullptr);
    pj["volume_mm3"] = io::json_number(p.props.volume_mm3, "volume");
    pj["mass_g"] = io::json_number(p.mass_g, "mass");
    pj["plastic_mass_g"] = io::json_number(p.plastic_mass_g, "plastic mass");
    if (p.weighed_g) pj["weighed_g"] = io::json_number(*p.weighed_g, "weighed mass");
    pj["centroid_mm"] = vec3(p.centroid_mm, "centroid");
    pj["material"] = job.material.name;
    pj["density_g_cm3"] = io::json_number(p.density_g_cm3, "density");
    pj["triangles"] = p.mesh.triangles.size();
    Json ins = Json::array();
    for (const auto& i : p.inserts)
      ins.push_back({{"kind", i.kind}, {"mass_g", io::json_number(i.mass_g, "insert mass")},
                     {"position_mm", vec3(i.position_mm, "insert position")}});
    pj["inserts"] = ins;
    if (p.shape.pause_height_mm > 0) {
      pj["pause_at_mm"] = io::json_number(p.shape.pause_height_mm, "pause height");
      pj["pause_layer"] = static_cast<int>(std::lround(p.shape.pause_height_mm / job.print.layer_mm)) + 1;
      pj["pocket_cover_mm"] = io::json_number(p.shape.pocket_cover_mm, "pocket cover");
    }
    parts.push_back(pj);
  }
  fx["parts"] = parts;
  r["fixture"] = fx;
  Json st;
  for (const auto& v : d.setting) st[v.key] = io::json_number(v.value, v.key);
  if (!d.weights.empty()) {
    Json w = Json::array();
    for (const auto& p : d.weights) w.push_back({{"part", p.part}, {"angle_deg", io::json_number(p.angle_deg, "weight angle")}});
    st["weights"] = w;
  }
  st["headline"] = d.headline;
  r["setting"] = st;
  r["achieved"] = {{"unbalance_gmm", io::json_number(d.achieved_gmm, "achieved")},
                   {"angle_deg", io::json_number(d.achieved_angle_deg, "achieved angle")}};
  Json checks = Json::array();
  for (const auto& k : run.checks) {
    Json kj;
    kj["name"] = k.name;
    if (!k.subject.empty()) kj["subject"] = k.subject;
    kj["value"] = io::json_number(k.value, k.name);
    kj["limit"] = io::json_number(k.limit, k.name);
    kj["unit"] = k.unit;
    kj["ok"] = k.ok;
    kj["accepted"] = k.accepted;
    kj["note"] = k.note;
    checks.push_back(kj);
  }
  r["checks"] = checks;
  r["warnings"] = run.warnings;
  r["cautions"] = check::cautions();
  r["steps"] = d.steps;
  r["outputs"] = outputs;
  return io::dump_json(r);
}

std::vector<std::string> write_outputs(const DesignRun& run, const std::string& dir) {
  io::OutputSet set(dir);
  std::vector<std::string> names;
  auto add = [&](const std::string& name, std::string bytes) {
    set.add(name, std::move(bytes));
    names.push_back(name);
  };
  for (const auto& p : run.design.parts) {
    if (wants(run, "stl")) add(stl_name(run, p), io::stl_bytes(p.mesh, p.name, io::StlFormat::kBinary));
    else if (wants(run, "stl-ascii")) add(stl_name(run, p), io::stl_bytes(p.mesh, p.name, io::StlFormat::kAscii));
  }
  if (wants(run, "3mf")) {
    std::vector<io::ThreeMfObject> objects;
    for (const auto& p : run.design.parts) objects.push_back({p.name, p.mesh});
    io::ThreeMfMetadata meta;
    meta.title = run.job.title;
    meta.entries = {{"family", run.design.family},
                    {"material", run.job.material.name},
                    {"infill_percent", fmt::format("{:g}", run.job.print.infill_percent)},
                    {"setting", run.design.headline}};
    for (const auto& p : run.design.parts)
      if (p.shape.pause_height_mm > 0)
        meta.entries.push_back({"pause_" + p.name,
                                fmt::format("pause at {:.2f} mm (layer {}) and drop the inserts in",
                                            p.shape.pause_height_mm,
                                            std::lround(p.shape.pause_height_mm / run.job.print.layer_mm) + 1)});
    for (auto& e : meta.entries)
      std::replace(e.first.begin(), e.first.end(), '-', '_');
    add(run.file_stem + ".3mf", io::three_mf_bytes(objects, meta));
  }
  if (wants(run, "csv")) {
    io::Table t(run.design.table.header);
    for (const auto& row : run.design.table.rows) t.add_row(row);
    add("chart.csv", io::to_csv(t));
  }
  bool pdf = wants(run, "pdf"), svg = wants(run, "svg"), png = wants(run, "png");
  if (pdf || svg || png) {
    io::ChartData data = chart_data(run);
    io::ChartOptions opt;
    opt.paper = io::parse_paper(run.job.output.paper);
    opt.tool_version = TRIMWRIGHT_VERSION;
    opt.png_dpi = run.job.output.png_dpi;
    io::validate_chart(data, opt);
    auto chart_writer = [data, opt](int which) {
      return [data, opt, which](const std::string& path) {
        io::ChartTargets t;
        (which == 0 ? t.pdf_path : which == 1 ? t.svg_path : t.png_path) = path;
        io::write_chart(data, opt, t);
      };
    };
    if (pdf) set.add_writer("chart.pdf", chart_writer(0)), names.push_back("chart.pdf");
    if (svg) set.add_writer("chart.svg", chart_writer(1)), names.push_back("chart.svg");
    if (png) set.add_writer("chart.png", chart_writer(2)), names.push_back("chart.png");
  }
  if (wants(run, "json")) {
    std::vector<std::string> listed = names;
    listed.push_back("report.json");
    add("report.json", report_json(run, listed));
  }
  set.commit();
  return names;
}

std::string summary_text(const DesignRun& run, const std::vector<std::string>& outputs,
                         const std::string& dir) {
  const fixture::Design& d = run.design;
  std::string s;
  s += fmt::format("trimwright {}{}\n", TRIMWRIGHT_VERSION, run.job.title.empty() ? "" : " · " + run.job.title);
  s += fmt::format("  correction  {:.1f} g·mm at {:.0f}° ({}{})", run.correction.unbalance_gmm,
                   run.correction.angle_deg, run.correction.method,
                   run.correction.mass_g && run.correction.radius_mm
                       ? fmt::format(", {:.2f} g at {:g} mm", *run.correction.mass_g, *run.correction.radius_mm)
                       : "");
  if (run.tolerance)
    s += fmt::format("; {} permits {:.2f} g·mm", run.tolerance->grade, run.tolerance->permissible_gmm);
  s += "\n";
  for (const auto& p : d.parts) {
    std::string what = p.inserts.empty()
                           ? fmt::format("of {}", run.job.material.name)
                           : fmt::format("({:.2f} g of {} and {} metal part{})", p.plastic_mass_g,
                                         run.job.material.name, p.inserts.size(), p.inserts.size() == 1 ? "" : "s");
    s += fmt::format("  part        {}: {:.2f} g{} {}, {:.0f} mm³ printed\n", p.name, p.mass_g,
                     p.weighed_g ? " (weighed)" : "", what, p.props.volume_mm3);
  }
  s += fmt::format("  fixture     {}: range {:.0f}–{:.0f} g·mm, {:.2f} g·mm per {}, sweeps Ø{:.1f} mm\n",
                   d.family, d.range_min_gmm, d.range_max_gmm, d.resolution_gmm, d.resolution_basis,
                   d.swept_diameter_mm);
  s += fmt::format("  SETTING     {}\n", d.headline);
  int ok = 0;
  for (const auto& k : run.checks) ok += k.ok ? 1 : 0;
  s += fmt::format("  checks      {} of {} passed\n", ok, run.checks.size());
  for (const auto& k : run.checks)
    if (!k.ok)
      s += fmt::format("    {} {}: {}\n", k.accepted ? "ACCEPTED" : "FAILED", k.name, k.note);
  for (const auto& w : run.warnings) s += fmt::format("  warning     {}\n", w);
  if (!outputs.empty()) {
    s += fmt::format("  wrote       {}/: ", dir);
    for (std::size_t i = 0; i < outputs.size(); ++i) s += (i ? ", " : "") + outputs[i];
    s += "\n";
  }
  s += "  cautions:\n";
  for (const auto& c : check::cautions()) s += fmt::format("    - {}\n", c);
  return s;
}

}  // namespace trimwright::cli
