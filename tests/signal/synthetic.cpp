// SPDX-License-Identifier: GPL-3.0-or-later
#include "synthetic.hpp"

#include <algorithm>
#include <cmath>
#include <cstdint>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <random>
#include <sstream>
#include <stdexcept>

namespace trimwright::signal::test {
namespace {
constexpr double kPi = 3.14159265358979323846;
constexpr double kG = 9.80665;
}  // namespace

SynthData synthesize(const SynthSpec& s) {
  SynthData d;
  std::mt19937_64 rng(s.seed);
  std::normal_distribution<double> gauss(0.0, 1.0);
  std::uniform_real_distribution<double> uni(-0.5, 0.5);
  const double f0 = s.rpm / 60.0;
  const double f_end = (s.rpm_end > 0 ? s.rpm_end : s.rpm) / 60.0;
  const double alpha = (f_end - f0) / s.duration_s;  // Hz/s
  const size_t n = static_cast<size_t>(std::floor(s.duration_s * s.sample_rate_hz)) + 1;
  const double dt = 1.0 / s.sample_rate_hz;
  for (size_t i = 0; i < n; ++i) {
    double t = static_cast<double>(i) * dt;
    if (s.jitter > 0 && i > 0 && i + 1 < n) t += s.jitter * dt * uni(rng);
    const double wobble = s.wobble_percent / 100 * f0 * (1 - std::cos(2 * kPi * 0.3 * t)) / (2 * kPi * 0.3);
    const double revs = f0 * t + 0.5 * alpha * t * t + wobble;  // shaft angle in revolutions
    const double theta = 2 * kPi * revs;
    auto vib = [&](double scale, double extra_lag_deg) {
      double v = scale * s.amp1_g * std::cos(theta - (s.lag1_deg + extra_lag_deg) * kPi / 180);
      for (const auto& h : s.harmonics) v += scale * h.amp_g * std::cos(h.order * theta - h.lag_deg * kPi / 180);
      return v;
    };
    double common = 0;
    for (const auto& m : s.mains) common += m.amp_g * std::cos(2 * kPi * m.hz * t + 17 * kPi / 180);
    double z = vib(1.0, 0) + common + s.noise_g * gauss(rng);
    if (s.clip_g > 0) z = std::clamp(z, -s.clip_g, s.clip_g);
    d.t.push_back(t);
    d.z.push_back(z + s.gravity_g);
    if (s.axes == 3) {
      d.x.push_back(vib(0.3, 60) + common + s.noise_g * gauss(rng));
      d.y.push_back(vib(0.5, 120) + common + s.noise_g * gauss(rng));
    } else {
      d.x.push_back(0);
      d.y.push_back(0);
    }
    const double frac = revs - std::floor(revs);
    // Level of a pulse from 0 to 1 with raised-cosine edges centred on its start and end.
    auto pulse = [&]() {
      if (s.edge_samples <= 0) return frac < s.pulse_width_rev ? 1.0 : 0.0;
      const double speed = f0 + alpha * t;
      const double half = 0.5 * s.edge_samples * dt * speed;  // half the ramp, in revolutions
      auto ramp = [&](double x) {  // 0 before −half, 1 after +half
        if (x <= -half) return 0.0;
        if (x >= half) return 1.0;
        return 0.5 - 0.5 * std::cos(kPi * (x + half) / (2 * half));
      };
      const double near_start = frac > 0.5 ? frac - 1 : frac;  // distance from the mark
      return ramp(near_start) - ramp(near_start - s.pulse_width_rev);
    };
    double r = 0;
    switch (s.ref) {
      case SynthSpec::Ref::kPulse: r = 5.0 * pulse(); break;
      case SynthSpec::Ref::kInverted: r = 3.3 - 3.1 * pulse(); break;
      case SynthSpec::Ref::kClick: {
        // A piezo click: a decaying ring at a tenth of the sample rate, starting at the mark.
        const double since = frac / (f0 + alpha * t);
        const double ring_hz = s.sample_rate_hz / 10;
        r = std::exp(-since * ring_hz / 3) * std::sin(2 * kPi * ring_hz * since);
        break;
      }
      case SynthSpec::Ref::kFlat: r = 1.0; break;
    }
    d.ref.push_back(r);
  }
  return d;
}

void write_text(const std::string& path, const std::string& text) {
  std::ofstream out(path, std::ios::binary);
  out << text;
  if (!out) throw std::runtime_error("cannot write " + path);
}

std::string out_path(const std::string& name) {
  const std::filesystem::path dir = std::filesystem::path(TRIMWRIGHT_BINARY_DIR) / "tests" / "signal" / "data";
  std::filesystem::create_directories(dir);
  return (dir / name).string();
}

void write_csv(const std::string& path, const SynthData& d, int axes, const CsvStyle& st) {
  std::ostringstream o;
  o.precision(10);
  const double tscale = st.time_units == "ms" ? 1000.0 : 1.0;
  const double ascale = st.accel_units == "g" ? 1.0 : kG;
  auto unit = [&](const std::string& axis) {
    if (!st.units_in_header) return axis;
    return st.accel_units == "g" ? axis + "_g" : axis + " (m/s2)";
  };
  if (st.header) {
    o << "time_" << st.time_units;
    if (axes == 3) o << st.sep << unit("x") << st.sep << unit("y");
    o << st.sep << unit("z");
    if (st.reference) o << st.sep << "ref";
    o << "\n";
  }
  auto num = [&](double v) {
    std::ostringstream c;
    c.precision(10);
    c << v;
    std::string s = c.str();
    if (st.decimal_comma) std::replace(s.begin(), s.end(), '.', ',');
    return s;
  };
  for (size_t i = 0; i < d.t.size(); ++i) {
    o << num(d.t[i] * tscale);
    if (axes == 3) o << st.sep << num(d.x[i] * ascale) << st.sep << num(d.y[i] * ascale);
    o << st.sep << num(d.z[i] * ascale);
    if (st.reference) o << st.sep << num(d.ref[i]);
    o << "\n";
  }
  write_text(path, o.str());
}

void write_wav(const std::string& path, const SynthData& d, int bits, bool stereo, double full_scale_g) {
  const int channels = stereo ? 2 : 1;
  const int bytes = bits / 8;
  const uint32_t rate = static_cast<uint32_t>(std::lround((static_cast<double>(d.t.size()) - 1) / d.t.back()));
  std::string data;
  double rmin = *std::min_element(d.ref.begin(), d.ref.end()), rmax = *std::max_element(d.ref.begin(), d.ref.end());
  const double rscale = rmax > rmin ? 1.6 / (rmax - rmin) : 0.0;
  auto put = [&](double v) {
    if (bits == 32) {
      float f = static_cast<float>(v);
      uint32_t b;
      std::memcpy(&b, &f, 4);
      for (int k = 0; k < 4; ++k) data += static_cast<char>((b >> (8 * k)) & 0xFF);
      return;
    }
    const double maxcode = bits == 16 ? 32767.0 : 8388607.0;
    const long code = std::lround(std::clamp(v, -1.0, 1.0) * (maxcode + 1));
    const long c = std::min(code, static_cast<long>(maxcode));
    for (int k = 0; k < bytes; ++k) data += static_cast<char>((static_cast<unsigned long>(c) >> (8 * k)) & 0xFF);
  };
  for (size_t i = 0; i < d.t.size(); ++i) {
    put(d.z[i] / full_scale_g);
    if (stereo) put((d.ref[i] - rmin) * rscale - 0.8);
  }
  auto u32 = [](uint32_t v) {
    std::string s;
    for (int k = 0; k < 4; ++k) s += static_cast<char>((v >> (8 * k)) & 0xFF);
    return s;
  };
  auto u16 = [](uint16_t v) { return std::string{static_cast<char>(v & 0xFF), static_cast<char>(v >> 8)}; };
  std::string fmtc = u16(bits == 32 ? 3 : 1) + u16(static_cast<uint16_t>(channels)) + u32(rate) +
                     u32(rate * static_cast<uint32_t>(channels * bytes)) + u16(static_cast<uint16_t>(channels * bytes)) +
                     u16(static_cast<uint16_t>(bits));
  std::string file = "RIFF" + u32(static_cast<uint32_t>(4 + 8 + fmtc.size() + 8 + data.size())) + "WAVE" + "fmt " +
                     u32(static_cast<uint32_t>(fmtc.size())) + fmtc + "data" + u32(static_cast<uint32_t>(data.size())) +
                     data;
  write_text(path, file);
}

}  // namespace trimwright::signal::test
