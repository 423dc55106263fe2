// SPDX-License-Identifier: GPL-3.0-or-later
// The building blocks: FFT, resampling, peak interpolation, least-squares lines, pulse detection
// and pulse-time smoothing.
#include <catch2/catch.hpp>

#include <cmath>
#include <complex>
#include <random>

#include "geom/base/angle.hpp"
#include "geom/signal/line_fit.hpp"
#include "geom/signal/pulses.hpp"
#include "geom/signal/spectrum.hpp"

using namespace trimwright;
using namespace trimwright::signal;

TEST_CASE("spectrum: FFT equals the direct DFT sum", "[signal]") {
  std::mt19937 rng(5);
  std::normal_distribution<double> g;
  std::vector<std::complex<double>> x(64);
  for (auto& v : x) v = {g(rng), g(rng)};
  auto y = x;
  fft_in_place(y);
  for (size_t k = 0; k < x.size(); ++k) {
    std::complex<double> s = 0;
    for (size_t n = 0; n < x.size(); ++n)
      s += x[n] * std::polar(1.0, -2 * kPi * static_cast<double>(k * n) / static_cast<double>(x.size()));
    CHECK(std::abs(y[k] - s) < 1e-10);
  }
}

TEST_CASE("spectrum: a sinusoid shows its amplitude at its frequency", "[signal]") {
  std::vector<double> t, v;
  for (int i = 0; i < 8000; ++i) {
    t.push_back(i / 1000.0);
    v.push_back(0.7 * std::cos(2 * kPi * 57.3 * t.back() + 0.3) + 3.0);
  }
  const Spectrum s = amplitude_spectrum(t, v, true);
  size_t peak = 1;
  for (size_t i = 1; i < s.amplitude.size(); ++i)
    if (s.amplitude[i] > s.amplitude[peak]) peak = i;
  CHECK(interpolate_peak_hz(s, peak) == Approx(57.3).margin(0.1 * s.bin_hz));
  CHECK(s.amplitude[peak] == Approx(0.7).epsilon(0.16));  // Hann scalloping loss is at most 1.42 dB (from memory)
  CHECK(s.amplitude[0] < 1e-3);                           // the mean is removed
  CHECK(noise_floor(s, 10, 100, {57.3}, 2) < 1e-3);
}

TEST_CASE("spectrum: linear resampling reproduces a straight line", "[signal]") {
  const std::vector<double> t{0, 0.3, 0.31, 1.0, 1.0, 2.0};
  std::vector<double> v;
  for (double x : t) v.push_back(2 * x - 1);
  v[4] = v[3];  // repeated time, same value
  const auto r = resample_uniform(t, v, 9);
  for (size_t i = 0; i < r.size(); ++i) CHECK(r[i] == Approx(2 * (0.25 * static_cast<double>(i)) - 1).margin(1e-12));
}

TEST_CASE("line fit: exact data give exact coefficients, uneven times included", "[signal]") {
  std::mt19937 rng(3);
  std::uniform_real_distribution<double> u(-0.4, 0.4);
  std::vector<double> t, y;
  const double f1 = 23.0;
  for (int i = 0; i < 3000; ++i) {
    const double ti = (i + (i > 0 ? u(rng) : 0)) / 500.0;
    t.push_back(ti);
  }
  const double mid = 0.5 * (t.front() + t.back());
  for (double ti : t) {
    const double th = 2 * kPi * f1 * (ti - mid);
    y.push_back(0.5 + 0.1 * ti + 1.2 * std::cos(th - 0.7) + 0.4 * std::cos(2 * th - 2.0) +
                0.9 * std::cos(2 * kPi * 50 * (ti - mid) - 1.1));
  }
  LineModel model;
  model.orders = 3;
  model.lines_hz = {50};
  const LineFit fit = fit_lines(t, y, nullptr, 0, t.size(), f1, model);
  REQUIRE(fit.ok);
  CHECK(std::abs(fit.orders[0]) == Approx(1.2).epsilon(1e-9));
  CHECK(std::arg(fit.orders[0]) == Approx(0.7).epsilon(1e-9));
  CHECK(std::abs(fit.orders[1]) == Approx(0.4).epsilon(1e-9));
  CHECK(std::abs(fit.orders[2]) < 1e-9);
  CHECK(std::abs(fit.lines[0]) == Approx(0.9).epsilon(1e-9));
  CHECK(fit.residual_rms < 1e-6);  // from the normal equations: rounding of yᵀy − βᵀAᵀy

  // A small frequency error is estimated by the τ-weighted columns.
  LineModel gm = model;
  gm.frequency_terms = true;
  const LineFit g = fit_lines(t, y, nullptr, 0, t.size(), f1 - 0.02, gm);
  REQUIRE(g.ok);
  CHECK(g.frequency_step_hz == Approx(0.02).epsilon(0.05));
}

