// SPDX-License-Identifier: GPL-3.0-or-later
#include "cli/toml_reader.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <sstream>

#include "geom/base/error.hpp"

namespace trimwright::cli {

std::string node_location(const toml::node& node, const std::string& fallback_file) {
  const auto& src = node.source();
  std::string file = src.path ? *src.path : fallback_file;
  if (src.begin.line == 0) return file;
  return fmt::format("{}:{}", file, src.begin.line);
}

std::string node_text(const toml::node& node) {
  if (auto s = node.as_string()) return fmt::format("\"{}\"", s->get());
  if (auto i = node.as_integer()) return fmt::format("{}", i->get());
  if (auto f = node.as_floating_point()) {
    double v = f->get();
    if (std::isnan(v)) return "nan";
    if (std::isinf(v)) return v > 0 ? "inf" : "-inf";
    return fmt::format("{}", v);
  }
  if (auto b = node.as_boolean()) return b->get() ? "true" : "false";
  if (node.is_table()) return "a table";
  if (node.is_array()) {
    std::ostringstream os;
    os << *node.as_array();
    std::string s = os.str();
    if (s.size() > 60) s = s.substr(0, 57) + "...";
    return s;
  }
  return "a date/time";
}

std::size_t edit_distance(const std::string& a, const std::string& b) {
  std::vector<std::size_t> prev(b.size() + 1), cur(b.size() + 1);
  for (std::size_t j = 0; j <= b.size(); ++j) prev[j] = j;
  for (std::size_t i = 1; i <= a.size(); ++i) {
    cur[0] = i;
    for (std::size_t j = 1; j <= b.size(); ++j) {
      std::size_t sub = prev[j - 1] + (a[i - 1] == b[j - 1] ? 0 : 1);
      cur[j] = std::min({prev[j] + 1, cur[j - 1] + 1, sub});
    }
    std::swap(prev, cur);
  }
  return prev[b.size()];
}

TableReader::TableReader(const toml::table& table, std::string path, std::string file,
                         std::map<std::string, std::string>& locations)
    : table_(table), path_(std::move(path)), file_(std::move(file)), locations_(locations) {}

std::string TableReader::dotted(const std::string& key) const {
  return path_.empty() ? key : path_ + "." + key;
}

std::string TableReader::table_location() const { return node_location(table_, file_); }

std::string TableReader::prefix(const std::string& key) const {
  const toml::node* n = table_.get(key);
  if (!n) return fmt::format("{}: {}: ", table_location(), dotted(key));
  return fmt::format("{}: {} = {}: ", node_location(*n, file_), dotted(key), node_text(*n));
}

void TableReader::fail(const std::string& key, const std::string& expected) const {
  throw InputError(prefix(key) + "expected " + expected);
}

void TableReader::missing(const std::string& key, const std::string& expected) const {
  // A misspelt required key shows up as missing: name the misspelling instead.
  for (auto&& [k, v] : table_) {
    std::string other(k.str());
    if (read_.count(other) || other == key) continue;
    if (edit_distance(other, key) <= std::max<std::size_t>(2, key.size() / 3)) {
      std::string loc = k.source().begin.line != 0
                            ? fmt::format("{}:{}", k.source().path ? *k.source().path : file_, k.source().begin.line)
                            : node_location(v, file_);
      throw InputError(fmt::format("{}: unknown key \"{}\": did you mean \"{}\"?", loc, dotted(other), dotted(key)));
    }
  }
  std::string where = path_.empty() ? std::string("the job") : "[" + path_ + "]";
  throw InputError(fmt::format("{}: {} has no \"{}\": expected {}", table_location(), where, key,
                               expected));
}

bool TableReader::has(const std::string& key) {
  read_.insert(key);
  return table_.get(key) != nullptr;
}

const toml::node* TableReader::node(const std::string& key) {
  read_.insert(key);
  const toml::node* n = table_.get(key);
  if (n) locations_[dotted(key)] = node_location(*n, file_);
  return n;
}

const toml::node& TableReader::require(const std::string& key, const std::string& expected) {
  const toml::node* n = node(key);
  if (!n) missing(key, expected);
  return *n;
}

double TableReader::check_number(const std::string& key, const toml::node& n, const Range& r) {
  double v = 0;
  if (auto i = n.as_integer()) {
    v = static_cast<double>(i->get());
  } else if (auto f = n.as_floating_point()) {
    v = f->get();
  } else {
    fail(key, fmt::format("a number: {}", r.what));
  }
  if (!std::isfinite(v)) fail(key, fmt::format("a finite number: {}", r.what));
  bool low_ok = r.min_inclusive ? v >= r.min : v > r.min;
  bool high_ok = r.max_inclusive ? v <= r.max : v < r.max;
  if (!low_ok || !high_ok) {
    fail(key, fmt::format("{} ({} {} value {} {})", r.what, fmt::format("{:g}", r.min),
                          r.min_inclusive ? "<=" : "<", r.max_inclusive ? "<=" : "<",
                          fmt::format("{:g}", r.max)));
  }
  return v;
}

double TableReader::number(const std::string& key, const Range& range) {
  return check_number(key, require(key, range.what), range);
}

std::optional<double> TableReader::optional_number(const std::string& key, const Range& range) {
  const toml::node* n = node(key);
  if (!n) return std::nullopt;
  return check_number(key, *n, range);
}

double TableReader::number_or(const std::string& key, double fallback, const Range& range) {
  auto v = optional_number(key, range);
  return v ? *v : fallback;
}

long long TableReader::integer(const std::string& key, long long min, long long max,
                               const char* what) {
  const toml::node& n = require(key, what);
  auto i = n.as_integer();
  if (!i) fail(key, fmt::format("a whole number: {}", what));
  long long v = i->get();
  if (v < min || v > max) fail(key, fmt::format("{} ({} to {})", what, min, max));
  return v;
}

std::optional<std::string> TableReader::optional_string(const std::string& key, const char* what) {
  const toml::node* n = node(key);
  if (!n) return std::nullopt;
  auto s = n->as_string();
  if (!s) fail(key, fmt::format("a quoted string: {}", what));
  return s->get();
}

std::string TableReader::choice(const std::string& key, const std::vector<std::string>& choices,
                                const std::string& fallback) {
  std::string list;
  for (const auto& c : choices) list += (list.empty() ? "" : " | ") + c;
  auto s = optional_string(key, list.c_str());
  if (!s) return fallback;
  if (std::find(choices.begin(), choices.end(), *s) != choices.end()) return *s;
  std::string best;
  std::size_t best_d = 3;
  for (const auto& c : choices) {
    std::size_t d = edit_distance(*s, c);
    if (d < best_d) best_d = d, best = c;
  }
  if (!best.empty()) fail(key, fmt::format("one of {} (did you mean \"{}\"?)", list, best));
  fail(key, fmt::format("one of {}", list));
}

bool TableReader::boolean_or(const std::string& key, bool fallback, const char* what) {
  const toml::node* n = node(key);
  if (!n) return fallback;
  auto b = n->as_boolean();
  if (!b) fail(key, fmt::format("true or false: {}", what));
  return b->get();
}

std::optional<std::vector<std::string>> TableReader::optional_strings(const std::string& key,
                                                                     const char* what) {
  const toml::node* n = node(key);
  if (!n) return std::nullopt;
  auto arr = n->as_array();
  if (!arr) fail(key, fmt::format("an array of strings: {}", what));
  std::vector<std::string> out;
  for (const auto& e : *arr) {
    auto s = e.as_string();
    if (!s) fail(key, fmt::format("an array of strings: {}", what));
    out.push_back(s->get());
  }
  return out;
}

std::optional<std::vector<double>> TableReader::optional_numbers(const std::string& key,
                                                                const Range& range) {
  const toml::node* n = node(key);
  if (!n) return std::nullopt;
  std::vector<double> out;
  if (auto arr = n->as_array()) {
    if (arr->empty()) fail(key, fmt::format("at least one number: {}", range.what));
    for (const auto& e : *arr) out.push_back(check_number(key, e, range));
  } else {
    out.push_back(check_number(key, *n, range));
  }
  return out;
}

const toml::table* TableReader::optional_table(const std::string& key) {
  const toml::node* n = node(key);
  if (!n) return nullptr;
  auto t = n->as_table();
  if (!t) fail(key, fmt::format("a table [{}]", dotted(key)));
  return t;
}

const toml::array* TableReader::optional_table_array(const std::string& key) {
  const toml::node* n = node(key);
  if (!n) return nullptr;
  auto a = n->as_array();
  if (!a || !a->is_array_of_tables()) fail(key, fmt::format("an array of tables [[{}]]", dotted(key)));
  return a;
}

void TableReader::finish(const std::vector<std::string>& also_known) {
  for (auto&& [k, v] : table_) {
    std::string key(k.str());
    if (read_.count(key)) continue;
    if (std::find(also_known.begin(), also_known.end(), key) != also_known.end()) continue;
    std::string best;
    std::size_t best_d = std::max<std::size_t>(2, key.size() / 3) + 1;
    std::vector<std::string> known(read_.begin(), read_.end());
    known.insert(known.end(), also_known.begin(), also_known.end());
    for (const auto& c : known) {
      std::size_t d = edit_distance(key, c);
      if (d < best_d) best_d = d, best = c;
    }
    std::string loc = node_location(v, file_);
    if (k.source().begin.line != 0) {
      loc = fmt::format("{}:{}", k.source().path ? *k.source().path : file_, k.source().begin.line);
    }
    if (!best.empty())
      throw InputError(fmt::format("{}: unknown key \"{}\": did you mean \"{}\"?", loc, dotted(key),
                                   dotted(best)));
    std::string list;
    for (const auto& c : known) list += (list.empty() ? "" : ", ") + c;
    throw InputError(fmt::format("{}: unknown key \"{}\": expected one of {}", loc, dotted(key), list));
  }
}

}  // namespace trimwright::cli
