// SPDX-License-Identifier: GPL-3.0-or-later
// CSV tables (RFC 4180, "Common Format and MIME Type for Comma-Separated Values (CSV) Files",
// section 2: CRLF line ends; fields with commas, quotes or line breaks in double quotes; an
// inner quote doubled).
#include "geom/io/csv.hpp"

#include <catch2/catch.hpp>
#include <limits>

#include "geom/base/error.hpp"

using trimwright::InternalError;
using trimwright::io::csv_field;
using trimwright::io::format_fixed;
using trimwright::io::Table;
using trimwright::io::to_csv;

TEST_CASE("csv: fields are quoted as RFC 4180 section 2 asks", "[io][csv]") {
  CHECK(csv_field("plain") == "plain");
  CHECK(csv_field("") == "");
  CHECK(csv_field("a,b") == "\"a,b\"");                    // RFC 4180 §2 rule 6
  CHECK(csv_field("say \"hi\"") == "\"say \"\"hi\"\"\"");  // §2 rule 7
  CHECK(csv_field("two\r\nlines") == "\"two\r\nlines\"");  // §2 rule 6
  CHECK(csv_field("lf\nonly") == "\"lf\nonly\"");
  CHECK(csv_field(" padded ") == "\" padded \"");  // kept: spaces are part of a field (§2 rule 4)
  CHECK(csv_field("212°") == "212°");
}

TEST_CASE("csv: a table with CRLF line ends, header first", "[io][csv]") {
  Table t({"setting", "offset_mm", "note"});
  t.add_row({"1", format_fixed(1.25, 2), "heavy mark on +x"});
  t.add_row({"2", format_fixed(-0.004, 2), "a, b"});
  CHECK(to_csv(t) ==
        "setting,offset_mm,note\r\n"
        "1,1.25,heavy mark on +x\r\n"
        "2,0.00,\"a, b\"\r\n");
  CHECK(t.column_count() == 3);
  CHECK(t.rows().size() == 2);
  CHECK_THROWS_AS(t.add_row({"only one"}), InternalError);
  CHECK_THROWS_AS(Table({}), InternalError);
}

TEST_CASE("csv: fixed-point numbers, never NaN", "[io][csv]") {
  CHECK(format_fixed(212.0, 1) == "212.0");
  CHECK(format_fixed(2.675, 2) == "2.67");  // the double nearest 2.675 is just below it
  CHECK(format_fixed(-1.5, 0) == "-2");     // round half to even on the exact binary value
  CHECK(format_fixed(-0.0, 3) == "0.000");
  CHECK_THROWS_AS(format_fixed(std::numeric_limits<double>::quiet_NaN(), 2), InternalError);
  CHECK_THROWS_AS(format_fixed(std::numeric_limits<double>::infinity(), 2), InternalError);
  CHECK_THROWS_AS(format_fixed(1, 13), InternalError);
}
