// SPDX-License-Identifier: GPL-3.0-or-later
// Writes synthetic recordings and our readings of them for the independent NumPy check
// (reference_fft.py, ctest entry signal_numpy_reference). The ctest fixture names the folder in
// TRIMWRIGHT_SIGNAL_REFERENCE_DIR; any other run writes to its own folder, so two runs never
// write the same manifest at once.
#include <catch2/catch.hpp>

#include <cstdlib>
#include <filesystem>
#include <fstream>

#include "geom/signal/measure.hpp"
#include "synthetic.hpp"

using namespace trimwright::signal;
using namespace trimwright::signal::test;

TEST_CASE("signal: reference recordings for the NumPy check", "[signal][reference-files]") {
  const char* env = std::getenv("TRIMWRIGHT_SIGNAL_REFERENCE_DIR");
  const std::filesystem::path dir =
      env && *env ? std::filesystem::path(env)
                  : std::filesystem::path(TRIMWRIGHT_BINARY_DIR) / "tests" / "signal" / "data" / "reference-check";
  std::filesystem::create_directories(dir);
  std::ofstream manifest(dir / "manifest.csv");
  manifest.precision(10);
  manifest << "file,format,full_scale_g,has_ref,true_rpm,true_amp_g,true_lag_deg,mains_hz,our_rpm,our_amp_g,"
              "our_phase_deg\n";

  struct Item {
    std::string file;
    SynthSpec spec;
    bool reference;
    int wav_bits;  // 0 = CSV
    double mains_hz;
  };
  std::vector<Item> items;
  {
    SynthSpec s;
    s.rpm = 3450;
    s.amp1_g = 0.25;
    s.lag1_deg = 123;
    s.harmonics = {{2, 0.08, 10}};
    s.noise_g = 0.03;
    s.duration_s = 8;
    s.seed = 101;
    items.push_back({"ref_even_3450.csv", s, true, 0, 0});
  }
  {
    SynthSpec s;
    s.rpm = 1500;
    s.amp1_g = 0.15;
    s.noise_g = 0.03;
    s.seed = 102;
    items.push_back({"noref_even_1500.csv", s, false, 0, 0});
  }
  {
    SynthSpec s;
    s.rpm = 1200;
    s.amp1_g = 0.3;
    s.lag1_deg = 300;
    s.sample_rate_hz = 400;
    s.jitter = 0.8;
    s.duration_s = 20;
    s.noise_g = 0.03;
    s.seed = 103;
    items.push_back({"ref_uneven_1200.csv", s, true, 0, 0});
  }
  {
    SynthSpec s;
    s.rpm = 2850;
    s.amp1_g = 0.2;
    s.lag1_deg = 200;
    s.sample_rate_hz = 8000;
    s.duration_s = 6;
    s.mains = {{50, 0.3}};
    s.noise_g = 0.02;
    s.seed = 104;
    items.push_back({"stereo16_2850.wav", s, true, 16, 50});
  }
  {
    SynthSpec s;
    s.rpm = 6000;
    s.amp1_g = 0.1;
    s.sample_rate_hz = 4000;
    s.duration_s = 5;
    s.noise_g = 0.02;
    s.seed = 105;
    items.push_back({"mono_float_6000.wav", s, false, 32, 0});
  }

  const double full_scale_g = 2.0;
  for (auto& it : items) {
    // Exactly steady speeds: the NumPy side fits one frequency to the whole recording.
    it.spec.wobble_percent = 0;
    const auto path = (dir / it.file).string();
    const SynthData d = synthesize(it.spec);
    if (it.wav_bits == 0) {
      CsvStyle st;
      st.reference = it.reference;
      write_csv(path, d, 1, st);
    } else {
      write_wav(path, d, it.wav_bits, it.reference, full_scale_g);
    }
    RecordingOptions opt;
    opt.nominal_rpm = it.spec.rpm;
    if (it.wav_bits != 0) opt.read.full_scale = full_scale_g;
    const Measurement m = measure_recording(path, opt);
    manifest << it.file << ',' << (it.wav_bits ? "wav" : "csv") << ',' << (it.wav_bits ? full_scale_g : 0.0) << ','
             << (it.reference ? 1 : 0) << ',' << it.spec.rpm << ',' << it.spec.amp1_g << ',' << it.spec.lag1_deg << ','
             << it.mains_hz << ',' << m.speed_rpm << ',' << m.amplitude << ','
             << (m.phase_deg ? std::to_string(*m.phase_deg) : std::string("")) << '\n';
    CHECK(m.amplitude == Approx(it.spec.amp1_g).epsilon(0.01));
  }
  manifest.close();
  CHECK(manifest.good());
}
