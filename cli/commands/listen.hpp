// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// `trimwright listen FILE`: measure one recording (CSV or WAV) and print its running speed, 1×
/// amplitude and phase, and how far to trust them (design.md §5, §8; docs/recordings.md).

#include <optional>
#include <string>

#include "cli/commands/command.hpp"

namespace trimwright::cli {

/// Options of `listen`, as given on the command line.
struct ListenOptions {
  std::string file;                        ///< the recording
  std::optional<double> rpm;               ///< nominal speed, rpm (where to look for 1×)
  std::string units = "g-pk";              ///< output amplitude unit
  std::string axis;                        ///< acceleration channel ("" = the one with the largest 1×)
  std::string reference;                   ///< reference column/channel ("" = by name/right channel, "none")
  std::string plot_dir;                    ///< write FILE-stem.svg/.png here ("" = no plot)
  bool json = false;                       ///< print the JSON reading instead of text
  std::string columns;                     ///< column map for CSV files without (or with wrong) names
  std::string time_column;                 ///< the time column, by name or number
  std::optional<double> threshold;         ///< reference threshold, in the reference column's units
  std::string edge = "auto";               ///< reference edge: auto, rising, falling
  std::string input_units;                 ///< acceleration units in the file: g or m/s2 ("" = from the file)
  std::string time_units;                  ///< time units in the file: s, ms, us, ns ("" = from the file)
  std::optional<double> full_scale;        ///< WAV: acceleration at digital full scale, in input units
  std::string mains = "auto";              ///< mains lines to fit: auto, 50, 60, none
  double speed_tolerance_percent = 2.0;    ///< speed wander reported above this, %
  int min_revolutions = 20;                ///< fewer revolutions are reported as short
};

/// Register `listen`.
void add_listen_command(CLI::App& app, int& exit_code);

/// Measure the recording and print the reading (text or JSON). Returns the exit code; throws
/// FileError when the file cannot be read or a plot written, InputError for bad options or content.
int run_listen(const ListenOptions& options);

}  // namespace trimwright::cli
