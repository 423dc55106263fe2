// SPDX-License-Identifier: GPL-3.0-or-later
// Reference pulse detection and pulse-time smoothing (docs/recordings.md, "Speed").
#include "geom/signal/pulses.hpp"

#include <algorithm>
#include <cmath>

namespace trimwright::signal {
namespace {

// One pass of edge detection with a fixed hold-off.
std::vector<double> find_edges(const std::vector<double>& t, const std::vector<double>& v, double threshold,
                               double hysteresis, bool rising, double holdoff_s) {
  std::vector<double> edges;
  const double sign = rising ? 1.0 : -1.0;
  const double thr = sign * threshold;
  const double arm = thr - hysteresis;
  bool armed = false;
  double last = -1e300;
  for (size_t i = 0; i < v.size(); ++i) {
    const double x = sign * v[i];
    if (x < arm) armed = true;
    if (armed && i > 0 && x >= thr) {
      const double x0 = sign * v[i - 1];
      // Linear interpolation of the crossing between the two samples that straddle it.
      double te = t[i];
      if (x0 < thr && x > x0) te = t[i - 1] + (t[i] - t[i - 1]) * (thr - x0) / (x - x0);
      armed = false;
      if (te - last >= holdoff_s) {
        edges.push_back(te);
        last = te;
      }
    }
  }
  return edges;
}

double quantile(std::vector<double> values, double q) {
  if (values.empty()) return 0;
  const size_t k = std::min(values.size() - 1, static_cast<size_t>(q * static_cast<double>(values.size() - 1) + 0.5));
  std::nth_element(values.begin(), values.begin() + static_cast<std::ptrdiff_t>(k), values.end());
  return values[k];
}

std::vector<double> intervals(const std::vector<double>& edges) {
  std::vector<double> d;
  for (size_t i = 1; i < edges.size(); ++i) d.push_back(edges[i] - edges[i - 1]);
  return d;
}

}  // namespace

const char* edge_name(Edge edge) {
  switch (edge) {
    case Edge::kAuto: return "auto";
    case Edge::kRising: return "rising";
    case Edge::kFalling: return "falling";
  }
  return "auto";
}

Pulses detect_pulses(const std::vector<double>& time_s, const std::vector<double>& reference,
                     const PulseOptions& options) {
  Pulses p;
  if (reference.size() < 2 || reference.size() != time_s.size()) return p;
  auto [lo_it, hi_it] = std::minmax_element(reference.begin(), reference.end());
  p.low = *lo_it;
  p.high = *hi_it;
  p.resting = quantile(reference, 0.5);
  const double up = p.high - p.resting, down = p.resting - p.low;
  if (!(p.high > p.low)) return p;

  // The pulse leaves the resting level toward the farther extreme.
  bool rising = up >= down;
  if (options.edge == Edge::kRising) rising = true;
  if (options.edge == Edge::kFalling) rising = false;
  p.edge = rising ? Edge::kRising : Edge::kFalling;
  const double excursion = std::max(up, down);
  p.threshold = options.threshold ? *options.threshold
                                  : (rising ? p.resting + 0.5 * up : p.resting - 0.5 * down);
  if (!options.threshold && excursion <= 0) return p;
  p.hysteresis = 0.2 * (excursion > 0 ? excursion : (p.high - p.low));

  std::vector<double> edges = find_edges(time_s, reference, p.threshold, p.hysteresis, rising, 0.0);
  if (edges.size() >= 4) {
    // Irregular intervals (ringing, contact bounce): ignore edges for half a revolution.
    auto d = intervals(edges);
    const double q10 = quantile(d, 0.1), q90 = quantile(d, 0.9);
    if (q10 < 0.6 * q90) {
      p.holdoff_s = 0.5 * q90;
      edges = find_edges(time_s, reference, p.threshold, p.hysteresis, rising, p.holdoff_s);
    }
  }
  p.times_s = std::move(edges);

  // Is any sample near each edge on its slope? Sharp edges have none.
  if (!p.times_s.empty()) {
    const double lo10 = rising ? p.resting + 0.1 * up : p.resting - 0.9 * down;
    const double hi90 = rising ? p.resting + 0.9 * up : p.resting - 0.1 * down;
    size_t on_slope = 0;
    for (double te : p.times_s) {
      const size_t i = static_cast<size_t>(std::lower_bound(time_s.begin(), time_s.end(), te) - time_s.begin());
      for (size_t j = (i >= 2 ? i - 2 : 0); j < std::min(reference.size(), i + 2); ++j)
        if (reference[j] > lo10 && reference[j] < hi90) {
          ++on_slope;
          break;
        }
    }
    p.sharp_edges = 2 * on_slope < p.times_s.size();
  }
  return p;
}

std::vector<double> smooth_pulse_times(const std::vector<double>& times_s, int half_window) {
  const int n = static_cast<int>(times_s.size());
  if (n < 3 || half_window < 1) return times_s;
  const int width = std::min(n, 2 * half_window + 1);
  std::vector<double> out(times_s.size());
  for (int i = 0; i < n; ++i) {
    // Window of `width` pulses, centred on i where possible.
    int a = std::clamp(i - width / 2, 0, n - width);
    // Quadratic fit t = c0 + c1·x + c2·x² with x = j − i, solved by normal equations (3×3).
    double s[5] = {0, 0, 0, 0, 0}, r[3] = {0, 0, 0};
    for (int j = a; j < a + width; ++j) {
      const double x = j - i, y = times_s[static_cast<size_t>(j)] - times_s[static_cast<size_t>(i)];
      double xp = 1;
      for (int k = 0; k < 5; ++k) {
        s[k] += xp;
        if (k < 3) r[k] += xp * y;
        xp *= x;
      }
    }
    double c0;
    if (width >= 5) {
      // Cramer's rule for [[s0 s1 s2][s1 s2 s3][s2 s3 s4]]·c = r, first unknown only.
      const double det = s[0] * (s[2] * s[4] - s[3] * s[3]) - s[1] * (s[1] * s[4] - s[3] * s[2]) +
                         s[2] * (s[1] * s[3] - s[2] * s[2]);
      const double det0 = r[0] * (s[2] * s[4] - s[3] * s[3]) - s[1] * (r[1] * s[4] - s[3] * r[2]) +
                          s[2] * (r[1] * s[3] - s[2] * r[2]);
      c0 = det0 / det;
    } else {
      // Too few for a quadratic: straight line.
      const double det = s[0] * s[2] - s[1] * s[1];
      c0 = (r[0] * s[2] - s[1] * r[1]) / det;
    }
    out[static_cast<size_t>(i)] = times_s[static_cast<size_t>(i)] + c0;
  }
  return out;
}

}  // namespace trimwright::signal