TEST_CASE("line fit: too few samples or collinear lines are refused", "[signal]") {
  std::vector<double> t{0, 1, 2, 3}, y{1, 2, 3, 4};
  CHECK_FALSE(fit_lines(t, y, nullptr, 0, 4, 0.1, LineModel{}).ok);
  std::vector<double> t2, y2;
  for (int i = 0; i < 500; ++i) {
    t2.push_back(i / 1000.0);
    y2.push_back(std::sin(i * 0.3));
  }
  LineModel same;
  same.orders = 1;
  same.lines_hz = {20.0};  // the 1× frequency itself: indistinguishable
  CHECK_FALSE(fit_lines(t2, y2, nullptr, 0, t2.size(), 20.0, same).ok);
}

TEST_CASE("pulses: edges, polarity, threshold and ringing", "[signal]") {
  const double fs = 10000, f = 37.0;
  std::vector<double> t, up, down, click;
  for (int i = 0; i < 20000; ++i) {
    const double ti = i / fs;
    t.push_back(ti);
    const double frac = ti * f - std::floor(ti * f);
    up.push_back(frac < 0.1 ? 4.8 : 0.1);
    down.push_back(frac < 0.1 ? 0.0 : 3.3);
    const double since = frac / f;
    click.push_back(std::exp(-since * 300) * std::sin(2 * kPi * 1000 * since));  // rings for several cycles
  }
  const double revs = std::floor(t.back() * f);
  SECTION("high-going pulses: rising edge at each mark") {
    const Pulses p = detect_pulses(t, up, {});
    CHECK(p.edge == Edge::kRising);
    REQUIRE(p.times_s.size() == static_cast<size_t>(revs));
    for (size_t k = 0; k < p.times_s.size(); ++k)
      CHECK(p.times_s[k] == Approx((k + 1) / f).margin(1.0 / fs));
  }
  SECTION("low-going pulses: falling edge") {
    const Pulses p = detect_pulses(t, down, {});
    CHECK(p.edge == Edge::kFalling);
    CHECK(p.times_s.size() == static_cast<size_t>(revs));
    CHECK(p.times_s.front() == Approx(1 / f).margin(1.0 / fs));
  }
  SECTION("the edge can be forced: the trailing edge a tenth of a turn later") {
    PulseOptions o;
    o.edge = Edge::kFalling;
    const Pulses p = detect_pulses(t, up, o);
    REQUIRE(p.times_s.size() >= 2);
    CHECK(p.times_s.front() == Approx(0.1 / f).margin(1.0 / fs));
  }
  SECTION("a ringing click gives one pulse per revolution") {
    const Pulses p = detect_pulses(t, click, {});
    CHECK(p.times_s.size() == static_cast<size_t>(revs) + 1);  // the first click at t = 0 counts too
    CHECK(p.holdoff_s > 0);
  }
  SECTION("constant signal: no pulses") { CHECK(detect_pulses(t, std::vector<double>(t.size(), 2.0), {}).times_s.empty()); }
}

TEST_CASE("pulses: smoothing keeps a steady acceleration and removes edge jitter", "[signal]") {
  std::mt19937 rng(9);
  std::uniform_real_distribution<double> u(-0.5e-3, 0.5e-3);
  std::vector<double> exact, jittered;
  for (int i = 0; i < 200; ++i) {
    const double ti = 0.02 * i + 1e-6 * i * i;  // speed changing steadily
    exact.push_back(ti);
    jittered.push_back(ti + u(rng));
  }
  const auto s_exact = smooth_pulse_times(exact, 10);
  for (size_t i = 0; i < exact.size(); ++i) CHECK(s_exact[i] == Approx(exact[i]).margin(1e-12));
  const auto s = smooth_pulse_times(jittered, 10);
  double e_raw = 0, e_s = 0;
  for (size_t i = 0; i < exact.size(); ++i) {
    e_raw += std::pow(jittered[i] - exact[i], 2);
    e_s += std::pow(s[i] - exact[i], 2);
  }
  CHECK(std::sqrt(e_s / e_raw) < 0.5);
}
