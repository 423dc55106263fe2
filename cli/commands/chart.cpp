// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/chart.hpp"

#include <CLI/CLI.hpp>
#include <fmt/core.h>

#include <cmath>
#include <filesystem>
#include <memory>

#include "cli/job.hpp"
#include "cli/pipeline.hpp"
#include "geom/base/error.hpp"
#include "geom/check/check.hpp"

namespace trimwright::cli {

std::pair<std::string, double> parse_weighed(const std::string& text) {
  auto eq = text.find('=');
  if (eq == std::string::npos || eq == 0 || eq + 1 == text.size())
    throw InputError(fmt::format("--weighed {}: expected PART=GRAMS, e.g. --weighed slide-disc=10.42", text));
  std::string name = text.substr(0, eq), grams_text = text.substr(eq + 1);
  double grams = 0;
  std::size_t used = 0;
  try {
    grams = std::stod(grams_text, &used);
  } catch (const std::exception&) {
    used = 0;
  }
  if (used != grams_text.size() || !std::isfinite(grams) || grams <= 0 || grams > 1e5)
    throw InputError(fmt::format("--weighed {}: \"{}\" is not a mass: expected grams, a number > 0", text, grams_text));
  return {name, grams};
}

int run_chart_command(const ChartCommandOptions& o) {
  Job job = load_job(o.job_path);
  DesignOptions weighed;
  for (const auto& w : o.weighed) weighed.weighed_g.push_back(parse_weighed(w));
  DesignRun predicted = run_design(job);
  for (const auto& [name, grams] : weighed.weighed_g) {
    const fixture::Part* part = nullptr;
    for (const auto& p : predicted.design.parts)
      if (p.name == name) part = &p;
    if (!part) {
      std::string names;
      for (const auto& p : predicted.design.parts) names += (names.empty() ? "" : ", ") + p.name;
      throw InputError(fmt::format("--weighed {}={:g}: no part \"{}\" in this design: expected one of {}", name,
                                   grams, name, names));
    }
    double change = grams / part->mass_g - 1;
    if (std::fabs(change) > 0.25)
      throw InputError(fmt::format(
          "--weighed {}={:g}: {:+.0f} % from the predicted {:.2f} g: expected the weight of this "
          "part (is it the right part, printed solid, with its inserts?)",
          name, grams, 100 * change, part->mass_g));
  }
  DesignRun run = run_design(job, weighed);
  std::vector<std::string> blocking = check::blocking_failures(run.checks);
  std::string out = o.out_dir;
  if (out.empty()) {
    std::filesystem::path dir(job.output.dir);
    if (dir.is_relative()) dir = std::filesystem::path(o.job_path).parent_path() / dir;
    out = dir.string();
  }
  std::vector<std::string> outputs;
  if (blocking.empty()) outputs = write_outputs(run, out);
  if (o.json) {
    fmt::print("{}", report_json(run, outputs));
  } else {
    fmt::print("predicted card: {}\n", predicted.design.headline);
    for (std::size_t i = 0; i < run.design.parts.size() && i < predicted.design.parts.size(); ++i) {
      double before = predicted.design.parts[i].mass_g, after = run.design.parts[i].mass_g;
      fmt::print("{}: predicted {:.2f} g, weighed {:.2f} g ({:+.1f} %)\n", run.design.parts[i].name,
                 before, after, 100 * (after / before - 1));
    }
    // For one part, U = m·e: the old card's setting scales with the mass.
    if (run.design.parts.size() == 1) {
      double ratio = run.design.parts[0].mass_g / predicted.design.parts[0].mass_g;
      fmt::print("the predicted card's setting would give {:.1f} g·mm instead of {:.1f} g·mm ({:+.1f} %)\n",
                 predicted.design.achieved_gmm * ratio, predicted.design.achieved_gmm, 100 * (ratio - 1));
    }
    fmt::print("{}", summary_text(run, outputs, out));
  }
  return blocking.empty() ? 0 : 1;
}

void add_chart_command(CLI::App& app, int& exit_code) {
  auto opts = std::make_shared<ChartCommandOptions>();
  CLI::App* sub = app.add_subcommand(
      "chart", "Redo the settings, card and report after weighing the printed parts");
  sub->add_option("job", opts->job_path, "Job file (TOML)")->required();
  sub->add_option("--weighed", opts->weighed, "PART=GRAMS: a printed part's mass from the scale (repeatable)")
      ->required();
  sub->add_option("--out", opts->out_dir, "Output folder (default: the job's [output] dir)");
  sub->add_flag("--json", opts->json, "Print the report (JSON) instead of the summary");
  sub->callback([opts, &exit_code] { exit_code = run_chart_command(*opts); });
}

}  // namespace trimwright::cli
