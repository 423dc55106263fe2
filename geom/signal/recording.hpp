// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// A vibration recording as read from a CSV or WAV file (docs/recordings.md): sample times,
/// one to three acceleration channels in m/s², and an optional once-per-revolution reference.

#include <optional>
#include <string>
#include <vector>

namespace trimwright::signal {

/// How to read a recording's columns and channels. Empty strings mean "find out from the file".
struct ReadOptions {
  /// CSV: names for the file's columns in order, comma separated ("t,z,ref"); overrides the
  /// header. A name "-" ignores its column. Units may be part of a name ("z_g", "t_ms").
  std::string columns;
  /// CSV: the time column, by name or 1-based index; "" = the column named t/time/timestamp,
  /// or the first column.
  std::string time_column;
  /// The reference column (CSV: name or 1-based index; WAV: "left"/"right"/"1"/"2");
  /// "" = a column named ref/reference/pulse/tach/trigger/opto/mark (CSV) or the right channel
  /// of a stereo WAV; "none" = ignore any reference.
  std::string reference;
  /// Units of the acceleration columns: "g", "m/s2" or "" (from the column names, else from the
  /// size of gravity in the data; otherwise the read fails and asks for them).
  std::string input_units;
  /// Units of the time column: "s", "ms", "us", "ns" or "" (from its name, else seconds).
  std::string time_units;
  /// WAV: acceleration at digital full scale, in input_units (default 1, stated as a warning).
  std::optional<double> full_scale;
};

/// One acceleration channel of a recording.
struct Channel {
  std::string name;                ///< column name or WAV channel ("left", "right", "mono")
  int column = 0;                  ///< 1-based CSV column or WAV channel number
  std::vector<double> accel_m_s2;  ///< one value per sample, m/s²
  bool clipped = false;            ///< flat tops found at the channel's extreme values
};

/// A recording: sample times, acceleration channels and an optional reference channel.
struct Recording {
  std::string source;                      ///< the file, for messages
  std::string format;                      ///< "csv" or "wav"
  std::vector<double> time_s;              ///< sample times from the first sample, s, non-decreasing
  std::vector<Channel> channels;           ///< 1 to 3 acceleration channels
  std::optional<std::vector<double>> reference;  ///< raw reference signal, one value per sample
  std::string reference_name;              ///< its column or channel name ("" when none)
  std::string units_source;                ///< how the acceleration units were found, for reports
  bool has_header = false;                 ///< CSV: the columns carry names (header or column map)
  bool evenly_sampled = true;              ///< sample intervals within 1 % of their mean
  std::vector<std::string> warnings;       ///< things the reader noticed (truncated file, assumed scale)

  /// Mean sample rate over the recording, Hz (0 with fewer than two samples).
  double mean_sample_rate_hz() const;
  /// Duration from the first to the last sample, s.
  double duration_s() const { return time_s.empty() ? 0.0 : time_s.back() - time_s.front(); }
};

/// Read a CSV recording. Throws FileError when the file cannot be read, InputError (naming
/// file, line, column and what was expected) for bad content.
Recording read_csv_recording(const std::string& path, const ReadOptions& options);

/// Read a WAV recording (16/24/32-bit PCM, 32/64-bit float; mono or stereo). Throws FileError
/// or InputError as read_csv_recording does.
Recording read_wav_recording(const std::string& path, const ReadOptions& options);

/// Read a recording, choosing the reader by the file's first bytes ("RIFF" → WAV, else CSV).
Recording read_recording(const std::string& path, const ReadOptions& options);

/// True when a channel has flat tops at its extreme values: at least 5 samples (and 0.05 % of
/// all) sit exactly at the maximum or the minimum, in at least 2 runs of 2 or more samples.
bool has_flat_tops(const std::vector<double>& values);

/// The channel an axis option names: its name (any case), its 1-based column or WAV channel
/// number, or x/y/z (a column named "z", "az", "acc_z", "accel z (g)"…; without names the 1st,
/// 2nd or 3rd acceleration column). Throws InputError listing the channels when none matches.
size_t find_channel(const Recording& recording, const std::string& axis);

/// A recording path as a job file names it: relative paths are taken from the job file's folder.
std::string recording_path_for_job(const std::string& job_file, const std::string& recording);

}  // namespace trimwright::signal
