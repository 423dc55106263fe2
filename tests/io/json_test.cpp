// SPDX-License-Identifier: GPL-3.0-or-later
// Report JSON helpers: significant-digit rounding, no NaN or infinity, key order kept.
#include "geom/io/json.hpp"

#include <catch2/catch.hpp>
#include <cmath>
#include <limits>

#include "geom/base/error.hpp"

using trimwright::InternalError;
using trimwright::io::dump_json;
using trimwright::io::Json;
using trimwright::io::json_number;
using trimwright::io::require_finite;
using trimwright::io::round_sig;

TEST_CASE("json: round_sig keeps the requested significant digits", "[io][json]") {
  CHECK(round_sig(12.0345678, 6) == 12.0346);
  CHECK(round_sig(0.000123456789, 3) == 0.000123);
  CHECK(round_sig(-98765.4321, 2) == -99000);
  CHECK(round_sig(1.0 / 3.0) == 0.333333);
  CHECK(round_sig(0.1 + 0.2) == 0.3);
  CHECK(round_sig(2.7e-300, 1) == 3e-300);
  CHECK(round_sig(123456789.0, 17) == 123456789.0);
  const double neg_zero = round_sig(-0.0);
  CHECK(neg_zero == 0.0);
  CHECK_FALSE(std::signbit(neg_zero));
  CHECK_THROWS_AS(round_sig(std::nan("")), InternalError);
  CHECK_THROWS_AS(round_sig(-std::numeric_limits<double>::infinity()), InternalError);
  CHECK_THROWS_AS(round_sig(1.0, 0), InternalError);
}

TEST_CASE("json: report numbers print short and keys keep their order", "[io][json]") {
  Json j;
  j["tool"] = {{"name", "trimwright"}, {"version", "0.1.0"}};
  j["correction"]["unbalance_gmm"] = json_number(75.00000000001, "unbalance_gmm");
  j["correction"]["angle_deg"] = json_number(212.123456789, "angle_deg");
  j["warnings"] = Json::array();
  CHECK(dump_json(j) ==
        "{\n"
        "  \"tool\": {\n"
        "    \"name\": \"trimwright\",\n"
        "    \"version\": \"0.1.0\"\n"
        "  },\n"
        "  \"correction\": {\n"
        "    \"unbalance_gmm\": 75.0,\n"
        "    \"angle_deg\": 212.123\n"
        "  },\n"
        "  \"warnings\": []\n"
        "}\n");
  CHECK_THROWS_WITH(json_number(std::nan(""), "offset_mm"), Catch::Contains("'offset_mm'"));
}

TEST_CASE("json: NaN or infinity anywhere is an internal error naming the path", "[io][json]") {
  Json j;
  j["checks"] = Json::array();
  j["checks"].push_back({{"name", "hoop"}, {"value", 1.0}});
  j["checks"].push_back(
      {{"name", "retention"}, {"value", std::numeric_limits<double>::infinity()}});
  CHECK_THROWS_WITH(require_finite(j), Catch::Contains("/checks/1/value"));
  CHECK_THROWS_AS(dump_json(j), InternalError);
  Json k;
  k["a/b"] = std::nan("");
  CHECK_THROWS_WITH(dump_json(k), Catch::Contains("/a~1b"));
  CHECK_NOTHROW(require_finite(Json{{"x", 1}, {"y", "text"}, {"z", nullptr}}));
}
