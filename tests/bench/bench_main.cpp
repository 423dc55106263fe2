// SPDX-License-Identifier: GPL-3.0-or-later
// Benchmarks of each pipeline stage on the built-in demo job and the samples (Google Benchmark).
// Run with scripts/bench.sh; results and the machine they ran on go in docs/performance.md.
#include <benchmark/benchmark.h>

#include <unistd.h>

#include <cmath>
#include <cstdlib>
#include <filesystem>
#include <string>
#include <vector>

#include "cli/job.hpp"
#include "cli/pipeline.hpp"
#include "geom/fixture/fixture.hpp"
#include "geom/io/stl.hpp"
#include "geom/io/three_mf.hpp"
#include "geom/kernel/glyphs.hpp"
#include "geom/kernel/mass.hpp"
#include "geom/kernel/mesh_check.hpp"
#include "geom/kernel/part.hpp"
#include "geom/kernel/profile.hpp"

namespace fs = std::filesystem;
using namespace trimwright;

namespace {

const std::string kSamples = std::string(TRIMWRIGHT_SOURCE_DIR) + "/samples/";

/// The demo job, designed once (the input of the writer benchmarks).
const cli::DesignRun& demo_run() {
  static const cli::DesignRun run = [] {
    cli::Job job = cli::load_job_text(cli::demo_job_text(), "<demo>", ".");
    return cli::run_design(job);
  }();
  return run;
}

/// A scratch folder for writer benchmarks, removed at exit.
const std::string& scratch() {
  static const std::string dir = [] {
    std::string templ = (fs::temp_directory_path() / "tw-bench-XXXXXX").string();
    if (!::mkdtemp(templ.data())) std::abort();
    std::atexit([] { std::error_code ec; fs::remove_all(scratch(), ec); });
    return templ;
  }();
  return dir;
}

/// The slide-disc geometry of the demo as a part spec: outline (disc − slot − notch) and a row
/// of engraved digits, at the given chord tolerance.
kernel::PartSpec demo_spec(double chord_mm) {
  using kernel::Profile;
  kernel::PartSpec spec;
  spec.outline = Profile::disc({9.0, 0}, 26.0) - Profile::obround({-8.5, 0}, {8.5, 0}, 8.04) -
                 Profile::polygon({{36.0, -1.2}, {36.0, 1.2}, {33.0, 0}});
  for (int e = 0; e <= 8; e += 2) {
    auto rings = kernel::text_outline(std::to_string(e), {{8.0 - e * 1.5, 13.0}, 2.5, 0.0}, chord_mm);
    spec.engraving.insert(spec.engraving.end(), rings.begin(), rings.end());
  }
  spec.thickness_mm = 5;
  spec.engraving_depth_mm = 0.6;
  spec.chord_mm = chord_mm;
  return spec;
}

void BM_JobLoad_Sample(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(cli::load_job(kSamples + "grinder-150.toml"));
}
BENCHMARK(BM_JobLoad_Sample)->Unit(benchmark::kMicrosecond);

void BM_JobLoad_Include(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(cli::load_job(kSamples + "right-wheel.toml"));
}
BENCHMARK(BM_JobLoad_Include)->Unit(benchmark::kMicrosecond);

/// The demo job's request as the pipeline builds it (cli/pipeline.cpp): G6.3 on a 0.72 kg wheel
/// at 3450 rpm, 75 g·mm at 212°, PETG, 80 mm room, 6 mm thickness.
fixture::Request demo_request() {
  fixture::Request r;
  r.need.unbalance_gmm = 75;
  r.need.angle_deg = 212;
  r.need.permissible_gmm = demo_run().tolerance->permissible_gmm;
  r.machine.speed_rpm = 3450;
  r.machine.spindle_diameter_mm = 15.875;
  r.machine.free_thread_mm = 20;
  r.machine.nut_height_mm = 9.5;
  r.machine.washer_diameter_mm = 2 * 15.875;
  r.machine.washer_thickness_mm = 0.18 * 15.875;
  r.machine.max_diameter_mm = 80;
  r.machine.max_thickness_mm = 6;
  r.machine.rotor_mass_kg = 0.72;
  r.print.material = "PETG";
  r.print.density_g_cm3 = 1.27;
  r.source = "<bench>";
  return r;
}

/// Sizing: the grid search, the part built with its engraving, the setting and the table.
void BM_Sizing_SlideDisc(benchmark::State& state) {
  fixture::Request req = demo_request();
  for (auto _ : state) benchmark::DoNotOptimize(fixture::design_family("slide-disc", req));
}
BENCHMARK(BM_Sizing_SlideDisc)->Unit(benchmark::kMillisecond);

/// The pipeline without writing: correction, tolerance, sizing, checks.
void BM_RunDesign(benchmark::State& state) {
  cli::Job job = cli::load_job_text(cli::demo_job_text(), "<demo>", ".");
  for (auto _ : state) benchmark::DoNotOptimize(cli::run_design(job));
}
BENCHMARK(BM_RunDesign)->Unit(benchmark::kMillisecond);

void BM_ProfileBooleans(benchmark::State& state) {
  using kernel::Profile;
  for (auto _ : state) {
    Profile p = Profile::disc({9.0, 0}, 26.0) - Profile::obround({-8.5, 0}, {8.5, 0}, 8.04) -
                Profile::polygon({{36.0, -1.2}, {36.0, 1.2}, {33.0, 0}});
    benchmark::DoNotOptimize(p.moments());
  }
}
BENCHMARK(BM_ProfileBooleans)->Unit(benchmark::kMicrosecond);

void BM_TextOutline(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(kernel::text_outline("0123456789", {{0, 0}, 2.5, 0}));
}
BENCHMARK(BM_TextOutline)->Unit(benchmark::kMicrosecond);

/// build_part at chord tolerances 0.1 … 0.001 mm (argument in µm): time and triangle count.
void BM_BuildPart_Chord(benchmark::State& state) {
  double chord = state.range(0) * 1e-3;
  kernel::PartSpec spec = demo_spec(chord);
  std::size_t triangles = 0;
  for (auto _ : state) {
    kernel::Mesh m = kernel::build_part(spec);
    triangles = m.triangles.size();
    benchmark::DoNotOptimize(m);
  }
  state.counters["triangles"] = static_cast<double>(triangles);
  state.counters["chord_mm"] = chord;
}
BENCHMARK(BM_BuildPart_Chord)->Arg(100)->Arg(30)->Arg(10)->Arg(3)->Arg(1)->Unit(benchmark::kMillisecond);

void BM_MassProperties(benchmark::State& state) {
  const kernel::Mesh& mesh = demo_run().design.parts.at(0).mesh;
  for (auto _ : state) benchmark::DoNotOptimize(kernel::mass_properties(mesh));
  state.counters["triangles"] = static_cast<double>(mesh.triangles.size());
}
BENCHMARK(BM_MassProperties)->Unit(benchmark::kMicrosecond);

void BM_InspectMesh(benchmark::State& state) {
  const kernel::Mesh& mesh = demo_run().design.parts.at(0).mesh;
  for (auto _ : state) benchmark::DoNotOptimize(kernel::inspect_mesh(mesh, state.range(0) != 0));
}
BENCHMARK(BM_InspectMesh)->Arg(0)->Arg(1)->Unit(benchmark::kMillisecond);

void BM_StlBytes(benchmark::State& state) {
  const kernel::Mesh& mesh = demo_run().design.parts.at(0).mesh;
  std::size_t bytes = 0;
  for (auto _ : state) {
    std::string s = io::stl_bytes(mesh, "slide-disc");
    bytes = s.size();
    benchmark::DoNotOptimize(s);
  }
  state.SetBytesProcessed(static_cast<std::int64_t>(bytes * state.iterations()));
}
BENCHMARK(BM_StlBytes)->Unit(benchmark::kMicrosecond);

void BM_StlBytes_Ascii(benchmark::State& state) {
  const kernel::Mesh& mesh = demo_run().design.parts.at(0).mesh;
  std::size_t bytes = 0;
  for (auto _ : state) {
    std::string s = io::stl_bytes(mesh, "slide-disc", io::StlFormat::kAscii);
    bytes = s.size();
    benchmark::DoNotOptimize(s);
  }
  state.SetBytesProcessed(static_cast<std::int64_t>(bytes * state.iterations()));
}
BENCHMARK(BM_StlBytes_Ascii)->Unit(benchmark::kMicrosecond);

void BM_StlParse(benchmark::State& state) {
  std::string bytes = io::stl_bytes(demo_run().design.parts.at(0).mesh, "slide-disc");
  for (auto _ : state) benchmark::DoNotOptimize(io::parse_stl(bytes, "bench.stl"));
  state.SetBytesProcessed(static_cast<std::int64_t>(bytes.size() * state.iterations()));
}
BENCHMARK(BM_StlParse)->Unit(benchmark::kMicrosecond);

void BM_ThreeMfBytes(benchmark::State& state) {
  std::vector<io::ThreeMfObject> objects{{"slide-disc", demo_run().design.parts.at(0).mesh}};
  io::ThreeMfMetadata meta;
  meta.title = "bench";
  std::size_t bytes = 0;
  for (auto _ : state) {
    std::string s = io::three_mf_bytes(objects, meta);
    bytes = s.size();
    benchmark::DoNotOptimize(s);
  }
  state.counters["bytes"] = static_cast<double>(bytes);
}
BENCHMARK(BM_ThreeMfBytes)->Unit(benchmark::kMillisecond);

void BM_ReportJson(benchmark::State& state) {
  for (auto _ : state) benchmark::DoNotOptimize(cli::report_json(demo_run(), {"a.stl", "report.json"}));
}
BENCHMARK(BM_ReportJson)->Unit(benchmark::kMicrosecond);

/// write_outputs with one format at a time (the output folder's atomic commit included).
void BM_WriteFormat(benchmark::State& state, const std::string& format) {
  cli::DesignRun run = demo_run();
  run.job.output.formats = {format};
  std::string dir = scratch() + "/" + format;
  for (auto _ : state) benchmark::DoNotOptimize(cli::write_outputs(run, dir));
}
BENCHMARK_CAPTURE(BM_WriteFormat, stl, std::string("stl"))->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_WriteFormat, 3mf, std::string("3mf"))->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_WriteFormat, pdf, std::string("pdf"))->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_WriteFormat, svg, std::string("svg"))->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_WriteFormat, png, std::string("png"))->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_WriteFormat, csv, std::string("csv"))->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_WriteFormat, json, std::string("json"))->Unit(benchmark::kMillisecond);

