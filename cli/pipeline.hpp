// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// The design pipeline (design.md §2): job → correction → fixture sizing → geometry → checks →
/// outputs. Commands call these; nothing here prints.

#include <optional>
#include <string>
#include <vector>

#include "cli/job.hpp"
#include "geom/check/check.hpp"
#include "geom/fixture/fixture.hpp"
#include "geom/solve/solve.hpp"

namespace trimwright::cli {

/// The correction the fixture must produce, and where it came from.
struct Correction {
  double unbalance_gmm = 0;
  double angle_deg = 0;                ///< job's angle sense, [0, 360)
  std::string method = "given";        ///< design.md §8 "method"
  std::optional<double> mass_g;        ///< at radius_mm, when a radius is known
  std::optional<double> radius_mm;
  std::vector<std::string> notes;      ///< solver warnings and remarks
};

/// ISO 21940-11 tolerance, when the job sets a grade.
struct Tolerance {
  std::string grade;                   ///< e.g. "G6.3"
  double permissible_gmm = 0;          ///< whole rotor
};

/// Options a command adds to the job.
struct DesignOptions {
  std::optional<std::string> family;   ///< --family overrides [fixture] family
  std::vector<std::pair<std::string, double>> weighed_g;  ///< chart --weighed PART=GRAMS
  int plane = 1;                       ///< which plane's correction to build (two-plane readings)
};

/// Everything a design produced, before writing.
struct DesignRun {
  Job job;
  Correction correction;
  std::optional<Tolerance> tolerance;
  fixture::Design design;
  std::vector<check::CheckResult> checks;
  std::vector<std::string> warnings;
  std::string file_stem;               ///< sanitised title for output names
};

/// A job's readings solved (recordings measured, logged fixture settings turned into weights).
struct SolvedJob {
  solve::SolveResult result;
  std::vector<std::string> notes;   ///< measurement remarks
  bool trimming = false;            ///< runs named fixture settings
  std::string saved_influence;      ///< where the influence coefficients were saved (if asked)
};

/// Solve a job's [readings]. Throws InputError for readings the method cannot use.
SolvedJob solve_job(const Job& job);

/// The correction for a job: the given one, or solved from its readings (plane `plane`).
Correction find_correction(const Job& job, int plane = 1);

/// The fixture request for a job and a correction (limits, defaults, printing); defaults it had
/// to assume are added to `warnings`.
fixture::Request make_request(const Job& job, const Correction& correction,
                              const std::optional<Tolerance>& tolerance, const DesignOptions& options,
                              std::vector<std::string>& warnings);

/// The tolerance for a job's grade, if any.
std::optional<Tolerance> find_tolerance(const Job& job);

/// Solve, size, build and check. Throws CannotMeetError when no part fits; failed checks are
/// values in the result (see `blocking_failures`).
DesignRun run_design(const Job& job, const DesignOptions& options = {});

/// Write every output format the job asks for into `dir`, all or none. Returns the file names.
std::vector<std::string> write_outputs(const DesignRun& run, const std::string& dir);

/// The JSON report (design.md §8) as text; `outputs` lists the files written.
std::string report_json(const DesignRun& run, const std::vector<std::string>& outputs);

/// The compact terminal summary.
std::string summary_text(const DesignRun& run, const std::vector<std::string>& outputs,
                         const std::string& dir);

}  // namespace trimwright::cli
