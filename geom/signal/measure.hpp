// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Readings from raw recordings: running speed, 1× amplitude and phase, harmonics, mains lines
/// and how far to trust them (design.md §5, §8 `listen`; method in docs/recordings.md).

#include <complex>
#include <optional>
#include <string>
#include <vector>

#include "geom/signal/pulses.hpp"
#include "geom/signal/recording.hpp"

namespace trimwright::signal {

/// Which mains lines to fit and keep out of the 1× figure.
enum class Mains { kAuto, k50, k60, kNone };

/// How to measure a recording. Defaults suit a phone or an accelerometer board on a small rotor.
struct RecordingOptions {
  ReadOptions read;                         ///< how to read the file (columns, units, reference)
  std::optional<double> nominal_rpm;        ///< the machine's speed, rpm (> 0); where to look for 1×
  std::string units = "g-pk";               ///< output amplitude unit (a known unit of vibration_units.hpp)
  std::string axis;                         ///< acceleration channel: name, 1-based column, x/y/z; "" = largest 1×
  PulseOptions pulses;                      ///< reference threshold and edge (automatic when unset)
  Mains mains = Mains::kAuto;               ///< kAuto fits the 50/60 Hz lines the spectrum shows
  double speed_tolerance_percent = 2.0;     ///< speed wander across blocks above this is reported
  double max_speed_deviation_percent = 20;  ///< measured speed this far from nominal stops the reading
  int min_revolutions = 20;                 ///< fewer revolutions than this is reported as short
};

/// A line (harmonic or mains) measured alongside 1×.
struct Component {
  std::string name;                   ///< "2×", "3×", "mains 50 Hz", …
  double frequency_hz = 0;            ///< Hz
  double amplitude = 0;               ///< in the measurement's units (converted at this frequency)
  std::optional<double> phase_deg;    ///< orders with a reference: lag in the component's own cycle, [0, 360)
};

/// The 1× reading of one block of whole revolutions.
struct BlockReading {
  double start_s = 0;                 ///< block start, s from the first sample
  double duration_s = 0;              ///< s
  double revolutions = 0;             ///< whole revolutions in the block (nominal count without a reference)
  double speed_rpm = 0;               ///< mean speed over the block, rpm
  std::complex<double> vector;        ///< 1× as amplitude·e^(i·lag) in the measurement's units (lag 0 without a reference)
};

/// How far to trust a reading (design.md §8 "confidence").
struct Confidence {
  std::string level;                          ///< "good", "fair" or "poor" (rules in docs/recordings.md)
  double snr_db = 0;                          ///< 1× amplitude over the median spectrum floor around it, dB
  double amplitude_scatter_percent = 0;       ///< standard deviation of block amplitudes / their mean, %
  std::optional<double> phase_scatter_deg;    ///< circular standard deviation of block phases, degrees
  double amplitude_uncertainty_percent = 0;   ///< standard error of the amplitude (scatter/√blocks), %
  std::optional<double> phase_uncertainty_deg;  ///< standard error of the phase, degrees
  std::optional<double> phase_resolution_deg;   ///< half a reference sample in degrees of rotation (180·f/fs)
  int blocks = 0;                             ///< blocks measured
  double revolutions_per_block = 0;           ///< revolutions in each block
  double revolutions = 0;                     ///< revolutions measured in all
  double speed_spread_percent = 0;            ///< std of revolution time (pulses) or of block speeds / mean, %
  double speed_wander_percent = 0;            ///< (fastest − slowest block) / mean speed, %
};

/// A spectrum kept for the picture: bins from 0 Hz, in m/s² peak.
struct SpectrumView {
  double bin_hz = 0;                   ///< Hz per bin
  std::vector<double> amplitude_m_s2;  ///< peak amplitude per bin, m/s²
};

/// What a recording says (design.md §8 `listen --json` keys plus details).
struct Measurement {
  double speed_rpm = 0;                    ///< running speed, rpm
  double frequency_hz = 0;                 ///< running frequency, Hz
  double amplitude = 0;                    ///< 1× amplitude in `units`
  std::string units;                       ///< the unit of amplitude, e.g. "g-pk"
  std::optional<double> phase_deg;         ///< 1× lag from the reference edge to its positive peak, [0, 360)
  Confidence confidence;                   ///< how far to trust it
  std::vector<std::string> warnings;       ///< one line each
  std::string source;                      ///< the recording file
  std::string format;                      ///< "csv" or "wav"
  std::string axis;                        ///< the acceleration channel measured
  bool axis_auto = false;                  ///< the channel was chosen as the one with the largest 1×
  std::string reference;                   ///< the reference column/channel ("" without)
  std::string speed_source;                ///< "reference pulses" or "spectrum peak"
  std::string units_source;                ///< how the input units were found
  double sample_rate_hz = 0;               ///< mean sample rate, Hz
  double duration_s = 0;                   ///< s
  bool evenly_sampled = true;              ///< samples at even intervals
  bool clipped = false;                    ///< flat tops on the measured channel
  int pulses = 0;                          ///< reference pulses found
  std::optional<double> pulse_threshold;   ///< threshold used, reference units
  std::string pulse_edge;                  ///< "rising" or "falling" ("" without a reference)
  std::vector<Component> harmonics;        ///< 2×, 3×, … as fitted
  std::vector<Component> mains;            ///< mains lines fitted
  std::vector<BlockReading> blocks;        ///< per-block 1× readings
  SpectrumView spectrum;                   ///< spectrum of the measured channel, up to the plot's range
};

/// Measure one recording read from `path` (CSV or WAV). Throws FileError when the file cannot be
/// read and InputError for bad content or a recording that cannot be measured (no pulses found,
/// speed far from nominal, too short, sample rate too low).
Measurement measure_recording(const std::string& path, const RecordingOptions& options);

/// Measure a recording already read.
Measurement measure(const Recording& recording, const RecordingOptions& options);

/// Parse a mains option: "auto", "50", "60" or "none"; nothing for anything else.
std::optional<Mains> parse_mains(const std::string& text);

/// Phase added when a 1× acceleration is stated as velocity (+90°) or displacement (+180°),
/// degrees: integration delays the positive peak by a quarter cycle each time.
double phase_shift_from_acceleration_deg(const std::string& units);

}  // namespace trimwright::signal
