// SPDX-License-Identifier: GPL-3.0-or-later
// Text tables and RFC 4180 CSV.
#include "geom/io/csv.hpp"

#include <fmt/format.h>

#include <cmath>
#include <utility>

#include "geom/base/error.hpp"

namespace trimwright::io {

Table::Table(std::vector<std::string> header) : header_(std::move(header)) {
  if (header_.empty()) throw InternalError("a table needs at least one column");
}

void Table::add_row(std::vector<std::string> cells) {
  if (cells.size() != header_.size()) {
    throw InternalError(fmt::format("table row with {} cells; the header has {} columns",
                                    cells.size(), header_.size()));
  }
  rows_.push_back(std::move(cells));
}

std::string format_fixed(double value, int decimals) {
  if (!std::isfinite(value)) {
    throw InternalError(fmt::format("table cell value {} is not a finite number", value));
  }
  if (decimals < 0 || decimals > 12) {
    throw InternalError(fmt::format("table cell with {} decimals; 0 to 12 expected", decimals));
  }
  std::string s = fmt::format("{:.{}f}", value, decimals);
  // A value that rounds to zero is printed without a sign.
  if (s.front() == '-' && s.find_first_not_of("0.", 1) == std::string::npos) s.erase(0, 1);
  return s;
}

std::string csv_field(std::string_view text) {
  const bool needs_quotes = text.find_first_of(",\"\r\n") != std::string_view::npos ||
                            (!text.empty() && (text.front() == ' ' || text.front() == '\t' ||
                                               text.back() == ' ' || text.back() == '\t'));
  if (!needs_quotes) return std::string(text);
  std::string out;
  out.reserve(text.size() + 2);
  out.push_back('"');
  for (char c : text) {
    if (c == '"') out.push_back('"');
    out.push_back(c);
  }
  out.push_back('"');
  return out;
}

std::string to_csv(const Table& table) {
  std::string out;
  auto line = [&out](const std::vector<std::string>& cells) {
    for (std::size_t i = 0; i < cells.size(); ++i) {
      if (i > 0) out.push_back(',');
      out += csv_field(cells[i]);
    }
    out += "\r\n";
  };
  line(table.header());
  for (const auto& row : table.rows()) line(row);
  return out;
}

}  // namespace trimwright::io
