// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// A small table of text cells and its CSV form (RFC 4180: comma-separated, CRLF line ends,
/// fields quoted when needed). Used for `chart.csv`.

#include <cstddef>
#include <string>
#include <string_view>
#include <vector>

namespace trimwright::io {

/// A table of text cells with a header row; every row has as many cells as the header.
class Table {
 public:
  /// A table with these column names (at least one).
  explicit Table(std::vector<std::string> header);

  /// Append a row. Throws InternalError when its cell count differs from the header's.
  void add_row(std::vector<std::string> cells);

  /// Column names.
  const std::vector<std::string>& header() const { return header_; }
  /// Data rows, in the order added.
  const std::vector<std::vector<std::string>>& rows() const { return rows_; }
  /// Number of columns.
  std::size_t column_count() const { return header_.size(); }

 private:
  std::vector<std::string> header_;
  std::vector<std::vector<std::string>> rows_;
};

/// A number as a table cell with `decimals` digits after the point (0…12), "-0" written as "0".
/// Throws InternalError for NaN or infinity (a table never shows them).
std::string format_fixed(double value, int decimals);

/// One CSV field: as is, or in double quotes with inner quotes doubled when it contains a comma,
/// a quote, CR or LF, or starts or ends with a space or tab.
std::string csv_field(std::string_view text);

/// The table as CSV: the header line, then one line per row, each ended by CRLF.
std::string to_csv(const Table& table);

}  // namespace trimwright::io
