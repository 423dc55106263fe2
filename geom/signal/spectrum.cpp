// SPDX-License-Identifier: GPL-3.0-or-later
// FFT, resampling and spectrum helpers (docs/recordings.md, "Spectrum").
#include "geom/signal/spectrum.hpp"

#include <algorithm>
#include <cmath>

#include "geom/base/angle.hpp"

namespace trimwright::signal {

void fft_in_place(std::vector<std::complex<double>>& a) {
  const size_t n = a.size();
  if (n < 2) return;
  for (size_t i = 1, j = 0; i < n; ++i) {
    size_t bit = n >> 1;
    for (; j & bit; bit >>= 1) j ^= bit;
    j ^= bit;
    if (i < j) std::swap(a[i], a[j]);
  }
  for (size_t len = 2; len <= n; len <<= 1) {
    const double ang = -2.0 * kPi / static_cast<double>(len);
    const std::complex<double> wl(std::cos(ang), std::sin(ang));
    for (size_t i = 0; i < n; i += len) {
      std::complex<double> w(1.0, 0.0);
      for (size_t k = 0; k < len / 2; ++k) {
        // Recompute the twiddle exactly every 64 steps to keep rounding from accumulating.
        if ((k & 63) == 0) w = std::polar(1.0, ang * static_cast<double>(k));
        const auto u = a[i + k], v = a[i + k + len / 2] * w;
        a[i + k] = u + v;
        a[i + k + len / 2] = u - v;
        w *= wl;
      }
    }
  }
}

std::vector<double> resample_uniform(const std::vector<double>& time_s, const std::vector<double>& values, size_t n) {
  std::vector<double> out(n);
  if (time_s.empty() || n == 0) return out;
  const double t0 = time_s.front(), t1 = time_s.back();
  size_t j = 0;
  for (size_t i = 0; i < n; ++i) {
    const double t = n > 1 ? t0 + (t1 - t0) * static_cast<double>(i) / static_cast<double>(n - 1) : t0;
    while (j + 1 < time_s.size() && time_s[j + 1] <= t) ++j;
    if (j + 1 >= time_s.size()) {
      out[i] = values.back();
    } else {
      const double dt = time_s[j + 1] - time_s[j];
      const double f = dt > 0 ? (t - time_s[j]) / dt : 0.0;
      out[i] = values[j] + f * (values[j + 1] - values[j]);
    }
  }
  return out;
}

size_t Spectrum::bin_of(double frequency_hz) const {
  if (amplitude.empty() || bin_hz <= 0) return 0;
  const double b = std::round(frequency_hz / bin_hz);
  if (b <= 0) return 0;
  return std::min(amplitude.size() - 1, static_cast<size_t>(b));
}

Spectrum amplitude_spectrum(const std::vector<double>& time_s, const std::vector<double>& values, bool evenly_sampled) {
  Spectrum s;
  const size_t n = values.size();
  if (n < 4 || time_s.size() != n || !(time_s.back() > time_s.front())) return s;
  std::vector<double> x = evenly_sampled ? values : resample_uniform(time_s, values, n);
  const double fs = static_cast<double>(n - 1) / (time_s.back() - time_s.front());
  double mean = 0;
  for (double v : x) mean += v;
  mean /= static_cast<double>(n);
  size_t m = 1;
  while (m < n) m <<= 1;
  std::vector<std::complex<double>> buf(m, 0.0);
  double wsum = 0;
  for (size_t i = 0; i < n; ++i) {
    const double w = 0.5 - 0.5 * std::cos(2.0 * kPi * static_cast<double>(i) / static_cast<double>(n - 1));
    wsum += w;
    buf[i] = (x[i] - mean) * w;
  }
  fft_in_place(buf);
  s.bin_hz = fs / static_cast<double>(m);
  s.amplitude.resize(m / 2 + 1);
  for (size_t k = 0; k <= m / 2; ++k) s.amplitude[k] = 2.0 * std::abs(buf[k]) / wsum;
  return s;
}

double interpolate_peak_hz(const Spectrum& spectrum, size_t bin) {
  const auto& a = spectrum.amplitude;
  if (bin == 0 || bin + 1 >= a.size() || a[bin - 1] <= 0 || a[bin] <= 0 || a[bin + 1] <= 0)
    return spectrum.frequency_hz(bin);
  const double l = std::log(a[bin - 1]), c = std::log(a[bin]), r = std::log(a[bin + 1]);
  const double den = l - 2 * c + r;
  double delta = den < 0 ? 0.5 * (l - r) / den : 0.0;
  delta = std::clamp(delta, -0.5, 0.5);
  return (static_cast<double>(bin) + delta) * spectrum.bin_hz;
}

double noise_floor(const Spectrum& spectrum, double lo_hz, double hi_hz, const std::vector<double>& excluded_hz,
                   double exclusion_hz) {
  std::vector<double> v;
  if (spectrum.amplitude.empty()) return 0;
  const size_t a = spectrum.bin_of(std::max(lo_hz, spectrum.bin_hz)), b = spectrum.bin_of(hi_hz);
  for (size_t i = a; i <= b && i < spectrum.amplitude.size(); ++i) {
    const double f = spectrum.frequency_hz(i);
    bool skip = false;
    for (double e : excluded_hz)
      if (std::fabs(f - e) <= exclusion_hz) skip = true;
    if (!skip) v.push_back(spectrum.amplitude[i]);
  }
  if (v.empty()) return 0;
  std::nth_element(v.begin(), v.begin() + static_cast<std::ptrdiff_t>(v.size() / 2), v.end());
  return v[v.size() / 2];
}

}  // namespace trimwright::signal
