// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Amplitude spectrum of a recording channel (Hann window, even sampling by linear resampling
/// when needed), its peaks and its noise floor.

#include <complex>
#include <vector>

namespace trimwright::signal {

/// In-place radix-2 FFT, X[k] = Σ x[n]·e^(−2πikn/N). The size must be a power of two.
void fft_in_place(std::vector<std::complex<double>>& data);

/// Values at n evenly spaced times from time_s.front() to time_s.back(), by linear
/// interpolation (time_s non-decreasing; repeated times take the later value).
std::vector<double> resample_uniform(const std::vector<double>& time_s, const std::vector<double>& values,
                                     size_t n);

/// A one-sided amplitude spectrum: a sinusoid of peak amplitude A on a bin shows about A.
struct Spectrum {
  double bin_hz = 0;               ///< spacing of the bins, Hz
  std::vector<double> amplitude;   ///< peak amplitude per bin, in the input's units
  /// Frequency of bin i, Hz.
  double frequency_hz(size_t i) const { return bin_hz * static_cast<double>(i); }
  /// The bin nearest a frequency, clamped to the spectrum.
  size_t bin_of(double frequency_hz) const;
};

/// The spectrum of values sampled at time_s: the mean is removed, uneven samples are resampled
/// to their mean rate, a Hann window is applied and the data are zero-padded to a power of two.
Spectrum amplitude_spectrum(const std::vector<double>& time_s, const std::vector<double>& values,
                            bool evenly_sampled);

/// Frequency of the peak at bin i refined by a parabola through the logarithms of the three
/// amplitudes around it (suits the Hann window's Gaussian-like main lobe), Hz.
double interpolate_peak_hz(const Spectrum& spectrum, size_t bin);

/// Median bin amplitude between lo_hz and hi_hz, leaving out bins within exclusion_hz of any of
/// the excluded frequencies; 0 when no bin remains.
double noise_floor(const Spectrum& spectrum, double lo_hz, double hi_hz, const std::vector<double>& excluded_hz,
                   double exclusion_hz);

}  // namespace trimwright::signal
