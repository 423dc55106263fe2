// SPDX-License-Identifier: GPL-3.0-or-later
// Report JSON helpers.
#include "geom/io/json.hpp"

#include <fmt/format.h>

#include <cmath>
#include <cstdlib>

#include "geom/base/error.hpp"

namespace trimwright::io {
namespace {

// Escape a key for a JSON pointer (RFC 6901): '~' → "~0", '/' → "~1".
std::string pointer_token(const std::string& key) {
  std::string out;
  for (char c : key) {
    if (c == '~') {
      out += "~0";
    } else if (c == '/') {
      out += "~1";
    } else {
      out.push_back(c);
    }
  }
  return out;
}

void check_finite(const Json& value, const std::string& path) {
  if (value.is_number_float()) {
    const double d = value.get<double>();
    if (!std::isfinite(d)) {
      throw InternalError(fmt::format("report value at {} is {}; reports hold finite numbers only",
                                      path.empty() ? "/" : path, d));
    }
  } else if (value.is_object()) {
    for (auto it = value.begin(); it != value.end(); ++it) {
      check_finite(it.value(), path + "/" + pointer_token(it.key()));
    }
  } else if (value.is_array()) {
    for (std::size_t i = 0; i < value.size(); ++i) {
      check_finite(value[i], path + "/" + std::to_string(i));
    }
  }
}

}  // namespace

double round_sig(double x, int digits) {
  if (!std::isfinite(x)) {
    throw InternalError(fmt::format("cannot round {} for a report", x));
  }
  if (digits < 1 || digits > 17) {
    throw InternalError(fmt::format("round_sig: {} significant digits; 1 to 17 expected", digits));
  }
  if (x == 0) return 0.0;
  // Decimal rounding through the shortest exact text form: correctly rounded, no drift from
  // scaling by powers of ten.
  const std::string text = fmt::format("{:.{}e}", x, digits - 1);
  return std::strtod(text.c_str(), nullptr) + 0.0;
}

Json json_number(double x, const std::string& what, int digits) {
  if (!std::isfinite(x)) {
    throw InternalError(
        fmt::format("report value '{}' is {}; a finite number is expected", what, x));
  }
  return Json(round_sig(x, digits));
}

void require_finite(const Json& value) { check_finite(value, ""); }

std::string dump_json(const Json& value) {
  require_finite(value);
  return value.dump(2, ' ', false, Json::error_handler_t::strict) + "\n";
}

}  // namespace trimwright::io
