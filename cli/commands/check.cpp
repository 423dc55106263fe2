// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/check.hpp"

#include <CLI/CLI.hpp>
#include <fmt/core.h>

#include <algorithm>
#include <cctype>
#include <filesystem>
#include <memory>

#include "cli/job.hpp"
#include "cli/pipeline.hpp"
#include "geom/check/check.hpp"
#include "geom/io/json.hpp"
#include "geom/io/mesh_file.hpp"
#include "geom/kernel/mesh_check.hpp"

namespace trimwright::cli {
namespace {

std::string extension_of(const std::string& path) {
  std::string e = std::filesystem::path(path).extension().string();
  std::transform(e.begin(), e.end(), e.begin(), [](unsigned char c) { return std::tolower(c); });
  return e;
}

int check_meshes(const std::string& path, bool json) {
  std::vector<io::NamedMesh> meshes = io::read_mesh_file(path);
  io::Json out;
  out["file"] = path;
  io::Json objects = io::Json::array();
  bool all_valid = true;
  std::string text;
  for (const auto& m : meshes) {
    kernel::MeshInspection mi = kernel::inspect_mesh(m.mesh, true);
    all_valid = all_valid && mi.valid();
    io::Json o;
    o["name"] = m.name;
    o["valid"] = mi.valid();
    o["closed"] = mi.closed();
    o["vertices"] = mi.vertex_count;
    o["triangles"] = mi.triangle_count;
    o["boundary_edges"] = mi.boundary_edges;
    o["nonmanifold_edges"] = mi.nonmanifold_edges;
    o["misoriented_edges"] = mi.misoriented_edges;
    o["degenerate_triangles"] = mi.degenerate_triangles;
    o["components"] = mi.components;
    o["self_intersects"] = mi.self_intersects;
    o["volume_mm3"] = io::json_number(mi.volume_mm3, "volume");
    o["bounds_mm"] = {{io::json_number(mi.bounds.min[0], "bounds"), io::json_number(mi.bounds.min[1], "bounds"),
                       io::json_number(mi.bounds.min[2], "bounds")},
                      {io::json_number(mi.bounds.max[0], "bounds"), io::json_number(mi.bounds.max[1], "bounds"),
                       io::json_number(mi.bounds.max[2], "bounds")}};
    objects.push_back(o);
    std::vector<std::string> problems;
    if (mi.boundary_edges) problems.push_back(fmt::format("{} open edges", mi.boundary_edges));
    if (mi.nonmanifold_edges) problems.push_back(fmt::format("{} non-manifold edges", mi.nonmanifold_edges));
    if (mi.misoriented_edges) problems.push_back(fmt::format("{} edges between inconsistently oriented triangles", mi.misoriented_edges));
    if (mi.degenerate_triangles) problems.push_back(fmt::format("{} degenerate triangles", mi.degenerate_triangles));
    if (mi.self_intersects) problems.push_back("self-intersections");
    if (mi.closed() && mi.volume_mm3 <= 0) problems.push_back("inside out (negative volume)");
    std::string verdict = problems.empty() ? "valid" : "INVALID: ";
    for (std::size_t i = 0; i < problems.size(); ++i) verdict += (i ? ", " : "") + problems[i];
    text += fmt::format("{}: {}: {} triangles, {} vertices, {} component{}, volume {:.3f} mm³, "
                        "box {:.2f} × {:.2f} × {:.2f} mm: {}\n",
                        path, m.name, mi.triangle_count, mi.vertex_count, mi.components,
                        mi.components == 1 ? "" : "s", mi.volume_mm3, mi.bounds.max[0] - mi.bounds.min[0],
                        mi.bounds.max[1] - mi.bounds.min[1], mi.bounds.max[2] - mi.bounds.min[2], verdict);
  }
  out["objects"] = objects;
  out["valid"] = all_valid;
  fmt::print("{}", json ? io::dump_json(out) : text);
  return all_valid ? 0 : 1;
}

int check_job(const std::string& path, bool json) {
  Job job = load_job(path);
  DesignRun run = run_design(job);
  std::vector<std::string> blocking = check::blocking_failures(run.checks);
  if (json) {
    fmt::print("{}", report_json(run, {}));
  } else {
    fmt::print("{}", summary_text(run, {}, ""));
    fmt::print("  (check only: nothing written)\n");
  }
  return blocking.empty() ? 0 : 1;
}

}  // namespace

int run_check_command(const CheckCommandOptions& o) {
  std::string ext = extension_of(o.path);
  if (ext == ".stl" || ext == ".3mf") return check_meshes(o.path, o.json);
  return check_job(o.path, o.json);
}

void add_check_command(CLI::App& app, int& exit_code) {
  auto opts = std::make_shared<CheckCommandOptions>();
  CLI::App* sub = app.add_subcommand(
      "check", "Check a mesh (STL, 3MF: closed, oriented, self-intersections) or a job's safety checks; writes nothing");
  sub->add_option("file", opts->path, "An .stl or .3mf file, or a job file (.toml)")->required();
  sub->add_flag("--json", opts->json, "Print the result as JSON");
  sub->callback([opts, &exit_code] { exit_code = run_check_command(*opts); });
}

}  // namespace trimwright::cli