/// The whole demo: load, solve, size, build, check, and write every output.
void BM_DemoDesign_Whole(benchmark::State& state) {
  std::string dir = scratch() + "/demo";
  for (auto _ : state) {
    cli::Job job = cli::load_job_text(cli::demo_job_text(), "<demo>", ".");
    cli::DesignRun run = cli::run_design(job);
    benchmark::DoNotOptimize(cli::write_outputs(run, dir));
  }
}
BENCHMARK(BM_DemoDesign_Whole)->Unit(benchmark::kMillisecond);

/// Each sample job, designed and written.
void BM_Sample_Whole(benchmark::State& state, const std::string& file) {
  std::string dir = scratch() + "/" + file;
  for (auto _ : state) {
    cli::Job job = cli::load_job(kSamples + file);
    cli::DesignRun run = cli::run_design(job);
    benchmark::DoNotOptimize(cli::write_outputs(run, dir));
  }
}
BENCHMARK_CAPTURE(BM_Sample_Whole, grinder_150, std::string("grinder-150.toml"))->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_Sample_Whole, buffing_wheel_100, std::string("buffing-wheel-100.toml"))->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_Sample_Whole, right_wheel, std::string("right-wheel.toml"))->Unit(benchmark::kMillisecond);
BENCHMARK_CAPTURE(BM_Sample_Whole, slow_grinder_200, std::string("slow-grinder-200.toml"))->Unit(benchmark::kMillisecond);

}  // namespace

BENCHMARK_MAIN();
