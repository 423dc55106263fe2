// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// The picture of a measured recording: its spectrum with the running speed, harmonics and mains
/// lines marked, and the 1× vector of each block on a polar plot (amplitudes only without a
/// reference). Black on white, told apart by dash patterns, so it prints and copies well.

#include <string>
#include <vector>

#include "geom/signal/measure.hpp"

namespace trimwright::signal {

/// Write DIR/STEM.svg and DIR/STEM.png (the folder is created if missing; each file is written
/// to a temporary name and renamed, so a failure leaves no partial file). Returns the two paths.
/// Throws FileError when a file cannot be written.
std::vector<std::string> write_measurement_plots(const Measurement& measurement, const std::string& dir,
                                                 const std::string& stem);

}  // namespace trimwright::signal
