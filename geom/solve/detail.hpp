// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Private to geom/solve: shared pieces of the method implementations. Not for other modules.

#include <complex>
#include <string>
#include <vector>

#include "geom/solve/solve.hpp"

namespace trimwright::solve::detail {

using Cplx = std::complex<double>;

/// printf-style formatting into a std::string.
std::string format(const char* pattern, ...) __attribute__((format(printf, 1, 2)));

/// "job.toml:31: run \"trial at mark\"" (without file or line when unknown).
std::string run_where(const Readings& readings, std::size_t run_index);

/// "job.toml: readings" or the first run's location.
std::string readings_where(const Readings& readings);

/// Throw InputError "<run_where>: <what>".
[[noreturn]] void fail_run(const Readings& readings, std::size_t run_index,
                           const std::string& what);

/// Throw InputError "<readings_where>: <what>".
[[noreturn]] void fail_readings(const Readings& readings, const std::string& what);

/// Checks a run's weights: planes 1..planes, mass and radius above 0, finite angle.
void validate_weights(const Readings& readings, std::size_t run_index, int planes);

/// Checks every run: the same number of sensors, finite amplitudes ≥ 0, phases where
/// `need_phase`, weights in planes 1..planes with mass and radius above 0. Returns the number of
/// sensors.
int validate_runs(const Readings& readings, int planes, bool need_phase, const char* method);

/// The sum of a run's weights per plane (size `planes`), g·mm, in the job's angle sense
/// (`internal` false) or the internal sense (true).
std::vector<Cplx> run_weights(const Readings& readings, const Run& run, int planes, bool internal);

/// The run's total trial unbalance (sum of |weights|), g·mm.
double run_trial_gmm(const Run& run);

/// A correction record from a user-sense complex unbalance.
Correction make_correction(int plane, Cplx unbalance_user, double radius_mm);

/// Severity of an amplitude, or nothing.
std::optional<Severity> severity_of(double amplitude, const Readings& readings,
                                    const SolveOptions& options);

/// With keep_trial, `total` (relative to the original state) less the last run's weights: what
/// to add to the rotor as it is now. Without, `total` itself. User angle sense.
std::vector<Cplx> minus_kept(const Readings& readings, const std::vector<Cplx>& total);

/// Phase methods: trial, two-plane, fit, and any of them with a known influence set.
/// Each method fills `result` (everything but corrections, combined and tolerance) and returns
/// what to add to the rotor as it is now, per plane, user angle sense.
std::vector<Cplx> solve_phase(const Readings& readings, const SolveOptions& options,
                              const std::optional<InfluenceSet>& influence, SolveResult& result);

/// Four-run amplitude-only method (one plane).
std::vector<Cplx> solve_four_run(const Readings& readings, const SolveOptions& options,
                                 SolveResult& result);

/// Static stand (one plane).
std::vector<Cplx> solve_static(const Readings& readings, const SolveOptions& options,
                               SolveResult& result);

/// Index (remount 180°): the rotor's correction (one plane), or nothing when no influence
/// coefficient is known.
std::vector<Cplx> solve_index(const Readings& readings, const SolveOptions& options,
                              const std::optional<InfluenceSet>& influence, SolveResult& result);

}  // namespace trimwright::solve::detail
