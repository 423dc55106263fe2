// SPDX-License-Identifier: GPL-3.0-or-later
// Speed, synchronous 1× amplitude and phase, and confidence from a recording
// (docs/recordings.md explains each step and every threshold used here).
#include "geom/signal/measure.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <limits>
#include <numeric>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/base/vibration_units.hpp"
#include "geom/signal/line_fit.hpp"
#include "geom/signal/spectrum.hpp"

namespace trimwright::signal {
namespace {

constexpr double kUsableNyquist = 0.45;     // lines are fitted below this fraction of the sample rate
constexpr int kMaxOrder = 4;                // machine orders fitted: 1× … 4×
constexpr int kMinBlockRevolutions = 4;     // shortest block
constexpr int kMaxBlocks = 32;              // longer recordings get longer blocks
constexpr double kHardMinRevolutions = 3;   // below this nothing is measured
constexpr int kSmoothHalfWindow = 10;       // pulse-time smoothing: ±10 revolutions
constexpr double kPulseIntervalTolerance = 0.3;  // a revolution ±30 % off the median is a missed/extra pulse
constexpr double kSnrClearDb = 10;          // 1× is "clearly above the noise" at or above this
constexpr double kSnrGoodDb = 20;
constexpr double kSnrCapDb = 120;
constexpr double kMainsPresentRatio = 4;    // a mains line is fitted when 12 dB above its floor
constexpr double kPeakClearRatio = 4;
constexpr double kPhaseResolutionWarnDeg = 1;  // half a sample of a sharp reference edge, degrees of rotation       // a spectral 1× peak is clear when 12 dB above the floor

struct Block {
  size_t i0 = 0, i1 = 0;
  double revolutions = 0;
  double speed_rpm = 0;
};

// Everything measured on one channel, in m/s² peak.
struct ChannelResult {
  size_t channel = 0;
  std::complex<double> x1;                      // coherent mean (reference) or amplitude (no reference)
  double amplitude_m_s2 = 0;
  std::vector<std::complex<double>> block_x1;   // per block
  std::vector<double> block_speed_rpm;
  std::vector<Block> blocks;
  std::vector<double> order_amp;                // orders 2.. (index 0 = 2×)
  std::vector<std::optional<double>> order_phase;
  std::vector<double> mains_hz, mains_amp;
  Spectrum spectrum;
  double snr_db = 0;
  double revolutions_per_block = 0;
  std::vector<std::string> warnings;
};

double mean_of(const std::vector<double>& v) {
  return v.empty() ? 0.0 : std::accumulate(v.begin(), v.end(), 0.0) / static_cast<double>(v.size());
}

double stddev_of(const std::vector<double>& v) {
  if (v.size() < 2) return 0.0;
  const double m = mean_of(v);
  double s = 0;
  for (double x : v) s += (x - m) * (x - m);
  return std::sqrt(s / static_cast<double>(v.size() - 1));
}

std::vector<double> mains_family(Mains mains) {
  switch (mains) {
    case Mains::k50: return {50, 100, 150};
    case Mains::k60: return {60, 120, 180};
    case Mains::kAuto: return {50, 100, 150, 60, 120, 180};
    case Mains::kNone: return {};
  }
  return {};
}

int orders_below_nyquist(double f1, double fs) {
  int h = 0;
  while (h < kMaxOrder && (h + 1) * f1 < kUsableNyquist * fs) ++h;
  return h;
}

std::string rpm_text(double rpm) { return fmt::format("{:.0f} rpm", rpm); }

// Power average of block amplitudes less the noise each block adds (E|X|² = A² + 2·var).
double incoherent_amplitude(const std::vector<double>& amps, const std::vector<double>& variances) {
  double p = 0;
  for (double a : amps) p += a * a;
  p /= static_cast<double>(std::max<size_t>(1, amps.size()));
  return std::sqrt(std::max(0.0, p - 2.0 * mean_of(variances)));
}

// Shaft angle within the revolution, rad in [0, 2π), for every sample between the first and last
// (smoothed) pulse of a segment; NaN elsewhere.
void fill_theta(const std::vector<double>& time_s, const std::vector<double>& pulses, std::vector<double>& theta) {
  if (pulses.size() < 2) return;
  size_t i = static_cast<size_t>(std::lower_bound(time_s.begin(), time_s.end(), pulses.front()) - time_s.begin());
  for (size_t j = 0; j + 1 < pulses.size(); ++j) {
    const double a = pulses[j], b = pulses[j + 1];
    for (; i < time_s.size() && time_s[i] < b; ++i)
      theta[i] = 2.0 * kPi * (time_s[i] - a) / (b - a);
  }
}

}  // namespace

std::optional<Mains> parse_mains(const std::string& text) {
  if (text == "auto") return Mains::kAuto;
  if (text == "50") return Mains::k50;
  if (text == "60") return Mains::k60;
  if (text == "none") return Mains::kNone;
  return std::nullopt;
}

double phase_shift_from_acceleration_deg(const std::string& units) {
  auto u = find_vibration_unit(units);
  if (!u) return 0.0;
  switch (u->quantity) {
    case VibrationQuantity::kAcceleration: return 0.0;
    case VibrationQuantity::kVelocity: return 90.0;
    case VibrationQuantity::kDisplacement: return 180.0;
  }
  return 0.0;
}

Measurement measure_recording(const std::string& path, const RecordingOptions& options) {
  return measure(read_recording(path, options.read), options);
}

Measurement measure(const Recording& rec, const RecordingOptions& opt) {
  const std::string& src = rec.source;
  // ---- options
  const auto out_unit = find_vibration_unit(opt.units);
  if (!out_unit)
    throw InputError(fmt::format("{}: units '{}': expected one of g-pk, g-pp, g-rms, m/s2-pk, m/s2-rms, mm/s-pk, "
                                 "mm/s-rms, in/s-pk, um-pp, mil-pp",
                                 src, opt.units));
  const VibrationUnit si_peak = *find_vibration_unit("m/s2-pk");
  if (opt.nominal_rpm && !(*opt.nominal_rpm > 0 && std::isfinite(*opt.nominal_rpm)))
    throw InputError(fmt::format("{}: nominal speed {} rpm; expected a positive speed", src, *opt.nominal_rpm));
  if (!(opt.speed_tolerance_percent > 0) || !(opt.max_speed_deviation_percent > 0) || opt.min_revolutions < 1)
    throw InputError(fmt::format("{}: speed tolerance {} %, deviation limit {} %, minimum revolutions {}; expected "
                                 "positive values",
                                 src, opt.speed_tolerance_percent, opt.max_speed_deviation_percent, opt.min_revolutions));
  if (rec.channels.empty())
    throw InputError(fmt::format("{}: no acceleration channel; expected 1 to 3", src));
  const size_t n = rec.time_s.size();
  if (n < 16)
    throw InputError(fmt::format("{}: {} samples; expected a recording of at least {} revolutions", src, n,
                                 kHardMinRevolutions));
  const double fs = rec.mean_sample_rate_hz();
  const double duration = rec.duration_s();

  Measurement m;
  m.source = src;
  m.format = rec.format;
  m.units = opt.units;
  m.units_source = rec.units_source;
  m.sample_rate_hz = fs;
  m.duration_s = duration;
  m.evenly_sampled = rec.evenly_sampled;
  m.warnings = rec.warnings;
  const double nominal_hz = opt.nominal_rpm ? *opt.nominal_rpm / 60.0 : 0.0;
  const double dev = opt.max_speed_deviation_percent / 100.0;
  if (opt.nominal_rpm && nominal_hz * (1 - dev) >= kUsableNyquist * fs)
    throw InputError(fmt::format("{}: sample rate {:.1f} Hz is too low for the nominal speed {:.0f} rpm; expected at "
                                 "least {:.1f} Hz",
                                 src, fs, *opt.nominal_rpm, nominal_hz / kUsableNyquist));

  // ---- channels to try
  std::vector<size_t> candidates;
  if (!opt.axis.empty()) {
    candidates.push_back(find_channel(rec, opt.axis));
  } else {
    for (size_t i = 0; i < rec.channels.size(); ++i) candidates.push_back(i);
  }
  m.axis_auto = candidates.size() > 1;
  // A channel that never changes recorded no vibration.
  candidates.erase(std::remove_if(candidates.begin(), candidates.end(),
                                  [&](size_t c) {
                                    const auto& v = rec.channels[c].accel_m_s2;
                                    auto [lo_it, hi_it] = std::minmax_element(v.begin(), v.end());
                                    return !(*hi_it > *lo_it);
                                  }),
                   candidates.end());
  if (candidates.empty())
    throw InputError(fmt::format("{}: the acceleration {} constant: no vibration was recorded; expected a varying "
                                 "signal",
                                 src, opt.axis.empty() && rec.channels.size() > 1 ? "columns are all" : "column is"));
  if (opt.nominal_rpm && duration * nominal_hz * (1 + dev) < kHardMinRevolutions)
    throw InputError(fmt::format("{}: too short to measure: {:.3f} s is {:.1f} revolutions at the nominal {:.0f} rpm; "
                                 "expected at least {:.0f} ({} recommended)",
                                 src, duration, duration * nominal_hz, *opt.nominal_rpm, kHardMinRevolutions,
                                 opt.min_revolutions));
  std::vector<Spectrum> spectra(rec.channels.size());
  for (size_t c : candidates)
    spectra[c] = amplitude_spectrum(rec.time_s, rec.channels[c].accel_m_s2, rec.evenly_sampled);
  const std::vector<double> mains_candidates = mains_family(opt.mains);

  // ---- speed
  double f1 = 0;
  std::vector<double> theta;                    // shaft angle per sample (reference only)
  std::vector<std::vector<double>> segments;    // smoothed pulse times of runs of regular revolutions
  std::vector<std::vector<double>> raw_segments;
  double speed_spread = 0;
  const bool has_ref = rec.reference.has_value();
  bool sharp_edges = false;
  if (has_ref) {
    m.reference = rec.reference_name;
    m.speed_source = "reference pulses";
    const Pulses p = detect_pulses(rec.time_s, *rec.reference, opt.pulses);
    m.pulses = static_cast<int>(p.times_s.size());
    m.pulse_threshold = p.threshold;
    m.pulse_edge = edge_name(p.edge);
    sharp_edges = p.sharp_edges;
    if (p.times_s.size() < 2)
      throw InputError(fmt::format("{}: no pulses found in reference '{}' (values {:.4g} to {:.4g}, threshold {:.4g}, "
                                   "{} edges); expected one pulse per revolution: check the column, set the threshold "
                                   "or edge, or measure without it (reference none)",
                                   src, rec.reference_name, p.low, p.high, p.threshold, edge_name(p.edge)));
    // Revolution times; intervals far from the median are missed or extra pulses and split the run.
    std::vector<double> intervals;
    for (size_t i = 1; i < p.times_s.size(); ++i) intervals.push_back(p.times_s[i] - p.times_s[i - 1]);
    std::vector<double> sorted = intervals;
    std::nth_element(sorted.begin(), sorted.begin() + static_cast<std::ptrdiff_t>(sorted.size() / 2), sorted.end());
    const double median = sorted[sorted.size() / 2];
    std::vector<double> good;
    std::vector<double> seg{p.times_s.front()};
    int irregular = 0;
    for (size_t i = 0; i < intervals.size(); ++i) {
      if (std::fabs(intervals[i] - median) <= kPulseIntervalTolerance * median) {
        good.push_back(intervals[i]);
        seg.push_back(p.times_s[i + 1]);
      } else {
        ++irregular;
        if (seg.size() >= 2) raw_segments.push_back(seg);
        seg.assign(1, p.times_s[i + 1]);
      }
    }
    if (seg.size() >= 2) raw_segments.push_back(seg);
    if (good.empty())
      throw InputError(fmt::format("{}: reference '{}' gave {} pulses at irregular intervals; expected one pulse per "
                                   "revolution at a steady speed",
                                   src, rec.reference_name, p.times_s.size()));
    if (irregular > 0)
      m.warnings.push_back(fmt::format("{} revolution time(s) differ from the median by more than {:.0f} %: missed or "
                                       "extra reference pulses; those revolutions were left out",
                                       irregular, kPulseIntervalTolerance * 100));
    const double mean_period = mean_of(good);
    f1 = 1.0 / mean_period;
    speed_spread = 100.0 * stddev_of(good) / mean_period;
    if (opt.nominal_rpm && std::fabs(f1 - nominal_hz) > dev * nominal_hz)
      throw InputError(fmt::format("{}: reference pulses give {:.0f} rpm, far from the nominal {:.0f} rpm (more than "
                                   "{:.0f} % off); expected one pulse per revolution near the nominal speed: check "
                                   "the nominal speed, the reference column and its threshold",
                                   src, 60.0 * f1, *opt.nominal_rpm, opt.max_speed_deviation_percent));
    if (f1 >= kUsableNyquist * fs)
      throw InputError(fmt::format("{}: sample rate {:.1f} Hz is too low for the running speed {:.1f} Hz; expected at "
                                   "least {:.1f} Hz",
                                   src, fs, f1, f1 / kUsableNyquist));
    theta.assign(n, std::numeric_limits<double>::quiet_NaN());
    for (const auto& s : raw_segments) {
      segments.push_back(smooth_pulse_times(s, kSmoothHalfWindow));
      fill_theta(rec.time_s, segments.back(), theta);
    }
  } else {
    m.speed_source = "spectrum peak";
    // Sum of the candidate channels' spectra: the running speed shows in all of them.
    Spectrum sum = spectra[candidates.front()];
    for (size_t k = 1; k < candidates.size(); ++k)
      for (size_t i = 0; i < sum.amplitude.size(); ++i) sum.amplitude[i] += spectra[candidates[k]].amplitude[i];
    const double bin = sum.bin_hz;
    const double f_max = kUsableNyquist * fs;
    double lo = std::max(1.0, 3 * bin), hi = f_max;
    if (opt.nominal_rpm) {
      lo = std::max(lo, nominal_hz * (1 - dev));
      hi = nominal_hz * (1 + dev);
      hi = std::min(hi, f_max);
    }
    if (lo >= hi)
      throw InputError(fmt::format("{}: too short to find the speed: {:.3f} s gives a frequency resolution of {:.2f} "
                                   "Hz, coarser than the band searched; expected a longer recording",
                                   src, duration, bin));
    // Local maxima in [a, b] that are not side lobes of a much larger neighbour.
    auto peaks_in = [&](double a, double b) {
      std::vector<size_t> out;
      for (size_t i = std::max<size_t>(1, sum.bin_of(a)); i <= sum.bin_of(b) && i + 1 < sum.amplitude.size(); ++i)
        if (sum.amplitude[i] >= sum.amplitude[i - 1] && sum.amplitude[i] >= sum.amplitude[i + 1]) out.push_back(i);
      std::vector<size_t> kept;
      for (size_t i : out) {
        bool side = false;
        for (size_t j : out)
          if (j != i && (j > i ? j - i : i - j) <= 12 && sum.amplitude[j] > 10 * sum.amplitude[i]) side = true;
        if (!side) kept.push_back(i);
      }
      return kept;
    };
    auto is_mains = [&](size_t i) {
      for (double mf : mains_candidates)
        if (std::fabs(sum.frequency_hz(i) - mf) <= 0.15 + 1.5 * bin) return true;
      return false;
    };
    // The 1× peak: among clear peaks, one off the mains lines before one on them; nearest the
    // nominal speed when there is one, else the strongest. Without a clear peak, the strongest.
    auto choose = [&](double a, double b, double floor_level) -> size_t {
      const auto cand = peaks_in(a, b);
      size_t best = 0;
      int best_rank = -1;
      for (size_t i : cand) {
        const bool clear_peak = sum.amplitude[i] > kPeakClearRatio * floor_level;
        const int rank = (clear_peak ? 2 : 0) + (is_mains(i) ? 0 : 1);
        bool better = rank > best_rank;
        if (rank == best_rank) {
          if (opt.nominal_rpm && clear_peak)
            better = std::fabs(sum.frequency_hz(i) - nominal_hz) < std::fabs(sum.frequency_hz(best) - nominal_hz);
          else
            better = sum.amplitude[i] > sum.amplitude[best];
        }
        if (better) {
          best = i;
          best_rank = rank;
        }
      }
      return best;
    };
    const double floor_in = noise_floor(sum, lo, hi, {}, 0);
    const size_t peak = choose(lo, hi, floor_in);
    const bool clear = peak > 0 && sum.amplitude[peak] > kPeakClearRatio * floor_in;
    if (!clear && opt.nominal_rpm) {
      const double floor_all = noise_floor(sum, std::max(1.0, 3 * bin), f_max, {}, 0);
      size_t any = 0;
      for (size_t i : peaks_in(std::max(1.0, 3 * bin), f_max))
        if (!is_mains(i) && (any == 0 || sum.amplitude[i] > sum.amplitude[any])) any = i;
      if (any > 0 && sum.amplitude[any] > 2.5 * kPeakClearRatio * floor_all) {
        const double fa = interpolate_peak_hz(sum, any);
        if (fa < lo || fa > hi)
          throw InputError(fmt::format("{}: no clear peak within {:.0f} % of the nominal {:.0f} rpm; the strongest "
                                       "peak is at {:.0f} rpm ({:.2f} Hz), far from nominal; expected the running "
                                       "speed near the nominal one: check the nominal speed",
                                       src, opt.max_speed_deviation_percent, *opt.nominal_rpm, 60 * fa, fa));
      }
    }
    if (peak == 0)
      throw InputError(fmt::format("{}: no spectral peak between {:.2f} and {:.2f} Hz; expected a running speed in "
                                   "that range",
                                   src, lo, hi));
    if (!clear)
      m.warnings.push_back("no clear peak at the running speed: the speed, and so the amplitude, are uncertain");
    if (!opt.nominal_rpm)
      m.warnings.push_back(fmt::format("no nominal speed given: took the strongest peak, {:.0f} rpm, as the running "
                                       "speed",
                                       60 * interpolate_peak_hz(sum, peak)));
    f1 = interpolate_peak_hz(sum, peak);
    // Refine over the whole recording by Gauss-Newton on the 1× frequency, on the channel with
    // the largest peak; steps are kept within 1.5 bins of the spectral estimate.
    size_t best_ch = candidates.front();
    for (size_t c : candidates)
      if (spectra[c].amplitude[peak] > spectra[best_ch].amplitude[peak]) best_ch = c;
    const double f_spec = f1;
    LineModel gm;
    gm.orders = orders_below_nyquist(f1, fs);
    gm.frequency_terms = true;
    for (int it = 0; it < 8; ++it) {
      LineFit g = fit_lines(rec.time_s, rec.channels[best_ch].accel_m_s2, nullptr, 0, n, f1, gm);
      if (!g.ok) break;
      const double step = std::clamp(g.frequency_step_hz, -0.5 * bin, 0.5 * bin);
      f1 = std::clamp(f1 + step, f_spec - 1.5 * bin, f_spec + 1.5 * bin);
      if (std::fabs(step) * duration < 1e-7) break;
    }
  }
  const int orders = std::max(1, orders_below_nyquist(f1, fs));
  if (orders < 3)
    m.warnings.push_back(fmt::format("sample rate {:.0f} Hz allows only {} order(s) below {:.0f} % of it; higher "
                                     "harmonics alias",
                                     fs, orders, 100 * kUsableNyquist));

  // Revolutions available.
  double total_revs = 0;
  if (has_ref) {
    for (const auto& s : segments) total_revs += static_cast<double>(s.size() - 1);
  } else {
    total_revs = duration * f1;
  }
  if (total_revs < kHardMinRevolutions)
    throw InputError(fmt::format("{}: too short to measure: {:.1f} revolutions at {}; expected at least {:.0f} ({} "
                                 "recommended)",
                                 src, total_revs, rpm_text(60 * f1), kHardMinRevolutions, opt.min_revolutions));

  // ---- per channel
  auto analyse = [&](size_t c) {
    ChannelResult r;
    r.channel = c;
    const auto& y = rec.channels[c].accel_m_s2;
    r.spectrum = spectra[c];
    const Spectrum& sp = r.spectrum;
    const double bin = sp.bin_hz;
    std::vector<double> order_hz;
    for (int k = 1; k <= orders; ++k) order_hz.push_back(k * f1);

    // Mains lines: which to fit, and how long blocks must be to separate them from the orders.
    double block_revs = kMinBlockRevolutions;
    for (double mf : mains_candidates) {
      if (mf >= kUsableNyquist * fs) continue;
      double sep = 1e300;
      int nearest = 1;
      for (int k = 1; k <= orders; ++k)
        if (std::fabs(mf - k * f1) < sep) {
          sep = std::fabs(mf - k * f1);
          nearest = k;
        }
      const bool near_order = sep < 0.5 + 2 * bin;
      bool present = opt.mains != Mains::kAuto;
      if (!present && !near_order) {
        double peak = 0;
        for (size_t i = sp.bin_of(mf - 0.2 - 2 * bin); i <= sp.bin_of(mf + 0.2 + 2 * bin); ++i)
          peak = std::max(peak, sp.amplitude[i]);
        const double fl = noise_floor(sp, mf - 10, mf + 10, order_hz, 4 * bin + 0.03 * f1) ;
        present = peak > kMainsPresentRatio * fl;
      }
      const double needed_revs = sep > 0 ? 2.0 * f1 / sep : 1e300;
      if (total_revs < needed_revs) {
        if (nearest == 1 && (present || near_order)) {
          if (sep * duration < 0.5)
            r.warnings.push_back(fmt::format("1\u00d7 ({:.2f} Hz) sits on the {:.0f} Hz mains line: mains "
                                             "interference, if any, cannot be told apart from 1\u00d7",
                                             f1, mf));
          else
            r.warnings.push_back(fmt::format("1\u00d7 ({:.2f} Hz) lies within {:.2f} Hz of the {:.0f} Hz mains line: "
                                             "this recording is too short to tell them apart (needs about {:.2g} s); "
                                             "mains interference may be in the 1\u00d7 figure",
                                             f1, sep, mf, 2.0 / sep));
        }
        continue;
      }
      if (near_order && !present && nearest == 1)
        r.warnings.push_back(fmt::format("1\u00d7 ({:.2f} Hz) lies within {:.2f} Hz of the {:.0f} Hz mains line, too "
                                         "close to see mains interference in the spectrum; if the sensor picks up "
                                         "mains, measure with mains {:.0f} to fit it",
                                         f1, sep, mf, mf < 55 || std::fmod(mf, 50.0) == 0 ? 50.0 : 60.0));
      if (!present) continue;
      r.mains_hz.push_back(mf);
      block_revs = std::max(block_revs, std::ceil(needed_revs));
    }
    block_revs = std::max(block_revs, std::ceil(total_revs / kMaxBlocks));

    // Blocks of whole revolutions.
    if (has_ref) {
      const int b = static_cast<int>(block_revs);
      for (const auto& s : segments) {
        const int revs = static_cast<int>(s.size()) - 1;
        for (int j = 0; j + b <= revs; j += b) {
          Block blk;
          blk.i0 = static_cast<size_t>(std::lower_bound(rec.time_s.begin(), rec.time_s.end(), s[static_cast<size_t>(j)]) -
                                       rec.time_s.begin());
          blk.i1 = static_cast<size_t>(
              std::lower_bound(rec.time_s.begin(), rec.time_s.end(), s[static_cast<size_t>(j + b)]) - rec.time_s.begin());
          blk.revolutions = b;
          blk.speed_rpm = 60.0 * b / (s[static_cast<size_t>(j + b)] - s[static_cast<size_t>(j)]);
          r.blocks.push_back(blk);
        }
      }
      if (r.blocks.empty()) {
        // Shorter than one block: one block of every regular revolution of the longest run.
        const auto& s = *std::max_element(segments.begin(), segments.end(),
                                          [](const auto& a, const auto& bb) { return a.size() < bb.size(); });
        Block blk;
        blk.i0 = static_cast<size_t>(std::lower_bound(rec.time_s.begin(), rec.time_s.end(), s.front()) - rec.time_s.begin());
        blk.i1 = static_cast<size_t>(std::lower_bound(rec.time_s.begin(), rec.time_s.end(), s.back()) - rec.time_s.begin());
        blk.revolutions = static_cast<double>(s.size() - 1);
        blk.speed_rpm = 60.0 * blk.revolutions / (s.back() - s.front());
        r.blocks.push_back(blk);
      }
    } else {
      const double tb = block_revs / f1;
      const int count = std::max(1, static_cast<int>(std::floor(duration / tb)));
      const double t_len = count == 1 ? duration : tb;
      for (int k = 0; k < count; ++k) {
        Block blk;
        const double ta = rec.time_s.front() + k * t_len, tb_end = ta + t_len;
        blk.i0 = static_cast<size_t>(std::lower_bound(rec.time_s.begin(), rec.time_s.end(), ta) - rec.time_s.begin());
        blk.i1 = k == count - 1 && count == 1
                     ? n
                     : static_cast<size_t>(std::lower_bound(rec.time_s.begin(), rec.time_s.end(), tb_end) -
                                           rec.time_s.begin());
        blk.revolutions = t_len * f1;
        r.blocks.push_back(blk);
      }
    }
    r.revolutions_per_block = r.blocks.front().revolutions;

    // Fit every block.
    LineModel model;
    model.orders = orders;
    model.lines_hz = r.mains_hz;
    std::vector<std::vector<std::complex<double>>> order_x(static_cast<size_t>(orders));
    std::vector<std::vector<double>> mains_a(r.mains_hz.size());
    std::vector<double> variances;
    std::vector<Block> kept;
    // Without a reference each block finds its own 1× frequency by Gauss-Newton, seeded by its
    // neighbour's (from the middle block outward), so a drifting speed is followed.
    std::vector<double> block_hz(r.blocks.size(), f1);
    if (!has_ref) {
      const size_t mid = r.blocks.size() / 2;
      std::vector<size_t> order_of_work{mid};
      for (size_t k = 1; k <= mid || mid + k < r.blocks.size(); ++k) {
        if (mid + k < r.blocks.size()) order_of_work.push_back(mid + k);
        if (k <= mid) order_of_work.push_back(mid - k);
      }
      for (size_t b : order_of_work) {
        const Block& blk = r.blocks[b];
        const double seed = b == mid ? f1 : block_hz[b > mid ? b - 1 : b + 1];
        const double t_len = rec.time_s[blk.i1 - 1] - rec.time_s[blk.i0];
        double fb = seed;
        LineModel gm = model;
        gm.frequency_terms = true;
        for (int it = 0; it < 6 && t_len > 0; ++it) {
          LineFit g = fit_lines(rec.time_s, y, nullptr, blk.i0, blk.i1, fb, gm);
          if (!g.ok) break;
          const double step = std::clamp(g.frequency_step_hz, -0.25 / t_len, 0.25 / t_len);
          fb += step;
          if (std::fabs(step) * t_len < 1e-6) break;
        }
        if (std::fabs(fb - seed) > 0.5 / std::max(t_len, 1e-9)) fb = seed;  // lost in noise: keep the seed
        block_hz[b] = fb;
      }
    }
    for (size_t b = 0; b < r.blocks.size(); ++b) {
      Block& blk = r.blocks[b];
      LineFit fit;
      if (has_ref) {
        fit = fit_lines(rec.time_s, y, &theta, blk.i0, blk.i1, f1, model);
      } else {
        fit = fit_lines(rec.time_s, y, nullptr, blk.i0, blk.i1, block_hz[b], model);
        blk.speed_rpm = 60.0 * block_hz[b];
      }
      if (!fit.ok) continue;
      kept.push_back(blk);
      r.block_x1.push_back(fit.orders[0]);
      for (int k = 0; k < orders; ++k) order_x[static_cast<size_t>(k)].push_back(fit.orders[static_cast<size_t>(k)]);
      for (size_t j = 0; j < r.mains_hz.size(); ++j) mains_a[j].push_back(std::abs(fit.lines[j]));
      variances.push_back(fit.coefficient_variance);
    }
    r.blocks = kept;
    if (r.blocks.empty())
      throw InputError(fmt::format("{}: channel '{}' could not be fitted (too few samples per block); expected a "
                                   "longer recording or a higher sample rate",
                                   src, rec.channels[c].name));
    for (const auto& b : r.blocks) r.block_speed_rpm.push_back(b.speed_rpm);

    // Combine blocks: coherent mean with a reference, power mean less noise without.
    auto combine = [&](const std::vector<std::complex<double>>& xs, std::complex<double>& mean_vec) {
      if (has_ref) {
        mean_vec = std::accumulate(xs.begin(), xs.end(), std::complex<double>(0, 0)) / static_cast<double>(xs.size());
        return std::abs(mean_vec);
      }
      std::vector<double> amps;
      for (const auto& x : xs) amps.push_back(std::abs(x));
      const double a = incoherent_amplitude(amps, variances);
      mean_vec = a;
      return a;
    };
    r.amplitude_m_s2 = combine(r.block_x1, r.x1);
    for (int k = 2; k <= orders; ++k) {
      std::complex<double> v;
      r.order_amp.push_back(combine(order_x[static_cast<size_t>(k - 1)], v));
      r.order_phase.push_back(has_ref ? std::optional<double>(wrap_deg_360(rad_to_deg(std::arg(v)))) : std::nullopt);
    }
    for (size_t j = 0; j < r.mains_hz.size(); ++j) r.mains_amp.push_back(incoherent_amplitude(mains_a[j], variances));

    // Signal-to-noise at 1×: against the median spectrum floor from 0.5× to 1.5×, lines left out.
    std::vector<double> excluded = order_hz;
    excluded.insert(excluded.end(), mains_candidates.begin(), mains_candidates.end());
    double fl = noise_floor(sp, 0.5 * f1, 1.5 * f1, excluded, 4 * bin + 0.03 * f1);
    if (fl <= 0) fl = noise_floor(sp, bin, sp.frequency_hz(sp.amplitude.size() - 1), {}, 0);  // too few bins near 1×
    r.snr_db = fl > 0 && r.amplitude_m_s2 > 0 ? std::min(kSnrCapDb, 20 * std::log10(r.amplitude_m_s2 / fl))
                                              : (r.amplitude_m_s2 > 0 ? kSnrCapDb : -kSnrCapDb);
    return r;
  };

  std::vector<ChannelResult> results;
  for (size_t c : candidates) results.push_back(analyse(c));
  const ChannelResult& r = *std::max_element(results.begin(), results.end(), [](const auto& a, const auto& b) {
    return a.amplitude_m_s2 < b.amplitude_m_s2;
  });
  const Channel& ch = rec.channels[r.channel];
  m.axis = ch.name;
  m.clipped = ch.clipped;
  m.warnings.insert(m.warnings.end(), r.warnings.begin(), r.warnings.end());
  // Without a reference the whole recording's fit gives the speed unless the blocks drifted away
  // from it; then their mean does.
  if (!has_ref) {
    const double block_mean_hz = mean_of(r.block_speed_rpm) / 60.0;
    if (std::fabs(block_mean_hz - f1) > 1.0 / duration) f1 = block_mean_hz;
  }
  m.frequency_hz = f1;
  m.speed_rpm = 60.0 * f1;

  // ---- results in the asked unit
  const double shift = phase_shift_from_acceleration_deg(opt.units);
  auto to_units = [&](double a_m_s2, double f_hz) { return convert_amplitude(a_m_s2, si_peak, *out_unit, f_hz); };
  m.amplitude = to_units(r.amplitude_m_s2, f1);
  if (has_ref) m.phase_deg = wrap_deg_360(rad_to_deg(std::arg(r.x1)) + shift);
  for (size_t k = 0; k < r.order_amp.size(); ++k) {
    const int order = static_cast<int>(k) + 2;
    Component comp;
    comp.name = fmt::format("{}\u00d7", order);
    comp.frequency_hz = order * f1;
    comp.amplitude = to_units(r.order_amp[k], comp.frequency_hz);
    if (r.order_phase[k]) comp.phase_deg = wrap_deg_360(*r.order_phase[k] + shift);
    m.harmonics.push_back(comp);
  }
  for (size_t j = 0; j < r.mains_hz.size(); ++j) {
    Component comp;
    comp.name = fmt::format("mains {:.0f} Hz", r.mains_hz[j]);
    comp.frequency_hz = r.mains_hz[j];
    comp.amplitude = to_units(r.mains_amp[j], r.mains_hz[j]);
    m.mains.push_back(comp);
  }
  std::vector<double> block_amp;
  std::vector<std::complex<double>> unit_vectors;
  for (size_t b = 0; b < r.blocks.size(); ++b) {
    BlockReading br;
    br.start_s = rec.time_s[r.blocks[b].i0];
    br.duration_s = rec.time_s[r.blocks[b].i1 - 1] - br.start_s;
    br.revolutions = r.blocks[b].revolutions;
    br.speed_rpm = r.blocks[b].speed_rpm;
    const double a = to_units(std::abs(r.block_x1[b]), f1);
    const double ph = has_ref ? deg_to_rad(rad_to_deg(std::arg(r.block_x1[b])) + shift) : 0.0;
    br.vector = std::polar(a, ph);
    block_amp.push_back(a);
    if (a > 0) unit_vectors.push_back(std::polar(1.0, ph));
    m.blocks.push_back(br);
  }

  // ---- confidence
  Confidence& cf = m.confidence;
  cf.blocks = static_cast<int>(r.blocks.size());
  cf.revolutions_per_block = r.revolutions_per_block;
  cf.revolutions = 0;
  for (const auto& b : r.blocks) cf.revolutions += b.revolutions;
  cf.snr_db = r.snr_db;
  const double amp_mean = mean_of(block_amp);
  cf.amplitude_scatter_percent = amp_mean > 0 ? 100.0 * stddev_of(block_amp) / amp_mean : 0.0;
  const double nb = static_cast<double>(cf.blocks);
  cf.amplitude_uncertainty_percent = cf.amplitude_scatter_percent / std::sqrt(nb);
  if (has_ref) {
    const auto sum = std::accumulate(unit_vectors.begin(), unit_vectors.end(), std::complex<double>(0, 0));
    const double rbar = unit_vectors.empty() ? 0.0 : std::abs(sum) / static_cast<double>(unit_vectors.size());
    cf.phase_scatter_deg = rbar > 0 ? rad_to_deg(std::sqrt(std::max(0.0, -2.0 * std::log(std::min(1.0, rbar))))) : 180.0;
    cf.phase_uncertainty_deg = *cf.phase_scatter_deg / std::sqrt(nb);
    cf.phase_resolution_deg = 180.0 * f1 / fs;
  }
  const double speed_mean = mean_of(r.block_speed_rpm);
  auto [smin, smax] = std::minmax_element(r.block_speed_rpm.begin(), r.block_speed_rpm.end());
  cf.speed_wander_percent = speed_mean > 0 ? 100.0 * (*smax - *smin) / speed_mean : 0.0;
  cf.speed_spread_percent = has_ref ? speed_spread : (speed_mean > 0 ? 100.0 * stddev_of(r.block_speed_rpm) / speed_mean : 0.0);

  // ---- warnings and the level
  const bool short_rec = cf.revolutions < opt.min_revolutions;
  const bool wandered = cf.speed_wander_percent > opt.speed_tolerance_percent;
  if (r.snr_db < kSnrClearDb)
    m.warnings.push_back(fmt::format("1\u00d7 is not clearly above the noise: signal-to-noise {:.1f} dB (below {:.0f} "
                                     "dB); the amplitude{} may be mostly noise",
                                     r.snr_db, kSnrClearDb, has_ref ? " and phase" : ""));
  if (short_rec)
    m.warnings.push_back(fmt::format("short recording: {:.0f} revolutions measured; at least {} recommended",
                                     cf.revolutions, opt.min_revolutions));
  if (m.clipped)
    m.warnings.push_back(fmt::format("channel '{}' is clipped (flat tops at its extreme values): the sensor's range "
                                     "was exceeded and the 1\u00d7 figure is unreliable",
                                     ch.name));
  if (wandered)
    m.warnings.push_back(fmt::format("speed wandered {:.2f} % between blocks (tolerance {:.2f} %): {:.0f} to {:.0f} rpm",
                                     cf.speed_wander_percent, opt.speed_tolerance_percent, *smin, *smax));
  if (sharp_edges && cf.phase_resolution_deg && *cf.phase_resolution_deg > kPhaseResolutionWarnDeg)
    m.warnings.push_back(fmt::format("the reference edges are sharp and sampled {:.0f} times per revolution: each "
                                     "edge is known to \u00b1{:.1f}\u00b0, and the phase averages better only while "
                                     "the speed drifts against the sample clock; record at a higher sample rate",
                                     fs / f1, *cf.phase_resolution_deg));
  if (cf.blocks < 2)
    m.warnings.push_back("one block only: no scatter figure; record longer for a confidence figure");
  const double phase_unc = cf.phase_uncertainty_deg.value_or(0.0);
  const bool poor = r.snr_db < kSnrClearDb || m.clipped || short_rec || cf.blocks < 2 ||
                    cf.amplitude_uncertainty_percent > 10 || phase_unc > 10;
  const bool good = r.snr_db >= kSnrGoodDb && cf.blocks >= 3 && cf.amplitude_uncertainty_percent <= 2 &&
                    phase_unc <= 2 && !wandered;
  cf.level = poor ? "poor" : (good ? "good" : "fair");

  // ---- spectrum for the picture: up to 4.5× (and the mains lines fitted), within Nyquist
  double f_show = 4.5 * f1;
  for (double mf : r.mains_hz) f_show = std::max(f_show, mf * 1.1);
  f_show = std::min(f_show, 0.5 * fs);
  m.spectrum.bin_hz = r.spectrum.bin_hz;
  const size_t last = r.spectrum.bin_of(f_show);
  m.spectrum.amplitude_m_s2.assign(r.spectrum.amplitude.begin(),
                                   r.spectrum.amplitude.begin() + static_cast<std::ptrdiff_t>(std::min(last + 1, r.spectrum.amplitude.size())));
  return m;
}

}  // namespace trimwright::signal
