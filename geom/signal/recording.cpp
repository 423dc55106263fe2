// SPDX-License-Identifier: GPL-3.0-or-later
// CSV and WAV recording readers (docs/recordings.md, "File formats").
#include "geom/signal/recording.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cerrno>
#include <cmath>
#include <cstdint>
#include <cstdlib>
#include <cstring>
#include <filesystem>
#include <fstream>
#include <iterator>
#include <set>

#include "geom/base/error.hpp"
#include "geom/base/vibration_units.hpp"

namespace trimwright::signal {
namespace {

// ---------------------------------------------------------------------------------------------
// Shared helpers

std::string read_whole_file(const std::string& path) {
  std::error_code ec;
  if (std::filesystem::is_directory(path, ec))
    throw FileError(fmt::format("{}: cannot read the recording: it is a folder, expected a CSV or WAV file", path));
  std::ifstream in(path, std::ios::binary);
  if (!in)
    throw FileError(fmt::format("{}: cannot read the recording: {}", path, std::strerror(errno)));
  std::string data((std::istreambuf_iterator<char>(in)), std::istreambuf_iterator<char>());
  if (in.bad()) throw FileError(fmt::format("{}: cannot read the recording: read failed", path));
  return data;
}

std::string lower(std::string s) {
  for (auto& c : s) c = static_cast<char>(std::tolower(static_cast<unsigned char>(c)));
  return s;
}

std::string trim(const std::string& s) {
  size_t a = 0, b = s.size();
  while (a < b && std::isspace(static_cast<unsigned char>(s[a]))) ++a;
  while (b > a && std::isspace(static_cast<unsigned char>(s[b - 1]))) --b;
  std::string t = s.substr(a, b - a);
  if (t.size() >= 2 && ((t.front() == '"' && t.back() == '"') || (t.front() == '\'' && t.back() == '\'')))
    t = t.substr(1, t.size() - 2);
  return t;
}

// Lower-case tokens of a column name, split on anything but letters, digits and non-ASCII bytes
// (so "µs" stays one token).
std::vector<std::string> tokens_of(const std::string& name) {
  std::vector<std::string> out;
  std::string cur;
  for (char ch : lower(name)) {
    auto u = static_cast<unsigned char>(ch);
    if (std::isalnum(u) || u >= 0x80) {
      cur += ch;
    } else if (!cur.empty()) {
      out.push_back(cur);
      cur.clear();
    }
  }
  if (!cur.empty()) out.push_back(cur);
  return out;
}

bool has_token(const std::vector<std::string>& tokens, std::initializer_list<const char*> words) {
  for (const auto& t : tokens)
    for (const char* w : words)
      if (t == w) return true;
  return false;
}

bool is_time_name(const std::string& name) {
  auto tk = tokens_of(name);
  if (tk.empty()) return false;
  return has_token(tk, {"time", "timestamp", "elapsed"}) || tk.front() == "t" || tk.front() == "seconds" ||
         tk.front() == "sec";
}

bool is_reference_name(const std::string& name) {
  return has_token(tokens_of(name),
                   {"ref", "reference", "pulse", "pulses", "tach", "tacho", "trigger", "opto", "mark", "once"});
}

// Columns that are never taken as acceleration unless asked for by name.
bool is_excluded_name(const std::string& name) {
  return has_token(tokens_of(name), {"gyro", "gyr", "magnetometer", "magnetic", "mag", "abs", "absolute",
                                     "magnitude", "norm", "total", "temp", "temperature", "sample", "samples",
                                     "count", "idx", "index", "seq", "lat", "lon", "latitude", "longitude"});
}

// Acceleration units named in a column name: "g", "m/s2" or "".
std::string units_in_name(const std::string& name) {
  std::string l = lower(name);
  for (const char* m : {"m/s", "ms^-2", "ms-2", "m s-2", "m s^-2", "mps2", "m/s2", "m_s2"})
    if (l.find(m) != std::string::npos) return "m/s2";
  if (has_token(tokens_of(name), {"g", "gs", "gee"})) return "g";
  return "";
}

// Seconds per unit of a time column, from its name (0 when it says nothing).
double time_scale_in_name(const std::string& name) {
  auto tk = tokens_of(name);
  if (has_token(tk, {"ns", "nanoseconds"})) return 1e-9;
  if (has_token(tk, {"us", "\xc2\xb5s", "\xce\xbcs", "microseconds"})) return 1e-6;
  if (has_token(tk, {"ms", "milliseconds", "millis"})) return 1e-3;
  if (has_token(tk, {"s", "sec", "secs", "seconds"})) return 1.0;
  return 0.0;
}

double time_scale_from_option(const std::string& source, const std::string& units) {
  if (units == "s") return 1.0;
  if (units == "ms") return 1e-3;
  if (units == "us") return 1e-6;
  if (units == "ns") return 1e-9;
  throw InputError(fmt::format("{}: time units '{}': expected s, ms, us or ns", source, units));
}

double accel_scale_from_units(const std::string& source, const std::string& units) {
  if (units == "g") return kStandardGravity_m_s2;
  if (units == "m/s2" || units == "m/s^2") return 1.0;
  throw InputError(fmt::format("{}: input units '{}': expected g or m/s2", source, units));
}

bool is_integer_text(const std::string& s) {
  return !s.empty() && std::all_of(s.begin(), s.end(), [](char c) { return std::isdigit(static_cast<unsigned char>(c)); });
}

void finish_recording(Recording& rec) {
  const auto& t = rec.time_s;
  rec.evenly_sampled = true;
  if (t.size() >= 3) {
    double mean_dt = (t.back() - t.front()) / static_cast<double>(t.size() - 1);
    for (size_t i = 1; i < t.size(); ++i)
      if (std::fabs((t[i] - t[i - 1]) - mean_dt) > 0.01 * mean_dt) {
        rec.evenly_sampled = false;
        break;
      }
  }
  for (auto& ch : rec.channels) ch.clipped = has_flat_tops(ch.accel_m_s2);
}

// ---------------------------------------------------------------------------------------------
// CSV

struct CsvLine {
  int number = 0;  // 1-based line number in the file
  std::string text;
};

std::vector<std::string> split_cells(const std::string& line, char sep) {
  std::vector<std::string> cells;
  std::string cur;
  bool quoted = false;
  for (char c : line) {
    if (c == '"') quoted = !quoted;
    if (c == sep && !quoted) {
      cells.push_back(trim(cur));
      cur.clear();
    } else {
      cur += c;
    }
  }
  cells.push_back(trim(cur));
  return cells;
}

// Parse a cell as a finite number; decimal commas are accepted when the separator is not a comma.
bool parse_number(const std::string& cell, bool decimal_comma, long double& out) {
  if (cell.empty()) return false;
  std::string s = cell;
  if (decimal_comma) std::replace(s.begin(), s.end(), ',', '.');
  char* end = nullptr;
  errno = 0;
  out = std::strtold(s.c_str(), &end);
  if (end == s.c_str()) return false;
  while (*end && std::isspace(static_cast<unsigned char>(*end))) ++end;
  if (*end != '\0') return false;
  return std::isfinite(static_cast<double>(out)) && errno != ERANGE;
}

// Find a column by name (case-insensitive) or 1-based index; -1 when none matches.
int find_column(const std::vector<std::string>& names, const std::string& key) {
  if (is_integer_text(key)) {
    int idx = std::atoi(key.c_str());
    return (idx >= 1 && idx <= static_cast<int>(names.size())) ? idx - 1 : -1;
  }
  for (size_t i = 0; i < names.size(); ++i)
    if (lower(names[i]) == lower(key)) return static_cast<int>(i);
  return -1;
}

std::string list_names(const std::vector<std::string>& names) {
  std::string out;
  for (size_t i = 0; i < names.size(); ++i) out += (i ? ", " : "") + fmt::format("{} '{}'", i + 1, names[i]);
  return out;
}

}  // namespace

double Recording::mean_sample_rate_hz() const {
  if (time_s.size() < 2) return 0.0;
  double d = duration_s();
  return d > 0 ? static_cast<double>(time_s.size() - 1) / d : 0.0;
}

bool has_flat_tops(const std::vector<double>& values) {
  const size_t n = values.size();
  if (n < 16) return false;
  auto [mn_it, mx_it] = std::minmax_element(values.begin(), values.end());
  const double mn = *mn_it, mx = *mx_it;
  if (!(mx > mn)) return false;  // a constant channel has no peaks to clip
  auto flat = [&](double level) {
    size_t count = 0, runs = 0, run = 0;
    for (size_t i = 0; i < n; ++i) {
      if (values[i] == level) {
        ++count;
        ++run;
      } else {
        if (run >= 2) ++runs;
        run = 0;
      }
    }
    if (run >= 2) ++runs;
    const double needed = std::max(5.0, 0.0005 * static_cast<double>(n));
    return static_cast<double>(count) >= needed && runs >= 2;
  };
  return flat(mx) || flat(mn);
}

size_t find_channel(const Recording& recording, const std::string& axis) {
  const auto& chs = recording.channels;
  const std::string key = lower(trim(axis));
  for (size_t i = 0; i < chs.size(); ++i)
    if (lower(chs[i].name) == key) return i;
  if (is_integer_text(key)) {
    const int col = std::atoi(key.c_str());
    for (size_t i = 0; i < chs.size(); ++i)
      if (chs[i].column == col) return i;
  }
  if (key == "x" || key == "y" || key == "z") {
    for (size_t i = 0; i < chs.size(); ++i) {
      if (!recording.has_header) break;
      auto tk = tokens_of(chs[i].name);
      for (const auto& t : tk)
        if (t == key || t == "a" + key || t == "acc" + key || t == "accel" + key || t == "acceleration" + key)
          return i;
    }
    const size_t idx = static_cast<size_t>(key[0] - 'x');
    if (!recording.has_header && idx < chs.size()) return idx;
  }
  std::string names;
  for (const auto& c : chs) names += (names.empty() ? "" : ", ") + fmt::format("'{}'", c.name);
  throw InputError(fmt::format("{}: no acceleration channel matches axis '{}'; expected one of {} (a name, a column "
                               "number, or x/y/z)",
                               recording.source, axis, names));
}

std::string recording_path_for_job(const std::string& job_file, const std::string& recording) {
  std::filesystem::path rec(recording);
  if (rec.is_absolute() || job_file.empty()) return rec.string();
  return (std::filesystem::path(job_file).parent_path() / rec).lexically_normal().string();
}

Recording read_csv_recording(const std::string& path, const ReadOptions& options) {
  const std::string data = read_whole_file(path);
  // Lines, without a UTF-8 byte-order mark, blank lines or '#' comments.
  std::vector<CsvLine> lines;
  {
    size_t pos = 0;
    int number = 0;
    if (data.compare(0, 3, "\xEF\xBB\xBF") == 0) pos = 3;
    while (pos < data.size()) {
      size_t eol = data.find('\n', pos);
      if (eol == std::string::npos) eol = data.size();
      std::string text = data.substr(pos, eol - pos);
      if (!text.empty() && text.back() == '\r') text.pop_back();
      ++number;
      pos = eol + 1;
      std::string t = trim(text);
      if (t.empty() || t[0] == '#') continue;
      lines.push_back({number, std::move(text)});
    }
  }
  if (lines.empty())
    throw InputError(fmt::format("{}: no data rows; expected a time column and 1 to 3 acceleration columns", path));

  // Separator from the first content line: semicolon, then tab, then comma.
  const std::string& first = lines.front().text;
  char sep = ',';
  if (first.find(';') != std::string::npos)
    sep = ';';
  else if (first.find('\t') != std::string::npos)
    sep = '\t';
  const bool decimal_comma = sep != ',';

  // Header: the first line is one unless every cell is a number.
  std::vector<std::string> first_cells = split_cells(first, sep);
  bool header = false;
  for (const auto& c : first_cells) {
    long double v;
    if (!parse_number(c, decimal_comma, v)) header = true;
  }
  const size_t data_begin = header ? 1 : 0;
  if (lines.size() <= data_begin)
    throw InputError(fmt::format("{}:{}: a header but no data rows; expected rows of numbers after it", path,
                                 lines.front().number));
  const size_t ncols = split_cells(lines[data_begin].text, sep).size();
  if (ncols < 2)
    throw InputError(fmt::format("{}:{}: found 1 column; expected a time column and 1 to 3 acceleration columns "
                                 "(separated by ',' or ';')",
                                 path, lines[data_begin].number));

  // Column names: a column map, else the header, else positions.
  std::vector<std::string> names(ncols);
  bool named = header;
  for (size_t i = 0; i < ncols; ++i) names[i] = header && i < first_cells.size() ? first_cells[i] : std::to_string(i + 1);
  if (!options.columns.empty()) {
    auto map = split_cells(options.columns, ',');
    if (map.size() > ncols)
      throw InputError(fmt::format("{}: the column map '{}' names {} columns; the file has {}", path, options.columns,
                                   map.size(), ncols));
    for (size_t i = 0; i < ncols; ++i) names[i] = i < map.size() ? map[i] : "-";
    named = true;
  }
  std::vector<bool> ignored(ncols, false);
  for (size_t i = 0; i < ncols; ++i) ignored[i] = names[i] == "-" || names[i].empty();

  // Time column.
  int time_col = -1;
  if (!options.time_column.empty()) {
    time_col = find_column(names, options.time_column);
    if (time_col < 0)
      throw InputError(fmt::format("{}: no column '{}' for time; columns are {}", path, options.time_column,
                                   list_names(names)));
  } else {
    for (size_t i = 0; i < ncols && time_col < 0; ++i)
      if (named && !ignored[i] && is_time_name(names[i])) time_col = static_cast<int>(i);
    if (time_col < 0) time_col = 0;
  }

  // Reference column.
  int ref_col = -1;
  if (lower(options.reference) != "none") {
    if (!options.reference.empty()) {
      ref_col = find_column(names, options.reference);
      if (ref_col < 0)
        throw InputError(fmt::format("{}: no column '{}' for the reference; columns are {}", path, options.reference,
                                     list_names(names)));
    } else if (named) {
      for (size_t i = 0; i < ncols && ref_col < 0; ++i)
        if (!ignored[i] && static_cast<int>(i) != time_col && is_reference_name(names[i])) ref_col = static_cast<int>(i);
    }
  }
  if (ref_col == time_col && ref_col >= 0)
    throw InputError(fmt::format("{}: column {} '{}' cannot be both time and reference", path, time_col + 1,
                                 names[static_cast<size_t>(time_col)]));

  // Acceleration columns: every other column that is not ignored or excluded by its name.
  std::vector<int> accel_cols;
  for (size_t i = 0; i < ncols; ++i) {
    const int ci = static_cast<int>(i);
    if (ci == time_col || ci == ref_col || ignored[i]) continue;
    if (named && (is_excluded_name(names[i]) || is_time_name(names[i]))) continue;
    accel_cols.push_back(ci);
  }
  if (accel_cols.empty())
    throw InputError(fmt::format("{}: no acceleration column; expected 1 to 3 besides time{} (columns are {})", path,
                                 ref_col >= 0 ? " and reference" : "", list_names(names)));
  if (accel_cols.size() > 3)
    throw InputError(fmt::format("{}: {} acceleration columns; expected 1 to 3 (name the others '-' in a column map, "
                                 "or give the axis)",
                                 path, accel_cols.size()));

  // Units.
  double time_scale = 1.0;
  std::string time_units_source = "seconds (default)";
  if (!options.time_units.empty()) {
    time_scale = time_scale_from_option(path, options.time_units);
    time_units_source = options.time_units + " (given)";
  } else if (named) {
    double s = time_scale_in_name(names[static_cast<size_t>(time_col)]);
    if (s > 0) {
      time_scale = s;
      time_units_source = "from the column name";
    }
  }

  // Parse rows.
  Recording rec;
  rec.source = path;
  rec.format = "csv";
  rec.has_header = named;
  const size_t nrows = lines.size() - data_begin;
  std::vector<long double> time_raw;
  time_raw.reserve(nrows);
  std::vector<std::vector<double>> accel_raw(accel_cols.size());
  for (auto& a : accel_raw) a.reserve(nrows);
  std::vector<double> ref_raw;
  if (ref_col >= 0) ref_raw.reserve(nrows);
  int max_used = std::max(time_col, ref_col);
  for (int c : accel_cols) max_used = std::max(max_used, c);

  auto cell_value = [&](const std::vector<std::string>& cells, int col, const CsvLine& line) {
    if (col >= static_cast<int>(cells.size()))
      throw InputError(fmt::format("{}:{}: found {} columns; expected at least {} (column {} '{}' is missing)", path,
                                   line.number, cells.size(), max_used + 1, col + 1, names[static_cast<size_t>(col)]));
    long double v = 0;
    const std::string& cell = cells[static_cast<size_t>(col)];
    if (!parse_number(cell, decimal_comma, v))
      throw InputError(fmt::format("{}:{}: column {} '{}': expected a number, found '{}'", path, line.number, col + 1,
                                   names[static_cast<size_t>(col)], cell));
    return v;
  };

  for (size_t r = data_begin; r < lines.size(); ++r) {
    const auto& line = lines[r];
    auto cells = split_cells(line.text, sep);
    long double t = cell_value(cells, time_col, line);
    if (!time_raw.empty() && t < time_raw.back())
      throw InputError(fmt::format("{}:{}: column {} '{}': time {} is earlier than the previous row's {}; expected "
                                   "times that never decrease",
                                   path, line.number, time_col + 1, names[static_cast<size_t>(time_col)],
                                   static_cast<double>(t), static_cast<double>(time_raw.back())));
    time_raw.push_back(t);
    for (size_t k = 0; k < accel_cols.size(); ++k)
      accel_raw[k].push_back(static_cast<double>(cell_value(cells, accel_cols[k], line)));
    if (ref_col >= 0) ref_raw.push_back(static_cast<double>(cell_value(cells, ref_col, line)));
  }
  if (time_raw.size() < 2 || !(time_raw.back() > time_raw.front()))
    throw InputError(fmt::format("{}: the time column '{}' does not advance ({} rows); expected increasing times", path,
                                 names[static_cast<size_t>(time_col)], time_raw.size()));
  rec.time_s.resize(time_raw.size());
  for (size_t i = 0; i < time_raw.size(); ++i)
    rec.time_s[i] = static_cast<double>((time_raw[i] - time_raw.front()) * time_scale);

  // Acceleration units per column: option, then name, then the size of gravity in the data.
  std::vector<double> scale(accel_cols.size(), 0.0);
  std::vector<std::string> unit_sources;
  for (size_t k = 0; k < accel_cols.size(); ++k) {
    std::string u = options.input_units;
    std::string how = "given";
    if (u.empty() && named) {
      u = units_in_name(names[static_cast<size_t>(accel_cols[k])]);
      how = "column name";
    }
    if (!u.empty()) {
      scale[k] = accel_scale_from_units(path, u);
      unit_sources.push_back(u + " (" + how + ")");
    }
  }
  if (std::any_of(scale.begin(), scale.end(), [](double s) { return s == 0.0; })) {
    // Gravity: the mean acceleration vector of a resting or rotating machine is 1 g long.
    double sum2 = 0;
    std::string unnamed;
    for (size_t k = 0; k < accel_cols.size(); ++k) {
      if (scale[k] != 0.0) continue;
      double mean = 0;
      for (double v : accel_raw[k]) mean += v;
      mean /= static_cast<double>(accel_raw[k].size());
      sum2 += mean * mean;
      unnamed += (unnamed.empty() ? "" : ", ") + names[static_cast<size_t>(accel_cols[k])];
    }
    const double g_len = std::sqrt(sum2);
    double s = 0;
    if (g_len > 0.8 && g_len < 1.2) s = kStandardGravity_m_s2;
    if (g_len > 0.8 * kStandardGravity_m_s2 && g_len < 1.2 * kStandardGravity_m_s2) s = 1.0;
    if (s == 0.0)
      throw InputError(fmt::format("{}: cannot tell whether column(s) {} are in g or m/s2 (their mean is {:.3g}, not "
                                   "gravity); expected the unit in the column name ('z_g', 'z (m/s2)') or given "
                                   "(--input-units g|m/s2)",
                                   path, unnamed, g_len));
    for (auto& sc : scale)
      if (sc == 0.0) sc = s;
    unit_sources.push_back(fmt::format("{} (gravity in the data: mean vector {:.3g})", s == 1.0 ? "m/s2" : "g", g_len));
  }
  for (size_t k = 0; k < accel_cols.size(); ++k) {
    Channel ch;
    ch.name = names[static_cast<size_t>(accel_cols[k])];
    ch.column = accel_cols[k] + 1;
    ch.accel_m_s2 = std::move(accel_raw[k]);
    for (auto& v : ch.accel_m_s2) v *= scale[k];
    rec.channels.push_back(std::move(ch));
  }
  std::set<std::string> uniq(unit_sources.begin(), unit_sources.end());
  for (const auto& u : uniq) rec.units_source += (rec.units_source.empty() ? "" : "; ") + u;
  rec.units_source += "; time " + time_units_source;
  if (ref_col >= 0) {
    rec.reference = std::move(ref_raw);
    rec.reference_name = names[static_cast<size_t>(ref_col)];
  }
  finish_recording(rec);
  return rec;
}

// ---------------------------------------------------------------------------------------------
// WAV

namespace {

uint32_t le32(const std::string& d, size_t at) {
  return static_cast<uint32_t>(static_cast<unsigned char>(d[at])) |
         static_cast<uint32_t>(static_cast<unsigned char>(d[at + 1])) << 8 |
         static_cast<uint32_t>(static_cast<unsigned char>(d[at + 2])) << 16 |
         static_cast<uint32_t>(static_cast<unsigned char>(d[at + 3])) << 24;
}
uint16_t le16(const std::string& d, size_t at) {
  return static_cast<uint16_t>(static_cast<unsigned char>(d[at]) | static_cast<unsigned char>(d[at + 1]) << 8);
}

// One sample as a fraction of digital full scale.
double wav_sample(const char* p, int format, int bits) {
  const auto* u = reinterpret_cast<const unsigned char*>(p);
  if (format == 3) {
    if (bits == 32) {
      uint32_t b = static_cast<uint32_t>(u[0]) | static_cast<uint32_t>(u[1]) << 8 | static_cast<uint32_t>(u[2]) << 16 |
                   static_cast<uint32_t>(u[3]) << 24;
      float f;
      std::memcpy(&f, &b, 4);
      return f;
    }
    uint64_t b = 0;
    for (int i = 7; i >= 0; --i) b = b << 8 | u[i];
    double dv;
    std::memcpy(&dv, &b, 8);
    return dv;
  }
  switch (bits) {
    case 8: return (static_cast<int>(u[0]) - 128) / 128.0;
    case 16: return static_cast<int16_t>(static_cast<uint16_t>(u[0] | u[1] << 8)) / 32768.0;
    case 24: {
      int32_t v = static_cast<int32_t>(static_cast<uint32_t>(u[0]) << 8 | static_cast<uint32_t>(u[1]) << 16 |
                                       static_cast<uint32_t>(u[2]) << 24) >> 8;
      return v / 8388608.0;
    }
    default: {
      int32_t v = static_cast<int32_t>(static_cast<uint32_t>(u[0]) | static_cast<uint32_t>(u[1]) << 8 |
                                       static_cast<uint32_t>(u[2]) << 16 | static_cast<uint32_t>(u[3]) << 24);
      return v / 2147483648.0;
    }
  }
}

}  // namespace

Recording read_wav_recording(const std::string& path, const ReadOptions& options) {
  const std::string d = read_whole_file(path);
  if (d.size() < 12 || d.compare(0, 4, "RIFF") != 0 || d.compare(8, 4, "WAVE") != 0)
    throw InputError(fmt::format("{}: not a WAV file; expected a RIFF/WAVE header", path));
  int format = -1, channels = 0, bits = 0, block_align = 0;
  uint32_t rate = 0;
  size_t data_at = 0, data_size = 0;
  bool have_data = false;
  Recording rec;
  rec.source = path;
  rec.format = "wav";
  size_t pos = 12;
  while (pos + 8 <= d.size()) {
    const std::string id = d.substr(pos, 4);
    const size_t size = le32(d, pos + 4);
    const size_t body = pos + 8;
    if (id == "fmt ") {
      if (size < 16 || body + 16 > d.size())
        throw InputError(fmt::format("{}: WAV format chunk is {} bytes; expected at least 16", path, size));
      format = le16(d, body);
      channels = le16(d, body + 2);
      rate = le32(d, body + 4);
      block_align = le16(d, body + 12);
      bits = le16(d, body + 14);
      if (format == 0xFFFE && size >= 40 && body + 26 <= d.size()) format = le16(d, body + 24);  // extensible
    } else if (id == "data") {
      data_at = body;
      data_size = size;
      have_data = true;
      if (data_at + data_size > d.size()) {
        data_size = d.size() - data_at;
        rec.warnings.push_back("the WAV data chunk is cut short (truncated file); read the samples present");
      }
      break;
    }
    pos = body + size + (size & 1u);
  }
  if (format < 0) throw InputError(fmt::format("{}: WAV file without a format chunk; expected 'fmt '", path));
  if (!have_data) throw InputError(fmt::format("{}: WAV file without a data chunk; expected 'data'", path));
  const bool pcm_ok = format == 1 && (bits == 8 || bits == 16 || bits == 24 || bits == 32);
  const bool float_ok = format == 3 && (bits == 32 || bits == 64);
  if (!pcm_ok && !float_ok)
    throw InputError(fmt::format("{}: WAV format {} with {} bits; expected PCM 8/16/24/32-bit or float 32/64-bit",
                                 path, format, bits));
  if (channels < 1 || channels > 2)
    throw InputError(fmt::format("{}: WAV with {} channels; expected mono or stereo", path, channels));
  if (rate == 0) throw InputError(fmt::format("{}: WAV sample rate 0; expected a positive rate", path));
  const int bytes = bits / 8;
  if (block_align != bytes * channels)
    throw InputError(fmt::format("{}: WAV block align {}; expected {} for {} channels of {} bits", path, block_align,
                                 bytes * channels, channels, bits));
  const size_t frames = data_size / static_cast<size_t>(block_align);
  if (frames < 2) throw InputError(fmt::format("{}: WAV data holds {} samples; expected a recording", path, frames));

  // Which channel is the reference.
  int ref_channel = -1;  // 0-based
  const std::string ref = lower(options.reference);
  if (ref == "none") {
    ref_channel = -1;
  } else if (ref.empty()) {
    ref_channel = channels == 2 ? 1 : -1;
  } else if (ref == "left" || ref == "1") {
    ref_channel = 0;
  } else if (ref == "right" || ref == "2") {
    ref_channel = channels == 2 ? 1 : -2;
  } else {
    ref_channel = -2;
  }
  if (ref_channel == -2 || (ref_channel >= 0 && channels == 1))
    throw InputError(fmt::format("{}: reference '{}' for a {} WAV; expected {}", path, options.reference,
                                 channels == 1 ? "mono" : "stereo",
                                 channels == 1 ? "none (a mono file has no reference channel)" : "left, right, 1, 2 or none"));

  std::string in_units = options.input_units.empty() ? "g" : options.input_units;
  double scale = accel_scale_from_units(path, in_units);
  double full_scale = 1.0;
  if (options.full_scale) {
    full_scale = *options.full_scale;
    if (!(full_scale > 0) || !std::isfinite(full_scale))
      throw InputError(fmt::format("{}: full scale {}; expected a positive acceleration at digital full scale", path,
                                   full_scale));
    rec.units_source = fmt::format("{} {} at full scale (given)", full_scale, in_units);
  } else {
    rec.units_source = fmt::format("1 {} at full scale (assumed)", in_units);
    rec.warnings.push_back(fmt::format("WAV amplitudes assume 1 {} at digital full scale (no full scale given); "
                                       "absolute values depend on it, readings relative to each other do not",
                                       in_units));
  }
  scale *= full_scale;

  rec.time_s.resize(frames);
  for (size_t i = 0; i < frames; ++i) rec.time_s[i] = static_cast<double>(i) / rate;
  std::vector<std::vector<double>> ch(static_cast<size_t>(channels), std::vector<double>(frames));
  for (size_t i = 0; i < frames; ++i)
    for (int c = 0; c < channels; ++c)
      ch[static_cast<size_t>(c)][i] =
          wav_sample(d.data() + data_at + i * static_cast<size_t>(block_align) + static_cast<size_t>(c * bytes), format, bits);
  for (int c = 0; c < channels; ++c) {
    if (c == ref_channel) {
      rec.reference = std::move(ch[static_cast<size_t>(c)]);
      rec.reference_name = c == 0 ? "left" : "right";
      continue;
    }
    Channel channel;
    channel.name = channels == 1 ? "mono" : (c == 0 ? "left" : "right");
    channel.column = c + 1;
    channel.accel_m_s2 = std::move(ch[static_cast<size_t>(c)]);
    for (auto& v : channel.accel_m_s2) {
      if (!std::isfinite(v))
        throw InputError(fmt::format("{}: WAV channel {} holds a non-finite sample; expected finite values", path,
                                     channel.name));
      v *= scale;
    }
    rec.channels.push_back(std::move(channel));
  }
  finish_recording(rec);
  return rec;
}

Recording read_recording(const std::string& path, const ReadOptions& options) {
  std::ifstream in(path, std::ios::binary);
  std::error_code ec;
  if (!in || std::filesystem::is_directory(path, ec))
    throw FileError(fmt::format("{}: cannot read the recording: {}", path,
                                std::filesystem::is_directory(path, ec) ? "it is a folder" : std::strerror(errno)));
  char magic[4] = {0, 0, 0, 0};
  in.read(magic, 4);
  if (in.gcount() == 4 && std::memcmp(magic, "RIFF", 4) == 0) return read_wav_recording(path, options);
  return read_csv_recording(path, options);
}

}  // namespace trimwright::signal
