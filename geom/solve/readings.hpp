// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Vibration readings as the job file states them (design.md §3a [readings], §5). Plain data:
/// cli/ fills it from TOML (or from recordings), geom/solve turns it into corrections.

#include <optional>
#include <string>
#include <vector>

namespace trimwright::solve {

/// Which solver to use.
enum class Method { kTrial, kFourRun, kTwoPlane, kFit, kStatic, kIndex };

/// How phase readings count: degrees of rotation from the reference pulse to the peak ("lag",
/// the default) or the opposite sense ("lead").
enum class PhaseSense { kLag, kLead };

/// Which way weight angles count on the rotor, from its reference mark.
enum class AngleSense { kAgainstRotation, kWithRotation };

/// Index method: what the phase reference is fixed to. With the reference on the adapter (or
/// spindle), turning the rotor on the adapter turns the rotor's share of the reading; with the
/// reference on the rotor, it turns the adapter's share.
enum class IndexReference { kAdapter, kRotor };

/// A weight on the rotor during a run, beyond its original state.
struct TrialWeight {
  int plane = 1;           ///< correction plane, 1-based
  double mass_g = 0;       ///< grams
  double radius_mm = 0;    ///< radius of its centre of mass, mm
  double angle_deg = 0;    ///< angle from the reference mark, in the job's angle sense
  /// Unbalance it adds, g·mm.
  double unbalance_gmm() const { return mass_g * radius_mm; }
};

/// A fixture setting logged with a run while trimming (design.md §5, `fit`). The fixture's mass
/// model turns it into a TrialWeight before solving.
struct FixtureSetting {
  std::vector<std::pair<std::string, double>> values;  ///< e.g. {"spindle_x_mm", 1.8}, {"angle_deg", 212}
};

/// One run of the machine: what each sensor read, and what was on the rotor.
struct Run {
  std::string name;                          ///< label from the job file
  std::vector<double> amplitude;             ///< one per sensor, in Readings::units
  std::vector<std::optional<double>> phase_deg;  ///< one per sensor; empty optional = not measured
  std::vector<TrialWeight> trial;            ///< every weight on the rotor this run
  std::optional<FixtureSetting> setting;     ///< fixture setting this run (trimming runs)
  std::optional<double> settle_angle_deg;    ///< static method: where the trial mark settled
  std::optional<double> index_deg;           ///< index method: how far the rotor was turned on its adapter
  std::string recording;                     ///< a CSV/WAV recording to measure instead of typed values
  std::string axis;                          ///< which recording column to use ("x", "y", "z" or a name)
  int line = 0;                              ///< line in the job file, for messages
};

/// All readings of a job.
struct Readings {
  Method method = Method::kTrial;
  std::string units = "mm/s-pk";     ///< any label; known units enable severity figures
  PhaseSense phase = PhaseSense::kLag;
  AngleSense angles = AngleSense::kAgainstRotation;
  double correction_radius_mm = 0;   ///< where corrections are expressed as a mass (0 = not given)
  std::vector<Run> runs;
  std::string influence_file;        ///< a saved influence-coefficient file to reuse (empty = none)
  std::string save_influence;        ///< where to save fitted coefficients (empty = don't)
  std::string source;                ///< the job file, for messages
  /// The weights of the last run stay on the rotor: corrections are then what to add on top of
  /// them, and SolveResult::combined gives the weights and the addition as one (false = every
  /// weight listed in the runs is removed before correcting).
  bool keep_trial = false;
  /// Number of correction planes for `fit` (0 = the highest plane any run names); a run naming a
  /// higher plane is an error.
  int planes = 0;
  /// Where each sensor sits ("left bearing, horizontal"), one per sensor, for the influence file.
  std::vector<std::string> sensor_notes;
  /// Index method: what the phase reference is fixed to (default: the adapter or spindle).
  IndexReference index_reference = IndexReference::kAdapter;
};

}  // namespace trimwright::solve
