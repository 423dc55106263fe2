// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// The job file as loaded and validated (design.md §3a). Every value here has passed its type,
/// range and unit checks; `where(key)` gives "file:line" for messages about a key's value.

#include <map>
#include <optional>
#include <string>
#include <vector>

#include "geom/solve/readings.hpp"

namespace trimwright::cli {

/// [machine]
struct MachineSpec {
  double speed_rpm = 0;                     ///< running speed
  std::string rotation = "ccw";             ///< "cw" | "ccw", seen facing the fixture side
  double spindle_diameter_mm = 0;
  std::optional<double> free_thread_mm;     ///< thread past the wheel's own nut, tightened
  std::optional<double> nut_height_mm;      ///< fixture nut; default 0.8 × spindle diameter
  std::optional<double> flange_diameter_mm; ///< outer flange
  std::optional<double> max_fixture_diameter_mm;  ///< room inside the guard, clear of the work
};

/// [rotor]
struct RotorSpec {
  std::string kind = "grinding-wheel";
  double diameter_mm = 0;
  std::optional<double> width_mm;
  std::optional<double> bore_mm;
  double mass_kg = 0;
  std::optional<double> max_speed_rpm;      ///< as marked on the rotor
  double bore_clearance_mm = 0;             ///< measured radial slop
};

/// [correction]: a known correction, "add unbalance_gmm at angle_deg".
struct CorrectionSpec {
  double unbalance_gmm = 0;
  double angle_deg = 0;
  std::optional<double> mass_g;             ///< when given as mass and radius
  std::optional<double> radius_mm;
};

/// A printing material (a preset or the [material] table).
struct MaterialSpec {
  std::string name;
  double density_g_cm3 = 0;
  double tensile_mpa = 0;     ///< in-plane tensile strength of printed parts
  double poisson = 0.35;
  double max_temp_c = 0;      ///< service temperature limit
  std::string note;           ///< source or caveat shown in reports
};

/// [fixture]
struct FixtureSpec {
  std::string family = "slide-disc";   ///< slide-disc | disc-pair | clamp-weights | bore-sleeve | auto
  std::string mount = "outboard";      ///< outboard | under-nut
  std::optional<double> max_diameter_mm;
  std::optional<double> max_thickness_mm;
  double margin = 1.5;                 ///< range / needed correction
  std::string inserts = "none";
  std::optional<double> rim_diameter_mm;
  std::optional<double> rim_thickness_mm;
  /// clamp-weights: the only angles (degrees, job's sense) where the rim takes a weight; empty: anywhere.
  std::vector<double> positions_deg;
  /// The correction the printed fixture was sized for (report.json `fixture.sized_for_gmm`):
  /// pins the sizing so that a re-run rebuilds the same part, e.g. while trimming with it.
  std::optional<double> sized_for_gmm;
};

/// [print]
struct PrintSpec {
  double nozzle_mm = 0.4;
  double layer_mm = 0.2;
  double infill_percent = 100;
  double clearance_mm = 0.2;
};

/// [output]
struct OutputSpec {
  std::string dir = "out";
  std::vector<std::string> formats = {"stl", "3mf", "pdf", "svg", "png", "csv", "json"};
  std::string paper = "a4";
  int png_dpi = 100;          ///< resolution of chart.png (a preview; the PDF is for printing)
};

/// A whole validated job.
struct Job {
  std::string source;                  ///< path of the job file ("<demo>" for the built-in one)
  std::string title;
  std::vector<std::string> included;   ///< files pulled in by `include`, in load order
  MachineSpec machine;
  RotorSpec rotor;
  std::optional<CorrectionSpec> correction;
  std::optional<solve::Readings> readings;
  solve::AngleSense angles = solve::AngleSense::kAgainstRotation;
  FixtureSpec fixture;
  MaterialSpec material;
  PrintSpec print;
  std::optional<std::string> grade;    ///< [target] grade, e.g. "G6.3"
  std::vector<std::string> accept;     ///< [checks] accept
  OutputSpec output;

  /// "file:line" where a dotted key (e.g. "fixture.max_diameter_mm") was set, or the job file.
  std::string where(const std::string& key) const;
  /// Locations of every key set, by dotted path.
  std::map<std::string, std::string> locations;
};

/// Load and validate a job file. Throws FileError (unreadable) or InputError (anything wrong in
/// it, with file:line, key, value and what was expected).
Job load_job(const std::string& path);

/// Load and validate a job from TOML text; `source` names it in messages, `base_dir` resolves
/// `include` and recordings.
Job load_job_text(const std::string& text, const std::string& source, const std::string& base_dir);

/// The built-in demo job's TOML text (also what `init` writes, with more comments).
const std::string& demo_job_text();

/// A commented job template for `trimwright init`.
std::string job_template();

/// Built-in material presets (`trimwright materials`).
const std::vector<MaterialSpec>& material_presets();

}  // namespace trimwright::cli
