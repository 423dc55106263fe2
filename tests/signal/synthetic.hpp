// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
// Synthetic recordings with known content, written as CSV or WAV, for the signal tests and the
// independent NumPy check (reference_fft.py).

#include <string>
#include <vector>

namespace trimwright::signal::test {

/// What to put in a synthetic recording. Accelerations in g.
struct SynthSpec {
  double rpm = 3000;             ///< speed at the start, rpm
  double rpm_end = 0;            ///< speed at the end (linear change); 0 = constant
  /// Slow speed wobble, % of speed at 0.3 Hz, as a real motor has; it also keeps reference edges
  /// from locking to the sample clock when the speed is a whole number of samples per turn.
  double wobble_percent = 0.15;
  double duration_s = 10;
  double sample_rate_hz = 2000;  ///< mean rate
  double jitter = 0;             ///< sample time jitter, fraction of the mean interval (uniform ±jitter/2)
  double amp1_g = 0.2;           ///< 1× peak amplitude
  double lag1_deg = 40;          ///< 1× lag from the reference edge to the positive peak
  struct Harmonic { int order; double amp_g; double lag_deg; };
  std::vector<Harmonic> harmonics;
  struct Line { double hz; double amp_g; };
  std::vector<Line> mains;       ///< mains lines (phase 17°)
  double noise_g = 0;            ///< white noise, rms
  unsigned seed = 1;
  double gravity_g = 1.0;        ///< constant on the measured axis
  int axes = 1;                  ///< 1: z only; 3: x (0.3×, +60°), y (0.5×, +120°), z (1×, gravity)
  enum class Ref { kPulse, kInverted, kClick, kFlat } ref = Ref::kPulse;
  double pulse_width_rev = 0.15; ///< pulse length, fraction of a revolution
  /// Rise and fall time of the pulse as a raised-cosine ramp, in sample intervals: a sensor and
  /// the recorder's anti-alias filter round every edge. 0 = a perfectly sharp step.
  double edge_samples = 2;
  double clip_g = 0;             ///< clip the vibration at ±clip_g around gravity (0 = no clipping)
};

/// Sampled signals: times, three axes (x, y zero when axes = 1) and the reference, in g and volts.
struct SynthData {
  std::vector<double> t, x, y, z, ref;
};

/// Make the samples.
SynthData synthesize(const SynthSpec& spec);

/// How to write a CSV file.
struct CsvStyle {
  char sep = ',';
  bool header = true;
  bool decimal_comma = false;
  std::string time_units = "s";     ///< s or ms (scales the time column; header says it)
  std::string accel_units = "g";    ///< g or m/s2 (scales; the header says it unless units_in_header is false)
  bool units_in_header = true;
  bool reference = true;            ///< write the reference column
};

/// Write a CSV recording: time, z (or x, y, z), ref.
void write_csv(const std::string& path, const SynthData& data, int axes, const CsvStyle& style);

/// Write a WAV recording: z in the left (or only) channel as a fraction of full_scale_g, the
/// reference (scaled into ±0.8) in the right when stereo. bits: 16 or 24 (PCM) or 32 (float).
void write_wav(const std::string& path, const SynthData& data, int bits, bool stereo, double full_scale_g);

/// Write raw text to a file.
void write_text(const std::string& path, const std::string& text);

/// A path in this test module's build folder (created on first use).
std::string out_path(const std::string& name);

}  // namespace trimwright::signal::test
