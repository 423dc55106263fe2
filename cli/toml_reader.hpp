// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Checked access to TOML tables for the job loader: every value is checked for type, range and
/// unit, every key not read is reported as unknown with the nearest valid key, and every message
/// is one line naming file:line, key, value and what was expected. toml++ itself silently falls
/// back to defaults on a type mismatch, so nothing here uses value_or().

#include <toml++/toml.h>

#include <map>
#include <optional>
#include <set>
#include <string>
#include <vector>

namespace trimwright::cli {

/// Inclusive/exclusive numeric range with a human description of the unit.
struct Range {
  double min = 0;
  double max = 0;
  bool min_inclusive = false;   ///< false: value must be > min
  bool max_inclusive = true;
  const char* what = "";        ///< e.g. "a running speed in rpm"
};

/// "file:line" of a node (the file it came from, which may be an included one).
std::string node_location(const toml::node& node, const std::string& fallback_file);

/// A TOML value shown as the user wrote it, for messages.
std::string node_text(const toml::node& node);

/// Levenshtein distance, for "did you mean" suggestions.
std::size_t edit_distance(const std::string& a, const std::string& b);

/// Reads one table; records which keys were read so `finish()` can reject unknown ones.
class TableReader {
 public:
  /// `path` is the dotted table name ("machine", "readings.run[2]"), "" for the root.
  TableReader(const toml::table& table, std::string path, std::string file,
              std::map<std::string, std::string>& locations);

  /// Whether the key is present (and marks it as known).
  bool has(const std::string& key);
  /// A required number within range.
  double number(const std::string& key, const Range& range);
  /// An optional number within range.
  std::optional<double> optional_number(const std::string& key, const Range& range);
  /// A number with a default.
  double number_or(const std::string& key, double fallback, const Range& range);
  /// A required integer within [min, max].
  long long integer(const std::string& key, long long min, long long max, const char* what);
  /// An optional string.
  std::optional<std::string> optional_string(const std::string& key, const char* what);
  /// A string that must be one of `choices`, with a default.
  std::string choice(const std::string& key, const std::vector<std::string>& choices,
                     const std::string& fallback);
  /// A boolean with a default.
  bool boolean_or(const std::string& key, bool fallback, const char* what);
  /// An optional array of strings.
  std::optional<std::vector<std::string>> optional_strings(const std::string& key,
                                                          const char* what);
  /// A number or an array of numbers (at least one), each within range.
  std::optional<std::vector<double>> optional_numbers(const std::string& key, const Range& range);
  /// A sub-table, if present (type-checked).
  const toml::table* optional_table(const std::string& key);
  /// An array of tables, if present (type-checked).
  const toml::array* optional_table_array(const std::string& key);
  /// The raw node of a key (marks it known), or nullptr.
  const toml::node* node(const std::string& key);

  /// Reject keys that were never read: "unknown key ... did you mean ...".
  void finish(const std::vector<std::string>& also_known = {});

  /// "file:line: path.key = value: " prefix for a message about `key`.
  std::string prefix(const std::string& key) const;
  /// "file:line" of the table itself.
  std::string table_location() const;
  /// The dotted name of `key` in this table.
  std::string dotted(const std::string& key) const;
  /// Throw InputError "file:line: path.key = value: expected <what>".
  [[noreturn]] void fail(const std::string& key, const std::string& expected) const;
  /// Throw InputError "file:line: [path] has no key: expected <what>" for a missing key.
  [[noreturn]] void missing(const std::string& key, const std::string& expected) const;

  const std::string& file() const { return file_; }
  const std::string& path() const { return path_; }

 private:
  const toml::node& require(const std::string& key, const std::string& expected);
  double check_number(const std::string& key, const toml::node& n, const Range& range);

  const toml::table& table_;
  std::string path_;
  std::string file_;
  std::map<std::string, std::string>& locations_;
  std::set<std::string> read_;
};

}  // namespace trimwright::cli
