// SPDX-License-Identifier: GPL-3.0-or-later
#pragma once
/// \file
/// Helpers for the JSON report (design.md §8): numbers rounded for people, never NaN or infinity,
/// keys kept in insertion order.

#include <nlohmann/json.hpp>
#include <string>

namespace trimwright::io {

/// The JSON type of reports: objects keep their keys in insertion order.
using Json = nlohmann::ordered_json;

/// Default significant digits of report numbers.
inline constexpr int kReportDigits = 6;

/// `x` rounded to `digits` significant decimal digits (1…17), e.g. round_sig(12.0345678, 6) =
/// 12.0346; zero stays zero (and -0 becomes 0). Throws InternalError for NaN or infinity.
double round_sig(double x, int digits = kReportDigits);

/// A report number: round_sig(x, digits) as JSON. Throws InternalError for NaN or infinity,
/// naming `what`.
Json json_number(double x, const std::string& what, int digits = kReportDigits);

/// Throws InternalError naming the JSON path (e.g. "/checks/2/value") of the first NaN or
/// infinite number in `value`.
void require_finite(const Json& value);

/// The document as text: two-space indent, a final newline, UTF-8 kept as is. Checks
/// require_finite first (nlohmann would silently write NaN as null).
std::string dump_json(const Json& value);

}  // namespace trimwright::io
