// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Least-squares fit of sinusoids at known frequencies or shaft angles to samples at known
/// (possibly uneven) times: machine orders 1×…n×, other lines (mains), an offset and a slope.

#include <complex>
#include <vector>

namespace trimwright::signal {

/// What to fit to one block of samples.
struct LineModel {
  int orders = 3;                  ///< machine orders 1..orders (cos kθ, sin kθ)
  std::vector<double> lines_hz;    ///< other lines fitted in time (mains and its harmonics), Hz
  bool frequency_terms = false;    ///< add τ·cos θ and τ·sin θ to estimate a 1× frequency correction
};

/// The result of fit_lines. A coefficient c = a + i·b stands for a·cos(x) + b·sin(x)
/// = |c|·cos(x − arg c): its amplitude is |c| and the angle x of its positive peak is arg c.
struct LineFit {
  bool ok = false;                            ///< the fit was determined (enough samples, well conditioned)
  std::vector<std::complex<double>> orders;   ///< orders[k−1]: order k, x = kθ
  std::vector<std::complex<double>> lines;    ///< lines[j]: x = 2π·f_j·(t − t_mid)
  double frequency_step_hz = 0;               ///< with frequency_terms: the 1× frequency correction, Hz
  double residual_rms = 0;                    ///< rms of what the model leaves, input units
  double coefficient_variance = 0;            ///< variance of the real (or imaginary) part of orders[0]
};

/// Fit the model to samples i0..i1−1. The shaft angle of each sample is theta_rad[i] when given
/// (reference pulses), else 2π·f1_hz·(t − t_mid). t_mid is the middle of the block's time span.
LineFit fit_lines(const std::vector<double>& time_s, const std::vector<double>& values,
                  const std::vector<double>* theta_rad, size_t i0, size_t i1, double f1_hz, const LineModel& model);

}  // namespace trimwright::signal
