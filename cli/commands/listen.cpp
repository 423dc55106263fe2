// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/commands/listen.hpp"

#include <CLI/CLI.hpp>
#include <fmt/core.h>

#include <cmath>
#include <complex>
#include <filesystem>
#include <memory>
#include <nlohmann/json.hpp>

#include "geom/base/angle.hpp"
#include "geom/base/error.hpp"
#include "geom/base/vibration_units.hpp"
#include "geom/signal/measure.hpp"
#include "geom/signal/plot.hpp"

namespace trimwright::cli {
namespace {

using nlohmann::ordered_json;

ordered_json optional_number(const std::optional<double>& v) { return v ? ordered_json(*v) : ordered_json(nullptr); }

ordered_json to_json(const signal::Measurement& m, const std::vector<std::string>& plots) {
  ordered_json j;
  j["speed_rpm"] = m.speed_rpm;
  j["amplitude"] = m.amplitude;
  j["units"] = m.units;
  j["phase_deg"] = optional_number(m.phase_deg);
  const auto& c = m.confidence;
  j["confidence"] = {{"level", c.level},
                     {"snr_db", c.snr_db},
                     {"amplitude_scatter_percent", c.amplitude_scatter_percent},
                     {"phase_scatter_deg", optional_number(c.phase_scatter_deg)},
                     {"amplitude_uncertainty_percent", c.amplitude_uncertainty_percent},
                     {"phase_uncertainty_deg", optional_number(c.phase_uncertainty_deg)},
                     {"phase_resolution_deg", optional_number(c.phase_resolution_deg)},
                     {"blocks", c.blocks},
                     {"revolutions_per_block", c.revolutions_per_block},
                     {"revolutions", c.revolutions},
                     {"speed_spread_percent", c.speed_spread_percent},
                     {"speed_wander_percent", c.speed_wander_percent}};
  j["warnings"] = m.warnings;
  j["file"] = m.source;
  j["format"] = m.format;
  j["axis"] = m.axis;
  j["reference"] = m.reference.empty() ? ordered_json(nullptr) : ordered_json(m.reference);
  j["speed_source"] = m.speed_source;
  j["frequency_hz"] = m.frequency_hz;
  j["sample_rate_hz"] = m.sample_rate_hz;
  j["duration_s"] = m.duration_s;
  j["evenly_sampled"] = m.evenly_sampled;
  j["clipped"] = m.clipped;
  j["input_units"] = m.units_source;
  if (!m.reference.empty())
    j["pulses"] = {{"count", m.pulses}, {"threshold", optional_number(m.pulse_threshold)}, {"edge", m.pulse_edge}};
  else
    j["pulses"] = nullptr;
  auto components = [](const std::vector<signal::Component>& cs) {
    ordered_json a = ordered_json::array();
    for (const auto& comp : cs)
      a.push_back({{"name", comp.name},
                   {"frequency_hz", comp.frequency_hz},
                   {"amplitude", comp.amplitude},
                   {"phase_deg", optional_number(comp.phase_deg)}});
    return a;
  };
  j["harmonics"] = components(m.harmonics);
  j["mains"] = components(m.mains);
  ordered_json blocks = ordered_json::array();
  for (const auto& b : m.blocks) {
    std::optional<double> ph;
    if (m.phase_deg) ph = wrap_deg_360(rad_to_deg(std::arg(b.vector)));
    blocks.push_back({{"start_s", b.start_s},
                      {"duration_s", b.duration_s},
                      {"revolutions", b.revolutions},
                      {"speed_rpm", b.speed_rpm},
                      {"amplitude", std::abs(b.vector)},
                      {"phase_deg", optional_number(ph)}});
  }
  j["blocks"] = blocks;
  j["plots"] = plots;
  return j;
}

void print_text(const signal::Measurement& m, const std::vector<std::string>& plots) {
  const auto& c = m.confidence;
  fmt::print("{}\n", m.source);
  fmt::print("  input      {} at {:.1f} samples/s{}, {:.2f} s; units {}\n", m.format, m.sample_rate_hz,
             m.evenly_sampled ? "" : " (uneven)", m.duration_s, m.units_source);
  fmt::print("  channel    {}{}\n", m.axis, m.axis_auto ? " (largest 1\u00d7)" : "");
  if (!m.reference.empty())
    fmt::print("  reference  '{}': {} pulses, {} edge at {:.4g}\n", m.reference, m.pulses, m.pulse_edge,
               m.pulse_threshold.value_or(0));
  else
    fmt::print("  reference  none: amplitude only\n");
  fmt::print("  speed      {:.1f} rpm ({:.3f} Hz) from the {}; spread {:.2f} %, wander {:.2f} %\n", m.speed_rpm,
             m.frequency_hz, m.speed_source, c.speed_spread_percent, c.speed_wander_percent);
  if (m.phase_deg)
    fmt::print("  1\u00d7         {:.4g} {} at {:.1f}\u00b0 (lag from the reference edge to the positive peak)\n",
               m.amplitude, m.units, *m.phase_deg);
  else
    fmt::print("  1\u00d7         {:.4g} {}\n", m.amplitude, m.units);
  for (const auto& h : m.harmonics) {
    if (h.phase_deg)
      fmt::print("  {:<10} {:.4g} {} at {:.1f}\u00b0\n", h.name, h.amplitude, m.units, *h.phase_deg);
    else
      fmt::print("  {:<10} {:.4g} {}\n", h.name, h.amplitude, m.units);
  }
  for (const auto& l : m.mains) fmt::print("  {:<12} {:.4g} {} (kept out of 1\u00d7)\n", l.name, l.amplitude, m.units);
  std::string scatter = fmt::format("amplitude \u00b1{:.2f} % (scatter {:.1f} %)", c.amplitude_uncertainty_percent,
                                    c.amplitude_scatter_percent);
  if (c.phase_uncertainty_deg)
    scatter += fmt::format(", phase \u00b1{:.2f}\u00b0 (scatter {:.1f}\u00b0)", *c.phase_uncertainty_deg,
                           c.phase_scatter_deg.value_or(0));
  fmt::print("  confidence {}: signal-to-noise {:.1f} dB; {}; {} blocks of {:.0f} revolutions\n", c.level, c.snr_db,
             scatter, c.blocks, c.revolutions_per_block);
  for (const auto& w : m.warnings) fmt::print("  warning    {}\n", w);
  for (const auto& p : plots) fmt::print("  wrote      {}\n", p);
}

}  // namespace

int run_listen(const ListenOptions& o) {
  if (!find_vibration_unit(o.units))
    throw InputError(fmt::format("--units '{}': expected one of g-pk, g-pp, g-rms, m/s2-pk, m/s2-rms, mm/s-pk, "
                                 "mm/s-rms, in/s-pk, um-pp, mil-pp",
                                 o.units));
  signal::RecordingOptions r;
  r.read.columns = o.columns;
  r.read.time_column = o.time_column;
  r.read.reference = o.reference;
  r.read.input_units = o.input_units;
  r.read.time_units = o.time_units;
  r.read.full_scale = o.full_scale;
  r.nominal_rpm = o.rpm;
  r.units = o.units;
  r.axis = o.axis;
  r.pulses.threshold = o.threshold;
  if (o.edge == "rising")
    r.pulses.edge = signal::Edge::kRising;
  else if (o.edge == "falling")
    r.pulses.edge = signal::Edge::kFalling;
  else if (o.edge != "auto")
    throw InputError(fmt::format("--edge '{}': expected auto, rising or falling", o.edge));
  const auto mains = signal::parse_mains(o.mains);
  if (!mains) throw InputError(fmt::format("--mains '{}': expected auto, 50, 60 or none", o.mains));
  r.mains = *mains;
  r.speed_tolerance_percent = o.speed_tolerance_percent;
  r.min_revolutions = o.min_revolutions;

  const signal::Measurement m = signal::measure_recording(o.file, r);
  std::vector<std::string> plots;
  if (!o.plot_dir.empty())
    plots = signal::write_measurement_plots(m, o.plot_dir, std::filesystem::path(o.file).stem().string());
  if (o.json)
    fmt::print("{}\n", to_json(m, plots).dump(2));
  else
    print_text(m, plots);
  return 0;
}

void add_listen_command(CLI::App& app, int& exit_code) {
  auto o = std::make_shared<ListenOptions>();
  CLI::App* sub = app.add_subcommand(
      "listen", "Measure a recording (CSV or WAV): running speed, 1x amplitude and phase, and how far to trust them");
  sub->add_option("file", o->file, "The recording: CSV (time, 1-3 acceleration columns, optional reference) or WAV")
      ->required();
  sub->add_option("--rpm", o->rpm, "Nominal running speed, rpm (where to look for 1x; checks the reference)")
      ->check(CLI::PositiveNumber);
  sub->add_option("--units", o->units, "Amplitude unit: g-pk (default), g-pp, g-rms, m/s2-pk, mm/s-pk, mm/s-rms, ...");
  sub->add_option("--axis", o->axis, "Acceleration channel: x, y, z, a column name or number (default: largest 1x)");
  sub->add_option("--reference", o->reference,
                  "Reference column (name or number) or WAV channel (left/right); 'none' to ignore it");
  sub->add_option("--plot", o->plot_dir, "Write a spectrum and polar plot (SVG and PNG) into this folder");
  sub->add_flag("--json", o->json, "Print the reading as JSON");
  sub->add_option("--columns", o->columns, "Names for the CSV columns in order, e.g. \"t_ms,x_g,y_g,z_g,ref\"");
  sub->add_option("--time-column", o->time_column, "The CSV time column, by name or number");
  sub->add_option("--threshold", o->threshold, "Reference threshold, in the reference column's units");
  sub->add_option("--edge", o->edge, "Reference edge: auto (default), rising or falling");
  sub->add_option("--input-units", o->input_units, "Acceleration units in the file: g or m/s2");
  sub->add_option("--time-units", o->time_units, "Time units in the file: s, ms, us or ns");
  sub->add_option("--full-scale", o->full_scale, "WAV: acceleration at digital full scale, in input units (default 1 g)")
      ->check(CLI::PositiveNumber);
  sub->add_option("--mains", o->mains, "Mains lines to fit and keep out of 1x: auto (default), 50, 60 or none");
  sub->add_option("--speed-tolerance", o->speed_tolerance_percent, "Report speed wander above this, % (default 2)")
      ->check(CLI::PositiveNumber);
  sub->add_option("--min-revs", o->min_revolutions, "Report recordings shorter than this many revolutions (default 20)")
      ->check(CLI::PositiveNumber);
  sub->callback([o, &exit_code] { exit_code = run_listen(*o); });
}

}  // namespace trimwright::cli
