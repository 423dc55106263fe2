// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/design.hpp"

#include <CLI/CLI.hpp>
#include <fmt/core.h>

#include <filesystem>
#include <memory>

#include "cli/job.hpp"
#include "cli/pipeline.hpp"
#include "geom/check/check.hpp"

namespace trimwright::cli {
namespace {

/// Runs a loaded job: design, write (unless a blocking check fails), print. Returns the exit code.
int design_and_write(const Job& job, const std::string& out_dir, const std::string& family, bool json,
                     int plane = 1) {
  DesignOptions options;
  if (!family.empty()) options.family = family;
  options.plane = plane;
  DesignRun run = run_design(job, options);
  std::vector<std::string> blocking = check::blocking_failures(run.checks);
  std::vector<std::string> outputs;
  if (blocking.empty()) outputs = write_outputs(run, out_dir);
  if (json) {
    fmt::print("{}", report_json(run, outputs));
  } else {
    fmt::print("{}", summary_text(run, outputs, out_dir));
  }
  if (!blocking.empty()) {
    std::string names;
    for (const auto& b : blocking) names += (names.empty() ? "" : ", ") + b;
    fmt::print(stderr,
               "trimwright: {}: failed check{} {}: nothing written. Fix the job, or list the check "
               "under [checks] accept if you knowingly accept the risk\n",
               job.source, blocking.size() > 1 ? "s" : "", names);
    return 1;
  }
  return 0;
}

std::string default_out_dir(const Job& job, const std::string& job_path) {
  std::filesystem::path dir(job.output.dir);
  if (dir.is_relative() && !job_path.empty()) dir = std::filesystem::path(job_path).parent_path() / dir;
  return dir.empty() ? std::string("out") : dir.string();
}

}  // namespace

int run_design_command(const DesignCommandOptions& o) {
  Job job = load_job(o.job_path);
  std::string out = o.out_dir.empty() ? default_out_dir(job, o.job_path) : o.out_dir;
  return design_and_write(job, out, o.family, o.json, o.plane);
}

void add_design_command(CLI::App& app, int& exit_code) {
  auto opts = std::make_shared<DesignCommandOptions>();
  CLI::App* sub = app.add_subcommand("design", "Size, build and check a fixture for a job; write every output");
  sub->add_option("job", opts->job_path, "Job file (TOML)")->required();
  sub->add_option("--out", opts->out_dir, "Output folder (default: the job's [output] dir)");
  sub->add_option("--family", opts->family, "Fixture family, overriding the job's [fixture] family");
  sub->add_option("--plane", opts->plane, "Correction plane to build for, with two-plane readings")
      ->check(CLI::Range(1, 2))
      ->capture_default_str();
  sub->add_flag("--json", opts->json, "Print the report (JSON) instead of the summary");
  sub->callback([opts, &exit_code] { exit_code = run_design_command(*opts); });
}

void add_demo_command(CLI::App& app, int& exit_code) {
  auto out = std::make_shared<std::string>("demo-out");
  CLI::App* sub = app.add_subcommand("demo", "Run the built-in sample job and write every output");
  sub->add_option("--out", *out, "Output folder")->capture_default_str();
  sub->callback([out, &exit_code] {
    Job job = load_job_text(demo_job_text(), "<demo>", ".");
    exit_code = design_and_write(job, *out, "", false);
  });
}

}  // namespace trimwright::cli
